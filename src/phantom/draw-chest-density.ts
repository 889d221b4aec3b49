import type { Rng } from '../core/seeded-random';
import { boxBlur } from './box-blur';
import { diaphragmRow, lateralOffset, type ChestGeometry, type LungShape } from './chest-geometry';
import { strokeSegment } from './stroke-segment';
import { valueNoise } from './value-noise';

/** Masks of the normal anatomy, each size * size. */
export interface AnatomyMasks {
  readonly right: Uint8Array;
  readonly left: Uint8Array;
  readonly heart: Uint8Array;
}

const uniform = (rng: Rng, lo: number, hi: number): number => lo + (hi - lo) * rng.next();
const smoothstep = (a: number, b: number, v: number): number => {
  const t = Math.min(1, Math.max(0, (v - a) / (b - a)));
  return t * t * (3 - 2 * t);
};

/** Half-width of the body (soft tissue outline) at row y: neck, shoulders, then chest wall. */
export function bodyHalfWidth(g: ChestGeometry, y: number): number {
  const top = Math.min(g.right.top, g.left.top);
  const neck = g.size * 0.1;
  const w = neck + (g.bodyHalfWidth - neck) * smoothstep(top - g.size * 0.1, top + g.size * 0.03, y);
  return w * (1 - 0.04 * smoothstep(g.size * 0.85, g.size, y));
}

/**
 * Soft-tissue path length (0..1) through an elliptical chest at each pixel: the base of the
 * attenuation map. Arms show as columns beside the chest wall.
 */
export function drawSoftTissue(g: ChestGeometry): Float32Array {
  const n = g.size;
  const out = new Float32Array(n * n);
  const top = Math.min(g.right.top, g.left.top);
  for (let y = 0; y < n; y++) {
    const hw = bodyHalfWidth(g, y + 0.5);
    const armOn = smoothstep(top - n * 0.05, top + n * 0.04, y + 0.5) * (1 - smoothstep(n * 0.55, n * 0.75, y + 0.5));
    for (let x = 0; x < n; x++) {
      const d = Math.abs(x + 0.5 - g.cx);
      let v = 0;
      if (d < hw) v = Math.sqrt(1 - (d / hw) ** 2);
      const a = (d - hw - n * 0.02) / (n * 0.07);
      if (armOn > 0 && a > -1 && a < 1) v = Math.max(v, 0.55 * armOn * Math.sqrt(1 - a * a));
      out[y * n + x] = v;
    }
  }
  return out;
}

/**
 * Pulmonary vessels as branching trees from each hilum, thinning and fading towards the
 * periphery. gain (optional, size * size) scales the vessels locally, e.g. congestion.
 */
export function drawVessels(rng: Rng, g: ChestGeometry, gain?: Float32Array): Float32Array {
  const n = g.size;
  const buf = new Float32Array(n * n);
  const k = n / 256;
  const grow = (x: number, y: number, angle: number, len: number, radius: number, amp: number, depth: number): void => {
    let px = x, py = y, a = angle;
    // A vessel is a gently curving chain of short segments.
    for (let s = 0; s < 3; s++) {
      a += rng.normal() * 0.12;
      const qx = px + (Math.cos(a) * len) / 3, qy = py + (Math.sin(a) * len) / 3;
      const gi = Math.min(n - 1, Math.max(0, Math.floor(py))) * n + Math.min(n - 1, Math.max(0, Math.floor(px)));
      const gv = gain ? 1 + gain[gi] : 1;
      strokeSegment(buf, n, { x0: px, y0: py, x1: qx, y1: qy }, radius * 0.35 * gv, Math.max(0.45, radius * 0.5), amp * Math.min(1.8, gv));
      px = qx;
      py = qy;
    }
    if (depth <= 0) return;
    const branches = 2 + (rng.next() < 0.25 ? 1 : 0);
    for (let b = 0; b < branches; b++) {
      const turn = (b - (branches - 1) / 2) * uniform(rng, 0.4, 0.75) + rng.normal() * 0.15;
      grow(px, py, a + turn, len * uniform(rng, 0.6, 0.78), radius * 0.7, amp * 0.78, depth - 1);
    }
  };
  for (const lung of [g.right, g.left]) {
    const h = lung.side === 'right' ? g.hila.right : g.hila.left;
    const trunks = 6 + rng.int(3);
    for (let i = 0; i < trunks; i++) {
      // Fan out from straight up (-pi/2) through lateral to straight down (+pi/2), mirrored per side.
      const a = -Math.PI * 0.42 + (Math.PI * 0.9 * (i + uniform(rng, 0.2, 0.8))) / trunks;
      const angle = lung.sign > 0 ? a : Math.PI - a;
      const len = (lung.base - lung.top) * uniform(rng, 0.09, 0.13);
      grow(h.x, h.y, angle, len, 2 * k, uniform(rng, 0.08, 0.11), 4);
    }
  }
  return buf;
}

