import type { GridShape, ImagePoint, ImageRect, ResizeTransform } from './types';

/** Throws a RangeError unless the grid has integer h, w >= 1. */
export function validateGrid(grid: GridShape): void {
  if (!(Number.isInteger(grid?.h) && grid.h >= 1 && Number.isInteger(grid.w) && grid.w >= 1)) {
    throw new RangeError(`'grid' must have integer h >= 1 and w >= 1; got ${grid?.h} x ${grid?.w}`);
  }
}

function checkCellIndex(grid: GridShape, cellIndex: number): void {
  const n = grid.h * grid.w;
  if (!(Number.isInteger(cellIndex) && cellIndex >= 0 && cellIndex < n)) {
    throw new RangeError(`'cellIndex' must be an integer in [0, ${n - 1}]; got ${cellIndex}`);
  }
}

/** Row and column of a row-major cell index (index = row * grid.w + col). */
export function cellIndexToRowCol(grid: GridShape, cellIndex: number): { row: number; col: number } {
  validateGrid(grid);
  checkCellIndex(grid, cellIndex);
  return { row: Math.floor(cellIndex / grid.w), col: cellIndex % grid.w };
}

// Edge k of n along one axis, in image pixels, clipped to [0, size]. Neighbouring cells use the
// same expression for their shared edge, so the cells tile the visible image exactly.
function edge(k: number, n: number, inputSize: number, scale: number, offset: number, size: number): number {
  const x = ((k * inputSize) / n - offset) / scale;
  // Snap float error at the image border (224 / (224 / 300) is 300.00000000000006 or just below).
  const eps = 1e-9 * size;
  return x < eps ? 0 : x > size - eps ? size : x;
}

/**
 * The image-pixel rectangle of one grid cell: the encoder input is split evenly into grid.h x
 * grid.w cells, the cell's input rectangle is mapped back through the resize transform and
 * clipped to the image. A cell lying wholly in letterbox padding gets zero width or height
 * (placed on the image border). Throws a RangeError for a bad grid or cell index.
 */
export function cellToImageRect(t: ResizeTransform, grid: GridShape, cellIndex: number): ImageRect {
  const { row, col } = cellIndexToRowCol(grid, cellIndex);
  const x0 = edge(col, grid.w, t.input.width, t.scaleX, t.offsetX, t.source.width);
  const x1 = edge(col + 1, grid.w, t.input.width, t.scaleX, t.offsetX, t.source.width);
  const y0 = edge(row, grid.h, t.input.height, t.scaleY, t.offsetY, t.source.height);
  const y1 = edge(row + 1, grid.h, t.input.height, t.scaleY, t.offsetY, t.source.height);
  return { x: x0, y: y0, w: x1 - x0, h: y1 - y0 };
}

/** Every cell's image rectangle, in row-major cell order (length grid.h * grid.w). */
export function gridCellRects(t: ResizeTransform, grid: GridShape): ImageRect[] {
  validateGrid(grid);
  const out: ImageRect[] = new Array(grid.h * grid.w);
  for (let i = 0; i < out.length; i++) out[i] = cellToImageRect(t, grid, i);
  return out;
}

/** Centre of a rectangle, in the rectangle's own pixel space. */
export function cellCentre(r: ImageRect): ImagePoint {
  return { x: r.x + r.w / 2, y: r.y + r.h / 2 };
}
