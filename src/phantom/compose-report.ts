import type { Rng } from '../core/seeded-random';
import type { LungZone, ZoneLabel } from '../core/types';
import type { Side } from './chest-geometry';
import type { FindingKind } from './plan-findings';
import {
  atelectasisText,
  consolidationText,
  edemaText,
  effusionText,
  NEGATIONS,
  noduleText,
  pneumothoraxText,
  type Built,
} from './finding-phrases';

/** One finding as the report sees it: kind, where its mask lies (zones by share of mask), severity. */
export interface ReportFinding {
  readonly index: number; // index into the study's finding list
  readonly kind: FindingKind;
  readonly side: Side | 'both';
  readonly zones: readonly LungZone[]; // zones the mask occupies, largest share first
  readonly severity: number;
  readonly variant: string;
}

export interface ReportFacts {
  readonly findings: readonly ReportFinding[];
  readonly cardiomegaly: boolean;
  readonly ctr: number;
  readonly edemaGrade: number;
}

/** Where a sentence's reference box comes from: a finding's mask within a zone, or the heart. */
export interface BoxTarget {
  readonly finding: number | 'heart';
  readonly zone: ZoneLabel;
}

/** One generated report sentence with the ground truth a parser should recover from it. */
export interface ReportSentence {
  readonly text: string;
  readonly section: 'findings' | 'impression';
  readonly negated: boolean;
  readonly uncertain: boolean;
  readonly zones: readonly LungZone[]; // lung zones the sentence names
  readonly finding: FindingKind | '';
  readonly targets: readonly BoxTarget[];
}

type Loc = { zones: LungZone[]; phrase: string };
const pick = <T>(rng: Rng, items: readonly T[]): T => items[rng.int(items.length)];
const cap = (s: string): string => s.charAt(0).toUpperCase() + s.slice(1);
const sideOf = (z: LungZone): Side => (z.startsWith('right') ? 'right' : 'left');
const rowOf = (z: LungZone): string => z.slice(z.indexOf('-') + 1);
const ROW_ORDER = ['upper', 'middle', 'lower'];

/** A phrase naming one or two zones, e.g. "the right middle and lower zones". */
function locate(rng: Rng, zones: readonly LungZone[], kind: FindingKind): Loc {
  const zs = [...zones];
  if (zs.length === 1) {
    const [z] = zs;
    const side = sideOf(z), row = rowOf(z);
    const options = [`the ${side} ${row} zone`, `the ${side} ${row} zone`];
    if (row === 'middle') options.push(`the ${side} mid zone`);
    if (row === 'lower' && kind !== 'nodule') options.push(`the ${side} base`);
    if (row === 'lower') options.push(`the ${side} lower zone`);
    return { zones: zs, phrase: pick(rng, options) };
  }
  const [a, b] = zs.sort((p, q) => (sideOf(p) === sideOf(q) ? ROW_ORDER.indexOf(rowOf(p)) - ROW_ORDER.indexOf(rowOf(q)) : sideOf(p) === 'right' ? -1 : 1));
  if (sideOf(a) === sideOf(b)) return { zones: zs, phrase: `the ${sideOf(a)} ${rowOf(a)} and ${rowOf(b)} zones` };
  if (rowOf(a) === rowOf(b)) {
    const row = rowOf(a);
    const options = [`both ${row} zones`, `the right and left ${row} zones`];
    if (row === 'lower' && kind !== 'nodule') options.push('both bases');
    return { zones: zs, phrase: pick(rng, options) };
  }
  return { zones: zs, phrase: `the ${sideOf(a)} ${rowOf(a)} zone and the ${sideOf(b)} ${rowOf(b)} zone` };
}

/** Zones a sentence names for a finding: at most two, the ones holding most of its mask. */
function namedZones(f: ReportFinding): LungZone[] {
  if (f.kind === 'edema') return ['right-middle', 'left-middle'];
  if (f.kind === 'nodule') return f.zones.slice(0, 1);
  if (f.kind === 'effusion') {
    const side = f.side as Side;
    const z: LungZone[] = [`${side}-lower` as LungZone];
    if (f.severity >= 3 && f.zones.includes(`${side}-middle` as LungZone)) z.push(`${side}-middle` as LungZone);
    return z;
  }
  if (f.kind === 'pneumothorax' && f.variant === 'apical') return [`${f.side}-upper` as LungZone];
  return f.zones.slice(0, 2);
}

/**
 * Writes a plain-prose report (FINDINGS and IMPRESSION sections) for a study's ground truth:
 * positive sentences naming each finding and its zones, hedged ones, one sentence naming two
 * places for paired findings, negated statements for absent findings, and normal statements.
 * Our own templates; several phrasings per finding. Returns the text and its sentences in order.
 */
