import { describe, expect, it } from 'vitest';
import { createRng } from './seeded-random';

describe('createRng', () => {
  it('createRng(seed) repeats its sequence for the same seed and differs for another', () => {
    const a = createRng(42), b = createRng(42), c = createRng(43);
    const sa = Array.from({ length: 5 }, () => a.next());
    const sb = Array.from({ length: 5 }, () => b.next());
    const sc = Array.from({ length: 5 }, () => c.next());
    expect(sa).toEqual(sb);
    expect(sa).not.toEqual(sc);
  });
  it('createRng(seed).next() stays in [0, 1) with a mean near 1/2', () => {
    const r = createRng(7);
    let sum = 0;
    for (let i = 0; i < 20000; i++) {
      const v = r.next();
      expect(v >= 0 && v < 1).toBe(true);
      sum += v;
    }
    expect(Math.abs(sum / 20000 - 0.5)).toBeLessThan(0.01);
  });
  it('createRng(seed).normal() has mean 0 and variance 1 within sampling error', () => {
    const r = createRng(3);
    let s = 0, s2 = 0;
    const n = 20000;
    for (let i = 0; i < n; i++) { const v = r.normal(); s += v; s2 += v * v; }
    expect(Math.abs(s / n)).toBeLessThan(0.03);
    expect(Math.abs(s2 / n - 1)).toBeLessThan(0.05);
  });
  it('createRng rejects a non-finite seed and int() a bad bound', () => {
    expect(() => createRng(Number.NaN)).toThrow(TypeError);
    expect(() => createRng(1).int(0)).toThrow(RangeError);
  });
});
