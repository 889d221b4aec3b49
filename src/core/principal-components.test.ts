import { describe, expect, it } from 'vitest';
import { expectClose } from '../../tests/support/expect-close';
import reference from '../../tests/fixtures/reference/pca-numpy.json';
import { componentsToRgb, principalComponents } from './principal-components';
import { createRng } from './seeded-random';

function randomData(seed: number, n: number, dim: number): Float32Array {
  const rng = createRng(seed);
  return Float32Array.from({ length: n * dim }, (_, i) => rng.normal() * (1 + (i % dim)));
}

describe('principalComponents', () => {
  it('principalComponents(data, n, dim, k) matches numpy.linalg.svd of the centred data (fixture pca-numpy.json)', () => {
    expect(reference.source).toMatch(/NumPy/);
    for (const c of reference.cases) {
      const pc = principalComponents(Float32Array.from(c.data), c.n, c.dim, c.k);
      expectClose(pc.components, c.components, 1e-6);
      expectClose(pc.scores, c.scores, 1e-5);
      expectClose(pc.explainedVariance, c.explained_variance, 1e-9 * c.explained_variance[0]);
      expectClose(pc.explainedVarianceRatio, c.explained_variance_ratio, 1e-12);
    }
  });
  it('principalComponents finds the axis of a line of points and gives it all the variance', () => {
    // Points on the line t * (3, 4) / 5, offset by (10, -2).
    const ts = [-2, -1, 0, 1, 2];
    const data = Float32Array.from(ts.flatMap((t) => [10 + 0.6 * t, -2 + 0.8 * t]));
    const pc = principalComponents(data, 5, 2, 2);
    expectClose(pc.components.subarray(0, 2), [0.6, 0.8], 1e-6);
    expectClose(pc.scores.filter((_, i) => i % 2 === 0), ts, 1e-5);
    expectClose(pc.explainedVariance, [2.5, 0], 1e-6);
    expectClose(pc.explainedVarianceRatio, [1, 0], 1e-6);
  });
  it('principalComponents gives orthonormal components, decreasing variances and centred scores', () => {
    const n = 30, dim = 7, k = 4;
    const pc = principalComponents(randomData(1, n, dim), n, dim, k);
    for (let a = 0; a < k; a++) {
      for (let b = 0; b < k; b++) {
        let dot = 0;
        for (let j = 0; j < dim; j++) dot += pc.components[a * dim + j] * pc.components[b * dim + j];
        expectClose(dot, a === b ? 1 : 0, 1e-6);
      }
      let mean = 0;
      for (let i = 0; i < n; i++) mean += pc.scores[i * k + a] / n;
      expectClose(mean, 0, 1e-5);
      if (a > 0) expect(pc.explainedVariance[a]).toBeLessThanOrEqual(pc.explainedVariance[a - 1]);
    }
  });
  it('principalComponents puts each component largest loading positive, whatever the data sign', () => {
    const n = 20, dim = 5;
    const data = randomData(2, n, dim);
    const a = principalComponents(data, n, dim, 3);
    const b = principalComponents(data.map((v) => -v), n, dim, 3);
    expectClose(b.components, a.components, 1e-6);
    expectClose(b.scores, a.scores.map((v) => -v), 1e-5);
    for (let c = 0; c < 3; c++) {
      const row = Array.from(a.components.subarray(c * dim, (c + 1) * dim));
      const big = row.reduce((m, v) => (Math.abs(v) > Math.abs(m) ? v : m), 0);
      expect(big).toBeGreaterThan(0);
    }
  });
  it('principalComponents is unchanged by a shift and scales its scores with the data', () => {
    const n = 15, dim = 4;
    const data = randomData(3, n, dim);
    const a = principalComponents(data, n, dim, 2);
    const b = principalComponents(data.map((v) => 2 * v + 100), n, dim, 2);
    expectClose(b.components, a.components, 1e-4);
    expectClose(b.scores, a.scores.map((v) => 2 * v), 1e-3);
  });
  it('principalComponents of one point or constant data has zero scores and zero variance', () => {
    const one = principalComponents(Float32Array.from([1, 2, 3]), 1, 3, 1);
    expect(Array.from(one.scores)).toEqual([0]);
    expect(one.explainedVariance).toEqual([0]);
    const flat = principalComponents(new Float32Array(12).fill(5), 4, 3, 2);
    expect(Array.from(flat.scores).every((v) => v === 0)).toBe(true);
    expect(flat.explainedVarianceRatio).toEqual([0, 0]);
  });
  it('principalComponents handles more dimensions than points (256-d embeddings of 20 cells)', () => {
    const n = 20, dim = 256;
    const pc = principalComponents(randomData(4, n, dim), n, dim, 3);
    expect(pc.scores.length).toBe(n * 3);
    expect(pc.components.length).toBe(3 * dim);
    expect(pc.explainedVariance[0]).toBeGreaterThan(pc.explainedVariance[2]);
  });
  it('principalComponents rejects bad shapes, k and non-finite values with RangeError', () => {
    expect(() => principalComponents(new Float32Array(5), 2, 3)).toThrow(/n \* dim = 6 values; got 5/);
    expect(() => principalComponents(new Float32Array(6), 2, 3, 3)).toThrow(/'k' must be an integer in \[1, min\(n, dim\) = 2\]; got 3/);
    expect(() => principalComponents(new Float32Array(0), 0, 3)).toThrow(/'n' must be an integer >= 1; got 0/);
    expect(() => principalComponents(Float32Array.from([1, Number.NaN, 2, 3]), 2, 2, 1)).toThrow(/finite; got NaN at row 0, col 1/);
  });
});

describe('componentsToRgb', () => {
  it('componentsToRgb(scores, n, 3) scales each component to 0..255 over the points', () => {
    const scores = [0, 10, -1, 5, 20, 0, 10, 30, 1];
    expect(Array.from(componentsToRgb(scores, 3, 3))).toEqual([0, 0, 0, 128, 128, 128, 255, 255, 255]);
  });
  it('componentsToRgb uses the first three of k components and fills missing channels with 0', () => {
    expect(Array.from(componentsToRgb([0, 9, 9, 9, 1, 9, 9, 9], 2, 4))).toEqual([0, 128, 128, 255, 128, 128]);
    expect(Array.from(componentsToRgb([2, 4], 2, 1))).toEqual([0, 0, 0, 255, 0, 0]);
  });
  it('componentsToRgb of no points is empty; of one point is mid-grey', () => {
    expect(componentsToRgb([], 0, 3).length).toBe(0);
    expect(Array.from(componentsToRgb([1e30, -1e30, 3], 1, 3))).toEqual([128, 128, 128]);
  });
  it('componentsToRgb is unchanged by a positive affine rescaling of a component', () => {
    const { scores } = principalComponents(randomData(6, 25, 6), 25, 6, 3);
    expect(componentsToRgb(scores.map((v) => 4 * v + 2), 25, 3)).toEqual(componentsToRgb(scores, 25, 3));
  });
  it('componentsToRgb rejects a wrong length, k < 1 and NaN with RangeError', () => {
    expect(() => componentsToRgb([1, 2], 1, 3)).toThrow(/n \* k = 3 values; got 2/);
    expect(() => componentsToRgb([1], 1, 0)).toThrow(/'k' must be an integer >= 1/);
    expect(() => componentsToRgb([1, Number.NaN], 2, 1)).toThrow(/finite; got NaN at point 1, component 0/);
  });
});
