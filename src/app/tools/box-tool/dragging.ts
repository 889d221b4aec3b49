import type { ImagePoint } from '../../../core/types';
import { addBox } from '../../state/commands';
import { imageSizeOf, isKey, rectFromCorners } from '../geometry';
import type { ToolContext, ToolState } from '../types';
import { boxIdle } from './idle';

/**
 * Box tool, drawing: the draft spans the press point and the pointer, cut to the image. Release
 * adds the box for the selected sentence (addBox) when both sides reach ctx.minBoxPx; a smaller
 * draft is dropped. Escape cancels.
 */
export function boxDragging(ctx: ToolContext, start: ImagePoint, current: ImagePoint): ToolState {
  const rect = rectFromCorners(start, current, imageSizeOf(ctx));
  return {
    tool: 'box',
    name: 'dragging',
    preview: [{ kind: 'draft-box', rect }],
    cursor: 'crosshair',
    handle(c, event) {
      if (isKey(event, 'Escape')) return boxIdle();
      if (event.type === 'move') return boxDragging(c, start, event.point);
      if (event.type === 'up') {
        const r = rectFromCorners(start, event.point, imageSizeOf(c));
        if (r.w >= c.minBoxPx && r.h >= c.minBoxPx) addBox(c.store, { rect: r });
        return boxIdle();
      }
      return this;
    },
  };
}
