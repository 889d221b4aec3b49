import type { GridShape, HitRule, ImagePoint, ImageRect, ResizeTransform, Size } from './types';
import { cellCentre, gridCellRects, validateGrid } from './grid-geometry';
import {
  countPixelCentresInUnion,
  isValidImageBox,
  pointInAnyRect,
  rectsOverlap,
  validateImageBox,
  type RectEdges,
} from './box-geometry';
import { planUpsampledArgMax, upsampledArgMax, type UpsamplePlan } from './upsampled-arg-max';

/** What the hit rules need about one sentence's map and the study geometry. */
export interface HitArgs {
  /** The sentence's similarity map, h * w values in row-major cell order. */
  readonly values: ArrayLike<number>;
  readonly grid: GridShape;
  /** Each cell's image rectangle (gridCellRects). */
  readonly cells: readonly ImageRect[];
  readonly transform: ResizeTransform;
  readonly imageSize: Size;
  /** Reference boxes in original image pixels. */
  readonly boxes: readonly ImageRect[];
  /** Boxes are enlarged by this many pixels on every side for the centre and upsampled rules. */
  readonly tolerancePx?: number;
}

/** The rule-independent facts about one study's grid, computed once per study. */
export interface StudyGeometry {
  readonly transform: ResizeTransform;
  readonly grid: GridShape;
  readonly imageSize: Size;
  readonly cells: readonly ImageRect[];
  readonly centres: readonly ImagePoint[];
  /** The cells' edges (x, y, x + w, y + h) and centres as typed arrays, for the per-cell loops. */
  readonly cellEdges: RectEdges;
  readonly centreX: Float64Array;
  readonly centreY: Float64Array;
  readonly cellAreas: Float64Array;
  readonly upsample: UpsamplePlan;
  /** Number of image pixels the encoder sees (the upsampled rule's population). */
  readonly visiblePixels: number;
  /**
   * Per-cell scratch space of groundSentence, overwritten by every call, so that scoring a
   * study's sentences allocates no per-cell arrays: a geometry belongs to one caller at a time.
   */
  readonly scratch: {
    readonly covered: Float64Array;
    readonly fraction: Float64Array;
    readonly inside: Uint8Array;
  };
}

const RULES: readonly HitRule[] = ['centre', 'overlap', 'upsampled'];

/**
 * Precomputes cell rectangles (gridCellRects unless given), centres, areas and the upsampling plan
 * of one study (see StudyGeometry); O(cells + image width + height).
 */
export function prepareStudyGeometry(
  transform: ResizeTransform,
  grid: GridShape,
  cells: readonly ImageRect[] = gridCellRects(transform, grid),
): StudyGeometry {
  validateGrid(grid);
  if (cells.length !== grid.h * grid.w) {
    throw new RangeError(`'cells' must hold grid.h x grid.w = ${grid.h * grid.w} rectangles; got ${cells.length}`);
  }
  const upsample = planUpsampledArgMax(transform, grid);
  const visible = (upsample.x.last - upsample.x.first + 1) * (upsample.y.last - upsample.y.first + 1);
  const n = cells.length;
  // One backing store for every per-cell array: a typed-array allocation costs more than filling it.
  const store = new ArrayBuffer(n * 9 * 8 + n);
  const column = (k: number): Float64Array => new Float64Array(store, k * n * 8, n);
  const [x0, y0, x1, y1, centreX, centreY, cellAreas, covered, fraction] = [0, 1, 2, 3, 4, 5, 6, 7, 8].map(column);
  const centres: ImagePoint[] = new Array<ImagePoint>(n);
  for (let i = 0; i < n; i++) {
    const c = cells[i];
    const p = cellCentre(c);
    centres[i] = p;
    centreX[i] = p.x;
    centreY[i] = p.y;
    cellAreas[i] = c.w * c.h;
    // rectEdges' sums.
    x0[i] = c.x;
    y0[i] = c.y;
    x1[i] = c.x + c.w;
    y1[i] = c.y + c.h;
  }
  return {
    transform,
    grid,
    imageSize: transform.source,
    cells,
    centres,
    cellEdges: { x0, y0, x1, y1 },
    centreX,
    centreY,
    cellAreas,
    upsample,
    visiblePixels: Math.max(0, visible),
    scratch: { covered, fraction, inside: new Uint8Array(store, n * 9 * 8, n) },
  };
}

