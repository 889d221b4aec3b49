import { deleteBox, selectBox } from '../../state/commands';
import { boxesOfStudy, selectedBox, selectedSentence, selectedStudy } from '../../state/queries';
import { HANDLE_CURSORS, hitBox, hitHandle } from '../handles';
import { isKey } from '../geometry';
import type { ToolContext, ToolEvent, ToolState } from '../types';
import { boxPointing } from './pointing';
import { boxPressing } from './pressing';
import { boxResizing } from './resizing';

function cursorAt(ctx: ToolContext, event: ToolEvent): string {
  if (event.type === 'key') return 'crosshair';
  const state = ctx.store.get();
  const sel = selectedBox(state);
  if (sel) {
    const h = hitHandle(sel.box, event.point, ctx.tolerancePx);
    if (h) return HANDLE_CURSORS[h];
  }
  const study = selectedStudy(state);
  return study && hitBox(boxesOfStudy(state, study.id), event.point) ? 'move' : 'crosshair';
}

/**
 * Box tool, waiting. Pressing on a handle of the selected box starts a resize, on a box selects it
 * and may start a move, elsewhere starts a new box for the selected sentence. Escape clears the
 * box selection; Delete or Backspace removes the selected box.
 */
export function boxIdle(cursor = 'crosshair'): ToolState {
  return {
    tool: 'box',
    name: 'idle',
    preview: [],
    cursor,
    handle(ctx, event) {
      const state = ctx.store.get();
      if (isKey(event, 'Escape')) {
        selectBox(ctx.store, undefined);
        return this;
      }
      if (isKey(event, 'Delete', 'Backspace')) {
        const sel = selectedBox(state);
        if (sel) deleteBox(ctx.store, sel.id);
        return this;
      }
      if (event.type === 'move') {
        const c = cursorAt(ctx, event);
        return c === cursor ? this : boxIdle(c);
      }
      if (event.type !== 'down') return this;
      const sel = selectedBox(state);
      const handle = sel ? hitHandle(sel.box, event.point, ctx.tolerancePx) : undefined;
      if (sel && handle) return boxResizing(ctx, sel, handle);
      const study = selectedStudy(state);
      const hit = study ? hitBox(boxesOfStudy(state, study.id), event.point) : undefined;
      if (hit) {
        selectBox(ctx.store, hit.id);
        return boxPressing(hit, event.point);
      }
      const sentence = selectedSentence(state);
      return boxPointing(event.point, sentence === undefined);
    },
  };
}
