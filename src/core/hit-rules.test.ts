import { describe, expect, it } from 'vitest';
import { bestCellIndex, chanceLevel, evaluateHit, prepareStudyGeometry, type HitArgs } from './hit-rules';
import { planUpsampledArgMax, upsampledArgMax, upsampledValueAt } from './upsampled-arg-max';
import { computeResizeTransform } from './resize-transform';
import { gridCellRects } from './grid-geometry';
import { resampleToInput } from './resample-bilinear';
import { createRng, type Rng } from './seeded-random';
import type { GridShape, ResizePolicy, ResizeTransform, Size } from './types';

function args(size: Size, grid: GridShape, policy: ResizePolicy, values: Float32Array, boxes: HitArgs['boxes'], tolerancePx = 0): HitArgs {
  const transform = computeResizeTransform(size, { width: 224, height: 224 }, policy);
  return { values, grid, cells: gridCellRects(transform, grid), transform, imageSize: size, boxes, tolerancePx };
}

function bruteArgMax(values: Float32Array, t: ResizeTransform, grid: GridShape): { px: number; py: number } | undefined {
  let best = -Infinity;
  let at: { px: number; py: number } | undefined;
  for (let py = 0; py < t.source.height; py++) {
    for (let px = 0; px < t.source.width; px++) {
      const v = upsampledValueAt(values, t, grid, px, py);
      if (v !== undefined && (v > best || (at === undefined && v === best))) {
        best = v;
        at = { px, py };
      }
    }
  }
  return at;
}

function randomCase(r: Rng): { t: ResizeTransform; grid: GridShape } {
  const policies: ResizePolicy[] = ['stretch', 'letterbox', 'centre-crop'];
  const source = { width: 5 + r.int(120), height: 5 + r.int(120) };
  const input = { width: 8 + r.int(60), height: 8 + r.int(60) };
  return { t: computeResizeTransform(source, input, policies[r.int(3)]), grid: { h: 1 + r.int(6), w: 1 + r.int(6) } };
}

describe('bestCellIndex', () => {
  it('bestCellIndex(values) takes the first maximum and ignores NaN', () => {
    expect(bestCellIndex([1, 3, 2, 3])).toBe(1);
    expect(bestCellIndex([Number.NaN, -5, Number.NaN, -2])).toBe(3);
    expect(bestCellIndex([Number.NaN, Number.NaN])).toBe(-1);
    expect(bestCellIndex([])).toBe(-1);
    expect(bestCellIndex([-Infinity])).toBe(0);
    expect(bestCellIndex([3e38, -3e38])).toBe(0);
  });
  it('bestCellIndex is invariant under a positive affine rescaling a * v + b', () => {
    const r = createRng(9);
    for (let t = 0; t < 200; t++) {
      const v = Array.from({ length: 1 + r.int(50) }, () => r.normal());
      const a = 0.01 + 10 * r.next();
      const b = 5 * r.normal();
      expect(bestCellIndex(v.map((x) => a * x + b))).toBe(bestCellIndex(v));
    }
  });
});

