import type { ReferenceBox } from '../../../dataset/types';
import { beginDrag, cancelDrag, endDrag, resizeBox } from '../../state/commands';
import { HANDLE_CURSORS, resizeRect, type Handle } from '../handles';
import { imageSizeOf, isKey } from '../geometry';
import type { ToolContext, ToolState } from '../types';
import { boxIdle } from './idle';

function resizingState(box: ReferenceBox, handle: Handle): ToolState {
  return {
    tool: 'box',
    name: 'resizing',
    preview: [],
    cursor: HANDLE_CURSORS[handle],
    handle(ctx, event) {
      if (isKey(event, 'Escape')) {
        cancelDrag(ctx.store);
        return boxIdle();
      }
      if (event.type === 'move') {
        const rect = resizeRect(box.box, handle, event.point, { imageSize: imageSizeOf(ctx), minSize: ctx.minBoxPx });
        if (ctx.store.get().boxes[box.id]) resizeBox(ctx.store, box.id, rect);
        return this;
      }
      if (event.type === 'up') {
        endDrag(ctx.store);
        return boxIdle(HANDLE_CURSORS[handle]);
      }
      return this;
    },
  };
}

/**
 * Box tool, resizing the selected box by one of its 8 handles inside an open drag (resizeRect):
 * release ends the drag (one undo step), Escape cancels it and restores the box.
 */
export function boxResizing(ctx: ToolContext, box: ReferenceBox, handle: Handle): ToolState {
  beginDrag(ctx.store, 'resizeBox');
  return resizingState(box, handle);
}
