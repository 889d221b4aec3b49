import type { GridShape, ResizeTransform } from './types';

/*
 * The upsampled map. A grid map (h x w values, one per cell) is upsampled bilinearly to the
 * original image: image pixel p (centre p + 0.5) maps through the resize transform to input
 * coordinate u = (p + 0.5) * scale + offset, then to grid coordinate g = u * n / inputSize - 0.5,
 * where node i (the centre of cell i) sits at g = i. g is clamped to [0, n - 1] (edge clamping),
 * i0 = min(floor(g), n - 2) and t = g - i0, so the value is the bilinear blend of four nodes.
 * Only pixels whose centre maps into the encoder input (g in [-0.5, n - 0.5]) take part: a
 * centre crop hides the rest from the model, so they cannot be its arg-max. This is the same
 * surface resampleToInput draws when the grid is resampled to image size.
 *
 * Why the arg-max needs only a few candidate pixels (exact, not a search near the best cell).
 * Group the visible pixels of an axis by i0. Within a group, t is a non-decreasing function of
 * the pixel index (the mapping is monotone; clamped pixels repeat t = 0 or t = 1). For a fixed
 * row, the value is linear in tx (a + b tx); a linear function over a set of t values is largest
 * at the smallest or the largest t, and when several pixels tie the first of them in pixel order
 * is the first pixel with the smallest t (the group's first pixel) or the first with the largest
 * t. So the first maximiser of every row within a group is one of two candidate columns C.
 * Now fix the group of rows: r(y) = max over C of the value is the maximum of two functions
 * linear in ty, hence convex in ty; its maximum over the group's rows is at the smallest or the
 * largest ty, and if it is reached at the largest ty only, no interior row reaches it (strict
 * convexity argument: r(interior) <= mix of r(ends) < max). So the first (row-major) maximiser
 * inside a group block lies in candidate rows x candidate columns. The global first maximiser is
 * the first maximiser of its own block, hence a candidate, and scanning the candidates in
 * row-major order with a strict comparison returns it. A search near the best node alone would
 * not be exact: pixels need not fall on nodes, so a slightly lower node with a pixel right on it
 * can beat the best node's nearest pixel. Cost: at most 2(w - 1) x 2(h - 1) evaluations per map,
 * independent of the image size. Values come from a Float32Array, so differences of values in
 * float64 never overflow; the blend a + t (b - a) is exact for equal nodes, so flat regions
 * (constant maps, clamped borders) tie exactly and the pixel-order rule decides.
 */

/** Per-axis sampling of the upsampled map: visible pixel range and the arg-max candidates. */
export interface UpsampleAxis {
  /** First and last visible pixel index (last < first when none is visible). */
  readonly first: number;
  readonly last: number;
  /**
   * Candidate pixel indices (ascending) with their node index and blend weight. Plain arrays:
   * a few dozen entries per study, cheaper to build than typed arrays.
   */
  readonly pixels: readonly number[];
  readonly node: readonly number[];
  /** The second node each candidate blends: node + 1, or node itself when its weight is 0. */
  readonly nextNode: readonly number[];
  readonly weight: readonly number[];
}

/** Everything the upsampled arg-max needs about one study's geometry; build once per study. */
export interface UpsamplePlan {
  readonly grid: GridShape;
  readonly x: UpsampleAxis;
  readonly y: UpsampleAxis;
  /**
   * Scratch space of upsampledArgMax (grid.h x x-candidates), overwritten by every call: a plan
   * belongs to one caller at a time.
   */
  readonly rowBlend: Float64Array;
}

function gridCoordinate(p: number, scale: number, offset: number, inputSize: number, n: number): number {
  return (((p + 0.5) * scale + offset) * n) / inputSize - 0.5;
}

function nodeAndWeight(g: number, n: number): [number, number] {
  if (n === 1) return [0, 0];
  const c = g < 0 ? 0 : g > n - 1 ? n - 1 : g;
  const i0 = Math.min(Math.floor(c), n - 2);
  return [i0, c - i0];
}

