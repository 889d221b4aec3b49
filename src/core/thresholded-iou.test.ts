import { describe, expect, it } from 'vitest';
import { thresholdedIou } from './thresholded-iou';
import { createRng } from './seeded-random';
import { expectClose } from '../../tests/support/expect-close';

const cells = [0, 1, 2, 3].map((i) => ({ x: (i % 2) * 10, y: Math.floor(i / 2) * 10, w: 10, h: 10 }));

describe('thresholdedIou', () => {
  it('thresholdedIou(values, cells, boxes) computes exact pixel-area IoU at 0.25, 0.5, 0.75', () => {
    // Normalised map: 1, 0.6, 0.3, 0. Box covers the left half (cells 0 and 2) and 5 px of cell 1.
    const res = thresholdedIou([1, 0.6, 0.3, 0], cells, [{ x: 0, y: 0, w: 15, h: 20 }]);
    expect(res.map((r) => r.threshold)).toEqual([0.25, 0.5, 0.75]);
    // t = 0.25: cells 0, 1, 2 (300 px); box 300 px; intersection 250 -> 250 / 350.
    // t = 0.5: cells 0, 1 (200); intersection 150 -> 150 / 350. t = 0.75: cell 0 -> 100 / 300.
    expectClose(res.map((r) => r.iou!), [250 / 350, 150 / 350, 100 / 300], 1e-12);
  });
  it('thresholdedIou is undefined for a constant or all-NaN map, and 0 with no boxes', () => {
    expect(thresholdedIou([2, 2, 2, 2], cells, [{ x: 0, y: 0, w: 5, h: 5 }]).every((r) => r.iou === undefined)).toBe(true);
    expect(thresholdedIou([Number.NaN, Number.NaN, Number.NaN, Number.NaN], cells, []).every((r) => r.iou === undefined)).toBe(true);
    expect(thresholdedIou([1, 0, 0, 0], cells, []).map((r) => r.iou)).toEqual([0, 0, 0]);
  });
  it('thresholdedIou is in [0, 1] and invariant under a positive affine rescaling', () => {
    const r = createRng(15);
    for (let t = 0; t < 50; t++) {
      const v = Array.from({ length: 4 }, () => r.normal());
      const boxes = [{ x: r.next() * 15, y: r.next() * 15, w: 1 + r.next() * 10, h: 1 + r.next() * 10 }];
      const a = thresholdedIou(v, cells, boxes).map((x) => x.iou!);
      const b = thresholdedIou(v.map((x) => 7 * x + 3), cells, boxes).map((x) => x.iou!);
      for (const x of a) expect(x >= 0 && x <= 1).toBe(true);
      expectClose(b, a, 1e-12);
    }
  });
});
