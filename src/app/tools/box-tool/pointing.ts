import type { ImagePoint } from '../../../core/types';
import { addNotice, selectBox } from '../../state/commands';
import { distance, isKey } from '../geometry';
import type { ToolState } from '../types';
import { boxDragging } from './dragging';
import { boxIdle } from './idle';

/**
 * Box tool, pressed on empty image: a move beyond the pointer slop starts drawing; a release
 * without moving is a click that clears the box selection; Escape goes back to idle. Without a
 * selected sentence nothing is drawn and the researcher is told why.
 */
export function boxPointing(start: ImagePoint, noSentence: boolean): ToolState {
  return {
    tool: 'box',
    name: 'pointing',
    preview: [],
    cursor: 'crosshair',
    handle(ctx, event) {
      if (isKey(event, 'Escape')) return boxIdle();
      if (event.type === 'move' && distance(event.point, start) > ctx.tolerancePx) {
        if (noSentence) {
          addNotice(ctx.store, { level: 'info', text: 'Choose a sentence first: each box belongs to one sentence of the report.', items: [] });
          return boxIdle();
        }
        return boxDragging(ctx, start, event.point);
      }
      if (event.type === 'up') {
        selectBox(ctx.store, undefined);
        return boxIdle();
      }
      return this;
    },
  };
}
