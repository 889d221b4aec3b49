import { LUNG_ZONES, type LungZone } from '../core/types';
import type { LocationMatch } from './types';
import { tokeniseSentence, type SentenceToken } from './tokenise-sentence';

type Side = 'right' | 'left';
type Level = 'upper' | 'middle' | 'lower';
const LEVELS: readonly Level[] = ['upper', 'middle', 'lower'];
const BOTH: readonly Side[] = ['right', 'left'];

interface SideWord {
  readonly sides: readonly Side[];
  /** "bilateral" names a location on its own; "both" needs a level or "lungs"/"sides" after it. */
  readonly standalone: boolean;
}
interface LevelWord {
  readonly level: Level;
  /** 'self': names a location alone ("perihilar"); 'side-or-lung': needs a side or "lung" ("base");
   *  'anchor': needs a side or a structure word such as lobe or zone ("upper"). */
  readonly needs: 'self' | 'side-or-lung' | 'anchor';
  readonly sides?: readonly Side[];
  readonly tag?: string;
}
interface StructWord {
  readonly anchorsSide: boolean; // "right lung", "left-sided"
  readonly anchorsLevel: boolean; // "upper zone", "lower lobe"
  readonly lung?: boolean;
  readonly lobe?: boolean;
}

const SIDE_WORDS: Readonly<Record<string, SideWord>> = {
  right: { sides: ['right'], standalone: false },
  left: { sides: ['left'], standalone: false },
  bilateral: { sides: BOTH, standalone: true },
  bilaterally: { sides: BOTH, standalone: true },
  both: { sides: BOTH, standalone: false },
};

const LEVEL_WORDS: Readonly<Record<string, LevelWord>> = {
  upper: { level: 'upper', needs: 'anchor' },
  apical: { level: 'upper', needs: 'self', tag: 'apex' },
  apex: { level: 'upper', needs: 'side-or-lung', tag: 'apex' },
  apices: { level: 'upper', needs: 'self', tag: 'apex' },
  biapical: { level: 'upper', needs: 'self', sides: BOTH, tag: 'apex' },
  middle: { level: 'middle', needs: 'anchor' },
  mid: { level: 'middle', needs: 'anchor' },
  midzone: { level: 'middle', needs: 'self' },
  midzones: { level: 'middle', needs: 'self' },
  perihilar: { level: 'middle', needs: 'self', tag: 'perihilar' },
  hilar: { level: 'middle', needs: 'self', tag: 'hilar' },
  hilum: { level: 'middle', needs: 'self', tag: 'hilar' },
  hila: { level: 'middle', needs: 'self', tag: 'hilar' },
  lingula: { level: 'middle', needs: 'self', sides: ['left'], tag: 'lingula' },
  lingular: { level: 'middle', needs: 'self', sides: ['left'], tag: 'lingula' },
  lower: { level: 'lower', needs: 'anchor' },
  basal: { level: 'lower', needs: 'self', tag: 'base' },
  basilar: { level: 'lower', needs: 'self', tag: 'base' },
  base: { level: 'lower', needs: 'side-or-lung', tag: 'base' },
  bases: { level: 'lower', needs: 'self', tag: 'base' },
  bibasal: { level: 'lower', needs: 'self', sides: BOTH, tag: 'base' },
  bibasilar: { level: 'lower', needs: 'self', sides: BOTH, tag: 'base' },
  costophrenic: { level: 'lower', needs: 'self', tag: 'costophrenic' },
  cp: { level: 'lower', needs: 'anchor', tag: 'costophrenic' },
  cardiophrenic: { level: 'lower', needs: 'self', tag: 'cardiophrenic' },
  retrocardiac: { level: 'lower', needs: 'self', sides: ['left'], tag: 'retrocardiac' },
  hemidiaphragm: { level: 'lower', needs: 'self', tag: 'hemidiaphragm' },
  hemidiaphragms: { level: 'lower', needs: 'self', tag: 'hemidiaphragm' },
};

const STRUCT_WORDS: Readonly<Record<string, StructWord>> = {
  lobe: { anchorsSide: false, anchorsLevel: true, lobe: true },
  lobes: { anchorsSide: false, anchorsLevel: true, lobe: true },
  zone: { anchorsSide: false, anchorsLevel: true },
  zones: { anchorsSide: false, anchorsLevel: true },
  field: { anchorsSide: false, anchorsLevel: true },
  fields: { anchorsSide: false, anchorsLevel: true },
  region: { anchorsSide: false, anchorsLevel: true },
  regions: { anchorsSide: false, anchorsLevel: true },
  angle: { anchorsSide: false, anchorsLevel: true },
  angles: { anchorsSide: false, anchorsLevel: true },
  lung: { anchorsSide: true, anchorsLevel: true, lung: true },
  lungs: { anchorsSide: true, anchorsLevel: true, lung: true },
  hemithorax: { anchorsSide: true, anchorsLevel: true },
  hemithoraces: { anchorsSide: true, anchorsLevel: true },
  side: { anchorsSide: true, anchorsLevel: false },
  sides: { anchorsSide: true, anchorsLevel: false },
  sided: { anchorsSide: true, anchorsLevel: false },
};