/**
 * Index of the largest value (the best cell), the first one on ties. NaN values are ignored;
 * -1 when values is empty or all NaN.
 */
export function bestCellIndex(values: ArrayLike<number>): number {
  let best = -1;
  let m = -Infinity;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (v > m || (best < 0 && v === m)) {
      m = v;
      best = i;
    }
  }
  return best;
}

/** Throws a RangeError listing every problem with the arguments of a hit rule. */
export function validateHitArgs(args: HitArgs, geometry?: StudyGeometry): void {
  const problems: string[] = [];
  validateGrid(args.grid);
  const n = args.grid.h * args.grid.w;
  if (args.values.length !== n) problems.push(`'values' must hold grid.h x grid.w = ${n} values; got ${args.values.length}`);
  for (let i = 0; i < args.values.length; i++) {
    const v = args.values[i];
    if (v === Infinity || v === -Infinity) {
      problems.push(`'values' must be finite numbers or NaN; got ${v} at cell ${i}`);
      break;
    }
  }
  if (args.cells.length !== n) problems.push(`'cells' must hold ${n} rectangles; got ${args.cells.length}`);
  const src = args.transform.source;
  if (args.imageSize.width !== src.width || args.imageSize.height !== src.height) {
    problems.push(
      `'imageSize' must equal the transform's source size ${src.width} x ${src.height}; got ${args.imageSize.width} x ${args.imageSize.height}`,
    );
  }
  const tol = args.tolerancePx ?? 0;
  if (!(Number.isFinite(tol) && tol >= 0)) problems.push(`'tolerancePx' must be a finite number >= 0; got ${tol}`);
  const boxes = args.boxes;
  for (let i = 0; i < boxes.length; i++) {
    // The quick test passes valid boxes; only a bad one pays for the messages.
    if (isValidImageBox(boxes[i], args.imageSize)) continue;
    for (const p of validateImageBox(boxes[i], args.imageSize)) problems.push(`boxes[${i}]: ${p}`);
  }
  if (geometry !== undefined && (geometry.grid.h !== args.grid.h || geometry.grid.w !== args.grid.w)) {
    problems.push(`'geometry' was prepared for a ${geometry.grid.h} x ${geometry.grid.w} grid; got ${args.grid.h} x ${args.grid.w}`);
  }
  if (problems.length > 0) throw new RangeError(problems.join('; '));
}

/** Best cell of a validated map; throws when every value is NaN (no best cell exists). */
export function requireBestCell(values: ArrayLike<number>): number {
  const best = bestCellIndex(values);
  if (best < 0) throw new RangeError(`'values' must hold at least one number that is not NaN; got ${values.length} NaN values`);
  return best;
}

/** Hit under the centre rule: the best cell's centre in a box enlarged by the tolerance. */
export function centreHit(centre: ImagePoint, boxes: readonly ImageRect[], tolerancePx: number): boolean {
  return pointInAnyRect(centre, boxes, tolerancePx);
}

/** Hit under the overlap rule: the best cell's rectangle overlaps a box with positive area. */
export function overlapHit(cell: ImageRect, boxes: readonly ImageRect[]): boolean {
  for (const b of boxes) if (rectsOverlap(cell, b)) return true;
  return false;
}

/** Centre of the upsampled map's arg-max pixel, or undefined when no pixel has a number. */
export function upsampledPoint(values: ArrayLike<number>, geometry: StudyGeometry): ImagePoint | undefined {
  const p = upsampledArgMax(values, geometry.upsample);
  return p === undefined ? undefined : { x: p.px + 0.5, y: p.py + 0.5 };
}

