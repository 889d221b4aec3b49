import type { ImagePoint, ImageRect, Size } from './types';

function checkTolerance(tolerancePx: number): void {
  if (!(Number.isFinite(tolerancePx) && tolerancePx >= 0)) {
    throw new RangeError(`'tolerancePx' must be a finite number >= 0; got ${tolerancePx}`);
  }
}

/**
 * Whether a point lies in a rectangle enlarged by tolerancePx on every side. The test is closed
 * (a point on the enlarged edge counts), so it is symmetric under mirroring. NaN never lies inside.
 */
export function pointInRect(p: ImagePoint, r: ImageRect, tolerancePx = 0): boolean {
  checkTolerance(tolerancePx);
  return (
    p.x >= r.x - tolerancePx &&
    p.x <= r.x + r.w + tolerancePx &&
    p.y >= r.y - tolerancePx &&
    p.y <= r.y + r.h + tolerancePx
  );
}

/** Whether a point lies in any of the rectangles, each enlarged by tolerancePx (see pointInRect). */
export function pointInAnyRect(p: ImagePoint, rects: readonly ImageRect[], tolerancePx = 0): boolean {
  for (const r of rects) if (pointInRect(p, r, tolerancePx)) return true;
  return false;
}

/** The rectangle grown by d on every side. */
export function enlargeRect(r: ImageRect, d: number): ImageRect {
  return { x: r.x - d, y: r.y - d, w: r.w + 2 * d, h: r.h + 2 * d };
}

/** The rectangle mirrored about the vertical line x = midlineX. */
export function mirrorRect(r: ImageRect, midlineX: number): ImageRect {
  return { x: 2 * midlineX - (r.x + r.w), y: r.y, w: r.w, h: r.h };
}

/** The intersection of two rectangles, or undefined when it has no positive area. */
export function intersectRects(a: ImageRect, b: ImageRect): ImageRect | undefined {
  const x0 = Math.max(a.x, b.x);
  const y0 = Math.max(a.y, b.y);
  const x1 = Math.min(a.x + a.w, b.x + b.w);
  const y1 = Math.min(a.y + a.h, b.y + b.h);
  return x1 > x0 && y1 > y0 ? { x: x0, y: y0, w: x1 - x0, h: y1 - y0 } : undefined;
}

/** Area of the intersection of two rectangles (0 when they only touch or are apart). */
export function intersectionArea(a: ImageRect, b: ImageRect): number {
  const w = Math.min(a.x + a.w, b.x + b.w) - Math.max(a.x, b.x);
  const h = Math.min(a.y + a.h, b.y + b.h) - Math.max(a.y, b.y);
  return w > 0 && h > 0 ? w * h : 0;
}

/** Whether two rectangles overlap with positive area (touching edges do not count). */
export function rectsOverlap(a: ImageRect, b: ImageRect): boolean {
  return intersectionArea(a, b) > 0;
}

function hasArea(r: ImageRect): boolean {
  return Number.isFinite(r.x) && Number.isFinite(r.y) && Number.isFinite(r.w) && Number.isFinite(r.h) && r.w > 0 && r.h > 0;
}

/**
 * Exact area of the union of rectangles, by coordinate compression: the distinct x edges cut the
 * plane into slabs, and in each slab the covered y intervals are merged. O(n^2 log n) for n
 * rectangles. Rectangles with no positive area or with NaN contribute nothing; empty input gives 0.
 */
export function unionArea(rects: readonly ImageRect[]): number {
  if (rects.length === 1) return hasArea(rects[0]) ? rects[0].w * rects[0].h : 0;
  const rs = rects.filter(hasArea);
  if (rs.length === 0) return 0;
  if (rs.length === 1) return rs[0].w * rs[0].h;
  const xs = Array.from(new Set(rs.flatMap((r) => [r.x, r.x + r.w]))).sort((a, b) => a - b);
  const spans: [number, number][] = [];
  let area = 0;
  for (let i = 0; i + 1 < xs.length; i++) {
    const xa = xs[i];
    const xb = xs[i + 1];
    spans.length = 0;
    for (const r of rs) if (r.x <= xa && r.x + r.w >= xb) spans.push([r.y, r.y + r.h]);
    if (spans.length === 0) continue;
    spans.sort((p, q) => p[0] - q[0]);
    let covered = 0;
    let [s, e] = spans[0];
    for (let k = 1; k < spans.length; k++) {
      const [ps, pe] = spans[k];
      if (ps > e) {
        covered += e - s;
        s = ps;
        e = pe;
      } else if (pe > e) e = pe;
    }
    covered += e - s;
    area += covered * (xb - xa);
  }
  return area;
}

