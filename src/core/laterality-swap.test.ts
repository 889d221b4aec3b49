import { describe, expect, it } from 'vitest';
import { isLateralitySwap } from './laterality-swap';

describe('isLateralitySwap', () => {
  const imageSize = { width: 1000, height: 800 };
  const boxes = [{ x: 100, y: 200, w: 200, h: 300 }];
  it('isLateralitySwap is true for a miss whose point lies in the box mirrored about x = width / 2', () => {
    expect(isLateralitySwap({ point: { x: 800, y: 300 }, boxes, hit: false, imageSize })).toBe(true);
    expect(isLateralitySwap({ point: { x: 500, y: 300 }, boxes, hit: false, imageSize })).toBe(false);
    expect(isLateralitySwap({ point: { x: 800, y: 300 }, boxes, hit: true, imageSize })).toBe(false);
  });
  it('isLateralitySwap honours a given midline and the tolerance', () => {
    // Mirrored about x = 450 the box spans x in [600, 800].
    expect(isLateralitySwap({ point: { x: 550, y: 300 }, boxes, hit: false, imageSize, midlineX: 450 })).toBe(false);
    expect(isLateralitySwap({ point: { x: 610, y: 300 }, boxes, hit: false, imageSize, midlineX: 450 })).toBe(true);
    expect(isLateralitySwap({ point: { x: 910, y: 300 }, boxes, hit: false, imageSize, tolerancePx: 15 })).toBe(true);
    expect(isLateralitySwap({ point: { x: 800, y: 300 }, boxes: [], hit: false, imageSize })).toBe(false);
  });
});