describe('upsampledArgMax', () => {
  it('upsampledArgMax equals a brute-force scan of every pixel on random maps and transforms', () => {
    const r = createRng(31);
    for (let c = 0; c < 300; c++) {
      const { t, grid } = randomCase(r);
      const values = Float32Array.from({ length: grid.h * grid.w }, () => r.normal());
      expect(upsampledArgMax(values, planUpsampledArgMax(t, grid)), `case ${c}`).toEqual(bruteArgMax(values, t, grid));
    }
  });
  it('upsampledArgMax equals brute force with ties, plateaus, NaN cells and huge values', () => {
    const r = createRng(32);
    for (let c = 0; c < 300; c++) {
      const { t, grid } = randomCase(r);
      const kind = c % 4;
      const values = Float32Array.from({ length: grid.h * grid.w }, () =>
        kind === 0 ? 0.25 : kind === 1 ? r.int(3) : kind === 2 ? (r.int(4) === 0 ? Number.NaN : r.normal()) : (r.next() - 0.5) * 6e38,
      );
      expect(upsampledArgMax(values, planUpsampledArgMax(t, grid)), `case ${c} kind ${kind}`).toEqual(bruteArgMax(values, t, grid));
    }
  });
  it('upsampledArgMax agrees with the arg-max of the map drawn by resampleToInput (same surface)', () => {
    const r = createRng(33);
    for (let c = 0; c < 60; c++) {
      const { t, grid } = randomCase(r);
      const values = Float32Array.from({ length: grid.h * grid.w }, () => r.normal());
      // The grid resampled to the image: grid coordinate = image coordinate through t, divided by cell size.
      const g2i: ResizeTransform = {
        policy: 'stretch',
        source: { width: grid.w, height: grid.h },
        input: t.source,
        scaleX: (t.input.width / grid.w) / t.scaleX,
        scaleY: (t.input.height / grid.h) / t.scaleY,
        offsetX: -t.offsetX / t.scaleX,
        offsetY: -t.offsetY / t.scaleY,
      };
      const img = resampleToInput(values, { width: grid.w, height: grid.h }, g2i, -Infinity);
      let bi = 0;
      for (let i = 1; i < img.length; i++) if (img[i] > img[bi]) bi = i;
      const fast = upsampledArgMax(values, planUpsampledArgMax(t, grid))!;
      const px = bi % t.source.width;
      const py = Math.floor(bi / t.source.width);
      // Float32 rounding of the drawn map may tie neighbours; the values must agree.
      expect(Math.abs(upsampledValueAt(values, t, grid, px, py)! - upsampledValueAt(values, t, grid, fast.px, fast.py)!)).toBeLessThan(1e-6);
    }
  });
  it('upsampledArgMax of a single cell is the first visible pixel', () => {
    const t = computeResizeTransform({ width: 100, height: 50 }, { width: 224, height: 224 }, 'centre-crop');
    const p = upsampledArgMax(new Float32Array([0.3]), planUpsampledArgMax(t, { h: 1, w: 1 }))!;
    expect(p).toEqual({ px: 25, py: 0 });
  });
});

describe('evaluateHit', () => {
  const size = { width: 700, height: 700 };
  const grid = { h: 7, w: 7 };
  const hot = (cell: number): Float32Array => Float32Array.from({ length: 49 }, (_, i) => (i === cell ? 1 : 0));
  it("evaluateHit('centre') applies the pointing-game tolerance: a centre 15 px outside the box still hits (Zhang et al., ECCV 2016, 15 px)", () => {
    // Cell 24 (row 3, col 3) has centre (350, 350); the box ends 15 px short of it.
    const box = [{ x: 200, y: 300, w: 135, h: 100 }];
    expect(evaluateHit('centre', args(size, grid, 'stretch', hot(24), box, 15))).toBe(true);
    expect(evaluateHit('centre', args(size, grid, 'stretch', hot(24), box, 14.9))).toBe(false);
    expect(evaluateHit('centre', args(size, grid, 'stretch', hot(24), box, 0))).toBe(false);
  });
  it("evaluateHit('overlap') counts positive-area overlap of the best cell only", () => {
    expect(evaluateHit('overlap', args(size, grid, 'stretch', hot(24), [{ x: 399, y: 399, w: 50, h: 50 }]))).toBe(true);
    expect(evaluateHit('overlap', args(size, grid, 'stretch', hot(24), [{ x: 400, y: 400, w: 50, h: 50 }]))).toBe(false);
  });
  it("evaluateHit('upsampled') tests the arg-max pixel of the upsampled map", () => {
    expect(evaluateHit('upsampled', args(size, grid, 'stretch', hot(24), [{ x: 340, y: 340, w: 20, h: 20 }]))).toBe(true);
    expect(evaluateHit('upsampled', args(size, grid, 'stretch', hot(0), [{ x: 340, y: 340, w: 20, h: 20 }]))).toBe(false);
  });
  it('evaluateHit is false with no boxes and rejects bad inputs, listing every problem', () => {
    expect(evaluateHit('centre', args(size, grid, 'stretch', hot(3), []))).toBe(false);
    expect(() => evaluateHit('centre', args(size, grid, 'stretch', new Float32Array(49).fill(Number.NaN), []))).toThrow(
      "'values' must hold at least one number that is not NaN; got 49 NaN values",
    );
    const bad = { ...args(size, grid, 'stretch', new Float32Array(3), [{ x: -1, y: 0, w: 0, h: 5 }]), tolerancePx: -2 };
    expect(() => evaluateHit('centre', bad)).toThrow(/'values' must hold grid.h x grid.w = 49 values; got 3.*'tolerancePx'.*boxes\[0\]: box 'w'.*boxes\[0\]: box lies outside/);
    expect(() => evaluateHit('middle' as 'centre', args(size, grid, 'stretch', hot(1), []))).toThrow("'rule' must be one of centre, overlap, upsampled; got 'middle'");
  });
  it('evaluateHit(rule) is invariant under a positive affine rescaling of the map', () => {
    const r = createRng(41);
    for (let c = 0; c < 40; c++) {
      const v = Float32Array.from({ length: 49 }, () => r.normal());
      const w = Float32Array.from(v, (x) => 3 * x - 2);
      const boxes = [{ x: r.int(500), y: r.int(500), w: 1 + r.int(200), h: 1 + r.int(200) }];
      for (const rule of ['centre', 'overlap', 'upsampled'] as const) {
        expect(evaluateHit(rule, args(size, grid, 'letterbox', w, boxes, 15))).toBe(evaluateHit(rule, args(size, grid, 'letterbox', v, boxes, 15)));
      }
    }
  });
});

