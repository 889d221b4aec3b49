import type { LungZone } from '../core/types';

export type ZoneRow = 'upper' | 'middle' | 'lower';
export const ZONE_ROWS: readonly ZoneRow[] = ['upper', 'middle', 'lower'];

/** Builds a zone name from a side and a row. */
export function zoneOf(side: 'right' | 'left', row: ZoneRow): LungZone {
  return `${side}-${row}` as LungZone;
}