/** Chance level of each rule: the hit rate if the best cell (or pixel) were drawn uniformly. */
export function chanceLevels(
  geometry: StudyGeometry,
  boxes: readonly ImageRect[],
  tolerancePx: number,
): Record<HitRule, number> {
  const n = geometry.cells.length;
  const { centreX, centreY } = geometry;
  const { x0, y0, x1, y1 } = geometry.cellEdges;
  let centre = 0;
  let overlap = 0;
  if (boxes.length > 0) {
    for (let i = 0; i < n; i++) {
      const cx = centreX[i];
      const cy = centreY[i];
      let c = 0;
      let o = 0;
      for (let k = 0; k < boxes.length; k++) {
        const b = boxes[k];
        const bx1 = b.x + b.w;
        const by1 = b.y + b.h;
        // The expressions of pointInRect and intersectionArea, so the counts match them exactly.
        if (c === 0 && cx >= b.x - tolerancePx && cx <= bx1 + tolerancePx && cy >= b.y - tolerancePx && cy <= by1 + tolerancePx) c = 1;
        if (o === 0) {
          const w = Math.min(x1[i], bx1) - Math.max(x0[i], b.x);
          const h = Math.min(y1[i], by1) - Math.max(y0[i], b.y);
          if (w > 0 && h > 0 && w * h > 0) o = 1;
        }
        if (c + o === 2) break;
      }
      centre += c;
      overlap += o;
    }
  }
  const { x, y } = geometry.upsample;
  const inside = countPixelCentresInUnion(
    boxes,
    { firstX: x.first, lastX: x.last, firstY: y.first, lastY: y.last },
    tolerancePx,
  );
  return {
    centre: centre / n,
    overlap: overlap / n,
    upsampled: geometry.visiblePixels > 0 ? inside / geometry.visiblePixels : 0,
  };
}

function checkRule(rule: HitRule): void {
  if (!RULES.includes(rule)) throw new RangeError(`'rule' must be one of ${RULES.join(', ')}; got '${String(rule)}'`);
}

/**
 * Whether the map hits the reference boxes under a rule:
 * - 'centre': the best cell's centre lies in a box enlarged by tolerancePx (the pointing game,
 *   Zhang et al., ECCV 2016, which uses a 15 px tolerance);
 * - 'overlap': the best cell's rectangle overlaps a box with positive area (boxes as drawn);
 * - 'upsampled': the centre of the arg-max pixel of the map upsampled bilinearly to the image
 *   (upsampled-arg-max.ts) lies in a box enlarged by tolerancePx.
 * No boxes: false. Throws a RangeError listing every bad argument (wrong lengths, infinite
 * values, invalid boxes, imageSize not the transform's source) and when every value is NaN.
 */
export function evaluateHit(rule: HitRule, args: HitArgs): boolean {
  checkRule(rule);
  validateHitArgs(args);
  const best = requireBestCell(args.values);
  const tol = args.tolerancePx ?? 0;
  switch (rule) {
    case 'centre':
      return centreHit(cellCentre(args.cells[best]), args.boxes, tol);
    case 'overlap':
      return overlapHit(args.cells[best], args.boxes);
    case 'upsampled': {
      const p = upsampledPoint(args.values, prepareStudyGeometry(args.transform, args.grid, args.cells));
      return p !== undefined && centreHit(p, args.boxes, tol);
    }
  }
}

/**
 * Chance level of a rule, in [0, 1]: 'centre', the share of cells whose centre would hit;
 * 'overlap', the share of cells overlapping a box; 'upsampled', the share of the image pixels
 * the encoder sees whose centre lies in the union of the enlarged boxes. No boxes: 0. The map
 * values are not used.
 */
export function chanceLevel(rule: HitRule, args: Omit<HitArgs, 'values'> & { readonly values?: ArrayLike<number> }): number {
  checkRule(rule);
  const n = args.grid.h * args.grid.w;
  validateHitArgs({ ...args, values: args.values ?? new Float32Array(n) });
  return chanceLevels(prepareStudyGeometry(args.transform, args.grid, args.cells), args.boxes, args.tolerancePx ?? 0)[rule];
}
