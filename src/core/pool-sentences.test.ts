import { describe, expect, it } from 'vitest';
import { poolSentences } from './pool-sentences';
import { expectClose } from '../../tests/support/expect-close';

describe('poolSentences', () => {
  it("poolSentences(values, 'mean') averages, is undefined on empty, propagates NaN", () => {
    expectClose(poolSentences([0.2, 0.4, 0.9])!, 0.5, 1e-12);
    expect(poolSentences([3])).toBe(3);
    expect(poolSentences([])).toBeUndefined();
    expect(Number.isNaN(poolSentences([1, Number.NaN])!)).toBe(true);
    expectClose(poolSentences([1.7e308, 1.7e308])!, 1.7e308, 1e295);
    expect(() => poolSentences([1], 'max' as 'mean')).toThrow("'method' must be 'mean'; got 'max'");
  });
});
