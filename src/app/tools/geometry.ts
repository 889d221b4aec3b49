import type { ImagePoint, ImageRect, Size } from '../../core/types';
import { selectedStudy } from '../state/queries';
import type { ToolContext } from './types';

/** The selected study's image size, when known. */
export function imageSizeOf(ctx: ToolContext): Size | undefined {
  return selectedStudy(ctx.store.get())?.imageSize;
}

export function clampPoint(p: ImagePoint, size: Size | undefined): ImagePoint {
  if (!size) return p;
  return { x: Math.max(0, Math.min(size.width, p.x)), y: Math.max(0, Math.min(size.height, p.y)) };
}

/** The rectangle spanned by two corners, in any order, with both cut to the image. */
export function rectFromCorners(a: ImagePoint, b: ImagePoint, size: Size | undefined): ImageRect {
  const p = clampPoint(a, size);
  const q = clampPoint(b, size);
  return { x: Math.min(p.x, q.x), y: Math.min(p.y, q.y), w: Math.abs(q.x - p.x), h: Math.abs(q.y - p.y) };
}

export function distance(a: ImagePoint, b: ImagePoint): number {
  return Math.hypot(a.x - b.x, a.y - b.y);
}

export function isKey(event: { readonly type: string; readonly key?: string }, ...keys: string[]): boolean {
  return event.type === 'key' && keys.includes(event.key as string);
}