/** Area of `rect` covered by the union of `boxes` (exact; see unionArea). */
export function areaInsideUnion(rect: ImageRect, boxes: readonly ImageRect[]): number {
  const parts: ImageRect[] = [];
  for (const b of boxes) {
    const p = intersectRects(rect, b);
    if (p !== undefined) parts.push(p);
  }
  return unionArea(parts);
}

/** Rectangles as edge arrays: x0 = x, y0 = y, x1 = x + w, y1 = y + h (the same sums as ImageRect users). */
export interface RectEdges {
  readonly x0: Float64Array;
  readonly y0: Float64Array;
  readonly x1: Float64Array;
  readonly y1: Float64Array;
}

/** The edges of each rectangle, for loops over many rectangles (see RectEdges). */
export function rectEdges(rects: readonly ImageRect[]): RectEdges {
  const n = rects.length;
  const x0 = new Float64Array(n);
  const y0 = new Float64Array(n);
  const x1 = new Float64Array(n);
  const y1 = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const r = rects[i];
    x0[i] = r.x;
    y0[i] = r.y;
    x1[i] = r.x + r.w;
    y1[i] = r.y + r.h;
  }
  return { x0, y0, x1, y1 };
}

/** For each rectangle, the area of it covered by the union of the boxes (see areaInsideUnion). */
export function coveredAreas(rects: readonly ImageRect[], boxes: readonly ImageRect[]): Float64Array {
  const out = new Float64Array(rects.length);
  coveredAreasInto(rects, rectEdges(rects), boxes, out);
  return out;
}

/**
 * As coveredAreas, written into `out` (one value per rectangle), with `edges` = rectEdges(rects)
 * computed once for many calls. The same numbers as areaInsideUnion: a rectangle that meets one
 * box gets the area of that intersection, one that meets several goes through unionArea.
 */
export function coveredAreasInto(
  rects: readonly ImageRect[],
  edges: RectEdges,
  boxes: readonly ImageRect[],
  out: Float64Array,
): void {
  const { x0, y0, x1, y1 } = edges;
  const nb = boxes.length;
  for (let i = 0; i < rects.length; i++) {
    let area = 0;
    let parts = 0;
    for (let k = 0; k < nb; k++) {
      const b = boxes[k];
      // intersectRects' expressions, so a single part has exactly areaInsideUnion's area.
      const ax = Math.max(x0[i], b.x);
      const ay = Math.max(y0[i], b.y);
      const bx = Math.min(x1[i], b.x + b.w);
      const by = Math.min(y1[i], b.y + b.h);
      if (bx > ax && by > ay) {
        parts++;
        area = (bx - ax) * (by - ay);
      }
    }
    out[i] = parts > 1 || !Number.isFinite(area) ? areaInsideUnion(rects[i], boxes) : area;
  }
}

/** Inclusive range of pixel indices [first, last] along both axes; empty when last < first. */
export interface PixelRange {
  readonly firstX: number;
  readonly lastX: number;
  readonly firstY: number;
  readonly lastY: number;
}

// One rectangle: the general count below with its bands written out (at most three, only the
// middle one covered), so the result is the same to the last pixel without its allocations.
function countPixelCentresInRect(r: ImageRect, range: PixelRange, tolerancePx: number): number {
  const x = r.x - tolerancePx;
  const y = r.y - tolerancePx;
  const w = r.w + 2 * tolerancePx;
  const h = r.h + 2 * tolerancePx;
  if (!(w >= 0 && h >= 0) || range.lastX < range.firstX) return 0;
  const a = Math.max(range.firstX, Math.ceil(x - 0.5));
  const b = Math.min(range.lastX, Math.floor(x + w - 0.5));
  const inRow = b >= a ? b - a + 1 : 0;
  if (inRow === 0) return 0;
  const end = range.lastY + 1;
  let lo = Math.ceil(y - 0.5);
  let hi = Math.floor(y + h - 0.5) + 1;
  if (!(lo > range.firstY && lo <= range.lastY)) lo = range.firstY;
  if (!(hi > range.firstY && hi <= range.lastY)) hi = end;
  const yEnd = y + h;
  let count = 0;
  // Bands [firstY, lo), [lo, hi), [hi, end) (or fewer when cuts coincide), each judged by its first row.
  const cuts = lo <= hi ? [range.firstY, lo, hi, end] : [range.firstY, hi, lo, end];
  for (let k = 0; k < 3; k++) {
    const from = cuts[k];
    const to = cuts[k + 1];
    if (to <= from) continue;
    const yc = from + 0.5;
    if (yc >= y && yc <= yEnd) count += inRow * (to - from);
  }
  return count;
}