function planAxis(size: number, scale: number, offset: number, inputSize: number, n: number): UpsampleAxis {
  const pixels: number[] = [];
  const nodes: number[] = [];
  const nextNodes: number[] = [];
  const weights: number[] = [];
  let first = -1;
  let last = -2;
  let groupNode = -1;
  let firstPixel = -1;
  let firstWeight = 0;
  let maxPixel = -1;
  let maxWeight = -Infinity;
  for (let p = 0; p <= size; p++) {
    let g = 0;
    let i0 = -1;
    let t = 0;
    if (p < size) {
      g = gridCoordinate(p, scale, offset, inputSize, n);
      if (!(g >= -0.5 && g <= n - 0.5)) continue;
      if (first < 0) first = p;
      last = p;
      const c = n === 1 ? 0 : g < 0 ? 0 : g > n - 1 ? n - 1 : g;
      i0 = n === 1 ? 0 : Math.min(Math.floor(c), n - 2);
      t = c - i0;
      if (i0 === groupNode) {
        if (t > maxWeight) {
          maxPixel = p;
          maxWeight = t;
        }
        continue;
      }
    }
    // A new group starts (or the axis ends): the finished group gives its first and its largest-t pixel.
    if (groupNode >= 0) {
      pixels.push(firstPixel);
      nodes.push(groupNode);
      nextNodes.push(firstWeight > 0 ? groupNode + 1 : groupNode);
      weights.push(firstWeight);
      if (maxPixel !== firstPixel) {
        pixels.push(maxPixel);
        nodes.push(groupNode);
        nextNodes.push(maxWeight > 0 ? groupNode + 1 : groupNode);
        weights.push(maxWeight);
      }
    }
    groupNode = i0;
    firstPixel = p;
    firstWeight = t;
    maxPixel = p;
    maxWeight = t;
  }
  return {
    first: first < 0 ? 0 : first,
    last: first < 0 ? -1 : last,
    pixels,
    node: nodes,
    nextNode: nextNodes,
    weight: weights,
  };
}

/** Builds the per-study plan for upsampledArgMax: O(image width + height). */
export function planUpsampledArgMax(t: ResizeTransform, grid: GridShape): UpsamplePlan {
  const x = planAxis(Math.round(t.source.width), t.scaleX, t.offsetX, t.input.width, grid.w);
  const y = planAxis(Math.round(t.source.height), t.scaleY, t.offsetY, t.input.height, grid.h);
  return { grid, x, y, rowBlend: new Float64Array(grid.h * x.pixels.length) };
}

function blend(values: ArrayLike<number>, w: number, ix: number, tx: number, iy: number, ty: number): number {
  const ix1 = tx > 0 ? ix + 1 : ix;
  const iy1 = ty > 0 ? iy + 1 : iy;
  const v00 = values[iy * w + ix];
  const v01 = values[iy * w + ix1];
  const v10 = values[iy1 * w + ix];
  const v11 = values[iy1 * w + ix1];
  const top = v00 + tx * (v01 - v00);
  const bottom = v10 + tx * (v11 - v10);
  return top + ty * (bottom - top);
}

/**
 * Value of the upsampled map at image pixel (px, py), or undefined when the pixel's centre lies
 * outside the encoder's view (centre crop). The definition of the surface (see the note above).
 */
export function upsampledValueAt(
  values: ArrayLike<number>,
  t: ResizeTransform,
  grid: GridShape,
  px: number,
  py: number,
): number | undefined {
  const gx = gridCoordinate(px, t.scaleX, t.offsetX, t.input.width, grid.w);
  const gy = gridCoordinate(py, t.scaleY, t.offsetY, t.input.height, grid.h);
  if (!(gx >= -0.5 && gx <= grid.w - 0.5 && gy >= -0.5 && gy <= grid.h - 0.5)) return undefined;
  const [ix, tx] = nodeAndWeight(gx, grid.w);
  const [iy, ty] = nodeAndWeight(gy, grid.h);
  return blend(values, grid.w, ix, tx, iy, ty);
}

/**
 * The image pixel (integer indices) where the bilinearly upsampled map is largest, the first in
 * row-major pixel order on ties; exact over every visible pixel (see the note above). NaN values
 * make the pixels that blend them NaN, and those are skipped; undefined when no visible pixel has
 * a number.
 */
export function upsampledArgMax(values: ArrayLike<number>, plan: UpsamplePlan): { px: number; py: number } | undefined {
  const { x, y, grid, rowBlend } = plan;
  const nx = x.pixels.length;
  const w = grid.w;
  // Each node row's horizontal blend at every candidate column, shared by the candidate rows that
  // blend that node row: the same expression as blend(), so the values are bit-identical.
  for (let r = 0; r < grid.h; r++) {
    const ro = r * w;
    const bo = r * nx;
    for (let i = 0; i < nx; i++) {
      const v0 = values[ro + x.node[i]];
      const v1 = values[ro + x.nextNode[i]];
      rowBlend[bo + i] = v0 + x.weight[i] * (v1 - v0);
    }
  }
  let best = -Infinity;
  let bx = -1;
  let by = -1;
  for (let j = 0; j < y.pixels.length; j++) {
    const ty = y.weight[j];
    const top = y.node[j] * nx;
    const bottom = y.nextNode[j] * nx;
    for (let i = 0; i < nx; i++) {
      const t = rowBlend[top + i];
      const v = t + ty * (rowBlend[bottom + i] - t);
      if (v > best || (bx < 0 && v === best)) {
        best = v;
        bx = i;
        by = j;
      }
    }
  }
  return bx < 0 ? undefined : { px: x.pixels[bx], py: y.pixels[by] };
}
