import { describe, expect, it } from 'vitest';
import { formatAggregator, parseAggregator, poolRegions, poolRegionsMatrix } from './pool-regions';
import { createRng } from './seeded-random';
import { expectClose } from '../../tests/support/expect-close';
import type { Aggregator } from './types';

const v = [0.1, 0.5, -0.2, 0.4];
const mean = (a: number[]): number => a.reduce((s, x) => s + x, 0) / a.length;

describe('poolRegions', () => {
  it("poolRegions(sim, 'max') picks the largest cell", () => {
    expect(poolRegions(v, { kind: 'max' })).toBe(0.5);
    expect(poolRegions([7], { kind: 'max' })).toBe(7);
  });
  it('poolRegions(sim, softmax:T) equals sum softmax(v/T) * v computed directly', () => {
    const T = 0.3;
    const w = v.map((x) => Math.exp(x / T));
    const z = w.reduce((s, x) => s + x, 0);
    expectClose(poolRegions(v, { kind: 'softmax', temperature: T }), w.reduce((s, x, i) => s + (x / z) * v[i], 0), 1e-12);
  });
  it('poolRegions(sim, lse:R) equals (1/R) log mean exp(R v) computed directly', () => {
    const R = 5;
    expectClose(poolRegions(v, { kind: 'lse', sharpness: R }), Math.log(mean(v.map((x) => Math.exp(R * x)))) / R, 1e-12);
  });
  it('poolRegions(sim, topk:K) averages the K largest', () => {
    expectClose(poolRegions(v, { kind: 'topk', k: 2 }), 0.45, 1e-12);
    expectClose(poolRegions(v, { kind: 'topk', k: 4 }), mean(v), 1e-12);
    const r = createRng(4);
    const big = Array.from({ length: 196 }, () => r.normal());
    const sorted = [...big].sort((a, b) => b - a);
    expectClose(poolRegions(big, { kind: 'topk', k: 5 }), mean(sorted.slice(0, 5)), 1e-12);
    expectClose(poolRegions(big, { kind: 'topk', k: 40 }), mean(sorted.slice(0, 40)), 1e-12);
  });
  it('poolRegions softmax and lse tend to the max (sharp) and the mean (flat), and stay between them', () => {
    expectClose(poolRegions(v, { kind: 'softmax', temperature: 1e-4 }), 0.5, 1e-9);
    expectClose(poolRegions(v, { kind: 'softmax', temperature: 1e6 }), mean(v), 1e-6);
    expectClose(poolRegions(v, { kind: 'lse', sharpness: 1e5 }), 0.5, 1e-4);
    expectClose(poolRegions(v, { kind: 'lse', sharpness: 1e-7 }), mean(v), 1e-6);
    const r = createRng(11);
    for (let t = 0; t < 50; t++) {
      const x = Array.from({ length: 1 + r.int(30) }, () => r.normal());
      const lo = mean(x) - 1e-12;
      const hi = Math.max(...x) + 1e-12;
      for (const a of [{ kind: 'softmax', temperature: 0.05 + r.next() }, { kind: 'lse', sharpness: 0.1 + 10 * r.next() }, { kind: 'topk', k: 1 + r.int(x.length) }] as Aggregator[]) {
        const p = poolRegions(x, a);
        expect(p >= lo && p <= hi, `${formatAggregator(a)} ${p}`).toBe(true);
      }
    }
  });
  it('poolRegions is stable for huge values', () => {
    const huge = [1e308, 1.5e308, -1e308];
    expect(poolRegions(huge, { kind: 'softmax', temperature: 0.1 })).toBe(1.5e308);
    expect(poolRegions(huge, { kind: 'lse', sharpness: 5 })).toBeLessThanOrEqual(1.5e308);
    expect(Number.isFinite(poolRegions(huge, { kind: 'lse', sharpness: 5 }))).toBe(true);
    expectClose(poolRegions([1000, 1000], { kind: 'softmax', temperature: 0.001 }), 1000, 1e-9);
  });
  it('poolRegions propagates NaN and rejects empty values and k beyond the cells', () => {
    for (const a of [{ kind: 'max' }, { kind: 'softmax', temperature: 1 }, { kind: 'lse', sharpness: 1 }, { kind: 'topk', k: 2 }] as Aggregator[]) {
      expect(Number.isNaN(poolRegions([1, Number.NaN, 2], a))).toBe(true);
      expect(() => poolRegions([], a)).toThrow(RangeError);
    }
    expect(() => poolRegions(v, { kind: 'topk', k: 5 })).toThrow("'k' must be an integer in [1, 4]; got 5");
  });
});

describe('poolRegionsMatrix', () => {
  it('poolRegionsMatrix(sim, max) pools each row', () => {
    const sim = { data: new Float32Array([1, 2, 3, 6, 5, 4]), rows: 2, cols: 3 };
    expect(Array.from(poolRegionsMatrix(sim, { kind: 'max' }))).toEqual([3, 6]);
    expect(poolRegionsMatrix({ data: new Float32Array(0), rows: 0, cols: 3 }, { kind: 'max' }).length).toBe(0);
  });
});

describe('parseAggregator', () => {
  it('parseAggregator reads the four forms and formatAggregator inverts it', () => {
    expect(parseAggregator('max')).toEqual({ kind: 'max' });
    expect(parseAggregator('softmax:0.1')).toEqual({ kind: 'softmax', temperature: 0.1 });
    expect(parseAggregator('lse:5')).toEqual({ kind: 'lse', sharpness: 5 });
    expect(parseAggregator('topk:5')).toEqual({ kind: 'topk', k: 5 });
    for (const t of ['max', 'softmax:0.1', 'softmax:0.07', 'lse:5', 'lse:0.5', 'topk:1', 'topk:49', 'softmax:1e-7']) {
      expect(parseAggregator(formatAggregator(parseAggregator(t)))).toEqual(parseAggregator(t));
    }
    const r = createRng(2);
    for (let i = 0; i < 100; i++) {
      const a: Aggregator = { kind: 'softmax', temperature: r.next() * 10 + 1e-9 };
      expect(parseAggregator(formatAggregator(a))).toEqual(a);
    }
  });
  it('parseAggregator rejects bad text, T <= 0, R <= 0 and non-integer k with a RangeError naming the setting', () => {
    expect(() => parseAggregator('mean')).toThrow("'aggregator' must be one of 'max', 'softmax:T' (T > 0), 'lse:R' (R > 0), 'topk:K' (integer K >= 1); got 'mean'");
    expect(() => parseAggregator('softmax:0')).toThrow("'temperature' must be a finite number > 0; got 0");
    expect(() => parseAggregator('softmax:-1')).toThrow("'temperature' must be a finite number > 0; got -1");
    expect(() => parseAggregator('lse:0')).toThrow("'sharpness' must be a finite number > 0; got 0");
    expect(() => parseAggregator('topk:2.5')).toThrow("'k' must be an integer >= 1; got 2.5");
    expect(() => parseAggregator('topk:0')).toThrow("'k' must be an integer >= 1; got 0");
    for (const bad of ['', 'softmax', 'softmax:', 'softmax:abc', 'topk: 5', 'MAX', 'max:1', 'lse:1e999']) {
      expect(() => parseAggregator(bad), bad).toThrow(RangeError);
    }
  });
});
