import type { Aggregator, HitRule, ImageRect } from '../../core/types';
import type { SentenceGrounding } from '../../core/ground-sentence';
import type { ParsedSentence } from '../../report/types';
import { groundStudySentences, type StudySimilarity } from '../../batch/study-similarity';
import type { SentenceOutcome } from './ReportPanel';

export { computeStudySimilarity, type StudySimilarity, type StudySimilarityArgs } from '../../batch/study-similarity';

/** One sentence, pooled and grounded. */
export interface SentenceAnalysis {
  readonly sentence: ParsedSentence;
  readonly values: Float32Array;
  readonly score: number;
  readonly grounding: SentenceGrounding;
  readonly boxes: readonly ImageRect[];
  readonly outcome: SentenceOutcome;
}

export interface StudyGroundingArgs {
  readonly similarity: StudySimilarity;
  readonly sentences: readonly ParsedSentence[];
  /** Reference boxes of each sentence, by sentence index. */
  readonly boxesOf: (sentenceIndex: number) => readonly ImageRect[];
  readonly aggregator: Aggregator;
  readonly hitRule: HitRule;
  readonly topK: number;
}

/** Re-pools and re-grounds every sentence from kept similarities, through the batch pipeline's own functions. */
export function groundStudy(a: StudyGroundingArgs): SentenceAnalysis[] {
  const boxes = a.sentences.map((s) => a.boxesOf(s.index));
  const scores = groundStudySentences(a.similarity, (row) => boxes[row], { aggregator: a.aggregator, topK: a.topK });
  return a.sentences.map((sentence, row) => {
    const { values, score, grounding } = scores[row];
    const outcome: SentenceOutcome = sentence.negated ? 'negated' : boxes[row].length === 0 ? 'no-boxes' : grounding.hits[a.hitRule] ? 'hit' : 'miss';
    return { sentence, values, score, grounding, boxes: boxes[row], outcome };
  });
}
