import { describe, expect, it } from 'vitest';
import { expectClose } from '../../tests/support/expect-close';
import reference from '../../tests/fixtures/reference/binomial-reference.json';
import { mcnemarExact, pairedCounts } from './mcnemar-exact';

describe('mcnemarExact', () => {
  // Exact binomial test on the discordant pairs (Agresti, Categorical Data Analysis): 2 * P(X <= 3), X ~ Bin(15, 1/2)
  // = 2 * 576 / 32768, and 2 * P(X <= 1), X ~ Bin(8, 1/2) = 2 * 9 / 256.
  it('mcnemarExact(3, 12) is 0.03515625 and mcnemarExact(1, 7) is 0.0703125 (exact binomial test)', () => {
    expectClose(mcnemarExact(3, 12), 0.03515625, 1e-15);
    expectClose(mcnemarExact(1, 7), 0.0703125, 1e-15);
  });
  it('mcnemarExact(b, c) matches exact decimal sums (fixture binomial-reference.json), b + c up to 1e5', () => {
    for (const { b, c, p } of reference.mcnemar) expectClose(mcnemarExact(b, c), p, 1e-13 * p);
  });
  it('mcnemarExact(0, 0) is 1: no discordant pairs, no evidence of a difference', () => {
    expect(mcnemarExact(0, 0)).toBe(1);
  });
  it('mcnemarExact(b, c) equals mcnemarExact(c, b), lies in (0, 1] and is 1 when b = c', () => {
    for (const [b, c] of [[0, 3], [2, 9], [40, 61], [1000, 1100], [300, 700]]) {
      const p = mcnemarExact(b, c);
      expect(mcnemarExact(c, b)).toBe(p);
      expect(p).toBeGreaterThan(0);
      expect(p).toBeLessThanOrEqual(1);
    }
    expect(mcnemarExact(7, 7)).toBe(1);
    expect(mcnemarExact(50_000, 50_000)).toBe(1);
  });
  it('mcnemarExact(b, c) falls as the imbalance grows at fixed b + c', () => {
    let prev = 1;
    for (let b = 50; b >= 0; b -= 5) {
      const p = mcnemarExact(b, 100 - b);
      expect(p).toBeLessThanOrEqual(prev);
      prev = p;
    }
  });
  it('mcnemarExact rejects negative, non-integer and NaN counts with RangeError', () => {
    expect(() => mcnemarExact(-1, 2)).toThrow(/'b' must be a non-negative integer; got -1/);
    expect(() => mcnemarExact(1, 2.5)).toThrow(/'c' must be a non-negative integer; got 2.5/);
    expect(() => mcnemarExact(Number.NaN, 2)).toThrow(RangeError);
  });
});

describe('pairedCounts', () => {
  it('pairedCounts(a, b) fills the 2 x 2 table', () => {
    const a = [true, true, false, false, true, false];
    const b = [true, false, true, false, false, false];
    expect(pairedCounts(a, b)).toEqual({ n: 6, both: 1, onlyA: 2, onlyB: 1, neither: 2 });
  });
  it('pairedCounts([], []) is all zeros and one pair counts once', () => {
    expect(pairedCounts([], [])).toEqual({ n: 0, both: 0, onlyA: 0, onlyB: 0, neither: 0 });
    expect(pairedCounts([false], [true])).toEqual({ n: 1, both: 0, onlyA: 0, onlyB: 1, neither: 0 });
  });
  it('pairedCounts(a, b) swaps onlyA and onlyB when the arguments swap', () => {
    const a = [true, false, false, true, true];
    const b = [false, true, false, false, true];
    const ab = pairedCounts(a, b), ba = pairedCounts(b, a);
    expect([ab.onlyA, ab.onlyB]).toEqual([ba.onlyB, ba.onlyA]);
    expect(ab.both + ab.onlyA + ab.onlyB + ab.neither).toBe(ab.n);
  });
  it('pairedCounts rejects unequal lengths with RangeError and non-booleans with TypeError', () => {
    expect(() => pairedCounts([true], [true, false])).toThrow(/same length; got 1 and 2/);
    expect(() => pairedCounts([1 as unknown as boolean], [true])).toThrow(TypeError);
  });
});