function drawRibs(rng: Rng, g: ChestGeometry, out: Float32Array): void {
  const n = g.size;
  for (const lung of [g.right, g.left]) {
    const h = lung.base - lung.top;
    const count = 10;
    const spacing = (h * uniform(rng, 0.95, 1.05)) / 9.2;
    const thick = n * uniform(rng, 0.024, 0.03);
    const reach = g.mediastinumHalfWidth + lung.width + n * 0.03;
    const start = n * 0.025;
    for (let r = 0; r < count; r++) {
      const y0 = lung.top - n * 0.035 + r * spacing * (1 + r * 0.012);
      const rise = n * uniform(rng, 0.03, 0.045);
      const drop = n * uniform(rng, 0.12, 0.16) * (0.7 + r * 0.04);
      const amp = uniform(rng, 0.09, 0.13);
      for (let d = start; d < reach; d += 1) {
        const u = (d - start) / (reach - start);
        const yc = y0 - rise * Math.sin(Math.PI * Math.min(1, u * 1.3)) + drop * u * u;
        const x = Math.floor(g.cx + lung.sign * d);
        if (x < 0 || x >= n) continue;
        const fade = smoothstep(0, 0.08, u) * (1 - 0.4 * smoothstep(0.85, 1, u));
        addBand(out, n, x, yc, thick * (1 - 0.15 * u), amp * fade);
      }
      // Anterior rib: fainter, running down towards the midline from the lateral wall.
      const ay = y0 + spacing * 1.5 + n * 0.04;
      for (let d = reach * 0.35; d < reach * 0.95; d += 1) {
        const u = (d - reach * 0.35) / (reach * 0.6);
        const yc = ay - n * 0.1 * u + n * 0.03 * u * u;
        const x = Math.floor(g.cx + lung.sign * d);
        if (x < 0 || x >= n) continue;
        addBand(out, n, x, yc, thick * 0.85, amp * 0.35 * smoothstep(0, 0.2, u));
      }
    }
  }
}

/** Adds a bone band of a column: brighter cortex at both edges, softer medulla between. */
function addBand(out: Float32Array, n: number, x: number, yTop: number, thick: number, amp: number): void {
  const y0 = Math.max(0, Math.floor(yTop)), y1 = Math.min(n - 1, Math.ceil(yTop + thick));
  for (let y = y0; y <= y1; y++) {
    const v = (y + 0.5 - yTop) / thick;
    if (v < 0 || v > 1) continue;
    const edge = Math.abs(2 * v - 1);
    out[y * n + x] += amp * (0.6 + 0.4 * edge ** 4) * smoothstep(0, 0.12, Math.min(v, 1 - v));
  }
}

function drawClavicles(rng: Rng, g: ChestGeometry, out: Float32Array): void {
  const n = g.size;
  const top = Math.min(g.right.top, g.left.top);
  for (const sign of [-1, 1]) {
    const ys = top + n * uniform(rng, 0.03, 0.06);
    const lift = n * uniform(rng, 0.045, 0.075);
    const thick = n * uniform(rng, 0.022, 0.03);
    const from = n * 0.035, to = n * uniform(rng, 0.28, 0.33);
    for (let d = from; d < to; d += 1) {
      const u = (d - from) / (to - from);
      const yc = ys - lift * u + n * 0.012 * Math.sin(Math.PI * 2 * u);
      const x = Math.floor(g.cx + sign * d);
      if (x >= 0 && x < n) addBand(out, n, x, yc, thick * (1 + 0.3 * (1 - u)), 0.36);
    }
  }
}

function drawSpine(rng: Rng, g: ChestGeometry, out: Float32Array): void {
  const n = g.size;
  const half = n * uniform(rng, 0.038, 0.046);
  const period = n * uniform(rng, 0.042, 0.05);
  const phase = rng.next() * period;
  for (let y = 0; y < n; y++) {
    const scale = 0.9 + 0.2 * (y / n);
    const w = half * scale;
    const disc = 0.75 + 0.25 * smoothstep(0.1, 0.3, Math.abs((((y + phase) / (period * scale)) % 1) - 0.5));
    for (let x = Math.max(0, Math.floor(g.cx - w - 2)); x <= Math.min(n - 1, Math.ceil(g.cx + w + 2)); x++) {
      const v = Math.abs(x + 0.5 - g.cx) / w;
      if (v >= 1) continue;
      // Pedicles make the lateral edges of each body denser.
      out[y * n + x] += 0.14 * disc * (0.85 + 0.15 * smoothstep(0.6, 0.9, v)) * (1 - smoothstep(0.55, 1, v));
    }
  }
}

/**
 * Attenuation map of a normal chest before findings, size * size, in arbitrary path-length
 * units (0 = air outside the body, about 1 = full soft tissue, higher for bone and heart).
 * vessels is the map from drawVessels, already cleared where a pneumothorax removes markings;
 * fill (optional) is the share of lung air replaced by fluid or tissue at each pixel.
 */
