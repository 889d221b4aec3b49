import { describe, expect, it } from 'vitest';
import { expectClose } from '../../tests/support/expect-close';
import reference from '../../tests/fixtures/reference/binomial-reference.json';
import { normalQuantile } from './normal-quantile';

describe('normalQuantile', () => {
  it('normalQuantile(p) matches scipy.stats.norm.ppf (fixture binomial-reference.json) to 1e-14 relative', () => {
    for (const { p, z } of reference.normal_quantile) {
      expectClose(normalQuantile(p), z, 1e-14 * Math.max(1, Math.abs(z)));
    }
  });
  it('normalQuantile(0.975) is 1.959963984540054 (common practice, from memory)', () => {
    expectClose(normalQuantile(0.975), 1.959963984540054, 1e-15);
  });
  it('normalQuantile(0) and normalQuantile(1) are -Infinity and Infinity; 0.5 gives 0', () => {
    expect(normalQuantile(0)).toBe(-Infinity);
    expect(normalQuantile(1)).toBe(Infinity);
    expect(normalQuantile(0.5)).toBe(0);
  });
  it('normalQuantile(p) is antisymmetric and increasing', () => {
    let prev = -Infinity;
    for (let i = 1; i < 1000; i++) {
      const p = i / 1000;
      const z = normalQuantile(p);
      expect(z).toBeGreaterThan(prev);
      expectClose(z, -normalQuantile(1 - p), 1e-12);
      prev = z;
    }
  });
  it('normalQuantile(NaN) and out-of-range p throw RangeError naming p', () => {
    expect(() => normalQuantile(Number.NaN)).toThrow(RangeError);
    expect(() => normalQuantile(-0.1)).toThrow(/'p' must be a number in \[0, 1\]; got -0.1/);
    expect(() => normalQuantile(1.5)).toThrow(RangeError);
  });
});
