import type { Aggregator, GridShape, HitRule, ImagePoint, ImageRect, ZoneLabel } from '../core/types';
import type { RetrievalSummary } from '../core/retrieval-metrics';

/** One model x study x sentence, as scored by the batch pipeline (one row of sentences.csv). */
export interface SentenceRecord {
  readonly model: string;
  readonly study: string;
  readonly sentenceIndex: number;
  readonly text: string;
  readonly negated: boolean;
  readonly uncertain: boolean;
  readonly finding: string; // finding named by the study labels for this sentence, or ''
  readonly zones: readonly ZoneLabel[]; // zones of its reference boxes
  readonly boxes: readonly ImageRect[];
  /** Scored for grounding: has at least one box and is not negated. */
  readonly scored: boolean;
  readonly score: number; // pooled region score under the aggregator
  readonly bestCell: { readonly row: number; readonly col: number };
  readonly bestPoint: ImagePoint; // centre of the best cell, image pixels
  readonly hits: Readonly<Record<HitRule, boolean>>;
  readonly chance: Readonly<Record<HitRule, number>>;
  readonly topKHit: boolean;
  readonly massInBoxes: number;
  readonly cnr: number | undefined;
  readonly lateralitySwap: boolean;
}

export interface RateSummary {
  readonly n: number;
  readonly hits: number;
  readonly rate: number | undefined;
  readonly wilson95: readonly [number, number] | undefined;
  readonly chance: number | undefined; // mean chance level over the group's sentences
  readonly lift: number | undefined; // rate / chance
}

export interface ModelSummary {
  readonly id: string;
  readonly aggregator: string; // formatted, e.g. 'max', 'softmax:0.1'
  readonly hit_rule: HitRule;
  readonly grounding: RateSummary & { readonly bootstrap95: readonly [number, number] | undefined };
  readonly by_zone: Readonly<Record<string, RateSummary>>;
  readonly by_finding: Readonly<Record<string, RateSummary>>;
  readonly by_rule: Readonly<Record<HitRule, RateSummary>>;
  readonly top_k_rate: number | undefined;
  readonly mean_mass_in_boxes: number | undefined;
  readonly mean_cnr: number | undefined;
  readonly negated: { readonly n: number }; // negated sentences with boxes, reported apart
  readonly laterality_swap_rate: number | undefined; // swaps / misses
  /** Local-score retrieval, with the global (mean-pooled) score's beside it. */
  readonly retrieval: RetrievalSummary & { readonly global?: RetrievalSummary };
}

export interface ModelComparison {
  readonly a: string;
  readonly b: string;
  readonly n_pairs: number;
  readonly diff: number | undefined; // rate(a) - rate(b) over paired sentences
  readonly bootstrap95: readonly [number, number] | undefined;
  readonly mcnemar_p: number | undefined;
  readonly b_only_a: number; // discordant pairs: a hit, b miss
  readonly c_only_b: number; // discordant pairs: b hit, a miss
}

export interface SkippedStudy {
  readonly study: string;
  readonly reason: string;
}

/** summary.json */
export interface ScoreSummary {
  readonly schema: 'tessera.summary/1';
  readonly set: string;
  readonly n_studies: number;
  readonly seed: number;
  readonly models: readonly ModelSummary[];
  readonly comparisons: readonly ModelComparison[];
  readonly skipped: readonly SkippedStudy[];
  readonly synthetic_set: boolean;
}

/** One line of similarity.jsonl. */
export interface SimilarityDump {
  readonly model: string;
  readonly study: string;
  readonly sentence: number;
  readonly negated: boolean;
  readonly grid: GridShape;
  readonly values: readonly number[];
  readonly cells: readonly (readonly [number, number, number, number])[];
  readonly boxes: readonly (readonly [number, number, number, number])[];
}

export type { Aggregator, HitRule };
