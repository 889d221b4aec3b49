import { describe, expect, it } from 'vitest';
import { gridCellRects } from '../../core/grid-geometry';
import { computeResizeTransform } from '../../core/resize-transform';
import { selectSentence, setOpacity, setOverlay } from '../state/commands';
import { makeTestStore } from '../state/test-support';
import { cividisHex } from './colour-scale';
import { featureCellShapes, featureColourHex, featureKeyShapes, regionFeatureColours } from './feature-shapes';
import type { RectShape, TextShape } from './shapes';
import { drawStudyScene } from './study-scene';

const grid = { h: 2, w: 3 };
const transform = computeResizeTransform({ width: 300, height: 200 }, { width: 6, height: 4 }, 'stretch');
const cells = gridCellRects(transform, grid);
const V = { scale: 2, offsetX: 10, offsetY: 20 };

// Six cells in 3 dimensions: the first axis splits the left column pair from the right (largest
// spread), the second splits the rows with a smaller spread, the third does not vary.
const EMBEDDINGS = Float32Array.from([2, 0.5, 0, 2, 0.5, 0, 0, 0.5, 0, 2, -0.5, 0, 2, -0.5, 0, 0, -0.5, 0]);

describe('region features', () => {
  it('regionFeatureColours(cells, n, dim) puts the largest spread in red and the next in green', () => {
    const { rgb, varianceShare } = regionFeatureColours(EMBEDDINGS, 6, 3);
    expect(rgb).toHaveLength(18);
    const red = [0, 1, 2, 3, 4, 5].map((i) => rgb[3 * i]);
    const green = [0, 1, 2, 3, 4, 5].map((i) => rgb[3 * i + 1]);
    // Sign of a component is the core's convention; only the split is checked here.
    expect(new Set([red[0], red[1], red[3], red[4]]).size).toBe(1);
    expect(red[2]).toBe(red[5]);
    expect([...new Set(red)].sort((a, b) => a - b)).toEqual([0, 255]);
    expect(green[0]).toBe(green[2]);
    expect(green[3]).toBe(green[5]);
    expect([...new Set(green)].sort((a, b) => a - b)).toEqual([0, 255]);
    // The third component has no variance: componentsToRgb maps it to the middle.
    expect([0, 1, 2, 3, 4, 5].every((i) => rgb[3 * i + 2] === 128)).toBe(true);
    expect(varianceShare).toHaveLength(3);
    expect(varianceShare[0]).toBeGreaterThan(varianceShare[1]);
    expect(varianceShare[0] + varianceShare[1] + varianceShare[2]).toBeCloseTo(1, 6);
  });

  it('regionFeatureColours uses fewer components when dim or n is below 3 and refuses NaN and empty input', () => {
    const one = regionFeatureColours(Float32Array.from([1, 2, 3, 4]), 4, 1);
    expect(one.varianceShare).toHaveLength(1);
    expect([...one.rgb]).toEqual([0, 0, 0, 85, 0, 0, 170, 0, 0, 255, 0, 0]);
    expect(() => regionFeatureColours(Float32Array.from([1, NaN]), 2, 1)).toThrow(RangeError);
    expect(() => regionFeatureColours(new Float32Array(0), 0, 4)).toThrow(RangeError);
  });

  it('featureCellShapes draws one rect per cell in its colour at the given opacity', () => {
    const { rgb } = regionFeatureColours(EMBEDDINGS, 6, 3);
    const shapes = featureCellShapes(grid, cells, rgb, V, { opacity: 0.3 });
    expect(shapes.map((s) => s.id)).toEqual(['features-0', 'features-1', 'features-2', 'features-3', 'features-4', 'features-5']);
    expect(shapes[4]).toEqual({ kind: 'rect', id: 'features-4', x: 10 + 200, y: 20 + 200, width: 200, height: 200, fill: featureColourHex(rgb, 4), opacity: 0.3 });
    expect(featureColourHex(Uint8ClampedArray.from([255, 128, 0]), 0)).toBe('#ff8000');
    expect(() => featureCellShapes(grid, cells.slice(1), rgb, V)).toThrow(/'cells' must have grid.h \* grid.w = 6 rects; got 5/);
    expect(() => featureCellShapes(grid, cells, rgb.slice(3), V)).toThrow(/'rgb' must hold 3 bytes per cell = 18; got 15/);
  });

  it('featureKeyShapes names each component shown with its channel and share of variance', () => {
    const texts = featureKeyShapes({ varianceShare: [0.5, 0.25], x: 4, y: 6 })
      .filter((s): s is TextShape => s.kind === 'text')
      .map((s) => s.text);
    expect(texts).toEqual(['Region features (principal components)', 'PC1 red: 50.0% of variance', 'PC2 green: 25.0% of variance']);
  });

  it("drawStudyScene with view.overlay 'features' draws the feature colours instead of the map, at the map's opacity", () => {
    const store = makeTestStore();
    selectSentence(store, 0);
    setOpacity(store, 0.7);
    const map = { grid, cells, values: [0, 1, 2, 3, 4, 5] };
    const features = { grid, cells, colours: regionFeatureColours(EMBEDDINGS, 6, 3) };
    const legendAt = { canvasX: 5, canvasY: 5 };

    const asMap = drawStudyScene({ state: store.get(), viewport: V, map, features, legendAt });
    expect(asMap.map.map((s) => s.id)).toEqual(['map-0', 'map-1', 'map-2', 'map-3', 'map-4', 'map-5']);
    expect((asMap.map[0] as RectShape).fill).toBe(cividisHex(0));

    setOverlay(store, 'features');
    const asFeatures = drawStudyScene({ state: store.get(), viewport: V, map, features, legendAt });
    expect(asFeatures.map.map((s) => s.id)).toEqual(['features-0', 'features-1', 'features-2', 'features-3', 'features-4', 'features-5']);
    expect(asFeatures.map.every((s) => (s as RectShape).opacity === 0.7)).toBe(true);
    expect(asFeatures.legend.some((s) => s.kind === 'text' && s.text.startsWith('PC1 red'))).toBe(true);
    expect(asFeatures.legend.some((s) => s.id.startsWith('legend-'))).toBe(false);
    // The sentence's best cell is still outlined over the features.
    expect(asFeatures.grounding.some((s) => s.id === 'best-cell')).toBe(true);

    // No sentence map (nothing selected yet): the features and the grid still show.
    const noMap = drawStudyScene({ state: store.get(), viewport: V, features });
    expect(noMap.map).toHaveLength(6);
    expect(noMap.grid).toHaveLength(7);
    expect(noMap.grounding).toEqual([]);
    // Features chosen but not computed: nothing is drawn in their place, not the map.
    expect(drawStudyScene({ state: store.get(), viewport: V, map }).map).toEqual([]);
  });
});
