import { describe, expect, it } from 'vitest';
import { expectClose } from '../../tests/support/expect-close';
import { quantileSorted } from './sample-quantile';

describe('quantileSorted', () => {
  it('quantileSorted(x, q) interpolates between order statistics (Hyndman and Fan type 7)', () => {
    // R: quantile(c(1, 2, 4, 8), c(0, 0.25, 0.5, 0.9, 1), type = 7) gives 1, 1.75, 3, 6.8, 8 (from memory; checked by hand:
    // h = 3q, so q = 0.25 -> 1 + 0.75 * 1, q = 0.9 -> 4 + 0.7 * 4).
    const x = [1, 2, 4, 8];
    expectClose([0, 0.25, 0.5, 0.9, 1].map((q) => quantileSorted(x, q)!), [1, 1.75, 3, 6.8, 8], 1e-12);
  });
  it('quantileSorted([], q) is undefined and one element gives that element', () => {
    expect(quantileSorted([], 0.5)).toBeUndefined();
    expect(quantileSorted([7], 0.3)).toBe(7);
  });
  it('quantileSorted(x, 0.5) is the middle value for odd length and the mean of the middle two for even', () => {
    expect(quantileSorted([1, 3, 9], 0.5)).toBe(3);
    expect(quantileSorted([1, 3, 5, 9], 0.5)).toBe(4);
  });
  it('quantileSorted(x, q) rejects q outside [0, 1] and NaN with RangeError', () => {
    expect(() => quantileSorted([1], 1.5)).toThrow(/'q' must be in \[0, 1\]; got 1.5/);
    expect(() => quantileSorted([1], Number.NaN)).toThrow(RangeError);
  });
});
