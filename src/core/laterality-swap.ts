import type { ImagePoint, ImageRect, Size } from './types';
import { mirrorRect, pointInAnyRect } from './box-geometry';

/**
 * Laterality swap: for a miss, whether the best point lies in one of the boxes mirrored about the
 * vertical line x = midlineX (default: the image's midline, width / 2), each enlarged by
 * tolerancePx as in the centre rule. A hit is never a swap (false). The swap rate over misses
 * shows a model that confuses the patient's right and left.
 */
export function isLateralitySwap({
  point,
  boxes,
  hit,
  imageSize,
  midlineX = imageSize.width / 2,
  tolerancePx = 0,
}: {
  point: ImagePoint;
  boxes: readonly ImageRect[];
  hit: boolean;
  imageSize: Size;
  midlineX?: number;
  tolerancePx?: number;
}): boolean {
  if (!Number.isFinite(midlineX)) throw new RangeError(`'midlineX' must be a finite number; got ${midlineX}`);
  if (hit) return false;
  return pointInAnyRect(point, boxes.map((b) => mirrorRect(b, midlineX)), tolerancePx);
}
