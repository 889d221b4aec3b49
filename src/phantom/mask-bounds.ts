import type { ImageRect } from '../core/types';

/** Pixel index range [x0, x1) x [y0, y1) whose pixel centres lie in the clip rectangle. */
function clipRange(size: number, clip?: ImageRect): [number, number, number, number] {
  if (!clip) return [0, 0, size, size];
  const lo = (v: number): number => Math.min(size, Math.max(0, Math.ceil(v - 0.5)));
  return [lo(clip.x), lo(clip.y), lo(clip.x + clip.w), lo(clip.y + clip.h)];
}

/**
 * Bounding rectangle of the non-zero pixels of a square row-major mask, optionally restricted to
 * the pixels whose centres lie in a clip rectangle [x, x + w) x [y, y + h). Returns undefined when no pixel is set.
 */
export function maskBounds(mask: Uint8Array, size: number, clip?: ImageRect): ImageRect | undefined {
  const [x0, y0, x1, y1] = clipRange(size, clip);
  let minX = size, minY = size, maxX = -1, maxY = -1;
  for (let y = y0; y < y1; y++) {
    const row = y * size;
    for (let x = x0; x < x1; x++) {
      if (mask[row + x] === 0) continue;
      if (x < minX) minX = x;
      if (x > maxX) maxX = x;
      if (y < minY) minY = y;
      if (y > maxY) maxY = y;
    }
  }
  if (maxX < 0) return undefined;
  return { x: minX, y: minY, w: maxX - minX + 1, h: maxY - minY + 1 };
}

/** Count of non-zero pixels inside a clip rectangle (the whole mask without one). */
export function maskArea(mask: Uint8Array, size: number, clip?: ImageRect): number {
  const [x0, y0, x1, y1] = clipRange(size, clip);
  let n = 0;
  for (let y = y0; y < y1; y++) {
    const row = y * size;
    for (let x = x0; x < x1; x++) if (mask[row + x] !== 0) n++;
  }
  return n;
}

/** Centroid (x, y) of the non-zero pixels at pixel centres; undefined for an empty mask. */
export function maskCentroid(mask: Uint8Array, size: number): { x: number; y: number } | undefined {
  let sx = 0, sy = 0, n = 0;
  for (let y = 0; y < size; y++) {
    const row = y * size;
    for (let x = 0; x < size; x++) {
      if (mask[row + x] === 0) continue;
      sx += x + 0.5;
      sy += y + 0.5;
      n++;
    }
  }
  return n === 0 ? undefined : { x: sx / n, y: sy / n };
}
