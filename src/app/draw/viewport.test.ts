import { describe, expect, it } from 'vitest';
import { expectClose } from '../../../tests/support/expect-close';
import { canvasToImage, fitViewport, imageToCanvas, panBy, rectToCanvas, zoomAbout } from './viewport';

const V = { scale: 2, offsetX: 10, offsetY: -5 };

describe('viewport', () => {
  it('imageToCanvas and canvasToImage are inverse', () => {
    for (const p of [{ x: 0, y: 0 }, { x: 123.5, y: -7 }, { x: 1e9, y: 3e-9 }]) {
      const back = canvasToImage(V, imageToCanvas(V, p));
      expectClose(back.x, p.x, Math.abs(p.x) * 1e-12 + 1e-12);
      expectClose(back.y, p.y, Math.abs(p.y) * 1e-12 + 1e-12);
    }
    expect(imageToCanvas(V, { x: 3, y: 4 })).toEqual({ canvasX: 16, canvasY: 3 });
  });

  it('rectToCanvas scales size and moves the corner', () => {
    expect(rectToCanvas(V, { x: 1, y: 2, w: 3, h: 4 })).toEqual({ x: 12, y: -1, width: 6, height: 8 });
  });

  it('zoomAbout keeps the image point under the zoom point fixed and holds the scale limits', () => {
    const at = { canvasX: 300, canvasY: 200 };
    const before = canvasToImage(V, at);
    for (const f of [0.5, 1.7, 8]) {
      const z = zoomAbout(V, at, f);
      expectClose(z.scale, V.scale * f, 1e-12);
      const after = canvasToImage(z, at);
      expectClose(after.x, before.x, 1e-9);
      expectClose(after.y, before.y, 1e-9);
    }
    expect(zoomAbout(V, at, 1e6).scale).toBe(64);
    expect(zoomAbout(V, at, 1e-6).scale).toBe(0.02);
    expect(() => zoomAbout(V, at, 0)).toThrow(/'factor' must be a finite number > 0; got 0/);
    expect(() => zoomAbout(V, at, NaN)).toThrow(RangeError);
  });

  it('fitViewport shows the whole image centred', () => {
    const v = fitViewport({ width: 400, height: 200 }, { width: 800, height: 800 }, { margin: 0 });
    expect(v).toEqual({ scale: 2, offsetX: 0, offsetY: 200 });
    const far = imageToCanvas(v, { x: 400, y: 200 });
    expect(far).toEqual({ canvasX: 800, canvasY: 600 });
    expect(() => fitViewport({ width: 0, height: 1 }, { width: 10, height: 10 })).toThrow(/'image'/);
    expect(() => fitViewport({ width: 1, height: 1 }, { width: 10, height: 10 }, { margin: 5 })).toThrow(/'canvas'/);
  });

  it('panBy moves the offsets only; a bad viewport throws', () => {
    expect(panBy(V, 5, -5)).toEqual({ scale: 2, offsetX: 15, offsetY: -10 });
    expect(() => imageToCanvas({ scale: 0, offsetX: 0, offsetY: 0 }, { x: 1, y: 1 })).toThrow(/'viewport'/);
  });
});
