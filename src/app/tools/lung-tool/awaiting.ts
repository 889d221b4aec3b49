import type { ImageRect } from '../../../core/types';
import { selectedStudy } from '../../state/queries';
import { isKey } from '../geometry';
import type { ToolState } from '../types';
import { lungDrawing } from './drawing';

export const LUNG_PROMPTS = {
  right: "Draw a rectangle around the patient's right lung (on the viewer's left).",
  left: "Now draw a rectangle around the patient's left lung (on the viewer's right).",
} as const;

/**
 * Lung tool, waiting for a rectangle: first the patient's right lung (viewer's left), then, with
 * `right` kept, the left lung. Escape starts over. Without a selected study nothing happens.
 */
export function lungAwaiting(side: 'right' | 'left', study?: string, right?: ImageRect): ToolState {
  return {
    tool: 'lungs',
    name: side === 'right' ? 'awaiting-right' : 'awaiting-left',
    preview: right ? [{ kind: 'lung-right', rect: right }] : [],
    cursor: 'crosshair',
    prompt: LUNG_PROMPTS[side],
    handle(ctx, event) {
      if (isKey(event, 'Escape')) return side === 'right' && !right ? this : lungAwaiting('right');
      if (event.type !== 'down') return this;
      const current = selectedStudy(ctx.store.get())?.id;
      if (current === undefined) return this;
      // A study change between the two rectangles starts over on the new study.
      if (side === 'left' && current !== study) return lungDrawing(ctx, 'right', current, undefined, event.point, event.point);
      return lungDrawing(ctx, side, current, right, event.point, event.point);
    },
  };
}
