import type { ZoneLabel } from '../../core/types';

/** One keyboard binding as the help overlay lists it. */
export interface KeyBinding {
  readonly keys: readonly string[];
  readonly action: string;
  readonly group: 'Report and studies' | 'Reference boxes' | 'View' | 'General';
}

/** Zone label keys: 1-6 the six lung zones (patient's right first), 7 cardiac. */
export const ZONE_KEYS: Readonly<Record<string, ZoneLabel>> = {
  '1': 'right-upper',
  '2': 'right-middle',
  '3': 'right-lower',
  '4': 'left-upper',
  '5': 'left-middle',
  '6': 'left-lower',
  '7': 'cardiac',
};

/** Plain words for a zone label. */
export function zoneName(zone: ZoneLabel): string {
  return zone.replace('-', ' ');
}

export const KEY_BINDINGS: readonly KeyBinding[] = [
  { keys: ['↑', '↓'], action: 'Previous / next report sentence', group: 'Report and studies' },
  { keys: ['PageUp', 'PageDown'], action: 'Previous / next study', group: 'Report and studies' },
  { keys: ['[', ']'], action: 'Previous / next study', group: 'Report and studies' },
  { keys: ['V'], action: 'Inspect: point at cells, click a cell to rank sentences; no editing', group: 'Reference boxes' },
  { keys: ['B'], action: 'Boxes: drag to draw a box for the selected sentence; drag a box to move it, its handles to resize', group: 'Reference boxes' },
  { keys: ['L'], action: 'Mark the lung template (right lung, then left lung)', group: 'Reference boxes' },
  ...Object.entries(ZONE_KEYS).map(([key, zone]): KeyBinding => ({
    keys: [key],
    action: `Zone label of the selected box: ${zoneName(zone)}`,
    group: 'Reference boxes',
  })),
  { keys: ['Enter'], action: 'Accept the proposed box of the selected sentence', group: 'Reference boxes' },
  { keys: ['Delete', 'Backspace'], action: 'Delete the selected box', group: 'Reference boxes' },
  { keys: ['Ctrl+Z'], action: 'Undo', group: 'Reference boxes' },
  { keys: ['Ctrl+Shift+Z', 'Ctrl+Y'], action: 'Redo', group: 'Reference boxes' },
  { keys: ['G'], action: 'Show or hide the region grid', group: 'View' },
  { keys: ['K'], action: 'Show or hide the links to the best cells', group: 'View' },
  { keys: ['M'], action: 'Show or hide the cell overlay (similarity map or region features)', group: 'View' },
  { keys: ['+', '-'], action: 'Zoom in / out', group: 'View' },
  { keys: ['0'], action: 'Fit the image to the view', group: 'View' },
  { keys: ['Wheel'], action: 'Zoom about the pointer', group: 'View' },
  { keys: ['Space + drag', 'Middle drag'], action: 'Pan the image', group: 'View' },
  { keys: ['?'], action: 'Open this list of keys', group: 'General' },
  { keys: ['Esc'], action: 'Close this list, or cancel the tool in progress', group: 'General' },
];
