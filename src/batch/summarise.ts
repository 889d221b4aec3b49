import type { Aggregator, HitRule } from '../core/types';
import type { ModelComparison, ModelSummary, RateSummary, ScoreSummary, SentenceRecord } from './types';
import type { ModelRun } from './score-set';
import { summariseRate } from '../core/rate-summary';
import { clusterBootstrapRate, pairedClusterBootstrapDiff } from '../core/cluster-bootstrap';
import { mcnemarExact } from '../core/mcnemar-exact';
import { retrievalSummary } from '../core/retrieval-metrics';
import { localStudyScoreMatrix, globalStudyScoreMatrix } from '../core/study-score-matrix';
import { formatAggregator } from '../core/pool-regions';

const HIT_RULES: readonly HitRule[] = ['centre', 'overlap', 'upsampled'];

export interface SummaryOptions {
  readonly aggregator: Aggregator;
  readonly hitRule: HitRule;
  readonly seed: number;
  readonly replicates?: number;
  readonly setName: string;
  readonly syntheticSet: boolean;
  readonly nStudies: number;
  readonly skipped: readonly { readonly study: string; readonly reason: string }[];
}

function rateOf(records: readonly SentenceRecord[], rule: HitRule): RateSummary {
  let hits = 0;
  let chance = 0;
  for (const r of records) {
    if (r.hits[rule]) hits++;
    chance += r.chance[rule];
  }
  const s = summariseRate(hits, records.length, chance);
  return { n: s.n, hits: s.hits, rate: s.rate, wilson95: s.wilson95, chance: s.chance, lift: s.lift };
}

function groupRates(records: readonly SentenceRecord[], keysOf: (r: SentenceRecord) => readonly string[], rule: HitRule): Record<string, RateSummary> {
  const groups = new Map<string, SentenceRecord[]>();
  for (const r of records) for (const k of keysOf(r)) {
    const g = groups.get(k) ?? [];
    g.push(r);
    groups.set(k, g);
  }
  const out: Record<string, RateSummary> = {};
  for (const k of [...groups.keys()].sort()) out[k] = rateOf(groups.get(k) as SentenceRecord[], rule);
  return out;
}

/** Hits and n per study, in first-seen order: the clusters of the study-level bootstrap. */
function studyClusters(records: readonly SentenceRecord[], rule: HitRule): { hits: number; n: number }[] {
  const by = new Map<string, { hits: number; n: number }>();
  for (const r of records) {
    const c = by.get(r.study) ?? { hits: 0, n: 0 };
    c.n++;
    if (r.hits[rule]) c.hits++;
    by.set(r.study, c);
  }
  return [...by.values()];
}

const mean = (xs: readonly number[]): number | undefined => (xs.length === 0 ? undefined : xs.reduce((a, b) => a + b, 0) / xs.length);

/** Summary of one model's run: overall, by zone, by finding, by rule, retrieval. */
export function summariseModel(run: ModelRun, opts: SummaryOptions): ModelSummary {
  const { hitRule, seed, replicates = 2000 } = opts;
  const scored = run.records.filter((r) => r.scored);
  const overall = rateOf(scored, hitRule);
  const misses = scored.filter((r) => !r.hits[hitRule]);
  const by_rule = {} as Record<HitRule, RateSummary>;
  for (const rule of HIT_RULES) by_rule[rule] = rateOf(scored, rule);
  const pool = [...run.pool].sort((a, b) => a.position - b.position).map((p) => p.embeddings);
  const local = retrievalSummary(localStudyScoreMatrix(pool, run.dim, opts.aggregator));
  const global = retrievalSummary(globalStudyScoreMatrix(pool, run.dim));
  const cnrs = scored.map((r) => r.cnr).filter((v): v is number => v !== undefined && Number.isFinite(v));
  return {
    id: run.model,
    aggregator: formatAggregator(opts.aggregator),
    hit_rule: hitRule,
    grounding: {
      ...overall,
      bootstrap95: clusterBootstrapRate(studyClusters(scored, hitRule), { replicates, seed }),
    },
    by_zone: groupRates(scored, (r) => r.zones, hitRule),
    by_finding: groupRates(scored, (r) => (r.finding ? [r.finding] : ['(unlabelled)']), hitRule),
    by_rule,
    top_k_rate: mean(scored.map((r) => (r.topKHit ? 1 : 0))),
    mean_mass_in_boxes: mean(scored.map((r) => r.massInBoxes)),
    mean_cnr: mean(cnrs),
    negated: { n: run.records.filter((r) => r.negated && r.boxes.length > 0).length },
    laterality_swap_rate: misses.length === 0 ? undefined : misses.filter((r) => r.lateralitySwap).length / misses.length,
    retrieval: { ...local, global },
  };
}

/** Paired comparison of two models over the sentences both scored (same study and sentence). */
export function compareRuns(a: ModelRun, b: ModelRun, opts: SummaryOptions): ModelComparison {
  const { hitRule, seed, replicates = 2000 } = opts;
  const keyOf = (r: SentenceRecord): string => `${r.study}\u0000${r.sentenceIndex}`;
  const bByKey = new Map(b.records.filter((r) => r.scored).map((r) => [keyOf(r), r]));
  const clusters = new Map<string, { a: number; b: number; n: number }>();
  let onlyA = 0;
  let onlyB = 0;
  let n = 0;
  let diffSum = 0;
  for (const ra of a.records) {
    if (!ra.scored) continue;
    const rb = bByKey.get(keyOf(ra));
    if (!rb) continue;
    const ha = ra.hits[hitRule] ? 1 : 0;
    const hb = rb.hits[hitRule] ? 1 : 0;
    n++;
    diffSum += ha - hb;
    if (ha && !hb) onlyA++;
    if (hb && !ha) onlyB++;
    const c = clusters.get(ra.study) ?? { a: 0, b: 0, n: 0 };
    c.a += ha;
    c.b += hb;
    c.n++;
    clusters.set(ra.study, c);
  }
  return {
    a: a.model,
    b: b.model,
    n_pairs: n,
    diff: n === 0 ? undefined : diffSum / n,
    bootstrap95: pairedClusterBootstrapDiff([...clusters.values()], { replicates, seed }),
    mcnemar_p: n === 0 ? undefined : mcnemarExact(onlyA, onlyB),
    b_only_a: onlyA,
    c_only_b: onlyB,
  };
}

/** The whole summary.json content for a set of model runs (every pair of models compared). */
export function buildSummary(runs: readonly ModelRun[], opts: SummaryOptions): ScoreSummary {
  const models = runs.map((r) => summariseModel(r, opts));
  const comparisons: ModelComparison[] = [];
  for (let i = 0; i < runs.length; i++) for (let j = i + 1; j < runs.length; j++) comparisons.push(compareRuns(runs[i], runs[j], opts));
  return {
    schema: 'tessera.summary/1',
    set: opts.setName,
    n_studies: opts.nStudies,
    seed: opts.seed,
    models,
    comparisons,
    skipped: opts.skipped,
    synthetic_set: opts.syntheticSet,
  };
}
