import type { ImagePoint } from '../../../core/types';
import type { ReferenceBox } from '../../../dataset/types';
import { beginDrag } from '../../state/commands';
import { distance, isKey } from '../geometry';
import type { ToolState } from '../types';
import { boxIdle } from './idle';
import { boxMoving } from './moving';

/** Box tool, pressed on a box (now selected): a move beyond the slop starts moving it; release or Escape ends. */
export function boxPressing(box: ReferenceBox, start: ImagePoint): ToolState {
  return {
    tool: 'box',
    name: 'pressing',
    preview: [],
    cursor: 'move',
    handle(ctx, event) {
      if (isKey(event, 'Escape') || event.type === 'up') return boxIdle('move');
      if (event.type === 'move' && distance(event.point, start) > ctx.tolerancePx) {
        beginDrag(ctx.store, 'moveBox');
        return boxMoving(box, start).handle(ctx, event);
      }
      return this;
    },
  };
}
