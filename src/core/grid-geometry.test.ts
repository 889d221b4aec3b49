import { describe, expect, it } from 'vitest';
import { cellCentre, cellIndexToRowCol, cellToImageRect, gridCellRects } from './grid-geometry';
import { computeResizeTransform } from './resize-transform';
import { unionArea } from './box-geometry';
import { expectClose } from '../../tests/support/expect-close';

const input = { width: 224, height: 224 };

describe('cellToImageRect', () => {
  it('cellToImageRect(stretch, 2 x 2) splits the image into quarters', () => {
    const t = computeResizeTransform({ width: 400, height: 200 }, input, 'stretch');
    expectClose(
      gridCellRects(t, { h: 2, w: 2 }).flatMap((c) => [c.x, c.y, c.w, c.h]),
      [0, 0, 200, 100, 200, 0, 200, 100, 0, 100, 200, 100, 200, 100, 200, 100],
      1e-9,
    );
  });
  it('cellToImageRect(letterbox) gives zero area to cells wholly in the padding and clips partial ones', () => {
    // 400 x 100 into 224 x 224: scale 0.56, content rows 84 .. 140 of the input.
    const t = computeResizeTransform({ width: 400, height: 100 }, input, 'letterbox');
    const cells = gridCellRects(t, { h: 4, w: 1 });
    expect(cells[0].h).toBe(0);
    expect(cells[3].h).toBe(0);
    expectClose([cells[1].y, cells[1].h, cells[2].y, cells[2].h], [0, 50, 50, 50], 1e-9);
  });
  it('gridCellRects tiles the visible image exactly for every policy', () => {
    for (const policy of ['stretch', 'letterbox', 'centre-crop'] as const) {
      const t = computeResizeTransform({ width: 613, height: 487 }, input, policy);
      const cells = gridCellRects(t, { h: 7, w: 7 });
      const sum = cells.reduce((s, c) => s + c.w * c.h, 0);
      expectClose(sum, unionArea(cells), 1e-6);
      const visible = policy === 'centre-crop' ? (224 / t.scaleX) * (224 / t.scaleY) : 613 * 487;
      expectClose(sum, visible, 1e-6);
      for (let i = 0; i + 1 < 7; i++) expect(cells[i].x + cells[i].w).toBe(cells[i + 1].x);
    }
  });
  it('cellToImageRect rejects a bad cell index or grid', () => {
    const t = computeResizeTransform({ width: 10, height: 10 }, input, 'stretch');
    expect(() => cellToImageRect(t, { h: 7, w: 7 }, 49)).toThrow("'cellIndex' must be an integer in [0, 48]; got 49");
    expect(() => cellToImageRect(t, { h: 0, w: 7 }, 0)).toThrow("'grid' must have integer h >= 1 and w >= 1; got 0 x 7");
  });
  it('cellToImageRect with a single cell covers the whole image', () => {
    const t = computeResizeTransform({ width: 300, height: 200 }, input, 'stretch');
    expect(cellToImageRect(t, { h: 1, w: 1 }, 0)).toEqual({ x: 0, y: 0, w: 300, h: 200 });
  });
});

describe('cellIndexToRowCol and cellCentre', () => {
  it('cellIndexToRowCol(grid, i) is row-major', () => {
    expect(cellIndexToRowCol({ h: 3, w: 4 }, 0)).toEqual({ row: 0, col: 0 });
    expect(cellIndexToRowCol({ h: 3, w: 4 }, 6)).toEqual({ row: 1, col: 2 });
    expect(cellIndexToRowCol({ h: 3, w: 4 }, 11)).toEqual({ row: 2, col: 3 });
  });
  it('cellCentre(r) is the rectangle midpoint', () => {
    expect(cellCentre({ x: 10, y: 20, w: 4, h: 6 })).toEqual({ x: 12, y: 23 });
  });
});
