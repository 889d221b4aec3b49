import { HIT_RULE_ORDER, orderKeys, orderZoneKeys, roundSignificant } from './export-format';
import type { ModelComparison, ModelSummary, RateSummary, ScoreSummary, SkippedStudy } from './types';

/** A JSON value; objects are Maps so keys are written in insertion order, integer-like keys included. */
type JsonValue = null | boolean | number | string | readonly JsonValue[] | ReadonlyMap<string, JsonValue>;

const SUMMARY_KEYS = ['schema', 'set', 'n_studies', 'seed', 'models', 'comparisons', 'skipped', 'synthetic_set'] as const;
const MODEL_KEYS = [
  'id', 'aggregator', 'hit_rule', 'grounding', 'by_zone', 'by_finding', 'by_rule', 'top_k_rate',
  'mean_mass_in_boxes', 'mean_cnr', 'negated', 'laterality_swap_rate', 'retrieval',
] as const;
const RATE_KEYS = ['n', 'hits', 'rate', 'wilson95', 'chance', 'lift'] as const;
const GROUNDING_KEYS = [...RATE_KEYS, 'bootstrap95'] as const;
const RETRIEVAL_KEYS = [
  'image_to_report_r1', 'image_to_report_r5', 'image_to_report_r10', 'report_to_image_r1',
  'report_to_image_r5', 'report_to_image_r10', 'image_to_report_median_rank', 'report_to_image_median_rank',
] as const;
const COMPARISON_KEYS = ['a', 'b', 'n_pairs', 'diff', 'bootstrap95', 'mcnemar_p', 'b_only_a', 'c_only_b'] as const;
const SKIPPED_KEYS = ['study', 'reason'] as const;

type Loose = Readonly<Record<string, unknown>>;

/** Plain value with numbers rounded and undefined as null; object keys keep their insertion order. */
function plain(value: unknown): JsonValue {
  if (value === undefined || value === null) return null;
  if (typeof value === 'number') return roundSignificant(value) ?? null;
  if (typeof value === 'boolean' || typeof value === 'string') return value;
  if (Array.isArray(value)) return value.map(plain);
  if (typeof value === 'object') {
    const out = new Map<string, JsonValue>();
    for (const [k, v] of Object.entries(value as Loose)) out.set(k, plain(v));
    return out;
  }
  return String(value);
}

/**
 * The known keys in contract order, then any keys a newer summary adds, sorted, so extra
 * fields are carried through rather than dropped.
 */
function ordered(source: Loose, keys: readonly string[], special: Readonly<Record<string, (v: unknown) => JsonValue>> = {}): JsonValue {
  const out = new Map<string, JsonValue>();
  const known = new Set(keys);
  const put = (k: string): void => {
    const v = source[k];
    out.set(k, special[k] ? special[k](v) : plain(v));
  };
  for (const k of keys) put(k);
  for (const k of orderKeys(Object.keys(source))) if (!known.has(k)) put(k);
  return out;
}

const rate = (v: unknown): JsonValue => (v == null ? null : ordered(v as Loose, RATE_KEYS));

function rateRecord(order: (keys: Iterable<string>) => string[]) {
  return (v: unknown): JsonValue => {
    if (v == null) return null;
    const rec = v as Readonly<Record<string, RateSummary>>;
    const out = new Map<string, JsonValue>();
    for (const k of order(Object.keys(rec))) out.set(k, rate(rec[k]));
    return out;
  };
}

function byRule(v: unknown): JsonValue {
  if (v == null) return null;
  const rec = v as Loose;
  const keys = [...HIT_RULE_ORDER.filter((r) => r in rec), ...orderKeys(Object.keys(rec).filter((k) => !(HIT_RULE_ORDER as readonly string[]).includes(k)))];
  const out = new Map<string, JsonValue>();
  for (const k of keys) out.set(k, rate(rec[k]));
  return out;
}

function retrieval(v: unknown): JsonValue {
  if (v == null) return null;
  const rec = v as Loose;
  return ordered(rec, 'global' in rec ? [...RETRIEVAL_KEYS, 'global'] : RETRIEVAL_KEYS, {
    global: (g) => (g == null ? null : ordered(g as Loose, RETRIEVAL_KEYS)),
  });
}

function model(m: ModelSummary): JsonValue {
  return ordered(m as unknown as Loose, MODEL_KEYS, {
    grounding: (g) => (g == null ? null : ordered(g as Loose, GROUNDING_KEYS)),
    by_zone: rateRecord(orderZoneKeys),
    by_finding: rateRecord(orderKeys),
    by_rule: byRule,
    retrieval,
  });
}

function stringify(value: JsonValue, indent: string): string {
  if (value === null || typeof value !== 'object') return JSON.stringify(value);
  const inner = indent + '  ';
  if (!(value instanceof Map)) {
    const items = value as readonly JsonValue[];
    if (items.length === 0) return '[]';
    // Intervals and coordinate lists stay on one line; arrays of objects open up.
    if (items.every((v) => v === null || typeof v !== 'object')) return `[${items.map((v) => JSON.stringify(v)).join(', ')}]`;
    return `[\n${items.map((v) => inner + stringify(v, inner)).join(',\n')}\n${indent}]`;
  }
  const entries = [...value.entries()];
  if (entries.length === 0) return '{}';
  return `{\n${entries.map(([k, v]) => `${inner}${JSON.stringify(k)}: ${stringify(v, inner)}`).join(',\n')}\n${indent}}`;
}

/**
 * summary.json text: keys in the contract's order (unknown extra keys after them, sorted), zones
 * in anatomical order and findings by code point, non-integer numbers to 6 significant digits,
 * undefined and non-finite numbers as null, two-space indent, a final newline. Equal summaries
 * give byte-identical text whatever their key insertion order.
 */
export function serialiseSummary(summary: ScoreSummary): string {
  const value = ordered(summary as unknown as Loose, SUMMARY_KEYS, {
    models: (v) => (Array.isArray(v) ? (v as ModelSummary[]).map(model) : null),
    comparisons: (v) => (Array.isArray(v) ? (v as ModelComparison[]).map((c) => ordered(c as unknown as Loose, COMPARISON_KEYS)) : null),
    skipped: (v) => (Array.isArray(v) ? (v as SkippedStudy[]).map((s) => ordered(s as unknown as Loose, SKIPPED_KEYS)) : null),
  });
  return stringify(value, '') + '\n';
}
