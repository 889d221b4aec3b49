import { describe, expect, it } from 'vitest';
import { lungZoneRects, zoneOf } from './lung-zone-rects';

describe('lungZoneRects', () => {
  it('lungZoneRects splits each lung into thirds of its height from apex to base (ILO zones)', () => {
    const z = lungZoneRects({ right: { x: 10, y: 30, w: 40, h: 90 }, left: { x: 70, y: 33, w: 38, h: 96 } });
    expect(z['right-upper']).toEqual({ x: 10, y: 30, w: 40, h: 30 });
    expect(z['right-middle']).toEqual({ x: 10, y: 60, w: 40, h: 30 });
    expect(z['right-lower']).toEqual({ x: 10, y: 90, w: 40, h: 30 });
    expect(z['left-lower']).toEqual({ x: 70, y: 97, w: 38, h: 32 });
    expect(zoneOf('left', 'middle')).toBe('left-middle');
  });
});
