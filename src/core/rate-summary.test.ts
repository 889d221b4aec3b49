import { describe, expect, it } from 'vitest';
import { expectClose } from '../../tests/support/expect-close';
import { summariseRate } from './rate-summary';
import { wilsonInterval } from './wilson-interval';

describe('summariseRate', () => {
  it('summariseRate(81, 263, chanceSum) gives rate, Wilson interval, mean chance and lift', () => {
    const s = summariseRate(81, 263, 26.3);
    expect(s.n).toBe(263);
    expect(s.hits).toBe(81);
    expectClose(s.rate!, 81 / 263, 1e-15);
    expect(s.wilson95).toEqual(wilsonInterval(81, 263));
    // Newcombe (1998) method 3 for 81/263: 0.2553 to 0.3662.
    expectClose(s.wilson95!, [0.2553, 0.3662], 5e-5);
    expectClose(s.chance!, 0.1, 1e-15);
    expectClose(s.lift!, 81 / 26.3, 1e-12);
  });
  it('summariseRate(0, 0, 0) leaves rate, interval, chance and lift undefined', () => {
    expect(summariseRate(0, 0, 0)).toEqual({ n: 0, hits: 0, rate: undefined, wilson95: undefined, chance: undefined, lift: undefined });
  });
  it('summariseRate with zero chance leaves only the lift undefined', () => {
    const s = summariseRate(3, 4, 0);
    expect(s.chance).toBe(0);
    expect(s.lift).toBeUndefined();
    expect(s.rate).toBe(0.75);
  });
  it('summariseRate of one item and of 1e6 items', () => {
    const one = summariseRate(1, 1, 0.25);
    expect(one.rate).toBe(1);
    expect(one.lift).toBe(4);
    const big = summariseRate(123_456, 1_000_000, 61_728);
    expectClose(big.lift!, 2, 1e-12);
    expect(big.wilson95![1] - big.wilson95![0]).toBeLessThan(0.0014);
  });
  it('summariseRate gives lift 1 when the rate equals its chance and 0 with no hits', () => {
    expectClose(summariseRate(20, 100, 20).lift!, 1, 1e-15);
    expect(summariseRate(0, 50, 5).lift).toBe(0);
  });
  it('summariseRate accepts a chance sum that rounds just above n', () => {
    expect(summariseRate(10, 10, 10 + 1e-14).chance).toBe(1);
    expect(() => summariseRate(10, 10, 10.001)).toThrow(RangeError);
  });
  it('summariseRate rejects chanceSum outside [0, n], NaN and bad counts with RangeError', () => {
    expect(() => summariseRate(1, 4, 5)).toThrow(/'chanceSum' must be in \[0, n = 4\]; got 5/);
    expect(() => summariseRate(1, 4, -0.1)).toThrow(RangeError);
    expect(() => summariseRate(1, 4, Number.NaN)).toThrow(RangeError);
    expect(() => summariseRate(5, 4, 1)).toThrow(/'hits'/);
    expect(() => summariseRate(Number.NaN, 4, 1)).toThrow(RangeError);
  });
});