export function composeReport(rng: Rng, facts: ReportFacts): { text: string; sentences: ReportSentence[] } {
  const oedema = rng.next() < 0.7 ? 'oedema' : 'edema';
  const findings: ReportSentence[] = [];
  const impression: ReportSentence[] = [];
  const add = (list: ReportSentence[], s: Omit<ReportSentence, 'section'>, section: 'findings' | 'impression'): void => {
    list.push({ ...s, section });
  };
  const lungFindings = facts.findings.filter((f) => f.kind !== 'cardiomegaly');
  const byKind = new Map<FindingKind, ReportFinding[]>();
  for (const f of lungFindings) byKind.set(f.kind, [...(byKind.get(f.kind) ?? []), f]);

  for (const [kind, group] of byKind) {
    // Two findings of one kind on different sides: often one sentence naming both places.
    const joined = group.length === 2 && kind !== 'pneumothorax' && rng.next() < 0.6;
    const units = joined ? [group] : group.map((f) => [f]);
    for (const unit of units) {
      const zones = joined ? unit.map((f) => namedZones(f)[0]) : namedZones(unit[0]);
      const loc = locate(rng, zones, kind);
      const f = unit[0];
      const hedge = !joined && kind !== 'edema' && f.severity === 1 && rng.next() < 0.18;
      let built: Built;
      switch (kind) {
        case 'consolidation': built = consolidationText(rng, loc.phrase, hedge, joined); break;
        case 'nodule': built = noduleText(rng, loc.phrase, hedge, joined, 6 + rng.int(15)); break;
        case 'effusion':
          built = joined
            ? { text: cap(`${pick(rng, ['small', 'moderate'])} pleural effusions at both bases.`), uncertain: false }
            : effusionText(rng, f, loc, hedge);
          break;
        case 'pneumothorax': built = pneumothoraxText(rng, f, loc, hedge); break;
        case 'atelectasis': built = atelectasisText(rng, loc.phrase, hedge); break;
        default: built = edemaText(rng, f.severity, oedema); break;
      }
      const named = joined && kind === 'effusion' ? unit.map((u) => `${u.side}-lower` as LungZone) : loc.zones;
      const targets: BoxTarget[] = [];
      for (const z of named) for (const u of unit) if (u.zones.includes(z) || kind === 'edema') targets.push({ finding: u.index, zone: z });
      add(findings, { text: cap(built.text), negated: false, uncertain: built.uncertain, zones: named, finding: kind, targets }, 'findings');
      add(impression, { text: impressionText(rng, kind, unit, loc.phrase, named, hedge, oedema), negated: false, uncertain: hedge, zones: named, finding: kind, targets }, 'impression');
    }
  }

  if (facts.cardiomegaly) {
    const text = pick(rng, [
      'The heart is enlarged.',
      'The cardiac silhouette is enlarged.',
      `Cardiomegaly, with a cardiothoracic ratio of about ${Math.round(facts.ctr * 100)} percent.`,
      'The heart is enlarged, with the cardiothoracic ratio above one half.',
    ]);
    const targets: BoxTarget[] = [{ finding: 'heart', zone: 'cardiac' }];
    add(findings, { text, negated: false, uncertain: false, zones: [], finding: 'cardiomegaly', targets }, 'findings');
    add(impression, { text: pick(rng, ['Cardiomegaly.', 'Enlarged cardiac silhouette.']), negated: false, uncertain: false, zones: [], finding: 'cardiomegaly', targets }, 'impression');
  } else {
    const text = pick(rng, ['The heart size is normal.', 'The cardiac silhouette is within normal limits.', 'Heart size is normal.', 'The cardiomediastinal silhouette is unremarkable.']);
    add(findings, { text, negated: false, uncertain: false, zones: [], finding: '', targets: [] }, 'findings');
  }

  const normals: ReportSentence[] = [];
  for (const kind of ['pneumothorax', 'effusion', 'consolidation', 'nodule', 'edema'] as const) {
    if (byKind.has(kind) || rng.next() < (kind === 'nodule' ? 0.6 : 0.25)) continue;
    const text = pick(rng, NEGATIONS[kind]).replace('OEDEMA', oedema);
    normals.push({ text, section: 'findings', negated: true, uncertain: false, zones: [], finding: kind, targets: [] });
  }
  if (lungFindings.length === 0 && rng.next() < 0.8) {
    normals.unshift({ text: pick(rng, ['The lungs are clear.', 'Both lungs are clear.', 'The lungs are well expanded and clear.']), section: 'findings', negated: false, uncertain: false, zones: [], finding: '', targets: [] });
  }
  if (rng.next() < 0.4) {
    normals.push({ text: pick(rng, ['The bony structures are intact.', 'The trachea is central.', 'The visualised bones are unremarkable.']), section: 'findings', negated: false, uncertain: false, zones: [], finding: '', targets: [] });
  }
  findings.push(...normals);
  if (impression.length === 0) {
    impression.push({ text: pick(rng, ['No acute cardiopulmonary abnormality.', 'Normal chest radiograph.', 'No acute abnormality.']), section: 'impression', negated: false, uncertain: false, zones: [], finding: '', targets: [] });
  }
  const sentences = [...findings, ...impression];
  const text = `FINDINGS:\n${findings.map((s) => s.text).join(' ')}\n\nIMPRESSION:\n${impression.map((s) => s.text).join(' ')}\n`;
  return { text, sentences };
}

function impressionText(rng: Rng, kind: FindingKind, unit: readonly ReportFinding[], loc: string, named: readonly LungZone[], hedge: boolean, oedema: string): string {
  const f = unit[0];
  const lead = (s: string): string => cap(hedge ? `possible ${s}` : s);
  switch (kind) {
    case 'consolidation': return lead(pick(rng, [`consolidation in ${loc}.`, `airspace opacity in ${loc}.`]));
    case 'nodule': return lead(pick(rng, [`nodule in ${loc}.`, `pulmonary nodule in ${loc}.`]));
    case 'effusion':
      if (unit.length === 2) return 'Bilateral basal pleural effusions.';
      return lead(named.length === 2 ? `pleural effusion in ${loc}.` : `${f.side} basal pleural effusion.`);
    case 'pneumothorax': return lead(f.variant === 'apical' ? `${f.side} apical pneumothorax.` : `pneumothorax in ${loc}.`);
    case 'atelectasis': return lead(`atelectasis in ${loc}.`);
    default: return cap(`${['', 'mild vascular congestion', 'interstitial', 'alveolar'][f.severity]}${f.severity >= 2 ? ` ${oedema}` : ''} in both perihilar regions.`);
  }
}