/**
 * Number of pixels in the range whose centre (px + 0.5, py + 0.5) lies in the union of the
 * rectangles, each enlarged by tolerancePx, with the same closed test as pointInRect. Exact: per
 * pixel row the covering x intervals are merged and their pixel centres counted.
 */
export function countPixelCentresInUnion(
  rects: readonly ImageRect[],
  range: PixelRange,
  tolerancePx = 0,
): number {
  checkTolerance(tolerancePx);
  if (rects.length === 1) return countPixelCentresInRect(rects[0], range, tolerancePx);
  const rs = rects.map((r) => enlargeRect(r, tolerancePx)).filter((r) => r.w >= 0 && r.h >= 0);
  if (rs.length === 0 || range.lastX < range.firstX) return 0;
  // Rows between consecutive box edges are covered by the same boxes: count one row per band.
  const cuts = new Set<number>([range.firstY, range.lastY + 1]);
  for (const r of rs) {
    for (const py of [Math.ceil(r.y - 0.5), Math.floor(r.y + r.h - 0.5) + 1]) {
      if (py > range.firstY && py <= range.lastY) cuts.add(py);
    }
  }
  const bands = Array.from(cuts).sort((p, q) => p - q);
  const spans: [number, number][] = [];
  let count = 0;
  for (let bi = 0; bi + 1 < bands.length; bi++) {
    const yc = bands[bi] + 0.5;
    spans.length = 0;
    for (const r of rs) if (yc >= r.y && yc <= r.y + r.h) spans.push([r.x, r.x + r.w]);
    if (spans.length === 0) continue;
    spans.sort((p, q) => p[0] - q[0]);
    let inRow = 0;
    let [s, e] = spans[0];
    for (let k = 1; k <= spans.length; k++) {
      if (k < spans.length && spans[k][0] <= e) {
        if (spans[k][1] > e) e = spans[k][1];
        continue;
      }
      // Pixel centres in the closed interval [s, e]: px + 0.5 in [s, e], px within the range.
      const a = Math.max(range.firstX, Math.ceil(s - 0.5));
      const b = Math.min(range.lastX, Math.floor(e - 0.5));
      if (b >= a) inRow += b - a + 1;
      if (k < spans.length) [s, e] = spans[k];
    }
    count += inRow * (bands[bi + 1] - bands[bi]);
  }
  return count;
}

/** Whether validateImageBox finds no problem with the box, without building any message. */
export function isValidImageBox(box: ImageRect, imageSize: Size): boolean {
  const { x, y, w, h } = box;
  return (
    Number.isFinite(x) && Number.isFinite(y) && Number.isFinite(w) && Number.isFinite(h) &&
    w > 0 && h > 0 && x >= 0 && y >= 0 && x + w <= imageSize.width && y + h <= imageSize.height
  );
}

/**
 * Problems with a reference box in original image pixels, as messages (empty when the box is
 * valid): coordinates that are not finite numbers, zero or negative width or height, and any
 * part outside the image [0, width] x [0, height].
 */
export function validateImageBox(box: ImageRect, imageSize: Size): string[] {
  const problems: string[] = [];
  for (const key of ['x', 'y', 'w', 'h'] as const) {
    if (!Number.isFinite(box[key])) problems.push(`box '${key}' must be a finite number; got ${box[key]}`);
  }
  if (problems.length > 0) return problems;
  if (box.w <= 0) problems.push(`box 'w' must be > 0 (zero or negative area); got ${box.w}`);
  if (box.h <= 0) problems.push(`box 'h' must be > 0 (zero or negative area); got ${box.h}`);
  const { width, height } = imageSize;
  if (box.x < 0) problems.push(`box lies outside the image: left edge x = ${box.x} < 0`);
  if (box.y < 0) problems.push(`box lies outside the image: top edge y = ${box.y} < 0`);
  if (box.x + box.w > width) {
    problems.push(`box lies outside the image: right edge x + w = ${box.x + box.w} > image width ${width}`);
  }
  if (box.y + box.h > height) {
    problems.push(`box lies outside the image: bottom edge y + h = ${box.y + box.h} > image height ${height}`);
  }
  return problems;
}
