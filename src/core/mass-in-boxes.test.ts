import { describe, expect, it } from 'vitest';
import { massInBoxes } from './mass-in-boxes';
import { createRng } from './seeded-random';
import { expectClose } from '../../tests/support/expect-close';

describe('massInBoxes', () => {
  it('massInBoxes(values, fraction) is the softmax mass weighted by the share of each cell inside the boxes', () => {
    const v = [0.5, 0.2, 0.1];
    const f = [1, 0.5, 0];
    const w = v.map((x) => Math.exp(x / 0.1));
    const z = w[0] + w[1] + w[2];
    expectClose(massInBoxes(v, f)!, (w[0] + 0.5 * w[1]) / z, 1e-12);
    expectClose(massInBoxes(v, f, { temperature: 1 })!, (Math.exp(0.5) + 0.5 * Math.exp(0.2)) / (Math.exp(0.5) + Math.exp(0.2) + Math.exp(0.1)), 1e-12);
  });
  it('massInBoxes is 1 when every cell is inside, 0 when none is, and in [0, 1] otherwise', () => {
    const r = createRng(3);
    for (let t = 0; t < 100; t++) {
      const n = 1 + r.int(50);
      const v = Array.from({ length: n }, () => r.normal());
      expectClose(massInBoxes(v, new Array(n).fill(1))!, 1, 1e-12);
      expect(massInBoxes(v, new Array(n).fill(0))).toBe(0);
      const m = massInBoxes(v, Array.from({ length: n }, () => r.next()))!;
      expect(m >= 0 && m <= 1).toBe(true);
    }
  });
  it('massInBoxes skips NaN cells, is undefined with no numbers, and is stable for huge values', () => {
    expectClose(massInBoxes([Number.NaN, 0.3, 0.3], [1, 1, 0])!, 0.5, 1e-12);
    expect(massInBoxes([Number.NaN], [1])).toBeUndefined();
    expect(massInBoxes([], [])).toBeUndefined();
    expectClose(massInBoxes([3e38, 1e38], [1, 0])!, 1, 1e-12);
    expect(() => massInBoxes([1], [1], { temperature: 0 })).toThrow("'temperature' must be a finite number > 0; got 0");
  });
});
