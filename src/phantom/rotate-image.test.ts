import { describe, expect, it } from 'vitest';
import { rotateImage, rotateMask } from './rotate-image';

describe('rotateImage', () => {
  it('rotateImage(src, size, 0) is an equal copy', () => {
    const src = Float32Array.from({ length: 9 }, (_, i) => i);
    const out = rotateImage(src, 3, 0);
    expect(out).not.toBe(src);
    expect(Array.from(out)).toEqual(Array.from(src));
  });
  it('rotateImage by a quarter turn moves the top-left pixel to the top-right, and rotateMask agrees', () => {
    const src = new Float32Array(25);
    src[0] = 1;
    const out = rotateImage(src, 5, Math.PI / 2);
    expect(out[4]).toBeCloseTo(1, 5);
    const m = new Uint8Array(25);
    m[0] = 1;
    expect(rotateMask(m, 5, Math.PI / 2)[4]).toBe(1);
  });
  it('rotateImage keeps a constant image constant, corners included (edge replication)', () => {
    const out = rotateImage(new Float32Array(121).fill(0.5), 11, 0.3);
    for (const v of out) expect(v).toBeCloseTo(0.5, 6);
  });
});
