import { describe, expect, it } from 'vitest';
import { transformImage, transformMask } from './transform-image';

describe('transformImage', () => {
  it('transformImage(src, size, identity) is an equal copy', () => {
    const src = Float32Array.from({ length: 9 }, (_, i) => i);
    const out = transformImage(src, 3, { angle: 0 });
    expect(out).not.toBe(src);
    expect(Array.from(out)).toEqual(Array.from(src));
  });
  it('transformImage by a quarter turn moves the top-left pixel to the top-right, and transformMask agrees', () => {
    const src = new Float32Array(25);
    src[0] = 1;
    expect(transformImage(src, 5, { angle: Math.PI / 2 })[4]).toBeCloseTo(1, 5);
    const m = new Uint8Array(25);
    m[0] = 1;
    expect(transformMask(m, 5, { angle: Math.PI / 2 })[4]).toBe(1);
  });
  it('transformImage with scale 2 enlarges about the centre and a shift moves the content', () => {
    const m = new Uint8Array(81);
    m[4 * 9 + 5] = 1; // one pixel right of the centre
    const zoomed = transformMask(m, 9, { angle: 0, scale: 2 });
    expect(zoomed[4 * 9 + 6]).toBe(1);
    const shifted = transformMask(m, 9, { angle: 0, shiftY: 2 });
    expect(shifted[6 * 9 + 5]).toBe(1);
  });
  it('transformImage keeps a constant image constant, corners included (edge replication)', () => {
    const out = transformImage(new Float32Array(121).fill(0.5), 11, { angle: 0.3, scale: 0.9 });
    for (const v of out) expect(v).toBeCloseTo(0.5, 6);
  });
});
