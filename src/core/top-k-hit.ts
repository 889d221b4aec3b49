import type { ImagePoint, ImageRect } from './types';
import { pointInAnyRect } from './box-geometry';

/**
 * Indices of the k largest values, largest first, lower index first on ties; NaN values are
 * skipped, so fewer than k come back when fewer than k values are numbers. 'k' must be an
 * integer >= 1 (RangeError).
 */
export function topKIndices(values: ArrayLike<number>, k: number): number[] {
  if (!(Number.isInteger(k) && k >= 1)) throw new RangeError(`'k' must be an integer >= 1; got ${k}`);
  const idx: number[] = [];
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (v !== v) continue;
    if (idx.length === k && !(v > values[idx[k - 1]])) continue;
    let p = idx.length < k ? idx.length : k - 1;
    if (idx.length < k) idx.push(i);
    while (p > 0 && values[idx[p - 1]] < v) {
      idx[p] = idx[p - 1];
      p--;
    }
    idx[p] = i;
  }
  return idx;
}

/**
 * Top-k hit: whether the centre of any of the k best cells lies in a box enlarged by tolerancePx
 * (a relaxed pointing game, common practice). k must be an integer in [1, number of cells]
 * (RangeError); NaN cells are never among the best; no boxes or no numbers: false.
 */
export function topKHit(
  values: ArrayLike<number>,
  centres: readonly ImagePoint[],
  boxes: readonly ImageRect[],
  { k = 5, tolerancePx = 0 }: { k?: number; tolerancePx?: number } = {},
): boolean {
  if (!(Number.isInteger(k) && k >= 1 && k <= values.length)) {
    throw new RangeError(`'k' must be an integer in [1, ${values.length}]; got ${k}`);
  }
  if (centres.length !== values.length) {
    throw new RangeError(`'centres' must hold one point per value (${values.length}); got ${centres.length}`);
  }
  for (const i of topKIndices(values, k)) if (pointInAnyRect(centres[i], boxes, tolerancePx)) return true;
  return false;
}
