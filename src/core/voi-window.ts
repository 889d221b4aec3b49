/**
 * The linear VOI (value of interest) function of DICOM PS3.3 C.11.2.1.2.1 (Window Center / Window
 * Width, function LINEAR) with output range [0, 1]:
 *   x <= c - 0.5 - (w - 1) / 2  -> 0
 *   x >  c - 0.5 + (w - 1) / 2  -> 1
 *   else                        -> (x - (c - 0.5)) / (w - 1) + 0.5
 * `value`, `centre` and `width` are in the units of the modality LUT output. NaN maps to NaN.
 * Throws RangeError when width < 1 (the standard requires Window Width >= 1) or is not finite.
 */
export function applyVoiLinear(value: number, centre: number, width: number): number {
  if (!Number.isFinite(width) || width < 1) throw new RangeError(`'width' must be a finite number >= 1; got ${width}`);
  if (!Number.isFinite(centre)) throw new RangeError(`'centre' must be a finite number; got ${centre}`);
  const half = (width - 1) / 2;
  const mid = centre - 0.5;
  if (value <= mid - half) return 0;
  if (value > mid + half) return 1;
  if (Number.isNaN(value)) return NaN;
  return (value - mid) / (width - 1) + 0.5;
}

/**
 * Maps every value of a decoded image to display intensity in [0, 1] (row-major, same length).
 * With `window`, applies the DICOM PS3.3 C.11.2.1.2.1 linear VOI function (applyVoiLinear).
 * Without it, maps valueRange linearly: lo -> 0, hi -> 1, clamped outside; for a degenerate range
 * (hi <= lo) values <= lo map to 0 and the rest to 1. NaN stays NaN. Empty data gives an empty array.
 */
export function toUnitIntensity(
  image: { readonly data: Float32Array; readonly valueRange: readonly [number, number] },
  window?: { readonly centre: number; readonly width: number },
): Float32Array {
  const { data } = image;
  const out = new Float32Array(data.length);
  if (window !== undefined) {
    const { centre, width } = window;
    applyVoiLinear(0, centre, width);
    for (let i = 0; i < data.length; i++) out[i] = applyVoiLinear(data[i], centre, width);
    return out;
  }
  const [lo, hi] = image.valueRange;
  if (!Number.isFinite(lo) || !Number.isFinite(hi)) throw new RangeError(`'image.valueRange' must be two finite numbers; got [${lo}, ${hi}]`);
  if (hi <= lo) {
    for (let i = 0; i < data.length; i++) out[i] = Number.isNaN(data[i]) ? NaN : data[i] <= lo ? 0 : 1;
    return out;
  }
  const scale = 1 / (hi - lo);
  for (let i = 0; i < data.length; i++) {
    const v = (data[i] - lo) * scale;
    out[i] = v < 0 ? 0 : v > 1 ? 1 : v;
  }
  return out;
}
