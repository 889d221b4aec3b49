import { describe, expect, it } from 'vitest';
import {
  areaInsideUnion,
  countPixelCentresInUnion,
  coveredAreas,
  coveredAreasInto,
  rectEdges,
  intersectionArea,
  mirrorRect,
  pointInRect,
  rectsOverlap,
  unionArea,
  validateImageBox,
} from './box-geometry';
import { createRng } from './seeded-random';
import type { ImageRect } from './types';

function rasterUnion(rects: ImageRect[], size: number, step: number): number {
  let n = 0;
  for (let y = step / 2; y < size; y += step) {
    for (let x = step / 2; x < size; x += step) {
      if (rects.some((r) => x >= r.x && x < r.x + r.w && y >= r.y && y < r.y + r.h)) n++;
    }
  }
  return n * step * step;
}

describe('pointInRect', () => {
  it('pointInRect(p, box, tol) enlarges the box by tol on every side, edges included', () => {
    const b = { x: 100, y: 100, w: 50, h: 20 };
    expect(pointInRect({ x: 100, y: 120 }, b)).toBe(true);
    expect(pointInRect({ x: 99, y: 110 }, b)).toBe(false);
    expect(pointInRect({ x: 85, y: 110 }, b, 15)).toBe(true);
    expect(pointInRect({ x: 84.9, y: 110 }, b, 15)).toBe(false);
    expect(pointInRect({ x: 165, y: 135 }, b, 15)).toBe(true);
    expect(pointInRect({ x: Number.NaN, y: 110 }, b, 15)).toBe(false);
    expect(() => pointInRect({ x: 0, y: 0 }, b, -1)).toThrow("'tolerancePx' must be a finite number >= 0; got -1");
  });
});

describe('rectsOverlap and intersectionArea', () => {
  it('rectsOverlap needs positive-area intersection; touching edges do not count', () => {
    const a = { x: 0, y: 0, w: 10, h: 10 };
    expect(rectsOverlap(a, { x: 5, y: 5, w: 10, h: 10 })).toBe(true);
    expect(intersectionArea(a, { x: 5, y: 5, w: 10, h: 10 })).toBe(25);
    expect(rectsOverlap(a, { x: 10, y: 0, w: 5, h: 5 })).toBe(false);
    expect(rectsOverlap(a, { x: 20, y: 20, w: 5, h: 5 })).toBe(false);
    expect(intersectionArea(a, { x: 2, y: 2, w: 0, h: 5 })).toBe(0);
  });
});

describe('unionArea', () => {
  it('unionArea of overlapping rectangles counts shared area once', () => {
    expect(unionArea([])).toBe(0);
    expect(unionArea([{ x: 0, y: 0, w: 10, h: 10 }])).toBe(100);
    expect(unionArea([{ x: 0, y: 0, w: 10, h: 10 }, { x: 5, y: 5, w: 10, h: 10 }])).toBe(175);
    expect(unionArea([{ x: 0, y: 0, w: 10, h: 10 }, { x: 2, y: 2, w: 3, h: 3 }])).toBe(100);
    expect(unionArea([{ x: 0, y: 0, w: 10, h: 10 }, { x: Number.NaN, y: 2, w: 3, h: 3 }, { x: 0, y: 0, w: -1, h: 5 }])).toBe(100);
  });
  it('unionArea agrees with a raster count on random integer rectangles', () => {
    const r = createRng(5);
    for (let t = 0; t < 30; t++) {
      const rects = Array.from({ length: 1 + r.int(8) }, () => ({ x: r.int(50), y: r.int(50), w: 1 + r.int(30), h: 1 + r.int(30) }));
      expect(unionArea(rects)).toBe(rasterUnion(rects, 100, 1));
    }
  });
  it('areaInsideUnion(cell, boxes) is the covered part of the cell', () => {
    const cell = { x: 0, y: 0, w: 10, h: 10 };
    expect(areaInsideUnion(cell, [{ x: 5, y: 0, w: 20, h: 20 }, { x: 0, y: 5, w: 20, h: 20 }])).toBe(75);
    expect(areaInsideUnion(cell, [])).toBe(0);
  });
  it('coveredAreasInto(rects, edges, boxes, out) equals areaInsideUnion exactly for 0 to 4 boxes', () => {
    const r = createRng(81);
    const rects = Array.from({ length: 49 }, (_, i) => ({ x: (i % 7) * 14.3, y: Math.floor(i / 7) * 11.7, w: 14.3, h: 11.7 }));
    const edges = rectEdges(rects);
    const out = new Float64Array(rects.length);
    for (let t = 0; t < 100; t++) {
      const boxes = Array.from({ length: r.int(5) }, () => ({ x: r.next() * 90, y: r.next() * 70, w: 1 + r.next() * 40, h: 1 + r.next() * 40 }));
      coveredAreasInto(rects, edges, boxes, out);
      for (let i = 0; i < rects.length; i++) expect(out[i]).toBe(areaInsideUnion(rects[i], boxes));
      expect(Array.from(coveredAreas(rects, boxes))).toEqual(Array.from(out));
    }
  });
});

