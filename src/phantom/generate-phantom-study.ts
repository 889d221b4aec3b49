import type { Rng } from '../core/seeded-random';
import { hashSentenceText } from '../core/text-hash';
import { LUNG_ZONES, type ImageRect, type LungZone } from '../core/types';
import type { FindingLabel, LungTemplate, ReferenceBox } from '../dataset/types';
import { boxBlur } from './box-blur';
import { rasterHeart, rasterLung, sampleChestGeometry } from './chest-geometry';
import { composeReport, type ReportFinding, type ReportSentence } from './compose-report';
import { drawChestDensity, drawSoftTissue, drawVessels } from './draw-chest-density';
import { drawFindings } from './draw-findings';
import { planFindings, type FindingKind } from './plan-findings';
import { zonesFromLungs } from '../core/lung-zones';
import { maskArea, maskBounds } from './mask-bounds';
import { transformImage, transformMask, type PlaneTransform } from './transform-image';

export const MIN_PHANTOM_SIZE = 128;
export const PHANTOM_ANNOTATOR = 'phantom-generator';

export interface PhantomStudyOptions {
  readonly size?: number;
  readonly id?: string;
  readonly created?: string; // ISO 8601 time stamped on boxes and lung templates
}

/** Ground-truth mask of one finding, in final image pixels. */
export interface PhantomFindingMask {
  readonly finding: FindingKind;
  readonly zones: readonly LungZone[];
  readonly mask: Uint8Array;
}

export interface PhantomLabels {
  readonly findings: readonly FindingLabel[];
  readonly edema_grade: number;
  readonly ctr: number; // cardiothoracic ratio measured from the masks
  /** For each report sentence with a finding: its index, finding and named zones. */
  readonly sentences: readonly { readonly index: number; readonly finding: string; readonly zones: readonly LungZone[]; readonly negated: boolean; readonly uncertain: boolean }[];
}

export interface PhantomStudy {
  readonly id: string;
  readonly size: number;
  /** size * size row-major intensities in [0, 1], higher = brighter (more attenuation). */
  readonly image: Float32Array;
  readonly report: string;
  readonly sentences: readonly ReportSentence[];
  readonly labels: PhantomLabels;
  readonly boxes: readonly ReferenceBox[];
  readonly lungs: LungTemplate;
  readonly masks: { readonly right: Uint8Array; readonly left: Uint8Array; readonly heart: Uint8Array; readonly findings: readonly PhantomFindingMask[] };
}

const uniform = (rng: Rng, lo: number, hi: number): number => lo + (hi - lo) * rng.next();

/**
 * Generates one synthetic frontal chest radiograph with its report, labels, reference boxes and
 * lung template, all from `rng`. Anatomy varies per study (size, position, small rotation,
 * exposure, blur, noise); findings sit in known zones with ground-truth masks; zones follow the
 * ILO thirds split of each lung's extent. Throws RangeError for a size below 128 or not an integer.
 */
export function generatePhantomStudy(rng: Rng, { size = 512, id = 'phantom', created = '2000-01-01T00:00:00.000Z' }: PhantomStudyOptions = {}): PhantomStudy {
  if (!Number.isInteger(size) || size < MIN_PHANTOM_SIZE) throw new RangeError(`'size' must be an integer >= ${MIN_PHANTOM_SIZE}; got ${size}`);
  const n = size;
  const enlarged = rng.next() < 0.22;
  const g = sampleChestGeometry(rng, n, { enlargedHeart: enlarged });
  const upright = { right: rasterLung(g, g.right), left: rasterLung(g, g.left), heart: rasterHeart(g) };
  const plans = planFindings(rng);
  const soft = drawSoftTissue(g);
  const layers = drawFindings(rng, g, plans, upright, soft);
  const vessels = drawVessels(rng, g, layers.vesselGain);
  for (let i = 0; i < vessels.length; i++) if (layers.vesselClear[i]) vessels[i] = 0;
  const density = drawChestDensity(rng, g, upright, soft, vessels, layers.fill);
  for (let i = 0; i < density.length; i++) density[i] += layers.delta[i];

  // Patient positioning: a small rotation, distance to the detector (zoom) and a vertical offset.
  const pose: PlaneTransform = {
    angle: (Math.max(-3, Math.min(3, rng.normal() * 1.3)) * Math.PI) / 180,
    scale: uniform(rng, 0.93, 1.05),
    shiftY: n * uniform(rng, -0.02, 0.02),
  };
  const rotated = transformImage(density, n, pose);
  const right = transformMask(upright.right, n, pose);
  const left = transformMask(upright.left, n, pose);
  const heart = transformMask(upright.heart, n, pose);
  const image = expose(rng, rotated, n);

  const rightBox = maskBounds(right, n)!;
  const leftBox = maskBounds(left, n)!;
  const lungs: LungTemplate = { study: id, right: rightBox, left: leftBox, annotator: PHANTOM_ANNOTATOR, created };
  const zoneRects = zonesFromLungs(lungs);
  const findingMasks: PhantomFindingMask[] = [];
  const reportFindings: ReportFinding[] = [];
  for (const f of layers.findings) {
    const mask = transformMask(f.mask, n, pose);
    const zones = zonesOfMask(mask, n, zoneRects);
    if (zones.length === 0) continue;
    reportFindings.push({ index: findingMasks.length, kind: f.kind, side: f.side, zones, severity: f.severity, variant: f.variant });
    findingMasks.push({ finding: f.kind, zones, mask });
  }
  const ctr = cardiothoracicRatio(heart, n, rightBox, leftBox);
  const cardiomegaly = ctr > 0.5;
  const edema = reportFindings.find((f) => f.kind === 'edema');
  const edemaGrade = edema ? edema.severity : 0;
  const { text, sentences } = composeReport(rng, { findings: reportFindings, cardiomegaly, ctr, edemaGrade });

  const boxes: ReferenceBox[] = [];
  sentences.forEach((s, index) => {
    if (s.negated) return;
    for (const t of s.targets) {
      const box = t.finding === 'heart' ? maskBounds(heart, n) : maskBounds(findingMasks[t.finding].mask, n, targetClip(findingMasks[t.finding].finding, t.zone as LungZone, lungs, zoneRects));
      if (!box) continue;
      boxes.push({
        id: `${id}-s${index}-${boxes.length}`,
        study: id,
        sentence: { index, text: s.text, hash: hashSentenceText(s.text) },
        zone: t.zone,
        box,
        annotator: PHANTOM_ANNOTATOR,
        created,
      });
    }
  });

  const findingLabels: FindingLabel[] = reportFindings.map((f) => ({ finding: f.kind, zones: f.zones, severity: f.severity }));
  if (cardiomegaly) findingLabels.push({ finding: 'cardiomegaly', zones: ['cardiac'], severity: ctr < 0.58 ? 1 : ctr < 0.63 ? 2 : 3 });
  const labels: PhantomLabels = {
    findings: findingLabels,
    edema_grade: edemaGrade,
    ctr: Math.round(ctr * 1000) / 1000,
    sentences: sentences.map((s, index) => ({ index, finding: s.finding, zones: s.zones, negated: s.negated, uncertain: s.uncertain })),
  };
  return { id, size: n, image, report: text, sentences, labels, boxes, lungs, masks: { right, left, heart, findings: findingMasks } };
}