const MODIFIER_TAGS: Readonly<Record<string, string>> = {
  lateral: 'lateral', laterally: 'lateral', medial: 'medial', medially: 'medial',
  peripheral: 'peripheral', peripherally: 'peripheral', subpleural: 'subpleural',
};
const CONJUNCTIONS = new Set(['and', 'or', ',', '/', '&', 'to']);
// A bare side word is a lung location only before one of these ("right pleural effusion").
const SIDE_CONTEXT = new Set([
  'pleural', 'pleura', 'pulmonary', 'effusion', 'effusions', 'pneumothorax', 'hydropneumothorax',
  'haemothorax', 'hemothorax', 'chest', 'thorax', 'thoracic',
]);
const SIDE_PREPOSITIONS = new Set(['on', 'at', 'in', 'to', 'over', 'towards']);
// Side and level words before these name something outside the lungs ("right upper quadrant").
const NON_LUNG_NEXT = new Set([
  'quadrant', 'extremity', 'extremities', 'arm', 'abdomen', 'abdominal', 'neck', 'ventricle', 'ventricular',
  'atrium', 'atrial', 'kidney', 'renal', 'breast', 'humerus', 'shoulder', 'heart', 'jugular', 'subclavian',
  'internal', 'brachiocephalic', 'paratracheal', 'femoral', 'decubitus',
]);

type Label =
  | { readonly kind: 'side'; readonly word: SideWord }
  | { readonly kind: 'level'; readonly word: LevelWord }
  | { readonly kind: 'struct'; readonly word: StructWord }
  | { readonly kind: 'modifier'; readonly tag: string }
  | { readonly kind: 'conj' };

function labelOf(token: SentenceToken): Label | undefined {
  const t = token.text;
  if (t in SIDE_WORDS) return { kind: 'side', word: SIDE_WORDS[t] };
  if (t in LEVEL_WORDS) return { kind: 'level', word: LEVEL_WORDS[t] };
  if (t in STRUCT_WORDS) return { kind: 'struct', word: STRUCT_WORDS[t] };
  if (t in MODIFIER_TAGS) return { kind: 'modifier', tag: MODIFIER_TAGS[t] };
  if (CONJUNCTIONS.has(t)) return { kind: 'conj' };
  return undefined;
}

interface Unit {
  first: number;
  last: number;
  sides: Side[];
  standaloneSide: boolean;
  levels: LevelWord[];
  structs: StructWord[];
  tags: Set<string>;
}

function newUnit(at: number): Unit {
  return { first: at, last: at, sides: [], standaloneSide: false, levels: [], structs: [], tags: new Set() };
}

function zone(side: Side, level: Level): LungZone {
  return `${side}-${level}` as LungZone;
}

/** The zones a unit names, or undefined when it is not anchored as a lung location. */
function unitZones(unit: Unit, context: { before: boolean; after: boolean }): LungZone[] | undefined {
  const hasSides = unit.sides.length > 0;
  const zones: LungZone[] = [];
  if (unit.levels.length === 0) {
    const anchored = unit.standaloneSide || unit.structs.some((s) => s.anchorsSide) || context.before || context.after;
    if (!hasSides || !anchored) return undefined;
    for (const side of unit.sides) for (const level of LEVELS) zones.push(zone(side, level));
    if (unit.sides.length === 2) unit.tags.add('bilateral');
    return zones;
  }
  const levelAnchor = unit.structs.some((s) => s.anchorsLevel);
  const lung = unit.structs.some((s) => s.lung);
  const lobe = unit.structs.some((s) => s.lobe);
  for (const level of unit.levels) {
    const ok =
      level.needs === 'self' || hasSides || (level.needs === 'anchor' ? levelAnchor : lung);
    if (!ok) continue;
    // Only the right lung has a middle lobe.
    const defaultSides: readonly Side[] = level.level === 'middle' && lobe && level.tag === undefined ? ['right'] : BOTH;
    const sides = level.sides ?? (hasSides ? unit.sides : defaultSides);
    if (level.sides === undefined && !hasSides && defaultSides.length === 2) unit.tags.add('unsided');
    else if (sides.length === 2) unit.tags.add('bilateral');
    for (const side of sides) zones.push(zone(side, level.level));
  }
  return zones.length > 0 ? zones : undefined;
}

