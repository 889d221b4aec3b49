import { topKIndices } from '../../core/top-k-hit';
import type { ImageRect } from '../../core/types';
import { OVERLAY_COLOURS, type LineShape, type RectShape } from './shapes';
import { imageToCanvas, rectToCanvas, type CanvasPoint, type Viewport } from './viewport';

/**
 * The best cell first (`bestCell` when given, else the largest value), then the next best, up to
 * topK cells, ranked by topKIndices; NaN never ranks. No numbers: [].
 */
export function rankedCells(values: ArrayLike<number>, topK: number, bestCell?: number): number[] {
  if (values.length === 0) return [];
  const ranked = topKIndices(values, Math.max(1, Math.min(topK, values.length)));
  const best = bestCell ?? ranked[0];
  if (best === undefined) return [];
  return [best, ...ranked.filter((i) => i !== best)].slice(0, Math.max(1, topK));
}

/**
 * Outlines of the best cell and of the next best up to topK (ranked by topKIndices; NaN never
 * ranks). `bestCell` (SentenceGrounding.bestCell.index) overrides the best when given. No numbers: [].
 */
export function bestCellShapes(values: ArrayLike<number>, cells: readonly ImageRect[], v: Viewport, { topK = 1, bestCell }: { topK?: number; bestCell?: number } = {}): RectShape[] {
  if (values.length !== cells.length) throw new RangeError(`'values' must have one number per cell (${cells.length}); got ${values.length}`);
  const [best, ...rest] = rankedCells(values, topK, bestCell);
  if (best === undefined) return [];
  return [
    ...rest.map((i, k): RectShape => ({ kind: 'rect', id: `topk-${k + 2}`, ...rectToCanvas(v, cells[i]), stroke: OVERLAY_COLOURS.topK, strokeWidth: 1.5, dash: [4, 3] })),
    { kind: 'rect', id: 'best-cell', ...rectToCanvas(v, cells[best]), stroke: OVERLAY_COLOURS.bestCell, strokeWidth: 2.5 },
  ];
}

/** Lines from a sentence's anchor (canvas pixels, e.g. beside the sentence list) to the centres of the given cells. */
export function linkShapes(anchor: CanvasPoint, cellIndices: readonly number[], cells: readonly ImageRect[], v: Viewport): LineShape[] {
  return cellIndices.map((i, k) => {
    const r = cells[i];
    if (!r) throw new RangeError(`'cellIndices' must index 'cells' (${cells.length}); got ${i}`);
    const c = imageToCanvas(v, { x: r.x + r.w / 2, y: r.y + r.h / 2 });
    return { kind: 'line', id: `link-${k}`, points: [anchor.canvasX, anchor.canvasY, c.canvasX, c.canvasY], stroke: OVERLAY_COLOURS.link, strokeWidth: k === 0 ? 2 : 1, opacity: k === 0 ? 0.9 : 0.5 };
  });
}