/** Attenuation to displayed intensity: exponential film response, exposure, blur and noise. */
function expose(rng: Rng, density: Float32Array, n: number): Float32Array {
  const mu = uniform(rng, 1.45, 2.0);
  const white = 1 - Math.exp(-mu * 1.45);
  const gamma = uniform(rng, 0.85, 1.15);
  const lift = uniform(rng, 0, 0.05);
  // A lookup table over density keeps exp and pow out of the per-pixel loop.
  const steps = 2048, top = 3;
  const lut = new Float32Array(steps + 2);
  for (let k = 0; k <= steps + 1; k++) {
    const v = (1 - Math.exp((-mu * top * k) / steps)) / white;
    lut[k] = lift + (1 - lift) * Math.min(1, v) ** gamma;
  }
  const out = new Float32Array(n * n);
  const scale = steps / top;
  for (let i = 0; i < out.length; i++) {
    const f = Math.min(steps, Math.max(0, density[i] * scale));
    const k = Math.floor(f);
    out[i] = lut[k] + (lut[k + 1] - lut[k]) * (f - k);
  }
  const radius = Math.max(0, Math.round((n / 256) * uniform(rng, 0.4, 1.6)));
  const blurred = radius > 0 ? boxBlur(out, n, radius, 1) : out;
  const sigma = uniform(rng, 0.006, 0.018);
  // Noise drawn through a table of sorted Gaussian samples (an empirical inverse CDF): one uniform
  // per pixel instead of a Box-Muller pair.
  const table = Float32Array.from({ length: 1024 }, () => rng.normal()).sort();
  for (let i = 0; i < blurred.length; i++) {
    const v = blurred[i] + sigma * table[(rng.next() * 1024) | 0];
    blurred[i] = v < 0 ? 0 : v > 1 ? 1 : v;
  }
  return blurred;
}

/**
 * The part of a finding's mask a reference box covers. Most findings are boxed zone by zone, as
 * their sentences name zones. Perihilar oedema is named by its place about the hilum, not by a
 * third of the lung: its opacity spreads from the middle zone into the upper and lower ones, so
 * its box covers the whole opacity in the named side's lung (labelled with the hilum's zone).
 */
function targetClip(kind: FindingKind, zone: LungZone, lungs: LungTemplate, zoneRects: Record<LungZone, ImageRect>): ImageRect {
  if (kind !== 'edema') return zoneRects[zone];
  return zone.startsWith('right') ? lungs.right : lungs.left;
}

/**
 * Zones a mask occupies: those holding at least 15% of its pixels (or all of a tiny mask's
 * largest zone), ordered by share, largest first.
 */
export function zonesOfMask(mask: Uint8Array, size: number, zoneRects: Record<LungZone, ImageRect>): LungZone[] {
  const counts = LUNG_ZONES.map((z) => ({ z, c: maskArea(mask, size, zoneRects[z]) }));
  const total = counts.reduce((s, e) => s + e.c, 0);
  if (total === 0) return [];
  counts.sort((a, b) => b.c - a.c || LUNG_ZONES.indexOf(a.z) - LUNG_ZONES.indexOf(b.z));
  const kept = counts.filter((e) => e.c >= 0.15 * total).map((e) => e.z);
  return kept.length > 0 ? kept : [counts[0].z];
}

/**
 * Cardiothoracic ratio: widest horizontal extent of the heart mask over the widest extent of the
 * two lung fields (common practice: > 0.5 is enlarged on a frontal film). 0 for an empty heart.
 */
export function cardiothoracicRatio(heart: Uint8Array, size: number, right: ImageRect, left: ImageRect): number {
  let widest = 0;
  for (let y = 0; y < size; y++) {
    let lo = -1, hi = -1;
    for (let x = 0; x < size; x++) {
      if (heart[y * size + x] === 0) continue;
      if (lo < 0) lo = x;
      hi = x;
    }
    if (lo >= 0) widest = Math.max(widest, hi - lo + 1);
  }
  const thorax = Math.max(right.x + right.w, left.x + left.w) - Math.min(right.x, left.x);
  return thorax > 0 ? widest / thorax : 0;
}
