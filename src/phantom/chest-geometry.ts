import type { Rng } from '../core/seeded-random';

export type Side = 'right' | 'left';

/** One lung in the upright drawing frame; 'right' is the patient's right, drawn on the image's left. */
export interface LungShape {
  readonly side: Side;
  readonly sign: -1 | 1; // direction from the midline in image x
  readonly top: number; // apex row, pixels
  readonly base: number; // costophrenic angle row, pixels
  readonly domeHeight: number; // rise of the hemidiaphragm dome above the angle, pixels
  readonly width: number; // lateral reach beyond the mediastinum at full width, pixels
}

/** Everything the drawing needs about one synthetic chest, in pixels of the upright frame. */
export interface ChestGeometry {
  readonly size: number;
  readonly cx: number;
  readonly bodyHalfWidth: number;
  readonly mediastinumHalfWidth: number;
  readonly right: LungShape;
  readonly left: LungShape;
  /** A tilted ellipse (semi-axes a >= b, long axis turned by tilt radians, apex towards the image's lower right), cut at bottom. */
  readonly heart: { readonly cx: number; readonly cy: number; readonly a: number; readonly b: number; readonly tilt: number; readonly bottom: number };
  readonly knob: { readonly x: number; readonly y: number; readonly r: number };
  readonly hila: Readonly<Record<Side, { readonly x: number; readonly y: number }>>;
  readonly ctrTarget: number;
}

const uniform = (rng: Rng, lo: number, hi: number): number => lo + (hi - lo) * rng.next();

/**
 * Draws the shape parameters of one chest: body width, lung apices and bases (the right
 * hemidiaphragm usually higher, common practice), mediastinum, heart sized to a target
 * cardiothoracic ratio (normal < 0.5, enlarged > 0.5, common practice), aortic knob and hila.
 */
export function sampleChestGeometry(rng: Rng, size: number, { enlargedHeart = false } = {}): ChestGeometry {
  const s = size;
  const cx = s * (0.5 + uniform(rng, -0.015, 0.015));
  const bodyHalfWidth = s * uniform(rng, 0.40, 0.44);
  const mediastinumHalfWidth = s * uniform(rng, 0.05, 0.065);
  const top = s * uniform(rng, 0.1, 0.15);
  const leftBase = s * uniform(rng, 0.76, 0.84);
  const rightHigher = rng.next() < 0.85;
  const rightBase = leftBase + s * (rightHigher ? -uniform(rng, 0.01, 0.045) : uniform(rng, 0, 0.015));
  const wall = s * uniform(rng, 0.03, 0.05);
  const width = bodyHalfWidth - mediastinumHalfWidth - wall;
  const lung = (side: Side, base: number): LungShape => ({
    side,
    sign: side === 'right' ? -1 : 1,
    top: top + s * uniform(rng, -0.008, 0.008),
    base,
    domeHeight: s * uniform(rng, 0.07, 0.1),
    width: width * uniform(rng, 0.96, 1.02),
  });
  const right = lung('right', rightBase);
  const left = lung('left', leftBase);
  const thoracic = 2 * mediastinumHalfWidth + right.width + left.width;
  const ctrTarget = enlargedHeart ? uniform(rng, 0.55, 0.66) : uniform(rng, 0.39, 0.47);
  const heartWidth = ctrTarget * thoracic;
  const rightShare = uniform(rng, 0.3, 0.38);
  const tilt = uniform(rng, 0.45, 0.7);
  const ratio = uniform(rng, 0.68, 0.8);
  // Widest horizontal extent of a tilted ellipse is 2 * sqrt(a^2 cos^2 + b^2 sin^2).
  const a = heartWidth / 2 / Math.sqrt(Math.cos(tilt) ** 2 + ratio * ratio * Math.sin(tilt) ** 2);
  const b = a * ratio;
  const bottom = left.base - left.domeHeight * 0.75;
  const vertical = Math.sqrt(a * a * Math.sin(tilt) ** 2 + b * b * Math.cos(tilt) ** 2);
  const heart = { cx: cx + heartWidth * (0.5 - rightShare), cy: bottom - vertical * uniform(rng, 0.6, 0.72), a, b, tilt, bottom };
  const knob = { x: cx + mediastinumHalfWidth + s * 0.005, y: top + s * uniform(rng, 0.1, 0.13), r: s * uniform(rng, 0.025, 0.035) };
  const hilumY = (l: LungShape): number => l.top + (l.base - l.top) * uniform(rng, 0.33, 0.4);
  const hila = {
    right: { x: cx - mediastinumHalfWidth - s * 0.025, y: hilumY(right) },
    left: { x: cx + mediastinumHalfWidth + s * 0.025, y: hilumY(left) - s * 0.01 },
  };
  return { size, cx, bodyHalfWidth, mediastinumHalfWidth, right, left, heart, knob, hila, ctrTarget };
}

