import type { GridShape, ImageRect } from '../../core/types';
import { cividisHex, normaliseToDomain, valueDomain } from './colour-scale';
import { OVERLAY_COLOURS, type LineShape, type RectShape, type Shape } from './shapes';
import { imageToCanvas, rectToCanvas, type Viewport } from './viewport';

function checkCells(grid: GridShape, cells: readonly ImageRect[], values?: ArrayLike<number>): void {
  const n = grid.h * grid.w;
  if (cells.length !== n) throw new RangeError(`'cells' must have grid.h * grid.w = ${n} rects; got ${cells.length}`);
  if (values && values.length !== n) throw new RangeError(`'values' must have grid.h * grid.w = ${n} numbers; got ${values.length}`);
}

/**
 * The region grid's lines: one vertical line per column boundary and one horizontal per row
 * boundary, spanning the grid's extent (cells from gridCellRects, image pixels). Empty grid: [].
 */
export function gridLineShapes(grid: GridShape, cells: readonly ImageRect[], v: Viewport, { stroke = OVERLAY_COLOURS.grid, opacity = 0.35 } = {}): LineShape[] {
  checkCells(grid, cells);
  if (cells.length === 0) return [];
  const top = cells[0].y;
  const bottom = cells[(grid.h - 1) * grid.w].y + cells[(grid.h - 1) * grid.w].h;
  const left = cells[0].x;
  const right = cells[grid.w - 1].x + cells[grid.w - 1].w;
  const xs = [...cells.slice(0, grid.w).map((c) => c.x), right];
  const ys = [...Array.from({ length: grid.h }, (_, r) => cells[r * grid.w].y), bottom];
  const line = (id: string, x0: number, y0: number, x1: number, y1: number): LineShape => {
    const a = imageToCanvas(v, { x: x0, y: y0 });
    const b = imageToCanvas(v, { x: x1, y: y1 });
    return { kind: 'line', id, points: [a.canvasX, a.canvasY, b.canvasX, b.canvasY], stroke, strokeWidth: 1, opacity };
  };
  return [...xs.map((x, i) => line(`grid-v${i}`, x, top, x, bottom)), ...ys.map((y, i) => line(`grid-h${i}`, left, y, right, y))];
}

/**
 * One filled rect per cell coloured by cividis over `domain` (default: the finite values' range);
 * NaN cells are left out. Values are row-major, one per cell.
 */
export function mapCellShapes(
  grid: GridShape,
  cells: readonly ImageRect[],
  values: ArrayLike<number>,
  v: Viewport,
  { domain = valueDomain(values), opacity = 0.5 }: { domain?: readonly [number, number]; opacity?: number } = {},
): RectShape[] {
  checkCells(grid, cells, values);
  if (!domain) return [];
  const out: RectShape[] = [];
  for (let i = 0; i < cells.length; i++) {
    const fill = cividisHex(normaliseToDomain(values[i], domain));
    if (fill === undefined) continue;
    out.push({ kind: 'rect', id: `map-${i}`, ...rectToCanvas(v, cells[i]), fill, opacity });
  }
  return out;
}

export interface LegendOptions {
  readonly domain: readonly [number, number];
  /** Top-left corner and size of the colour bar, canvas pixels. */
  readonly x: number;
  readonly y: number;
  readonly width?: number;
  readonly height?: number;
  readonly steps?: number;
  readonly title?: string;
  readonly fontSize?: number;
}

/** A horizontal colour bar of `steps` cividis swatches, low to high, with the domain's ends and middle labelled. */
export function legendShapes({ domain, x, y, width = 160, height = 10, steps = 32, title = 'Similarity', fontSize = 11 }: LegendOptions): Shape[] {
  if (!(Number.isInteger(steps) && steps >= 2)) throw new RangeError(`'steps' must be an integer >= 2; got ${steps}`);
  const [lo, hi] = domain;
  if (!(Number.isFinite(lo) && Number.isFinite(hi) && hi >= lo)) throw new RangeError(`'domain' must be two finite numbers, low first; got [${lo}, ${hi}]`);
  const sw = width / steps;
  const out: Shape[] = [{ kind: 'text', id: 'legend-title', x, y: y - fontSize - 3, text: title, fontSize, fill: OVERLAY_COLOURS.label }];
  for (let i = 0; i < steps; i++) {
    out.push({ kind: 'rect', id: `legend-${i}`, x: x + i * sw, y, width: sw, height, fill: cividisHex(i / (steps - 1)) as string });
  }
  out.push({ kind: 'rect', id: 'legend-frame', x, y, width, height, stroke: OVERLAY_COLOURS.label, strokeWidth: 1 });
  const ticks: [number, 'left' | 'center' | 'right'][] = [[0, 'left'], [0.5, 'center'], [1, 'right']];
  for (const [f, align] of ticks) {
    out.push({ kind: 'text', id: `legend-tick-${f}`, x: x + f * width, y: y + height + 3, text: formatTick(lo + f * (hi - lo)), fontSize, fill: OVERLAY_COLOURS.label, align });
  }
  return out;
}

function formatTick(v: number): string {
  const a = Math.abs(v);
  return a !== 0 && (a < 0.01 || a >= 1e4) ? v.toExponential(1) : v.toFixed(2);
}
