import { describe, expect, it } from 'vitest';
import { expectClose } from '../../tests/support/expect-close';
import reference from '../../tests/fixtures/reference/binomial-reference.json';
import { binomialCdf, binomialLogCdf, binomialLogPmf } from './binomial';

describe('binomial', () => {
  it('binomialCdf(k, n, p) matches exact decimal sums (fixture binomial-reference.json) to 1e-13 relative', () => {
    for (const { k, n, p, cdf, logcdf } of reference.cdf) {
      expectClose(binomialCdf(k, n, p), cdf, 1e-13 * cdf + 1e-300);
      expectClose(binomialLogCdf(k, n, p), logcdf, 1e-11 * Math.max(1, Math.abs(logcdf)));
    }
  });
  it('binomialLogPmf(k, n, p) matches exact decimal values (fixture binomial-reference.json) to 1e-13 relative', () => {
    for (const { k, n, p, logpmf } of reference.logpmf) {
      expectClose(binomialLogPmf(k, n, p), logpmf, 1e-13 * Math.max(1, Math.abs(logpmf)));
    }
  });
  it('binomialLogPmf(k, n, p) sums to 1 over k for small and large n', () => {
    for (const [n, p] of [[1, 0.3], [12, 0.5], [300, 0.07], [20000, 0.9]] as const) {
      let s = 0;
      for (let k = 0; k <= n; k++) s += Math.exp(binomialLogPmf(k, n, p));
      expectClose(s, 1, 1e-12);
    }
  });
  it('binomialCdf(k, n, p) agrees with a direct sum of small-n probabilities', () => {
    const n = 9, p = 0.37;
    let c = 0, choose = 1;
    for (let k = 0; k <= n; k++) {
      if (k > 0) choose = (choose * (n - k + 1)) / k;
      c += choose * p ** k * (1 - p) ** (n - k);
      expectClose(binomialCdf(k, n, p), c, 1e-14);
    }
  });
  it('binomialLogCdf(k, 1e5, 1/2) stays finite where the cdf underflows a double', () => {
    const lc = binomialLogCdf(10_000, 100_000, 0.5);
    expect(binomialCdf(10_000, 100_000, 0.5)).toBe(0);
    expect(Number.isFinite(lc)).toBe(true);
    // The tail exceeds its last term by about 1 / (1 - 1/9): successive terms shrink by about k / (n - k).
    expect(lc - binomialLogPmf(10_000, 100_000, 0.5)).toBeGreaterThan(0.1);
    expect(lc - binomialLogPmf(10_000, 100_000, 0.5)).toBeLessThan(0.12);
  });
  it('binomialCdf handles the edges: k < 0, k >= n, n = 0, p = 0 and p = 1', () => {
    expect(binomialCdf(-1, 5, 0.5)).toBe(0);
    expect(binomialCdf(5, 5, 0.5)).toBe(1);
    expect(binomialCdf(9, 5, 0.5)).toBe(1);
    expect(binomialCdf(0, 0, 0.5)).toBe(1);
    expect(binomialCdf(0, 5, 0)).toBe(1);
    expect(binomialCdf(4, 5, 1)).toBe(0);
    expect(binomialLogPmf(6, 5, 0.5)).toBe(-Infinity);
  });
  it('binomialCdf is non-decreasing in k', () => {
    let prev = 0;
    for (let k = 0; k <= 200; k++) {
      const c = binomialCdf(k, 200, 0.3);
      expect(c).toBeGreaterThanOrEqual(prev);
      prev = c;
    }
  });
  it('binomialCdf rejects NaN, non-integers and bad probabilities with RangeError', () => {
    expect(() => binomialCdf(Number.NaN, 5, 0.5)).toThrow(/'k' must be an integer; got NaN/);
    expect(() => binomialCdf(1, 5.5, 0.5)).toThrow(/'n' must be a non-negative integer/);
    expect(() => binomialCdf(1, 5, 1.2)).toThrow(/'p' must be a probability in \[0, 1\]; got 1.2/);
    expect(() => binomialLogPmf(1, 5, Number.NaN)).toThrow(RangeError);
  });
});
