/**
 * Sample quantile of values already sorted ascending, by linear interpolation between order statistics
 * (definition 7 of R. J. Hyndman and Y. Fan (1996), "Sample quantiles in statistical packages",
 * The American Statistician 50:361-365). q = 0.5 gives the median (mean of the middle two for even length).
 * Returns undefined for an empty array. Throws RangeError for q outside [0, 1].
 * The order is not checked: the caller sorts.
 */
export function quantileSorted(sorted: ArrayLike<number>, q: number): number | undefined {
  if (!(q >= 0 && q <= 1)) throw new RangeError(`'q' must be in [0, 1]; got ${q}`);
  const m = sorted.length;
  if (m === 0) return undefined;
  const h = (m - 1) * q;
  const lo = Math.floor(h);
  const hi = Math.min(lo + 1, m - 1);
  return sorted[lo] + (h - lo) * (sorted[hi] - sorted[lo]);
}
