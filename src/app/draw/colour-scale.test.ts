import { describe, expect, it } from 'vitest';
import { expectClose } from '../../../tests/support/expect-close';
import { CIVIDIS_CONTROL_POINTS, cividis, cividisHex, normaliseToDomain, rgbToHex, valueDomain } from './colour-scale';

// Entries of the published 256-entry cividis table (Nuñez, Anderton and Renslow 2018, PLOS ONE;
// colormaps/cividis.txt of the authors' cmaputil repository) that are NOT control points.
const TABLE_CHECKS: [number, [number, number, number]][] = [
  [4, [0.0, 0.1379, 0.3269]],
  [30, [0.0, 0.2073, 0.4329]],
  [60, [0.2375, 0.292, 0.42]],
  [100, [0.394, 0.4047, 0.4381]],
  [131, [0.5008, 0.4945, 0.4727]],
  [200, [0.7771, 0.715, 0.4205]],
  [250, [1.0, 0.8979, 0.2655]],
  [253, [1.0, 0.9094, 0.2634]],
];

describe('cividis', () => {
  it('cividis(t) stays within 0.018 of the published table between control points', () => {
    for (const [entry, rgb] of TABLE_CHECKS) {
      const c = cividis(entry / 255) as number[];
      for (let k = 0; k < 3; k++) expectClose(c[k], rgb[k], 0.018);
    }
  });

  it('cividis(t) hits every control point exactly and runs dark blue to yellow', () => {
    for (const [e, r, g, b] of CIVIDIS_CONTROL_POINTS) expect(cividis(e / 255)).toEqual([expect.closeTo(r, 12), expect.closeTo(g, 12), expect.closeTo(b, 12)]);
    expect(cividisHex(0)).toBe('#00204d');
    expect(cividisHex(1)).toBe('#ffea46');
  });

  it('cividis(t) clamps outside [0, 1] and gives undefined for NaN', () => {
    expect(cividis(-5)).toEqual(cividis(0));
    expect(cividis(1e300)).toEqual(cividis(1));
    expect(cividis(NaN)).toBeUndefined();
  });

  it('cividis lightness (sum of channels) rises monotonically with t', () => {
    let prev = -Infinity;
    for (let i = 0; i <= 1000; i++) {
      const [r, g, b] = cividis(i / 1000) as number[];
      const l = 0.2126 * r + 0.7152 * g + 0.0722 * b;
      expect(l).toBeGreaterThanOrEqual(prev - 1e-12);
      prev = l;
    }
  });

  it('valueDomain skips NaN and infinities; empty gives undefined', () => {
    expect(valueDomain([3, NaN, -1, Infinity, 2])).toEqual([-1, 3]);
    expect(valueDomain([])).toBeUndefined();
    expect(valueDomain([NaN])).toBeUndefined();
    expect(valueDomain([7])).toEqual([7, 7]);
  });

  it('normaliseToDomain maps ends to 0 and 1, a flat domain to 0.5', () => {
    expect(normaliseToDomain(-1, [-1, 3])).toBe(0);
    expect(normaliseToDomain(3, [-1, 3])).toBe(1);
    expect(normaliseToDomain(1, [-1, 3])).toBe(0.5);
    expect(normaliseToDomain(5, [5, 5])).toBe(0.5);
    expect(normaliseToDomain(NaN, [0, 1])).toBeNaN();
    expect(rgbToHex([1, 0, 0.5])).toBe('#ff0080');
  });
});