/** Image-x extent [x0, x1] of the heart's silhouette at row y, or undefined outside it. */
export function heartRow(g: ChestGeometry, y: number): [number, number] | undefined {
  const h = g.heart;
  if (y > h.bottom) return undefined;
  const c = Math.cos(h.tilt), s = Math.sin(h.tilt);
  const dy = y - h.cy;
  const ia = 1 / (h.a * h.a), ib = 1 / (h.b * h.b);
  // Row through a tilted ellipse: A dx^2 + B dx + C = 0.
  const qa = c * c * ia + s * s * ib;
  const qb = 2 * dy * s * c * (ia - ib);
  const qc = dy * dy * (s * s * ia + c * c * ib) - 1;
  const disc = qb * qb - 4 * qa * qc;
  if (disc <= 0) return undefined;
  const r = Math.sqrt(disc);
  return [h.cx + (-qb - r) / (2 * qa), h.cx + (-qb + r) / (2 * qa)];
}

/** Distance from the midline to the lung's medial border at row y (mediastinum, heart, knob). */
export function medialOffset(g: ChestGeometry, lung: LungShape, y: number): number {
  let m = g.mediastinumHalfWidth;
  const row = heartRow(g, y);
  if (row) m = Math.max(m, lung.sign < 0 ? g.cx - row[0] : row[1] - g.cx);
  if (lung.side === 'left') {
    const v = (y - g.knob.y) / g.knob.r;
    if (v * v < 1) m = Math.max(m, g.knob.x - g.cx + g.knob.r * Math.sqrt(1 - v * v) * 0.8);
  }
  return m;
}

/** Distance from the midline to the lung's lateral border at row y; the apex narrows. */
export function lateralOffset(g: ChestGeometry, lung: LungShape, y: number): number {
  const t = (y - lung.top) / (lung.base - lung.top);
  const u = Math.min(1, Math.max(0, t / 0.55));
  const f = 0.3 + 0.7 * Math.sqrt(1 - (1 - u) * (1 - u));
  return g.mediastinumHalfWidth + lung.width * f;
}

export interface LungPoint {
  readonly inside: boolean;
  readonly p: number; // 0 at the medial border, 1 at the lateral one
  readonly t: number; // 0 at the apex row, 1 at the costophrenic angle
}

/**
 * Where a pixel sits in a lung (see LungPoint); inside is false outside the lung field. The
 * returned function caches the borders of the last row it saw, so scan rows in order.
 */
export function lungSampler(g: ChestGeometry, lung: LungShape): (x: number, y: number) => LungPoint {
  let rowY = Number.NaN, m = 0, l = 0;
  return (x, y) => {
    const t = (y - lung.top) / (lung.base - lung.top);
    if (t < 0 || t > 1) return { inside: false, p: 0, t };
    if (y !== rowY) {
      rowY = y;
      m = medialOffset(g, lung, y);
      l = lateralOffset(g, lung, y);
    }
    const d = lung.sign * (x - g.cx);
    const p = (d - m) / Math.max(1e-6, l - m);
    if (l <= m || p < 0 || p > 1) return { inside: false, p, t };
    const apex = lung.top + g.size * 0.045 * ((p - 0.55) / 0.55) ** 2;
    if (y < apex) return { inside: false, p, t };
    return { inside: y <= diaphragmRow(lung, p), p, t };
  };
}

/** Row of the hemidiaphragm at lung fraction p: a dome peaking a third of the way out, lowest laterally. */
export function diaphragmRow(lung: LungShape, p: number): number {
  const q = (p - 0.35) / 0.65;
  return lung.base - lung.domeHeight * Math.sqrt(Math.max(0, 1 - q * q));
}

/** Binary mask of one lung field (pixel centres), size * size. */
export function rasterLung(g: ChestGeometry, lung: LungShape): Uint8Array {
  const n = g.size;
  const out = new Uint8Array(n * n);
  const y0 = Math.max(0, Math.floor(lung.top)), y1 = Math.min(n - 1, Math.ceil(lung.base));
  const at = lungSampler(g, lung);
  for (let y = y0; y <= y1; y++) {
    for (let x = 0; x < n; x++) if (at(x + 0.5, y + 0.5).inside) out[y * n + x] = 1;
  }
  return out;
}

/** Binary mask of the cardiac silhouette above the diaphragm, size * size. */
export function rasterHeart(g: ChestGeometry): Uint8Array {
  const n = g.size;
  const out = new Uint8Array(n * n);
  const h = g.heart;
  const reach = Math.max(h.a, h.b);
  for (let y = Math.max(0, Math.floor(h.cy - reach)); y <= Math.min(n - 1, Math.ceil(h.bottom)); y++) {
    const row = heartRow(g, y + 0.5);
    if (!row) continue;
    const x0 = Math.max(0, Math.ceil(row[0] - 0.5)), x1 = Math.min(n - 1, Math.floor(row[1] - 0.5));
    for (let x = x0; x <= x1; x++) out[y * n + x] = 1;
  }
  return out;
}