describe('chanceLevel', () => {
  const size = { width: 700, height: 700 };
  const grid = { h: 7, w: 7 };
  const v = new Float32Array(49);
  it('chanceLevel is the share of cells (centre, overlap) or pixels (upsampled) that would hit', () => {
    const box = [{ x: 0, y: 0, w: 200, h: 100 }];
    expect(chanceLevel('centre', args(size, grid, 'stretch', v, box))).toBe(2 / 49);
    expect(chanceLevel('overlap', args(size, grid, 'stretch', v, box))).toBe(2 / 49);
    expect(chanceLevel('upsampled', args(size, grid, 'stretch', v, box))).toBe((200 * 100) / (700 * 700));
    expect(chanceLevel('centre', args(size, grid, 'stretch', v, []))).toBe(0);
  });
  it('chanceLevel and hits stay in [0, 1] and chance equals the mean hit over all one-hot maps (centre, overlap)', () => {
    const r = createRng(42);
    for (let c = 0; c < 10; c++) {
      const s = { width: 100 + r.int(400), height: 100 + r.int(400) };
      const policy = (['stretch', 'letterbox', 'centre-crop'] as const)[c % 3];
      const boxes = [{ x: r.int(50), y: r.int(50), w: 1 + r.int(49), h: 1 + r.int(49) }];
      for (const rule of ['centre', 'overlap'] as const) {
        let hits = 0;
        for (let i = 0; i < 49; i++) {
          const hot = Float32Array.from({ length: 49 }, (_, j) => (j === i ? 1 : 0));
          if (evaluateHit(rule, args(s, grid, policy, hot, boxes, 5))) hits++;
        }
        const ch = chanceLevel(rule, args(s, grid, policy, v, boxes, 5));
        expect(ch).toBe(hits / 49);
        expect(ch >= 0 && ch <= 1).toBe(true);
      }
      const up = chanceLevel('upsampled', args(s, grid, policy, v, boxes, 5));
      expect(up >= 0 && up <= 1).toBe(true);
    }
    expect(chanceLevel('upsampled', args(size, grid, 'stretch', v, [{ x: 0, y: 0, w: 700, h: 700 }], 15))).toBe(1);
  });
  it('prepareStudyGeometry counts only pixels the encoder sees under a centre crop', () => {
    const t = computeResizeTransform({ width: 400, height: 200 }, { width: 224, height: 224 }, 'centre-crop');
    expect(prepareStudyGeometry(t, grid).visiblePixels).toBe(200 * 200);
  });
});
