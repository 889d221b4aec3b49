import type { Rng } from '../core/seeded-random';
import { boxBlur } from './box-blur';
import { diaphragmRow, lungSampler, lateralOffset, medialOffset, type ChestGeometry, type LungShape } from './chest-geometry';
import type { AnatomyMasks } from './draw-chest-density';
import type { ZoneRow } from './zone-names';
import type { FindingPlan } from './plan-findings';
import { strokeSegment } from './stroke-segment';
import { valueNoise } from './value-noise';

export type { FindingKind, FindingPlan } from './plan-findings';

/** A drawn finding with its ground-truth mask (upright frame, size * size). */
export interface DrawnFinding extends FindingPlan {
  readonly mask: Uint8Array;
}

/**
 * What the findings change: fill (0..1, the share of lung air replaced by fluid or tissue), added
 * attenuation (pneumothorax air and pleural line), vessel gain (congestion), and where vessels vanish.
 */
export interface FindingLayers {
  readonly fill: Float32Array;
  readonly delta: Float32Array;
  readonly vesselGain: Float32Array;
  readonly vesselClear: Uint8Array;
  readonly findings: readonly DrawnFinding[];
}

const uniform = (rng: Rng, lo: number, hi: number): number => lo + (hi - lo) * rng.next();
const smoothstep = (a: number, b: number, v: number): number => {
  const t = Math.min(1, Math.max(0, (v - a) / (b - a)));
  return t * t * (3 - 2 * t);
};

/** Row range [y0, y1) of one zone row of a lung in the upright frame (thirds of its height). */
function rowBand(lung: LungShape, row: ZoneRow): [number, number] {
  const h = (lung.base - lung.top) / 3;
  const k = row === 'upper' ? 0 : row === 'middle' ? 1 : 2;
  return [lung.top + k * h, lung.top + (k + 1) * h];
}

/** Image x at lung fraction p (0 medial, 1 lateral) on row y. */
function xAt(g: ChestGeometry, lung: LungShape, y: number, p: number): number {
  const m = medialOffset(g, lung, y), l = lateralOffset(g, lung, y);
  return g.cx + lung.sign * (m + p * (l - m));
}

/**
 * A point in a lung's zone row: row fraction and lung fraction drawn from the given ranges, kept
 * only when it and four points `margin` away all lie in the lung field (lower zones dip under
 * the dome medially). After 40 tries the row's lateral middle is used, which always lies inside.
 */
function placeInLung(
  rng: Rng,
  g: ChestGeometry,
  lung: LungShape,
  band: [number, number],
  rows: [number, number],
  across: [number, number],
  margin: number,
): { x: number; y: number } {
  const inside = lungSampler(g, lung);
  const ok = (x: number, y: number): boolean =>
    [[0, 0], [margin, 0], [-margin, 0], [0, margin], [0, -margin]].every(([dx, dy]) => inside(x + dx, y + dy).inside);
  for (let k = 0; k < 40; k++) {
    const y = band[0] + (band[1] - band[0]) * uniform(rng, rows[0], rows[1]);
    const x = xAt(g, lung, y, uniform(rng, across[0], across[1]));
    if (ok(x, y)) return { x, y };
  }
  const y = band[0] + (band[1] - band[0]) * 0.35;
  return { x: xAt(g, lung, y, 0.6), y };
}

/**
 * Draws the planned findings into layers over the normal anatomy. Each finding's mask is the
 * region it changes, clipped to its lung field; soft is the soft-tissue map (drawSoftTissue).
 */
export function drawFindings(rng: Rng, g: ChestGeometry, plans: readonly FindingPlan[], masks: AnatomyMasks, soft: Float32Array): FindingLayers {
  const n = g.size;
  const fill = new Float32Array(n * n);
  const delta = new Float32Array(n * n);
  const vesselGain = new Float32Array(n * n);
  const vesselClear = new Uint8Array(n * n);
  const findings: DrawnFinding[] = [];
  for (const plan of plans) {
    const lungs = plan.side === 'both' ? [g.right, g.left] : [plan.side === 'right' ? g.right : g.left];
    const mask = new Uint8Array(n * n);
    for (const lung of lungs) {
      const lungMask = lung.side === 'right' ? masks.right : masks.left;
      const field = new Float32Array(n * n);
      switch (plan.kind) {
        case 'consolidation': drawConsolidation(rng, g, lung, plan, field); break;
        case 'nodule': drawNodule(rng, g, lung, plan, field); break;
        case 'atelectasis': drawAtelectasis(rng, g, lung, plan, field); break;
        case 'effusion': drawEffusion(rng, g, lung, plan, field); break;
        case 'pneumothorax': drawPneumothorax(rng, g, lung, plan, field, lungMask, vesselClear, delta, soft); break;
        case 'edema': drawEdema(rng, g, lung, plan, field, vesselGain); break;
        default: break;
      }
      for (let i = 0; i < field.length; i++) {
        if (lungMask[i] === 0 || field[i] <= 0) continue;
        if (field[i] >= 0.5) mask[i] = 1;
        if (plan.kind !== 'pneumothorax') fill[i] = Math.max(fill[i], Math.min(1, field[i] * amplitude(plan)));
      }
    }
    findings.push({ ...plan, mask });
  }
  return { fill, delta, vesselGain, vesselClear, findings };
}

