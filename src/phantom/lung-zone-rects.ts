import type { ImageRect, LungZone } from '../core/types';

export type ZoneRow = 'upper' | 'middle' | 'lower';
export const ZONE_ROWS: readonly ZoneRow[] = ['upper', 'middle', 'lower'];

/**
 * The six lung zones as rectangles: each lung's extent split into thirds of its height from apex
 * to hemidiaphragm (the zone split of the ILO classification of radiographs of pneumoconioses).
 * 'right' is the patient's right lung, shown on the viewer's left. Rectangles are in image pixels.
 */
export function lungZoneRects(lungs: { readonly right: ImageRect; readonly left: ImageRect }): Record<LungZone, ImageRect> {
  const split = (r: ImageRect, k: number): ImageRect => ({ x: r.x, y: r.y + (r.h * k) / 3, w: r.w, h: r.h / 3 });
  return {
    'right-upper': split(lungs.right, 0),
    'right-middle': split(lungs.right, 1),
    'right-lower': split(lungs.right, 2),
    'left-upper': split(lungs.left, 0),
    'left-middle': split(lungs.left, 1),
    'left-lower': split(lungs.left, 2),
  };
}

/** Builds a zone name from a side and a row. */
export function zoneOf(side: 'right' | 'left', row: ZoneRow): LungZone {
  return `${side}-${row}` as LungZone;
}
