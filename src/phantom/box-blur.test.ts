import { describe, expect, it } from 'vitest';
import { expectClose } from '../../tests/support/expect-close';
import { boxBlur } from './box-blur';

describe('boxBlur', () => {
  it('boxBlur(constant) keeps the constant, including at the clamped edges', () => {
    expectClose(boxBlur(new Float32Array(25).fill(0.7), 5, 2, 3), new Float32Array(25).fill(0.7), 1e-6);
  });
  it('boxBlur(impulse, radius 1) spreads it evenly over a 3 x 3 block', () => {
    const img = new Float32Array(49);
    img[3 * 7 + 3] = 9;
    const out = boxBlur(img, 7, 1);
    for (let y = 0; y < 7; y++) for (let x = 0; x < 7; x++) expect(out[y * 7 + x]).toBeCloseTo(Math.abs(x - 3) <= 1 && Math.abs(y - 3) <= 1 ? 1 : 0, 6);
  });
  it('boxBlur(src, size, 0) returns an equal copy, not the same array', () => {
    const src = Float32Array.from([1, 2, 3, 4]);
    const out = boxBlur(src, 2, 0);
    expect(out).not.toBe(src);
    expect(Array.from(out)).toEqual([1, 2, 3, 4]);
  });
  it('boxBlur on one pixel and on an empty image stays finite', () => {
    expect(Array.from(boxBlur(Float32Array.from([5]), 1, 3))).toEqual([5]);
    expect(boxBlur(new Float32Array(0), 0, 2).length).toBe(0);
  });
});
