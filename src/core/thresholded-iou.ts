import type { ImageRect } from './types';
import { coveredAreas, unionArea } from './box-geometry';

/** Default thresholds of thresholdedIou, on the min-max normalised map. */
export const DEFAULT_IOU_THRESHOLDS: readonly number[] = [0.25, 0.5, 0.75];

/** IoU of the thresholded map with the boxes at one threshold. */
export interface ThresholdIou {
  readonly threshold: number;
  readonly iou: number | undefined;
}

/**
 * As thresholdedIou, from precomputed areas: cellAreas[i] is cell i's image area, covered[i] the
 * part of it inside the box union, boxArea the area of the box union. For the batch path, where
 * the areas are shared with massInBoxes.
 */
export function thresholdedIouFromAreas(
  values: ArrayLike<number>,
  cellAreas: ArrayLike<number>,
  covered: ArrayLike<number>,
  boxArea: number,
  thresholds: readonly number[] = DEFAULT_IOU_THRESHOLDS,
): ThresholdIou[] {
  for (const t of thresholds) {
    if (!(t >= 0 && t <= 1)) throw new RangeError(`'thresholds' must be numbers in [0, 1]; got ${t}`);
  }
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  const range = hi - lo;
  if (!(range > 0)) return thresholds.map((threshold) => ({ threshold, iou: undefined }));
  // One pass over the cells for every threshold; each threshold still sums its cells in order.
  const nt = thresholds.length;
  const mapArea = new Float64Array(nt);
  const inter = new Float64Array(nt);
  for (let i = 0; i < values.length; i++) {
    const z = (values[i] - lo) / range;
    for (let t = 0; t < nt; t++) {
      if (z >= thresholds[t]) {
        mapArea[t] += cellAreas[i];
        inter[t] += covered[i];
      }
    }
  }
  return thresholds.map((threshold, t) => {
    const union = mapArea[t] + boxArea - inter[t];
    return { threshold, iou: union > 0 ? inter[t] / union : undefined };
  });
}

/**
 * IoU, in image-pixel area, between the thresholded map and the reference boxes, for each
 * threshold t (default 0.25, 0.5, 0.75): the map is min-max normalised over its numbers, the
 * cells with normalised value >= t form one region (cells are disjoint, so its area is the sum
 * of theirs), and IoU = |region ∩ box union| / |region ∪ box union| with exact areas. NaN cells
 * are never selected. iou is undefined when the map is constant or all NaN (no normalisation)
 * or when both regions are empty. Thresholded saliency IoU is common practice in grounding work.
 */
export function thresholdedIou(
  values: ArrayLike<number>,
  cells: readonly ImageRect[],
  boxes: readonly ImageRect[],
  { thresholds = DEFAULT_IOU_THRESHOLDS }: { thresholds?: readonly number[] } = {},
): ThresholdIou[] {
  if (cells.length !== values.length) {
    throw new RangeError(`'cells' must hold one rectangle per value (${values.length}); got ${cells.length}`);
  }
  return thresholdedIouFromAreas(
    values,
    cells.map((c) => c.w * c.h),
    coveredAreas(cells, boxes),
    unionArea(boxes),
    thresholds,
  );
}
