import { describe, expect, it } from 'vitest';
import { groundSentence, type GroundSentenceArgs } from './ground-sentence';
import { chanceLevel, evaluateHit, prepareStudyGeometry } from './hit-rules';
import { computeResizeTransform } from './resize-transform';
import { gridCellRects } from './grid-geometry';
import { createRng } from './seeded-random';
import type { ImageRect, ResizePolicy } from './types';

function study(policy: ResizePolicy, values: Float32Array, boxes: ImageRect[], size = { width: 1000, height: 800 }): GroundSentenceArgs {
  const grid = { h: 7, w: 7 };
  const transform = computeResizeTransform(size, { width: 224, height: 224 }, policy);
  return { values, grid, cells: gridCellRects(transform, grid), transform, imageSize: size, boxes, tolerancePx: 15 };
}

describe('groundSentence', () => {
  it('groundSentence agrees with evaluateHit and chanceLevel for every rule', () => {
    const r = createRng(51);
    for (let c = 0; c < 30; c++) {
      const policy = (['stretch', 'letterbox', 'centre-crop'] as const)[c % 3];
      const values = Float32Array.from({ length: 49 }, () => r.normal());
      const boxes = [{ x: r.int(700), y: r.int(500), w: 1 + r.int(300), h: 1 + r.int(300) }];
      const a = study(policy, values, boxes);
      const g = groundSentence(a);
      for (const rule of ['centre', 'overlap', 'upsampled'] as const) {
        expect(g.hits[rule]).toBe(evaluateHit(rule, a));
        expect(g.chance[rule]).toBe(chanceLevel(rule, a));
        expect(g.chance[rule] >= 0 && g.chance[rule] <= 1).toBe(true);
      }
      expect(g.massInBoxes >= 0 && g.massInBoxes <= 1).toBe(true);
      expect(g.iou).toHaveLength(3);
      if (g.hits.centre) expect(g.lateralitySwap).toBe(false);
    }
  });
  it('groundSentence reports the best cell, its centre, and a laterality swap for a mirrored peak', () => {
    // Peak at row 3, col 1 (the viewer's left); the box sits at the mirror position on the right.
    const values = Float32Array.from({ length: 49 }, (_, i) => (i === 3 * 7 + 1 ? 1 : 0));
    const g = groundSentence(study('stretch', values, [{ x: 760, y: 350, w: 60, h: 60 }]));
    expect(g.bestCell).toEqual({ index: 22, row: 3, col: 1 });
    expect(g.bestPoint.x).toBeCloseTo((1.5 * 1000) / 7, 9);
    expect(g.bestPoint.y).toBeCloseTo((3.5 * 800) / 7, 9);
    expect(g.hits).toEqual({ centre: false, overlap: false, upsampled: false });
    expect(g.lateralitySwap).toBe(true);
    expect(g.upsampledPoint!.x).toBeCloseTo(g.bestPoint.x, -1);
  });
  it('groundSentence with a prepared geometry gives the same result', () => {
    const r = createRng(52);
    const values = Float32Array.from({ length: 49 }, () => r.normal());
    const a = study('letterbox', values, [{ x: 100, y: 100, w: 300, h: 200 }]);
    expect(groundSentence({ ...a, geometry: prepareStudyGeometry(a.transform, a.grid, a.cells) })).toEqual(groundSentence(a));
  });
  it('groundSentence reusing one geometry (and its scratch) across many sentences matches a fresh geometry each time', () => {
    const r = createRng(54);
    const first = study('centre-crop', new Float32Array(49), []);
    const geometry = prepareStudyGeometry(first.transform, first.grid, first.cells);
    for (let c = 0; c < 40; c++) {
      const values = Float32Array.from({ length: 49 }, () => (c % 5 === 0 ? r.int(3) : r.normal()));
      const boxes = Array.from({ length: r.int(4) }, () => ({ x: r.int(600), y: r.int(400), w: 1 + r.int(390), h: 1 + r.int(390) }));
      const a = study('centre-crop', values, boxes);
      expect(groundSentence({ ...a, geometry })).toEqual(groundSentence({ ...a, geometry: prepareStudyGeometry(a.transform, a.grid, a.cells) }));
    }
  });
  it('groundSentence with no boxes: no hits, zero chance and mass, CNR undefined', () => {
    const g = groundSentence(study('stretch', new Float32Array(49).map((_, i) => i), []));
    expect(g.hits).toEqual({ centre: false, overlap: false, upsampled: false });
    expect(g.chance).toEqual({ centre: 0, overlap: 0, upsampled: 0 });
    expect(g.massInBoxes).toBe(0);
    expect(g.cnr).toBeUndefined();
    expect(g.topKHit).toBe(false);
  });
  it('groundSentence handles a single cell, NaN cells and huge values', () => {
    const size = { width: 300, height: 200 };
    const transform = computeResizeTransform(size, { width: 32, height: 32 }, 'letterbox');
    const one = { values: new Float32Array([0.4]), grid: { h: 1, w: 1 }, cells: gridCellRects(transform, { h: 1, w: 1 }), transform, imageSize: size, boxes: [{ x: 0, y: 0, w: 300, h: 200 }] };
    const g = groundSentence(one);
    expect(g.hits).toEqual({ centre: true, overlap: true, upsampled: true });
    expect(g.chance).toEqual({ centre: 1, overlap: 1, upsampled: 1 });
    expect(g.massInBoxes).toBe(1);
    expect(g.cnr).toBeUndefined();
    const withNaN = Float32Array.from({ length: 49 }, (_, i) => (i % 2 ? Number.NaN : i));
    expect(groundSentence(study('stretch', withNaN, [{ x: 0, y: 0, w: 50, h: 50 }])).bestCell.index).toBe(48);
    const huge = Float32Array.from({ length: 49 }, (_, i) => (i === 10 ? 3e38 : -3e38));
    const h = groundSentence(study('centre-crop', huge, [{ x: 0, y: 0, w: 50, h: 50 }]));
    expect(h.bestCell.index).toBe(10);
    expect(Number.isFinite(h.massInBoxes)).toBe(true);
  });
  it('groundSentence rejects an all-NaN map and invalid boxes', () => {
    expect(() => groundSentence(study('stretch', new Float32Array(49).fill(Number.NaN), []))).toThrow(/at least one number that is not NaN/);
    expect(() => groundSentence(study('stretch', new Float32Array(49), [{ x: 990, y: 0, w: 20, h: 10 }]))).toThrow(/boxes\[0\]: box lies outside the image/);
  });
  it('groundSentence is fast enough for batch scoring (10 sentences x 1,000 studies of a 14 x 14 grid on 2048 px images)', () => {
    const size = { width: 2048, height: 2048 };
    const grid = { h: 14, w: 14 };
    const transform = computeResizeTransform(size, { width: 224, height: 224 }, 'letterbox');
    const geometry = prepareStudyGeometry(transform, grid);
    const r = createRng(53);
    const values = Float32Array.from({ length: 196 }, () => r.normal());
    const boxes = [{ x: 300, y: 400, w: 500, h: 600 }, { x: 1200, y: 500, w: 300, h: 300 }];
    const start = performance.now();
    for (let i = 0; i < 200; i++) groundSentence({ values, grid, cells: geometry.cells, transform, imageSize: size, boxes, geometry });
    const perSentenceMs = (performance.now() - start) / 200;
    // Generous bound for a shared CI machine; typical is well under 1 ms.
    expect(perSentenceMs).toBeLessThan(5);
  });
});