/** Splits one run of location-like tokens [from, to] into units and turns them into one match. */
function interpretRun(sentence: string, tokens: readonly SentenceToken[], labels: readonly (Label | undefined)[], from: number, to: number): LocationMatch | undefined {
  let first = from;
  let last = to;
  while (first <= last && labels[first]?.kind === 'conj') first++;
  while (last >= first && labels[last]?.kind === 'conj') last--;
  if (first > last) return undefined;
  const next = tokens[last + 1];
  if (next !== undefined && NON_LUNG_NEXT.has(next.text)) return undefined;

  const units: Unit[] = [];
  let unit = newUnit(first);
  let rangePending = false;
  for (let i = first; i <= last; i++) {
    const label = labels[i];
    if (label === undefined) continue;
    if (label.kind === 'side') {
      if (unit.levels.length > 0 || unit.structs.length > 0) {
        units.push(unit);
        unit = newUnit(i);
      }
      for (const s of label.word.sides) if (!unit.sides.includes(s)) unit.sides.push(s);
      unit.standaloneSide ||= label.word.standalone;
    } else if (label.kind === 'level') {
      const previous = unit.levels[unit.levels.length - 1];
      if (rangePending && previous !== undefined) {
        const a = LEVELS.indexOf(previous.level);
        const b = LEVELS.indexOf(label.word.level);
        for (let k = Math.min(a, b) + 1; k < Math.max(a, b); k++) unit.levels.push({ level: LEVELS[k], needs: previous.needs });
      }
      unit.levels.push(label.word);
      if (label.word.tag !== undefined) unit.tags.add(label.word.tag);
    } else if (label.kind === 'struct') {
      unit.structs.push(label.word);
    } else if (label.kind === 'modifier') {
      unit.tags.add(label.tag);
    }
    rangePending = label.kind === 'conj' ? tokens[i].text === 'to' : false;
    unit.last = i;
  }
  units.push(unit);

  const prev1 = tokens[first - 1];
  const prev2 = tokens[first - 2];
  const before = prev1?.text === 'the' && prev2 !== undefined && SIDE_PREPOSITIONS.has(prev2.text);
  const after = next !== undefined && SIDE_CONTEXT.has(next.text);
  const zones = new Set<LungZone>();
  const tags = new Set<string>();
  let spanFirst = -1;
  let spanLast = -1;
  units.forEach((u, k) => {
    const z = unitZones(u, { before: k === 0 && before, after: k === units.length - 1 && after });
    if (z === undefined) return;
    z.forEach((x) => zones.add(x));
    u.tags.forEach((t) => tags.add(t));
    if (spanFirst < 0) spanFirst = u.first;
    spanLast = u.last;
  });
  if (zones.size === 0) return undefined;
  while (labels[spanLast]?.kind === 'conj') spanLast--;
  const ordered = LUNG_ZONES.filter((z) => zones.has(z));
  const rightAndLeft = ordered.some((z) => z.startsWith('right')) && ordered.some((z) => z.startsWith('left'));
  if (rightAndLeft && !tags.has('unsided')) tags.add('bilateral');
  const span = { start: tokens[spanFirst].span.start, end: tokens[spanLast].span.end };
  return { phrase: sentence.slice(span.start, span.end), span, zones: ordered, tags: [...tags].sort() };
}

/**
 * Finds lung-location phrases in a sentence and maps each to the six radiographic zones
 * (patient's right; common practice): side words (right, left, bilateral, both), levels (upper,
 * middle/mid, lower, apex/apical, base/basal/basilar, perihilar, hilar, lingula, costophrenic,
 * retrocardiac, hemidiaphragm) and structures (lobe, zone, lung, field, hemithorax, angle, -sided),
 * joined by "and", "or", commas, slashes and "to" ("right upper and middle zones", "right and left
 * lower lobes", "mid to lower zones"). A level without a side means both sides; a side without a
 * level means all three zones of that side; lobes are read as the zone of the same name (an
 * approximation: lobes and radiographic zones do not coincide). Bare level words need a side or a
 * structure word ("lower thoracic spine" is no match). Spans are relative to the sentence; tags
 * include 'apex', 'base', 'perihilar', 'hilar', 'lingula', 'retrocardiac', 'costophrenic',
 * 'cardiophrenic', 'hemidiaphragm', 'lateral', 'medial', 'peripheral', 'subpleural', 'bilateral' (both
 * sides named, or a bi- word) and 'unsided' (a level with no side, read as both sides).
 * Empty text, or text without a location, gives [].
 */
export function findLocations(sentence: string): LocationMatch[] {
  if (typeof sentence !== 'string') throw new TypeError(`'sentence' must be a string; got ${typeof sentence}`);
  const tokens = tokeniseSentence(sentence);
  const labels = tokens.map(labelOf);
  const matches: LocationMatch[] = [];
  let i = 0;
  while (i < tokens.length) {
    if (labels[i] === undefined) {
      i++;
      continue;
    }
    let j = i;
    while (j + 1 < tokens.length && labels[j + 1] !== undefined) j++;
    const match = interpretRun(sentence, tokens, labels, i, j);
    if (match !== undefined) matches.push(match);
    i = j + 1;
  }
  return matches;
}

/** Union of the matches' zones, in LUNG_ZONES order; [] for no matches. */
export function sentenceZones(matches: readonly LocationMatch[]): LungZone[] {
  const all = new Set<LungZone>();
  for (const m of matches) for (const z of m.zones) all.add(z);
  return LUNG_ZONES.filter((z) => all.has(z));
}
