/**
 * Pools a study's per-sentence region scores into one study score. 'mean' (the only method, the
 * default) is the arithmetic mean, as in local image-report alignment scoring (common practice).
 * Returns undefined for no sentences (a study score over nothing is undefined); NaN propagates.
 */
export function poolSentences(values: ArrayLike<number>, method: 'mean' = 'mean'): number | undefined {
  if (method !== 'mean') throw new RangeError(`'method' must be 'mean'; got '${String(method)}'`);
  const n = values.length;
  if (n === 0) return undefined;
  let s = 0;
  for (let i = 0; i < n; i++) s += values[i];
  if (Number.isFinite(s) || Number.isNaN(s)) return s / n;
  for (let i = 0; i < n; i++) if (!Number.isFinite(values[i])) return s / n;
  // Finite values whose sum overflows: a running mean stays finite.
  let m = 0;
  for (let i = 0; i < n; i++) m += (values[i] - m) / (i + 1);
  return m;
}
