/**
 * Contrast-to-noise ratio of a map between the cells inside the reference boxes and the rest:
 * CNR = |mean_in - mean_out| / sqrt(var_in + var_out), population variances (Boecking et al.,
 * ECCV 2022). inside[i] marks cell i as inside (groundSentence uses: centre in a box). NaN cells
 * are left out. Undefined when either side is empty or both variances are 0. Invariant under a
 * positive affine rescaling a * map + b (a > 0). Lengths must match (RangeError).
 */
export function contrastToNoise(values: ArrayLike<number>, inside: ArrayLike<boolean | number>): number | undefined {
  if (inside.length !== values.length) {
    throw new RangeError(`'inside' must hold one flag per value (${values.length}); got ${inside.length}`);
  }
  let nIn = 0;
  let nOut = 0;
  let sIn = 0;
  let sOut = 0;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (v !== v) continue;
    if (inside[i]) {
      nIn++;
      sIn += v;
    } else {
      nOut++;
      sOut += v;
    }
  }
  if (nIn === 0 || nOut === 0) return undefined;
  const mIn = sIn / nIn;
  const mOut = sOut / nOut;
  // Two passes (deviations from the means) keep the variances accurate for large offsets.
  let qIn = 0;
  let qOut = 0;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (v !== v) continue;
    if (inside[i]) qIn += (v - mIn) * (v - mIn);
    else qOut += (v - mOut) * (v - mOut);
  }
  const noise = Math.sqrt(qIn / nIn + qOut / nOut);
  if (!(noise > 0)) return undefined;
  return Math.abs(mIn - mOut) / noise;
}