/** Peak share of lung air each finding replaces. */
function amplitude(plan: FindingPlan): number {
  switch (plan.kind) {
    case 'consolidation': return 0.78;
    case 'nodule': return 0.82;
    case 'atelectasis': return 0.7;
    case 'effusion': return 1;
    case 'edema': return [0, 0.14, 0.3, 0.66][plan.severity] ?? 0.6;
    default: return 0;
  }
}

function drawConsolidation(rng: Rng, g: ChestGeometry, lung: LungShape, plan: FindingPlan, field: Float32Array): void {
  const n = g.size;
  const [b0, b1] = rowBand(lung, plan.row);
  const big = plan.severity >= 2;
  const { x: cx, y: cy } = placeInLung(rng, g, lung, [b0, b1], big ? [0.45, 0.8] : [0.35, 0.65], [0.35, 0.7], lung.width * 0.15);
  const r = lung.width * (big ? uniform(rng, 0.3, 0.4) : uniform(rng, 0.17, 0.26));
  const noise = valueNoise(rng, n, 18);
  const fine = valueNoise(rng, n, 48);
  const lobes = Array.from({ length: 4 + rng.int(3) }, () => ({
    x: cx + rng.normal() * r * 0.45,
    y: cy + rng.normal() * r * 0.45,
    r: r * uniform(rng, 0.35, 0.7),
  }));
  const y0 = Math.max(0, Math.floor(cy - 2 * r)), y1 = Math.min(n, Math.ceil(cy + 2 * r));
  const x0 = Math.max(0, Math.floor(cx - 2 * r)), x1 = Math.min(n, Math.ceil(cx + 2 * r));
  for (let y = y0; y < y1; y++) {
    for (let x = x0; x < x1; x++) {
      let w = 0;
      for (const l of lobes) w += Math.exp(-(((x + 0.5 - l.x) ** 2 + (y + 0.5 - l.y) ** 2) / (l.r * l.r)));
      const i = y * n + x;
      const v = w * (1 + 0.5 * noise[i]);
      // Patchy, fluffy texture with an ill-defined edge.
      field[i] = smoothstep(0.2, 0.85, v) * (0.75 + 0.25 * fine[i]);
    }
  }
  // Air bronchograms: dark branching lines inside the opacity.
  const bronchi = new Float32Array(n * n);
  const a0 = lung.sign > 0 ? uniform(rng, -0.4, 0.8) : Math.PI - uniform(rng, -0.4, 0.8);
  for (let k = 0; k < 3; k++) {
    const a = a0 + (k - 1) * 0.45;
    strokeSegment(bronchi, n, { x0: cx - Math.cos(a) * r * 0.5, y0: cy - Math.sin(a) * r * 0.5, x1: cx + Math.cos(a) * r * 0.6, y1: cy + Math.sin(a) * r * 0.6 }, 0.4, 0.7 * (n / 256), 0.35);
  }
  for (let i = 0; i < field.length; i++) if (field[i] > 0.5) field[i] -= bronchi[i] * field[i];
}

