import { describe, expect, it } from 'vitest';
import { contrastToNoise } from './contrast-to-noise';
import { createRng } from './seeded-random';
import { expectClose } from '../../tests/support/expect-close';

describe('contrastToNoise', () => {
  it('contrastToNoise on a hand-worked example (formula of Boecking et al., ECCV 2022)', () => {
    // in: 0.8, 0.6 -> mean 0.7, population variance 0.01; out: 0.2, 0, 0.1, 0.1 -> mean 0.1, variance 0.005.
    // CNR = |0.7 - 0.1| / sqrt(0.01 + 0.005) = 0.6 / sqrt(0.015) = 4.898979485566356.
    expectClose(contrastToNoise([0.8, 0.2, 0.6, 0, 0.1, 0.1], [1, 0, 1, 0, 0, 0])!, 4.898979485566356, 1e-12);
  });
  it('contrastToNoise is invariant under a positive affine rescaling a * map + b, a > 0 (Boecking et al., ECCV 2022)', () => {
    const r = createRng(12);
    for (let t = 0; t < 200; t++) {
      const n = 4 + r.int(60);
      const v = Array.from({ length: n }, () => r.normal());
      const inside = Array.from({ length: n }, (_, i) => (i < 2 ? 1 : i < 4 ? 0 : r.int(2)));
      const a = 1e-3 + 1e3 * r.next();
      const b = 100 * r.normal();
      const c0 = contrastToNoise(v, inside)!;
      expectClose(contrastToNoise(v.map((x) => a * x + b), inside)!, c0, 1e-7 * Math.max(1, c0));
      expect(c0).toBeGreaterThanOrEqual(0);
    }
  });
  it('contrastToNoise is undefined when a side is empty or both variances are 0, and skips NaN cells', () => {
    expect(contrastToNoise([1, 2], [1, 1])).toBeUndefined();
    expect(contrastToNoise([1, 2], [0, 0])).toBeUndefined();
    expect(contrastToNoise([], [])).toBeUndefined();
    expect(contrastToNoise([1, 1, 0, 0], [1, 1, 0, 0])).toBeUndefined();
    expect(contrastToNoise([1, 3, 0, Number.NaN], [1, 1, 0, 0])).toBe(2); // |2 - 0| / sqrt(1 + 0)
    expect(contrastToNoise([Number.NaN, 1, 2], [1, 0, 0])).toBeUndefined();
  });
  it('contrastToNoise stays accurate for huge offsets', () => {
    expectClose(contrastToNoise([1e12 + 0.8, 1e12 + 0.2, 1e12 + 0.6, 1e12, 1e12 + 0.1, 1e12 + 0.1], [1, 0, 1, 0, 0, 0])!, 4.898979485566356, 1e-3);
  });
});
