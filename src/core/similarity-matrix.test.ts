import { describe, expect, it } from 'vitest';
import { Matrix as MlMatrix } from 'ml-matrix';
import { computeSimilarity, computeSimilarityWithNormalisedCells, l2Normalise } from './similarity-matrix';
import { createRng } from './seeded-random';
import { expectClose } from '../../tests/support/expect-close';

function randomRows(seed: number, n: number, dim: number): Float32Array {
  const r = createRng(seed);
  return Float32Array.from({ length: n * dim }, () => r.normal());
}

function mlRows(data: Float32Array, n: number, dim: number): MlMatrix {
  return new MlMatrix(Array.from({ length: n }, (_, i) => Array.from(data.subarray(i * dim, (i + 1) * dim))));
}

describe('l2Normalise', () => {
  it('l2Normalise(data, n, dim) gives unit rows and leaves the input untouched', () => {
    const data = randomRows(1, 7, 5);
    const copy = data.slice();
    const out = l2Normalise(data, 7, 5);
    expect(Array.from(data)).toEqual(Array.from(copy));
    for (let i = 0; i < 7; i++) {
      let ss = 0;
      for (let k = 0; k < 5; k++) ss += out[i * 5 + k] ** 2;
      expectClose(ss, 1, 1e-6);
    }
  });
  it('l2Normalise keeps zero rows zero, handles n = 0 and huge values', () => {
    expectClose(l2Normalise(new Float32Array([0, 0, 3, 4]), 2, 2), [0, 0, 0.6, 0.8], 1e-7);
    expect(l2Normalise(new Float32Array(0), 0, 3).length).toBe(0);
    expectClose(l2Normalise(new Float32Array([3e38, 3e38]), 1, 2), [Math.SQRT1_2, Math.SQRT1_2], 1e-7);
  });
  it('l2Normalise rejects a length that does not match n x dim', () => {
    expect(() => l2Normalise(new Float32Array(5), 2, 3)).toThrow("'data' must hold 2 x 3 = 6 values; got 5");
  });
});

describe('computeSimilarity', () => {
  it('computeSimilarity(sentences, cells) agrees with an ml-matrix product of normalised rows (reference library)', () => {
    for (const [ns, nc, dim] of [[10, 196, 128], [3, 7, 5], [1, 1, 1], [5, 49, 33]]) {
      const s = randomRows(ns * 31 + nc, ns, dim);
      const c = randomRows(nc * 17 + dim, nc, dim);
      const got = computeSimilarity(s, ns, c, nc, dim);
      const ref = mlRows(l2Normalise(s, ns, dim), ns, dim).mmul(mlRows(l2Normalise(c, nc, dim), nc, dim).transpose());
      expect([got.rows, got.cols]).toEqual([ns, nc]);
      expectClose(got.data, ref.to1DArray(), 1e-6);
    }
  });
  it('computeSimilarityWithNormalisedCells matches computeSimilarity', () => {
    const s = randomRows(5, 6, 16);
    const c = randomRows(6, 11, 16);
    expect(Array.from(computeSimilarityWithNormalisedCells(s, 6, l2Normalise(c, 11, 16), 11, 16).data)).toEqual(
      Array.from(computeSimilarity(s, 6, c, 11, 16).data),
    );
  });
  it('computeSimilarity is a cosine: in [-1, 1], 1 for equal directions, 0 with a zero vector', () => {
    const s = new Float32Array([1, 2, 0, 0, -2, -4]);
    const c = new Float32Array([2, 4, 1, 0]);
    const m = computeSimilarity(s, 3, c, 2, 2);
    expectClose(m.data, [1, 1 / Math.sqrt(5), 0, 0, -1, -1 / Math.sqrt(5)], 1e-6);
    const big = computeSimilarity(randomRows(9, 4, 8), 4, randomRows(10, 9, 8), 9, 8);
    for (const v of big.data) expect(Math.abs(v)).toBeLessThanOrEqual(1 + 1e-6);
  });
  it('computeSimilarity gives empty matrices for no sentences or no cells, and propagates NaN', () => {
    expect(computeSimilarity(new Float32Array(0), 0, new Float32Array(4), 2, 2).data.length).toBe(0);
    expect(computeSimilarity(new Float32Array(4), 2, new Float32Array(0), 0, 2).data.length).toBe(0);
    const m = computeSimilarity(new Float32Array([Number.NaN, 1]), 1, new Float32Array([1, 0]), 1, 2);
    expect(Number.isNaN(m.data[0])).toBe(true);
  });
  it('computeSimilarity rejects a bad count', () => {
    expect(() => computeSimilarity(new Float32Array(4), 1.5, new Float32Array(4), 2, 2)).toThrow("'nSentences' must be an integer >= 0; got 1.5");
  });
});
