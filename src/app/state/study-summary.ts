import type { SentenceGrounding } from '../../core/ground-sentence';
import { summariseRate, type RateWithChance } from '../../core/rate-summary';
import type { HitRule, ImageRect } from '../../core/types';
import { boxesOfSentence, findStudy } from './queries';
import type { AppState } from './records';

/** One sentence of a study with its groundSentence result (from src/core, computed by the caller). */
export interface SentenceResult {
  readonly index: number;
  readonly grounding: SentenceGrounding;
}

export interface StudySummary {
  readonly rule: HitRule;
  /** Sentence indices in input order, with hit and chance under `rule`. */
  readonly sentences: readonly { readonly index: number; readonly hit: boolean; readonly chance: number }[];
  readonly hits: number;
  readonly misses: number;
  /** summariseRate over the scored sentences: rate, Wilson 95%, mean chance and lift (undefined when none is scored). */
  readonly rate: RateWithChance;
}

/**
 * A sentence is scored for grounding when it has at least one reference box and is not negated
 * (the batch pipeline's rule). The study's scored sentences with their boxes, in report order;
 * [] for an unknown study.
 */
export function scoredSentences(state: AppState, studyId: string): { index: number; boxes: ImageRect[] }[] {
  const study = findStudy(state, studyId);
  if (!study) return [];
  return study.parsed.sentences
    .filter((s) => !s.negated)
    .map((s) => ({ index: s.index, boxes: boxesOfSentence(state, studyId, s.index).map((b) => b.box) }))
    .filter((s) => s.boxes.length > 0);
}

/**
 * Hits, misses and chance of one study's scored sentences under a hit rule, from groundSentence
 * results passed in; the rate, its interval and the lift come from summariseRate. Computes no
 * grounding measure itself. Empty input: zero hits and misses, rate fields undefined. RangeError
 * for a repeated sentence index.
 */
export function summariseStudy(results: readonly SentenceResult[], { rule = 'centre' }: { readonly rule?: HitRule } = {}): StudySummary {
  const seen = new Set<number>();
  for (const r of results) {
    if (seen.has(r.index)) throw new RangeError(`'results' must hold each sentence once; got index ${r.index} twice`);
    seen.add(r.index);
  }
  const sentences = results.map((r) => ({ index: r.index, hit: r.grounding.hits[rule], chance: r.grounding.chance[rule] }));
  const hits = sentences.filter((s) => s.hit).length;
  const chanceSum = sentences.reduce((a, s) => a + s.chance, 0);
  return { rule, sentences, hits, misses: sentences.length - hits, rate: summariseRate(hits, sentences.length, chanceSum) };
}
