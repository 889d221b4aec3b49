import type { ImagePoint } from '../../../core/types';
import type { ReferenceBox } from '../../../dataset/types';
import { cancelDrag, endDrag, moveBox } from '../../state/commands';
import { imageSizeOf, isKey } from '../geometry';
import type { ToolState } from '../types';
import { boxIdle } from './idle';

/**
 * Box tool, moving a box inside an open drag: the box follows the pointer, held inside the image;
 * release ends the drag (one undo step), Escape cancels it and puts the box back.
 */
export function boxMoving(box: ReferenceBox, grab: ImagePoint): ToolState {
  return {
    tool: 'box',
    name: 'moving',
    preview: [],
    cursor: 'move',
    handle(ctx, event) {
      if (isKey(event, 'Escape')) {
        cancelDrag(ctx.store);
        return boxIdle('move');
      }
      if (event.type === 'move') {
        const size = imageSizeOf(ctx);
        let x = box.box.x + event.point.x - grab.x;
        let y = box.box.y + event.point.y - grab.y;
        if (size) {
          x = Math.max(0, Math.min(size.width - box.box.w, x));
          y = Math.max(0, Math.min(size.height - box.box.h, y));
        }
        if (ctx.store.get().boxes[box.id]) moveBox(ctx.store, box.id, { x, y });
        return this;
      }
      if (event.type === 'up') {
        endDrag(ctx.store);
        return boxIdle('move');
      }
      return this;
    },
  };
}
