import { describe, expect, it } from 'vitest';
import { computeResizeTransform, imagePointToInput, imageRectToInput, inputPointToImage, inputRectToImage } from './resize-transform';
import { createRng } from './seeded-random';
import { expectClose } from '../../tests/support/expect-close';

describe('computeResizeTransform', () => {
  it("computeResizeTransform(source, input, 'stretch') scales each axis to fill the input", () => {
    const t = computeResizeTransform({ width: 400, height: 200 }, { width: 224, height: 224 }, 'stretch');
    expect([t.scaleX, t.scaleY, t.offsetX, t.offsetY]).toEqual([0.56, 1.12, 0, 0]);
  });
  it("computeResizeTransform(source, input, 'letterbox') scales by the smaller ratio and centres with padding", () => {
    const t = computeResizeTransform({ width: 400, height: 200 }, { width: 224, height: 224 }, 'letterbox');
    expectClose([t.scaleX, t.scaleY, t.offsetX, t.offsetY], [0.56, 0.56, 0, 56], 1e-12);
    const r = imageRectToInput(t, { x: 0, y: 0, w: 400, h: 200 });
    expectClose([r.inputX, r.inputY, r.inputW, r.inputH], [0, 56, 224, 112], 1e-12);
  });
  it("computeResizeTransform(source, input, 'centre-crop') scales by the larger ratio and crops centred", () => {
    const t = computeResizeTransform({ width: 400, height: 200 }, { width: 224, height: 224 }, 'centre-crop');
    expectClose([t.scaleX, t.scaleY, t.offsetX, t.offsetY], [1.12, 1.12, -112, 0], 1e-12);
    const mid = imagePointToInput(t, { x: 200, y: 100 });
    expectClose([mid.inputX, mid.inputY], [112, 112], 1e-12);
  });
  it('computeResizeTransform rejects zero or NaN sizes and unknown policies', () => {
    expect(() => computeResizeTransform({ width: 0, height: 10 }, { width: 1, height: 1 }, 'stretch')).toThrow("'source' must have finite width and height > 0; got 0 x 10");
    expect(() => computeResizeTransform({ width: 10, height: 10 }, { width: Number.NaN, height: 1 }, 'stretch')).toThrow(RangeError);
    expect(() => computeResizeTransform({ width: 10, height: 10 }, { width: 1, height: 1 }, 'pad' as 'stretch')).toThrow("'policy' must be one of stretch, letterbox, centre-crop; got 'pad'");
  });
  it('imageRectToInput and inputRectToImage round-trip image -> input -> image for every policy', () => {
    const r = createRng(21);
    for (let i = 0; i < 200; i++) {
      const source = { width: 50 + r.int(3000), height: 50 + r.int(3000) };
      const input = { width: 32 + r.int(500), height: 32 + r.int(500) };
      for (const policy of ['stretch', 'letterbox', 'centre-crop'] as const) {
        const t = computeResizeTransform(source, input, policy);
        const box = { x: r.next() * source.width, y: r.next() * source.height, w: r.next() * 100, h: r.next() * 100 };
        const back = inputRectToImage(t, imageRectToInput(t, box));
        expectClose([back.x, back.y, back.w, back.h], [box.x, box.y, box.w, box.h], 1e-9);
        const p = inputPointToImage(t, imagePointToInput(t, { x: box.x, y: box.y }));
        expectClose([p.x, p.y], [box.x, box.y], 1e-9);
      }
    }
  });
  it('computeResizeTransform letterbox keeps the whole image inside the input and centred', () => {
    const r = createRng(22);
    for (let i = 0; i < 100; i++) {
      const source = { width: 1 + r.int(4000), height: 1 + r.int(4000) };
      const input = { width: 1 + r.int(600), height: 1 + r.int(600) };
      const t = computeResizeTransform(source, input, 'letterbox');
      const q = imageRectToInput(t, { x: 0, y: 0, w: source.width, h: source.height });
      expect(t.offsetX).toBeGreaterThanOrEqual(0);
      expect(t.offsetY).toBeGreaterThanOrEqual(0);
      expect(Math.min(t.offsetX, t.offsetY)).toBe(0);
      expectClose(q.inputX * 2 + q.inputW, input.width, 1e-9);
      expectClose(q.inputY * 2 + q.inputH, input.height, 1e-9);
      expect(Math.min(Math.abs(q.inputW - input.width), Math.abs(q.inputH - input.height))).toBeLessThan(1e-9);
    }
  });
});