function drawNodule(rng: Rng, g: ChestGeometry, lung: LungShape, plan: FindingPlan, field: Float32Array): void {
  const n = g.size;
  const [b0, b1] = rowBand(lung, plan.row);
  const { x: cx, y: cy } = placeInLung(rng, g, lung, [b0, b1], [0.3, 0.7], [0.35, 0.75], n * 0.04);
  const r = n * uniform(rng, 0.014, 0.026);
  const edge = Math.max(0.8, n / 300);
  const wobble = [rng.normal() * 0.08, rng.next() * 6.283, rng.normal() * 0.06, rng.next() * 6.283];
  for (let y = Math.max(0, Math.floor(cy - 2 * r)); y < Math.min(n, cy + 2 * r); y++) {
    for (let x = Math.max(0, Math.floor(cx - 2 * r)); x < Math.min(n, cx + 2 * r); x++) {
      const dx = x + 0.5 - cx, dy = y + 0.5 - cy;
      const th = Math.atan2(dy, dx);
      const rr = r * (1 + wobble[0] * Math.cos(3 * th + wobble[1]) + wobble[2] * Math.cos(5 * th + wobble[3]));
      const d = Math.sqrt(dx * dx + dy * dy);
      // Denser centre, sharp rim.
      field[y * n + x] = (1 - smoothstep(rr - edge, rr + edge, d)) * (0.85 + 0.15 * (1 - d / rr));
    }
  }
}

function drawAtelectasis(rng: Rng, g: ChestGeometry, lung: LungShape, plan: FindingPlan, field: Float32Array): void {
  const n = g.size;
  const [b0, b1] = rowBand(lung, plan.row);
  const { x: cx, y: cy } = placeInLung(rng, g, lung, [b0, b1], [0.3, 0.65], [0.4, 0.6], n * 0.03);
  const half = lung.width * uniform(rng, 0.22, 0.32);
  // Plate-like bands run roughly horizontally, often rising laterally.
  const tilt = uniform(rng, -0.15, 0.35) * -lung.sign;
  const thick = n * uniform(rng, 0.008, 0.014);
  const buf = new Float32Array(n * n);
  strokeSegment(buf, n, { x0: cx - Math.cos(tilt) * half, y0: cy - Math.sin(tilt) * half, x1: cx + Math.cos(tilt) * half, y1: cy + Math.sin(tilt) * half }, thick, thick * 0.6, 1);
  const texture = valueNoise(rng, n, 24);
  // A band that is denser in its middle and fades towards both ends.
  const ux = Math.cos(tilt), uy = Math.sin(tilt);
  for (let i = 0; i < field.length; i++) {
    if (buf[i] === 0) continue;
    const along = Math.abs((((i % n) + 0.5 - cx) * ux + (Math.floor(i / n) + 0.5 - cy) * uy) / half);
    field[i] = buf[i] * (1 - 0.6 * smoothstep(0.6, 1.05, along)) * (0.85 + 0.15 * texture[i]);
  }
}

function drawEffusion(rng: Rng, g: ChestGeometry, lung: LungShape, plan: FindingPlan, field: Float32Array): void {
  const n = g.size;
  const h = lung.base - lung.top;
  const level = h * (plan.severity === 1 ? uniform(rng, 0.08, 0.12) : plan.severity === 2 ? uniform(rng, 0.17, 0.25) : uniform(rng, 0.33, 0.43));
  const soften = n * 0.01;
  const at = lungSampler(g, lung);
  for (let y = Math.max(0, Math.floor(lung.base - lung.domeHeight - level - soften * 2)); y < n; y++) {
    for (let x = 0; x < n; x++) {
      const c = at(x + 0.5, y + 0.5);
      if (!c.inside) continue;
      // Meniscus: fluid over the dome, climbing higher along the lateral chest wall.
      const top = diaphragmRow(lung, c.p) - level * (0.35 + 0.65 * c.p ** 1.5);
      const v = smoothstep(top - soften, top + soften, y + 0.5);
      field[y * n + x] = v * (0.88 + 0.12 * smoothstep(top, lung.base, y + 0.5));
    }
  }
}

