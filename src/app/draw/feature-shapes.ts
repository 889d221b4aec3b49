import { componentsToRgb, principalComponents } from '../../core/principal-components';
import type { GridShape, ImageRect } from '../../core/types';
import { rgbToHex } from './colour-scale';
import { OVERLAY_COLOURS, type RectShape, type Shape } from './shapes';
import { rectToCanvas, type Viewport } from './viewport';

/** One study's region embeddings as colours: the first three principal components as red, green and blue. */
export interface RegionFeatureColours {
  /** RGB bytes, nCells x 3, row-major cells. */
  readonly rgb: Uint8ClampedArray;
  /** Share of the total variance along each component shown (up to three), in [0, 1]. */
  readonly varianceShare: readonly number[];
}

/** The region features over the study's grid, for the canvas overlay. */
export interface RegionFeatureMap {
  readonly grid: GridShape;
  readonly cells: readonly ImageRect[]; // gridCellRects, image pixels
  readonly colours: RegionFeatureColours;
}

/**
 * Colours of nCells cell embeddings (row-major nCells x dim, as normalised for similarity): the
 * core's principalComponents with k = min(3, nCells, dim), then componentsToRgb (each component
 * min-max scaled over the study). The one place the grid view and the canvas overlay get their
 * colours from. Throws the core's RangeError for a wrong length, NaN or nCells < 1.
 */
export function regionFeatureColours(cells: Float32Array, nCells: number, dim: number): RegionFeatureColours {
  const k = Math.min(3, nCells, dim);
  const pcs = principalComponents(cells, nCells, dim, k);
  return { rgb: componentsToRgb(pcs.scores, nCells, k), varianceShare: pcs.explainedVarianceRatio };
}

/** The CSS colour of cell i: `#rrggbb`. */
export function featureColourHex(rgb: Uint8ClampedArray, i: number): string {
  return rgbToHex([rgb[3 * i] / 255, rgb[3 * i + 1] / 255, rgb[3 * i + 2] / 255]);
}

/**
 * One filled rect per cell in its feature colour, at `opacity`, over the cells' image rectangles.
 * Throws RangeError unless there are grid.h * grid.w cells and 3 bytes per cell.
 */
export function featureCellShapes(
  grid: GridShape,
  cells: readonly ImageRect[],
  rgb: Uint8ClampedArray,
  v: Viewport,
  { opacity = 0.5 }: { opacity?: number } = {},
): RectShape[] {
  const n = grid.h * grid.w;
  if (cells.length !== n) throw new RangeError(`'cells' must have grid.h * grid.w = ${n} rects; got ${cells.length}`);
  if (rgb.length !== 3 * n) throw new RangeError(`'rgb' must hold 3 bytes per cell = ${3 * n}; got ${rgb.length}`);
  return cells.map((c, i) => ({ kind: 'rect', id: `features-${i}`, ...rectToCanvas(v, c), fill: featureColourHex(rgb, i), opacity }));
}

const CHANNELS = [
  { name: 'red', colour: '#FF0000' },
  { name: 'green', colour: '#00FF00' },
  { name: 'blue', colour: '#0000FF' },
] as const;

/**
 * The overlay's key, top-left at (x, y) canvas pixels: a title, then one line per component shown
 * with a swatch of its channel and its share of the variance.
 */
export function featureKeyShapes({ varianceShare, x, y, fontSize = 11 }: { varianceShare: readonly number[]; x: number; y: number; fontSize?: number }): Shape[] {
  const line = fontSize + 4;
  const out: Shape[] = [{ kind: 'text', id: 'features-key-title', x, y, text: 'Region features (principal components)', fontSize, fill: OVERLAY_COLOURS.label }];
  varianceShare.slice(0, 3).forEach((share, c) => {
    const top = y + (c + 1) * line;
    out.push({ kind: 'rect', id: `features-key-swatch-${c}`, x, y: top, width: fontSize, height: fontSize, fill: CHANNELS[c].colour, stroke: OVERLAY_COLOURS.label, strokeWidth: 1 });
    out.push({ kind: 'text', id: `features-key-pc-${c}`, x: x + fontSize + 4, y: top, text: `PC${c + 1} ${CHANNELS[c].name}: ${(share * 100).toFixed(1)}% of variance`, fontSize, fill: OVERLAY_COLOURS.label });
  });
  return out;
}
