import type { ImagePoint, ImageRect, Size } from '../../core/types';
import type { ReferenceBox } from '../../dataset/types';

/** The eight resize handles of a box: corners and edge midpoints, by compass direction. */
export type Handle = 'nw' | 'n' | 'ne' | 'e' | 'se' | 's' | 'sw' | 'w';

export const HANDLES: readonly Handle[] = ['nw', 'n', 'ne', 'e', 'se', 's', 'sw', 'w'];

/** CSS cursor per handle. */
export const HANDLE_CURSORS: Readonly<Record<Handle, string>> = {
  nw: 'nwse-resize',
  se: 'nwse-resize',
  ne: 'nesw-resize',
  sw: 'nesw-resize',
  n: 'ns-resize',
  s: 'ns-resize',
  e: 'ew-resize',
  w: 'ew-resize',
};

/** Where each handle sits on the rect, image pixels. */
export function handlePoint(r: ImageRect, h: Handle): ImagePoint {
  const x = h.includes('w') ? r.x : h.includes('e') ? r.x + r.w : r.x + r.w / 2;
  const y = h.startsWith('n') ? r.y : h.startsWith('s') ? r.y + r.h : r.y + r.h / 2;
  return { x, y };
}

/** The handle within `reach` of p (nearest first; corners win ties), or undefined. */
export function hitHandle(r: ImageRect, p: ImagePoint, reach: number): Handle | undefined {
  let best: Handle | undefined;
  let bestD = Infinity;
  for (const h of HANDLES) {
    const q = handlePoint(r, h);
    const d = Math.max(Math.abs(q.x - p.x), Math.abs(q.y - p.y));
    if (d <= reach && (d < bestD || (d === bestD && h.length === 2))) {
      best = h;
      bestD = d;
    }
  }
  return best;
}

/** The topmost box (last drawn) whose rect, grown by reach, holds p. */
export function hitBox(boxes: readonly ReferenceBox[], p: ImagePoint, reach = 0): ReferenceBox | undefined {
  for (let i = boxes.length - 1; i >= 0; i--) {
    const r = boxes[i].box;
    if (p.x >= r.x - reach && p.x <= r.x + r.w + reach && p.y >= r.y - reach && p.y <= r.y + r.h + reach) return boxes[i];
  }
  return undefined;
}

/**
 * The rect after dragging handle `h` of `start` to p: the dragged edges follow p, the others stay;
 * dragging past the opposite edge flips the box; sides stay >= minSize and inside the image.
 */
export function resizeRect(start: ImageRect, h: Handle, p: ImagePoint, { imageSize, minSize = 1 }: { imageSize?: Size; minSize?: number } = {}): ImageRect {
  const px = imageSize ? Math.max(0, Math.min(imageSize.width, p.x)) : p.x;
  const py = imageSize ? Math.max(0, Math.min(imageSize.height, p.y)) : p.y;
  const xs = h.includes('w') ? [start.x + start.w, px] : h.includes('e') ? [start.x, px] : [start.x, start.x + start.w];
  const ys = h.startsWith('n') ? [start.y + start.h, py] : h.startsWith('s') ? [start.y, py] : [start.y, start.y + start.h];
  const [x0, x1] = fitSpan(xs[0], xs[1], !h.includes('w'), minSize, imageSize?.width);
  const [y0, y1] = fitSpan(ys[0], ys[1], !h.startsWith('n'), minSize, imageSize?.height);
  return { x: x0, y: y0, w: x1 - x0, h: y1 - y0 };
}

/**
 * The span between a fixed and a moving edge, at least minSize long (grown on the moving edge's
 * side, its original side on a tie), inside [0, limit] when given.
 */
function fitSpan(fixed: number, moving: number, movingAbove: boolean, minSize: number, limit: number | undefined): [number, number] {
  let lo = Math.min(fixed, moving);
  let hi = Math.max(fixed, moving);
  const above = moving === fixed ? movingAbove : moving > fixed;
  if (hi - lo < minSize) [lo, hi] = above ? [fixed, fixed + minSize] : [fixed - minSize, fixed];
  if (limit !== undefined && hi > limit) [lo, hi] = [limit - (hi - lo), limit];
  if (lo < 0) [lo, hi] = [0, hi - lo];
  return [lo, hi];
}