describe('countPixelCentresInUnion', () => {
  it('countPixelCentresInUnion matches a per-pixel test with pointInRect', () => {
    const r = createRng(8);
    for (let t = 0; t < 20; t++) {
      const rects = Array.from({ length: 1 + r.int(4) }, () => ({ x: r.next() * 40, y: r.next() * 40, w: r.next() * 20, h: r.next() * 20 }));
      const tol = r.int(3) === 0 ? 0 : r.next() * 5;
      const range = { firstX: r.int(5), lastX: 40 + r.int(10), firstY: r.int(5), lastY: 40 + r.int(10) };
      let brute = 0;
      for (let py = range.firstY; py <= range.lastY; py++) {
        for (let px = range.firstX; px <= range.lastX; px++) {
          if (rects.some((b) => pointInRect({ x: px + 0.5, y: py + 0.5 }, b, tol))) brute++;
        }
      }
      expect(countPixelCentresInUnion(rects, range, tol)).toBe(brute);
    }
  });
  it('countPixelCentresInUnion of one rectangle matches the per-pixel test, edges on pixel centres included', () => {
    const r = createRng(82);
    for (let t = 0; t < 200; t++) {
      const half = t % 2 === 0;
      const rect = half
        ? { x: r.int(40) + 0.5, y: r.int(40) + 0.5, w: r.int(20), h: r.int(20) }
        : { x: r.next() * 50 - 5, y: r.next() * 50 - 5, w: r.next() * 30, h: r.next() * 30 };
      const tol = t % 3 === 0 ? 0 : r.int(3);
      const range = { firstX: r.int(8), lastX: 30 + r.int(20), firstY: r.int(8), lastY: 30 + r.int(20) };
      let brute = 0;
      for (let py = range.firstY; py <= range.lastY; py++) {
        for (let px = range.firstX; px <= range.lastX; px++) if (pointInRect({ x: px + 0.5, y: py + 0.5 }, rect, tol)) brute++;
      }
      expect(countPixelCentresInUnion([rect], range, tol), `case ${t}`).toBe(brute);
    }
  });
});

describe('mirrorRect', () => {
  it('mirrorRect about the midline swaps sides and is an involution', () => {
    const b = { x: 10, y: 5, w: 20, h: 7 };
    expect(mirrorRect(b, 50)).toEqual({ x: 70, y: 5, w: 20, h: 7 });
    expect(mirrorRect(mirrorRect(b, 50), 50)).toEqual(b);
  });
});

describe('validateImageBox', () => {
  const size = { width: 100, height: 80 };
  it('validateImageBox(box, size) accepts a box inside the image', () => {
    expect(validateImageBox({ x: 0, y: 0, w: 100, h: 80 }, size)).toEqual([]);
  });
  it('validateImageBox reports zero area, outside parts and NaN, every problem at once', () => {
    expect(validateImageBox({ x: -5, y: 10, w: 0, h: 90 }, size)).toEqual([
      "box 'w' must be > 0 (zero or negative area); got 0",
      'box lies outside the image: left edge x = -5 < 0',
      'box lies outside the image: bottom edge y + h = 100 > image height 80',
    ]);
    expect(validateImageBox({ x: Number.NaN, y: 0, w: 1, h: Infinity }, size)).toEqual([
      "box 'x' must be a finite number; got NaN",
      "box 'h' must be a finite number; got Infinity",
    ]);
    expect(validateImageBox({ x: 90, y: 0, w: 20, h: -1 }, size)).toHaveLength(2);
  });
});