export function drawChestDensity(
  rng: Rng,
  g: ChestGeometry,
  masks: AnatomyMasks,
  soft: Float32Array,
  vessels: Float32Array,
  fill?: Float32Array,
): Float32Array {
  const n = g.size;
  const out = new Float32Array(n * n);
  const lungSoft = new Float32Array(n * n);
  for (let i = 0; i < lungSoft.length; i++) lungSoft[i] = masks.right[i] | masks.left[i];
  const lungBlur = boxBlur(lungSoft, n, Math.max(1, Math.round(n / 200)), 2);
  const heartBlur = boxBlur(Float32Array.from(masks.heart), n, Math.max(1, Math.round(n / 180)), 2);
  const blurRadius = Math.max(1, Math.round(n / 200));
  const fillBlur = fill ? boxBlur(fill, n, blurRadius, 2) : undefined;
  const air = uniform(rng, 0.68, 0.78);
  const texture = valueNoise(rng, n, 24);
  for (let y = 0; y < n; y++) {
    for (let x = 0; x < n; x++) {
      const i = y * n + x;
      const t = soft[i];
      const l = lungBlur[i];
      // Lung bases are overlain by more soft tissue (diaphragm curvature), apices by muscle.
      const lungAir = air * (1 - 0.12 * smoothstep(0.7, 1, y / n) - 0.1 * (1 - smoothstep(0.1, 0.25, y / n)));
      const kept = fillBlur ? 1 - fillBlur[i] : 1;
      out[i] = t * (1 - l * lungAir * kept * (1 + 0.04 * texture[i])) + l * t * vessels[i] * (0.4 + 0.6 * kept) + 0.07 * heartBlur[i] * t;
    }
  }
  drawBelowDiaphragm(rng, g, soft, out);
  drawMediastinalAir(g, out);
  drawHila(g, out, lungBlur);
  drawSpine(rng, g, out);
  drawRibs(rng, g, out);
  drawClavicles(rng, g, out);
  return out;
}

function drawBelowDiaphragm(rng: Rng, g: ChestGeometry, soft: Float32Array, out: Float32Array): void {
  const n = g.size;
  const bubble = { x: g.cx + g.left.width * uniform(rng, 0.35, 0.55) + g.mediastinumHalfWidth, r: n * uniform(rng, 0.025, 0.045) };
  const rowBelow = (lung: LungShape, d: number): number => {
    const m = g.mediastinumHalfWidth;
    const p = (d - m) / Math.max(1, lateralOffset(g, lung, lung.base) - m);
    return diaphragmRow(lung, Math.min(1, Math.max(0, p)));
  };
  for (let x = 0; x < n; x++) {
    const dx = x + 0.5 - g.cx;
    const lung = dx < 0 ? g.right : g.left;
    // Blend the two domes across the midline so the abdomen has no seam under the heart.
    const w = smoothstep(-g.mediastinumHalfWidth, g.mediastinumHalfWidth, dx);
    const yd = (1 - w) * rowBelow(g.right, Math.abs(dx)) + w * rowBelow(g.left, Math.abs(dx));
    for (let y = Math.max(0, Math.floor(yd)); y < n; y++) {
      const i = y * n + x;
      // The liver under the right dome and the gastric bubble under the left one.
      out[i] += soft[i] * 0.12 * smoothstep(yd, yd + n * 0.02, y + 0.5);
      if (lung.side === 'left') {
        const bx = (x + 0.5 - bubble.x) / (bubble.r * 1.4), by = (y + 0.5 - (yd + bubble.r * 1.1)) / bubble.r;
        const b = bx * bx + by * by;
        if (b < 1) out[i] -= soft[i] * 0.32 * (1 - b);
      }
    }
  }
}

function drawMediastinalAir(g: ChestGeometry, out: Float32Array): void {
  const n = g.size;
  const air = new Float32Array(n * n);
  const carina = { x: g.cx + n * 0.004, y: Math.min(g.right.top, g.left.top) + n * 0.2 };
  strokeSegment(air, n, { x0: g.cx, y0: 0, x1: carina.x, y1: carina.y }, n * 0.012, n * 0.004, 0.22);
  strokeSegment(air, n, { x0: carina.x, y0: carina.y, x1: g.hila.right.x, y1: g.hila.right.y }, n * 0.006, n * 0.003, 0.15);
  strokeSegment(air, n, { x0: carina.x, y0: carina.y, x1: g.hila.left.x, y1: g.hila.left.y }, n * 0.006, n * 0.003, 0.15);
  for (let i = 0; i < out.length; i++) out[i] -= air[i];
}

function drawHila(g: ChestGeometry, out: Float32Array, lungBlur: Float32Array): void {
  const n = g.size;
  const r = n * 0.036;
  for (const h of [g.hila.right, g.hila.left]) {
    for (let y = Math.max(0, Math.floor(h.y - 3 * r)); y < Math.min(n, h.y + 3 * r); y++) {
      for (let x = Math.max(0, Math.floor(h.x - 3 * r)); x < Math.min(n, h.x + 3 * r); x++) {
        const d2 = ((x + 0.5 - h.x) ** 2 + ((y + 0.5 - h.y) / 1.6) ** 2) / (r * r);
        out[y * n + x] += 0.3 * Math.exp(-d2) * lungBlur[y * n + x];
      }
    }
  }
}
