import { describe, expect, it } from 'vitest';
import { mirrorZone, zoneOfPoint, zonesFromLungs } from './lung-zones';
import { LUNG_ZONES } from './types';

// Display convention (common practice): the patient's right lung is on the viewer's left.
const lungs = { right: { x: 100, y: 150, w: 300, h: 600 }, left: { x: 600, y: 120, w: 300, h: 660 } };

describe('zonesFromLungs', () => {
  it('zonesFromLungs splits each lung into upper, middle and lower thirds of its height (ILO classification six zones)', () => {
    const z = zonesFromLungs(lungs);
    expect(z['right-upper']).toEqual({ x: 100, y: 150, w: 300, h: 200 });
    expect(z['right-middle']).toEqual({ x: 100, y: 350, w: 300, h: 200 });
    expect(z['right-lower']).toEqual({ x: 100, y: 550, w: 300, h: 200 });
    expect(z['left-upper'].h).toBeCloseTo(220, 9);
    expect(z['left-lower'].y + z['left-lower'].h).toBe(780);
  });
  it("zonesFromLungs puts 'right-*' zones at smaller x (display convention, common practice) and rejects swapped lungs", () => {
    const z = zonesFromLungs(lungs);
    for (const level of ['upper', 'middle', 'lower']) {
      expect(z[`right-${level}` as 'right-upper'].x).toBeLessThan(z[`left-${level}` as 'left-upper'].x);
    }
    expect(() => zonesFromLungs({ right: lungs.left, left: lungs.right })).toThrow(/must lie on the viewer's left/);
    expect(() => zonesFromLungs({ right: { x: 0, y: 0, w: 0, h: 5 }, left: lungs.left })).toThrow(RangeError);
  });
});

describe('zoneOfPoint', () => {
  const z = zonesFromLungs(lungs);
  it('zoneOfPoint finds the zone, the lower one on a boundary, undefined outside', () => {
    expect(zoneOfPoint(z, { x: 150, y: 200 })).toBe('right-upper');
    expect(zoneOfPoint(z, { x: 150, y: 350 })).toBe('right-middle');
    expect(zoneOfPoint(z, { x: 150, y: 750 })).toBe('right-lower');
    expect(zoneOfPoint(z, { x: 700, y: 700 })).toBe('left-lower');
    expect(zoneOfPoint(z, { x: 500, y: 300 })).toBeUndefined();
    expect(zoneOfPoint(z, { x: Number.NaN, y: 300 })).toBeUndefined();
  });
});

describe('mirrorZone', () => {
  it('mirrorZone swaps the side, keeps the level, and is an involution', () => {
    expect(mirrorZone('right-upper')).toBe('left-upper');
    expect(mirrorZone('left-lower')).toBe('right-lower');
    for (const zone of LUNG_ZONES) expect(mirrorZone(mirrorZone(zone))).toBe(zone);
    expect(() => mirrorZone('cardiac' as 'left-upper')).toThrow(RangeError);
  });
});
