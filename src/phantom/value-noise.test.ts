import { describe, expect, it } from 'vitest';
import { createRng } from '../core/seeded-random';
import { valueNoise } from './value-noise';

describe('valueNoise', () => {
  it('valueNoise(rng, size, cells) stays in [-1, 1], repeats for a seed and varies smoothly', () => {
    const a = valueNoise(createRng(1), 64, 8);
    const b = valueNoise(createRng(1), 64, 8);
    expect(Array.from(a)).toEqual(Array.from(b));
    let maxStep = 0;
    for (let i = 0; i < a.length; i++) {
      expect(a[i] >= -1 && a[i] <= 1).toBe(true);
      if (i % 64 !== 63) maxStep = Math.max(maxStep, Math.abs(a[i + 1] - a[i]));
    }
    // A lattice cell spans 8 pixels, so neighbours differ by well under the full range.
    expect(maxStep).toBeLessThan(0.5);
  });
  it('valueNoise with cells < 1 uses one cell', () => {
    expect(valueNoise(createRng(2), 4, 0).length).toBe(16);
  });
});
