import { describe, expect, it } from 'vitest';
import { maskArea, maskBounds, maskCentroid } from './mask-bounds';

function mask(size: number, on: [number, number][]): Uint8Array {
  const m = new Uint8Array(size * size);
  for (const [x, y] of on) m[y * size + x] = 1;
  return m;
}

describe('maskBounds', () => {
  it('maskBounds(empty) is undefined, as are the area 0 and centroid undefined', () => {
    const m = new Uint8Array(16);
    expect(maskBounds(m, 4)).toBeUndefined();
    expect(maskArea(m, 4)).toBe(0);
    expect(maskCentroid(m, 4)).toBeUndefined();
  });
  it('maskBounds gives the half-open pixel rectangle of the set pixels', () => {
    const m = mask(8, [[2, 3], [5, 1], [4, 6]]);
    expect(maskBounds(m, 8)).toEqual({ x: 2, y: 1, w: 4, h: 6 });
    expect(maskArea(m, 8)).toBe(3);
    expect(maskCentroid(mask(8, [[0, 0], [2, 0]]), 8)).toEqual({ x: 1.5, y: 0.5 });
  });
  it('maskBounds(mask, size, clip) keeps pixels whose centres lie in the clip rectangle', () => {
    const m = new Uint8Array(36).fill(1);
    // Rows with centres in [1.2, 3.4): rows 1 (1.5), 2 (2.5) and 3 (3.5 is outside).
    expect(maskBounds(m, 6, { x: 0, y: 1.2, w: 6, h: 2.2 })).toEqual({ x: 0, y: 1, w: 6, h: 2 });
    expect(maskArea(m, 6, { x: 0, y: 1.2, w: 6, h: 2.2 })).toBe(12);
    expect(maskBounds(m, 6, { x: 10, y: 10, w: 3, h: 3 })).toBeUndefined();
  });
});
