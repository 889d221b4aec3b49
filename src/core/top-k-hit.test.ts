import { describe, expect, it } from 'vitest';
import { topKHit, topKIndices } from './top-k-hit';
import { createRng } from './seeded-random';

describe('topKIndices', () => {
  it('topKIndices(values, k) returns the k largest, lower index first on ties, NaN skipped', () => {
    expect(topKIndices([1, 5, 3, 5, 2], 3)).toEqual([1, 3, 2]);
    expect(topKIndices([Number.NaN, 1, Number.NaN], 2)).toEqual([1]);
    expect(topKIndices([], 2)).toEqual([]);
    const r = createRng(6);
    const v = Array.from({ length: 100 }, () => r.normal());
    const ref = v.map((x, i) => [x, i]).sort((a, b) => b[0] - a[0] || a[1] - b[1]).slice(0, 7).map((p) => p[1]);
    expect(topKIndices(v, 7)).toEqual(ref);
  });
});

describe('topKHit', () => {
  const centres = [0, 1, 2, 3].map((i) => ({ x: 10 * i + 5, y: 5 }));
  const box = [{ x: 20, y: 0, w: 10, h: 10 }];
  it('topKHit(values, centres, boxes, k) hits when any of the k best centres is in a box', () => {
    const v = [0.9, 0.8, 0.7, 0.1];
    expect(topKHit(v, centres, box, { k: 1 })).toBe(false);
    expect(topKHit(v, centres, box, { k: 2 })).toBe(false);
    expect(topKHit(v, centres, box, { k: 3 })).toBe(true);
    expect(topKHit(v, centres, box, { k: 1, tolerancePx: 15 })).toBe(true);
    expect(topKHit(v, centres, [], { k: 4 })).toBe(false);
  });
  it('topKHit rejects k outside [1, cells]', () => {
    expect(() => topKHit([1, 2, 3, 4], centres, box, { k: 5 })).toThrow("'k' must be an integer in [1, 4]; got 5");
    expect(() => topKHit([1, 2, 3, 4], centres, box, { k: 0 })).toThrow(RangeError);
  });
});
