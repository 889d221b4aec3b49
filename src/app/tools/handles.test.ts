import { describe, expect, it } from 'vitest';
import { HANDLES, handlePoint, hitHandle, resizeRect } from './handles';

const R = { x: 10, y: 20, w: 100, h: 50 };

describe('handles', () => {
  it('handlePoint(r, h) puts corners on corners and edge handles on edge midpoints', () => {
    expect(HANDLES.map((h) => handlePoint(R, h))).toEqual([
      { x: 10, y: 20 }, { x: 60, y: 20 }, { x: 110, y: 20 }, { x: 110, y: 45 },
      { x: 110, y: 70 }, { x: 60, y: 70 }, { x: 10, y: 70 }, { x: 10, y: 45 },
    ]);
  });

  it('hitHandle(r, p, reach) finds each handle at its point and none in the middle', () => {
    for (const h of HANDLES) expect(hitHandle(R, handlePoint(R, h), 2)).toBe(h);
    expect(hitHandle(R, { x: 60, y: 45 }, 2)).toBeUndefined();
    expect(hitHandle(R, { x: 13, y: 23 }, 2)).toBeUndefined();
  });

  it('resizeRect flips when dragged past the opposite edge and keeps minSize', () => {
    expect(resizeRect(R, 'e', { x: 0, y: 0 })).toEqual({ x: 0, y: 20, w: 10, h: 50 });
    expect(resizeRect(R, 'e', { x: 10, y: 0 }, { minSize: 4 })).toEqual({ x: 10, y: 20, w: 4, h: 50 });
    expect(resizeRect(R, 'n', { x: 0, y: 70 }, { minSize: 4 })).toEqual({ x: 10, y: 66, w: 100, h: 4 });
  });

  it('resizeRect stays inside the image for huge and negative pointers', () => {
    const size = { width: 200, height: 100 };
    expect(resizeRect(R, 'se', { x: 1e9, y: 1e9 }, { imageSize: size })).toEqual({ x: 10, y: 20, w: 190, h: 80 });
    expect(resizeRect(R, 'nw', { x: -1e9, y: -1e9 }, { imageSize: size })).toEqual({ x: 0, y: 0, w: 110, h: 70 });
    expect(resizeRect({ x: 198, y: 0, w: 2, h: 5 }, 'w', { x: 200, y: 0 }, { imageSize: size, minSize: 4 })).toEqual({ x: 196, y: 0, w: 4, h: 5 });
  });
});
