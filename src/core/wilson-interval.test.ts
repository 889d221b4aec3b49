import { describe, expect, it } from 'vitest';
import { expectClose } from '../../tests/support/expect-close';
import { wilsonInterval } from './wilson-interval';

const round4 = (x: number): number => Math.round(x * 1e4) / 1e4;

describe('wilsonInterval', () => {
  // Newcombe (1998), Statistics in Medicine 17:857-872, Table II, method 3 (Wilson score, no continuity correction).
  const newcombe: [number, number, number, number][] = [
    [81, 263, 0.2553, 0.3662],
    [15, 148, 0.0624, 0.1605],
    [0, 20, 0, 0.1611],
    [1, 29, 0.0061, 0.1718],
  ];
  for (const [hits, n, lo, hi] of newcombe) {
    it(`wilsonInterval(${hits}, ${n}) gives ${lo} to ${hi} as in Newcombe (1998) method 3`, () => {
      const ci = wilsonInterval(hits, n)!;
      expect([round4(ci[0]), round4(ci[1])]).toEqual([lo, hi]);
    });
  }
  it('wilsonInterval(hits, 0) is undefined', () => {
    expect(wilsonInterval(0, 0)).toBeUndefined();
  });
  it('wilsonInterval(0, n) starts at exactly 0 and wilsonInterval(n, n) ends at exactly 1', () => {
    expect(wilsonInterval(0, 7)![0]).toBe(0);
    expect(wilsonInterval(7, 7)![1]).toBe(1);
  });
  it('wilsonInterval(1, 1) is [0.2065, 1] for one item (closed form z^2 / (1 + z^2) lower bound)', () => {
    const z = 1.959963984540054;
    const ci = wilsonInterval(1, 1)!;
    expectClose(ci[0], 1 / (1 + z * z), 1e-15);
    expect(ci[1]).toBe(1);
  });
  it('wilsonInterval(hits, 1e6) stays accurate for tiny and mid proportions', () => {
    const [lo, hi] = wilsonInterval(1, 1e6)!;
    expect(lo).toBeGreaterThan(0);
    expect(lo).toBeLessThan(1e-6);
    expect(hi).toBeGreaterThan(1e-6);
    const mid = wilsonInterval(500_000, 1e6)!;
    // Half-width tends to z * sqrt(p (1 - p) / n) for large n.
    expectClose(mid[1] - mid[0], 2 * 1.959963984540054 * Math.sqrt(0.25 / 1e6), 1e-8);
    expectClose(mid[0] + mid[1], 1, 1e-15);
  });
  it('wilsonInterval(hits, n) lies in [0, 1], contains hits / n and is symmetric under hits -> n - hits', () => {
    for (const n of [1, 2, 5, 17, 100, 1001]) {
      for (let hits = 0; hits <= n; hits += Math.max(1, Math.floor(n / 13))) {
        const [lo, hi] = wilsonInterval(hits, n)!;
        const [lo2, hi2] = wilsonInterval(n - hits, n)!;
        expect(lo).toBeGreaterThanOrEqual(0);
        expect(hi).toBeLessThanOrEqual(1);
        expect(lo).toBeLessThanOrEqual(hits / n);
        expect(hi).toBeGreaterThanOrEqual(hits / n);
        expectClose(lo, 1 - hi2, 1e-15);
        expectClose(hi, 1 - lo2, 1e-15);
      }
    }
  });
  it('wilsonInterval(hits, n, level) widens as the level rises', () => {
    const w = (level: number): number => { const [lo, hi] = wilsonInterval(30, 100, level)!; return hi - lo; };
    expect(w(0.8)).toBeLessThan(w(0.9));
    expect(w(0.9)).toBeLessThan(w(0.95));
    expect(w(0.95)).toBeLessThan(w(0.99));
  });
  it('wilsonInterval rejects hits > n, negatives, non-integers, NaN and bad levels with RangeError', () => {
    expect(() => wilsonInterval(5, 4)).toThrow(/'hits' must be an integer in \[0, n = 4\]; got 5/);
    expect(() => wilsonInterval(-1, 4)).toThrow(RangeError);
    expect(() => wilsonInterval(1, -4)).toThrow(/'n' must be a non-negative integer; got -4/);
    expect(() => wilsonInterval(1.5, 4)).toThrow(RangeError);
    expect(() => wilsonInterval(1, 4.5)).toThrow(RangeError);
    expect(() => wilsonInterval(Number.NaN, 4)).toThrow(RangeError);
    expect(() => wilsonInterval(1, 4, 1)).toThrow(/'level' must be in \(0, 1\); got 1/);
    expect(() => wilsonInterval(1, 4, Number.NaN)).toThrow(RangeError);
  });
});
