import type { ImagePoint, ImageRect } from '../../../core/types';
import { addNotice, setLungTemplate } from '../../state/commands';
import { imageSizeOf, isKey, rectFromCorners } from '../geometry';
import type { ToolContext, ToolState } from '../types';
import { lungAwaiting } from './awaiting';

const centreX = (r: ImageRect): number => r.x + r.w / 2;

/**
 * Lung tool, drawing one lung's rectangle. Release keeps it when both sides reach ctx.minBoxPx:
 * the right lung leads to awaiting the left; the left lung must lie on the viewer's right of the
 * right one (display convention, common practice), then setLungTemplate stores both as one undo
 * step. A left lung on the wrong side is refused with a notice and drawn again. Escape starts over.
 */
export function lungDrawing(ctx: ToolContext, side: 'right' | 'left', study: string, right: ImageRect | undefined, start: ImagePoint, current: ImagePoint): ToolState {
  const rect = rectFromCorners(start, current, imageSizeOf(ctx));
  return {
    tool: 'lungs',
    name: side === 'right' ? 'drawing-right' : 'drawing-left',
    preview: [...(right ? [{ kind: 'lung-right' as const, rect: right }] : []), { kind: side === 'right' ? 'lung-right' : 'lung-left', rect }],
    cursor: 'crosshair',
    handle(c, event) {
      if (isKey(event, 'Escape')) return lungAwaiting('right');
      if (event.type === 'move') return lungDrawing(c, side, study, right, start, event.point);
      if (event.type !== 'up') return this;
      const r = rectFromCorners(start, event.point, imageSizeOf(c));
      if (!(r.w >= c.minBoxPx && r.h >= c.minBoxPx)) return lungAwaiting(side, study, right);
      if (side === 'right') return lungAwaiting('left', study, r);
      const rightLung = right as ImageRect;
      if (!(centreX(rightLung) < centreX(r))) {
        addNotice(c.store, {
          level: 'warning',
          text: "The left lung must lie on the viewer's right of the right lung (a frontal image shows the patient's right on the viewer's left). Draw the left lung again.",
          items: [],
        });
        return lungAwaiting('left', study, rightLung);
      }
      setLungTemplate(c.store, study, { right: rightLung, left: r });
      return lungAwaiting('right');
    },
  };
}