function drawPneumothorax(
  rng: Rng,
  g: ChestGeometry,
  lung: LungShape,
  plan: FindingPlan,
  field: Float32Array,
  lungMask: Uint8Array,
  vesselClear: Uint8Array,
  delta: Float32Array,
  soft: Float32Array,
): void {
  const n = g.size;
  const h = lung.base - lung.top;
  const depth = h * (plan.severity === 1 ? uniform(rng, 0.11, 0.15) : plan.severity === 2 ? uniform(rng, 0.16, 0.22) : uniform(rng, 0.24, 0.3));
  const gap = plan.severity === 1 ? uniform(rng, 0.15, 0.2) : plan.severity === 2 ? uniform(rng, 0.22, 0.3) : uniform(rng, 0.32, 0.42);
  const region = new Uint8Array(n * n);
  const at = lungSampler(g, lung);
  for (let y = Math.max(0, Math.floor(lung.top)); y < Math.min(n, Math.ceil(lung.base)); y++) {
    for (let x = 0; x < n; x++) {
      if (lungMask[y * n + x] === 0) continue;
      const c = at(x + 0.5, y + 0.5);
      let inside: boolean;
      if (plan.variant === 'apical') {
        // Pleural line parallel to the apex, a little lower laterally.
        inside = y + 0.5 < lung.top + depth * (0.7 + 0.5 * c.p);
      } else {
        // Air rim along the lateral wall, widest in the upper zone and tapering downwards.
        const t = Math.max(0, c.t);
        inside = c.p > 1 - gap * (1 - smoothstep(0.25, 0.72, t)) * (0.6 + 0.4 * smoothstep(0, 0.15, t)) || y + 0.5 < lung.top + depth * 0.5;
      }
      if (inside) region[y * n + x] = 1;
    }
  }
  const line = new Float32Array(n * n);
  for (let y = 1; y < n - 1; y++) {
    for (let x = 1; x < n - 1; x++) {
      const i = y * n + x;
      if (region[i] === 0) continue;
      const next = [i - 1, i + 1, i - n, i + n];
      // The visceral pleural line: where the air region meets aerated lung.
      if (next.some((j) => region[j] === 0 && lungMask[j] === 1)) line[i] = 1;
    }
  }
  const lineSoft = n >= 384 ? boxBlur(line, n, 1, 1) : line;
  for (let i = 0; i < region.length; i++) {
    if (region[i]) {
      field[i] = 1;
      vesselClear[i] = 1;
      // Air without lung tissue: darker than the aerated lung beside it.
      delta[i] -= 0.16 * soft[i];
    }
    delta[i] += 0.3 * soft[i] * lineSoft[i];
  }
}

function drawEdema(rng: Rng, g: ChestGeometry, lung: LungShape, plan: FindingPlan, field: Float32Array, vesselGain: Float32Array): void {
  const n = g.size;
  const hilum = lung.side === 'right' ? g.hila.right : g.hila.left;
  const h = lung.base - lung.top;
  const sx = lung.width * uniform(rng, 0.55, 0.7), sy = h * uniform(rng, 0.24, 0.3);
  const cy = hilum.y + h * 0.04;
  const fluffy = valueNoise(rng, n, 20);
  const fine = valueNoise(rng, n, 64);
  // exp(-r^2) < 0.05 beyond r = 1.74.
  const y0 = Math.max(0, Math.floor(cy - 1.75 * sy)), y1 = Math.min(n, Math.ceil(cy + 1.75 * sy));
  const x0 = Math.max(0, Math.floor(hilum.x - 1.75 * sx)), x1 = Math.min(n, Math.ceil(hilum.x + 1.75 * sx));
  for (let y = y0; y < y1; y++) {
    for (let x = x0; x < x1; x++) {
      const dx = (x + 0.5 - hilum.x) / sx, dy = (y + 0.5 - cy) / sy;
      const w = Math.exp(-(dx * dx + dy * dy));
      if (w < 0.05) continue;
      const i = y * n + x;
      vesselGain[i] = Math.max(vesselGain[i], 0.8 * w);
      if (plan.severity === 1) field[i] = smoothstep(0.2, 0.6, w);
      // Grade 2: reticular interstitial texture; grade 3: confluent perihilar airspace shadowing.
      else if (plan.severity === 2) field[i] = smoothstep(0.2, 0.6, w) * (0.55 + 0.45 * Math.abs(fine[i]) * 2) ;
      else field[i] = smoothstep(0.25, 0.65, w * (1 + 0.35 * fluffy[i])) * (0.8 + 0.2 * fine[i]);
    }
  }
  if (plan.severity >= 2) {
    // Kerley B lines: short horizontal lines at the lateral lung bases.
    const buf = new Float32Array(n * n);
    const lines = 5 + rng.int(4);
    for (let k = 0; k < lines; k++) {
      const y = lung.base - h * uniform(rng, 0.08, 0.25);
      const xe = xAt(g, lung, y, 0.97);
      const len = n * uniform(rng, 0.015, 0.03);
      // Below 0.5 so the lines add density without entering the perihilar mask.
      strokeSegment(buf, n, { x0: xe, y0: y, x1: xe - lung.sign * len, y1: y }, 0.3, 0.5, 0.49);
    }
    for (let i = 0; i < buf.length; i++) if (buf[i] > field[i]) field[i] = buf[i];
  }
}
