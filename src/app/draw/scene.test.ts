import { describe, expect, it } from 'vitest';
import { gridCellRects } from '../../core/grid-geometry';
import { computeResizeTransform } from '../../core/resize-transform';
import { addBox, selectSentence, setLungTemplate } from '../state/commands';
import { LUNGS, makeTestStore } from '../state/test-support';
import { boxShapes, lungTemplateShapes, toolPreviewShapes } from './annotation-shapes';
import { cividisHex } from './colour-scale';
import { bestCellShapes, linkShapes, rankedCells } from './grounding-shapes';
import { gridLineShapes, legendShapes, mapCellShapes } from './map-shapes';
import type { LineShape, RectShape, Shape } from './shapes';
import { drawStudyScene } from './study-scene';

const grid = { h: 2, w: 3 };
const transform = computeResizeTransform({ width: 300, height: 200 }, { width: 6, height: 4 }, 'stretch');
const cells = gridCellRects(transform, grid);
const V = { scale: 2, offsetX: 10, offsetY: 20 };
const byId = (shapes: readonly Shape[], id: string) => shapes.find((s) => s.id === id);

describe('draw', () => {
  it('gridLineShapes gives w + 1 vertical and h + 1 horizontal lines on the cell edges', () => {
    const lines = gridLineShapes(grid, cells, V);
    expect(lines).toHaveLength(4 + 3);
    expect(lines[1].points).toEqual([10 + 200, 20, 10 + 200, 20 + 400]);
    expect(lines[5].points).toEqual([10, 20 + 200, 10 + 600, 20 + 200]);
    expect(gridLineShapes({ h: 0, w: 0 }, [], V)).toEqual([]);
    expect(() => gridLineShapes(grid, cells.slice(1), V)).toThrow(/'cells' must have grid.h \* grid.w = 6 rects; got 5/);
  });

  it('mapCellShapes colours by cividis over the value range and leaves NaN cells out', () => {
    const values = [0, 1, 2, NaN, 4, 4];
    const shapes = mapCellShapes(grid, cells, values, V, { opacity: 0.3 });
    expect(shapes.map((s) => s.id)).toEqual(['map-0', 'map-1', 'map-2', 'map-4', 'map-5']);
    expect(shapes[0]).toEqual({ kind: 'rect', id: 'map-0', x: 10, y: 20, width: 200, height: 200, fill: cividisHex(0), opacity: 0.3 });
    expect(shapes[2].fill).toBe(cividisHex(0.5));
    expect(shapes[4].fill).toBe(cividisHex(1));
    expect(mapCellShapes(grid, cells, new Array(6).fill(NaN), V)).toEqual([]);
  });

  it('legendShapes runs low to high with labelled ends', () => {
    const shapes = legendShapes({ domain: [-0.2, 0.6], x: 5, y: 50, width: 100, steps: 10 });
    const swatches = shapes.filter((s) => s.kind === 'rect' && s.id.startsWith('legend-') && s.id !== 'legend-frame') as RectShape[];
    expect(swatches).toHaveLength(10);
    expect(swatches[0].fill).toBe(cividisHex(0));
    expect(swatches[9].fill).toBe(cividisHex(1));
    expect(swatches[9].x + swatches[9].width).toBeCloseTo(105, 12);
    expect(shapes.filter((s) => s.kind === 'text').map((s) => (s as { text: string }).text)).toEqual(['Similarity', '-0.20', '0.20', '0.60']);
    expect(() => legendShapes({ domain: [1, 0], x: 0, y: 0 })).toThrow(/'domain'/);
  });

  it('bestCellShapes outlines the best and the next top-k cells; a grounding best cell wins', () => {
    const values = [0.1, 0.9, 0.3, NaN, 0.8, 0.2];
    const shapes = bestCellShapes(values, cells, V, { topK: 3 });
    expect(shapes.map((s) => s.id)).toEqual(['topk-2', 'topk-3', 'best-cell']);
    expect(byId(shapes, 'best-cell')).toMatchObject({ x: 10 + 200, y: 20, width: 200, height: 200 });
    expect(rankedCells(values, 3)).toEqual([1, 4, 2]);
    expect(rankedCells(values, 2, 5)).toEqual([5, 1]);
    expect(rankedCells([NaN, NaN], 2)).toEqual([]);
    expect(bestCellShapes([], [], V)).toEqual([]);
  });

  it('linkShapes runs from the anchor to each cell centre', () => {
    const lines = linkShapes({ canvasX: 0, canvasY: 0 }, [1, 4], cells, V);
    expect(lines.map((l) => l.points)).toEqual([
      [0, 0, 10 + 300, 20 + 100],
      [0, 0, 10 + 300, 20 + 300],
    ]);
    expect(() => linkShapes({ canvasX: 0, canvasY: 0 }, [9], cells, V)).toThrow(/'cellIndices'/);
  });

  it('boxShapes labels every box with its zone and gives only the selected one 8 handles', () => {
    const store = makeTestStore();
    const a = addBox(store, { rect: { x: 10, y: 10, w: 20, h: 20 } });
    const b = addBox(store, { rect: { x: 100, y: 100, w: 40, h: 20 }, zone: 'cardiac' });
    const shapes = boxShapes([a, b], V, { selectedId: b.id, handleSize: 6 });
    expect(shapes.filter((s) => s.id.startsWith('handle-'))).toHaveLength(8);
    expect(byId(shapes, `handle-${b.id}-se`)).toMatchObject({ x: 10 + 280 - 3, y: 20 + 240 - 3, width: 6 });
    expect(byId(shapes, `box-label-${a.id}`)).toMatchObject({ text: 'right-lower' });
    expect(byId(shapes, `box-${b.id}`)).toMatchObject({ x: 210, y: 220, width: 80, height: 40 });
  });

  it('lungTemplateShapes draws both lungs and the lines between their thirds', () => {
    const shapes = lungTemplateShapes({ study: 's', ...LUNGS, annotator: '', created: '' }, { scale: 1, offsetX: 0, offsetY: 0 });
    const thirds = shapes.filter((s) => s.kind === 'line') as LineShape[];
    expect(thirds.map((l) => l.points[1])).toEqual([100, 170, 100, 170]);
    // The side labels sit under each lung, leaving the tops to the zone proposals' labels.
    const right = shapes.find((s) => s.id === 'lung-right') as RectShape;
    const rightLabel = shapes.find((s) => s.id === 'lung-label-right');
    expect(rightLabel?.kind === 'text' && rightLabel.y).toBeGreaterThanOrEqual(right.y + right.height);
    expect(toolPreviewShapes([{ kind: 'draft-box', rect: { x: 1, y: 2, w: 3, h: 4 } }], V)[0]).toMatchObject({ x: 12, y: 24, width: 6, height: 8, dash: [4, 4] });
  });

  it('drawStudyScene honours showGrid, showLinks and opacity and includes proposals', () => {
    const store = makeTestStore();
    setLungTemplate(store, 'study-a', LUNGS);
    selectSentence(store, 2);
    const map = { grid, cells, values: [0, 1, 2, 3, 4, 5] };
    const scene = drawStudyScene({ state: store.get(), viewport: V, map, linkAnchor: { canvasX: 0, canvasY: 0 }, legendAt: { canvasX: 5, canvasY: 5 } });
    expect(scene.image).toMatchObject({ x: 10, y: 20, width: 800, height: 600 });
    expect(scene.grid.length).toBe(7);
    expect(scene.map.every((s) => (s as RectShape).opacity === 0.5)).toBe(true);
    expect(scene.grounding.filter((s) => s.kind === 'line')).toHaveLength(5);
    expect(scene.annotations.filter((s) => s.id.startsWith('proposal-') && !s.id.includes('label'))).toHaveLength(2);
    expect(scene.legend.length).toBeGreaterThan(0);
    const hidden = drawStudyScene({ state: { ...store.get(), view: { ...store.get().view, showGrid: false, showLinks: false } }, viewport: V, map, linkAnchor: { canvasX: 0, canvasY: 0 } });
    expect(hidden.grid).toEqual([]);
    expect(hidden.grounding.filter((s) => s.kind === 'line')).toEqual([]);
    expect(drawStudyScene({ state: { ...store.get(), selection: {} }, viewport: V })).toEqual({ grid: [], map: [], grounding: [], annotations: [], tool: [], legend: [] });
  });
});
