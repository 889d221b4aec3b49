import { zonesFromLungs } from '../../core/lung-zones';
import type { ImageRect } from '../../core/types';
import type { LungTemplate, ReferenceBox } from '../../dataset/types';
import type { Proposal } from '../state/records';
import { HANDLES, handlePoint } from '../tools/handles';
import type { ToolPreview } from '../tools/types';
import { OVERLAY_COLOURS, type Shape } from './shapes';
import { imageToCanvas, rectToCanvas, type Viewport } from './viewport';

const LABEL_SIZE = 11;

/** A label just above the rectangle's top-left corner, or (below) just under its bottom-left corner. */
function label(id: string, v: Viewport, r: ImageRect, text: string, fill: string, below = false): Shape {
  const p = imageToCanvas(v, below ? { x: r.x, y: r.y + r.h } : r);
  return { kind: 'text', id, x: p.canvasX + 2, y: below ? p.canvasY + 2 : p.canvasY - LABEL_SIZE - 2, text, fontSize: LABEL_SIZE, fill };
}

/**
 * Reference boxes as outlines labelled with their zone; the selected one is highlighted and gets
 * its 8 resize handles (squares of handleSize canvas pixels centred on handlePoint).
 */
export function boxShapes(boxes: readonly ReferenceBox[], v: Viewport, { selectedId, handleSize = 8 }: { selectedId?: string; handleSize?: number } = {}): Shape[] {
  const out: Shape[] = [];
  for (const b of boxes) {
    const selected = b.id === selectedId;
    const colour = selected ? OVERLAY_COLOURS.selectedBox : OVERLAY_COLOURS.box;
    out.push({ kind: 'rect', id: `box-${b.id}`, ...rectToCanvas(v, b.box), stroke: colour, strokeWidth: selected ? 2.5 : 1.5 });
    out.push(label(`box-label-${b.id}`, v, b.box, b.zone, colour));
    if (!selected) continue;
    for (const h of HANDLES) {
      const c = imageToCanvas(v, handlePoint(b.box, h));
      out.push({ kind: 'rect', id: `handle-${b.id}-${h}`, x: c.canvasX - handleSize / 2, y: c.canvasY - handleSize / 2, width: handleSize, height: handleSize, fill: colour, stroke: '#000000', strokeWidth: 1 });
    }
  }
  return out;
}

/** Proposed boxes: dashed outlines labelled with the zone and how to accept them. */
export function proposalShapes(proposals: readonly Proposal[], v: Viewport): Shape[] {
  return proposals.flatMap((p): Shape[] => [
    { kind: 'rect', id: `proposal-${p.zone}`, ...rectToCanvas(v, p.box), stroke: OVERLAY_COLOURS.proposal, strokeWidth: 1.5, dash: [6, 4] },
    label(`proposal-label-${p.zone}`, v, p.box, `${p.zone}?`, OVERLAY_COLOURS.proposal),
  ]);
}

/**
 * A study's lung template: both lung rectangles labelled with the patient's side, and the thirds
 * that split each lung into upper, middle and lower zones (zonesFromLungs) as thin lines.
 */
export function lungTemplateShapes(lungs: LungTemplate, v: Viewport): Shape[] {
  const zones = zonesFromLungs(lungs);
  const out: Shape[] = [];
  for (const side of ['right', 'left'] as const) {
    const r = lungs[side];
    out.push({ kind: 'rect', id: `lung-${side}`, ...rectToCanvas(v, r), stroke: OVERLAY_COLOURS.lungs, strokeWidth: 1.5, dash: [2, 3] });
    out.push(label(`lung-label-${side}`, v, r, `patient's ${side} lung`, OVERLAY_COLOURS.lungs, true));
    for (const third of ['middle', 'lower'] as const) {
      const z = zones[`${side}-${third}`];
      const a = imageToCanvas(v, { x: z.x, y: z.y });
      const b = imageToCanvas(v, { x: z.x + z.w, y: z.y });
      out.push({ kind: 'line', id: `lung-${side}-${third}-top`, points: [a.canvasX, a.canvasY, b.canvasX, b.canvasY], stroke: OVERLAY_COLOURS.lungs, strokeWidth: 1, opacity: 0.6, dash: [2, 3] });
    }
  }
  return out;
}

/** What a tool is drawing: the draft box, or the lung rectangles being marked. */
export function toolPreviewShapes(previews: readonly ToolPreview[], v: Viewport): Shape[] {
  return previews.flatMap((p, i): Shape[] => {
    if (p.kind === 'draft-box') return [{ kind: 'rect', id: `draft-${i}`, ...rectToCanvas(v, p.rect), stroke: OVERLAY_COLOURS.draft, strokeWidth: 1.5, dash: [4, 4] }];
    const side = p.kind === 'lung-right' ? 'right' : 'left';
    return [
      { kind: 'rect', id: `draft-${i}`, ...rectToCanvas(v, p.rect), stroke: OVERLAY_COLOURS.lungs, strokeWidth: 1.5, dash: [4, 4] },
      label(`draft-label-${i}`, v, p.rect, `patient's ${side} lung`, OVERLAY_COLOURS.lungs),
    ];
  });
}
