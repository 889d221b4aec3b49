import type { LungZone } from '../core/types';

/** A half-open character range [start, end) in the report text. */
export interface Span {
  readonly start: number;
  readonly end: number;
}

export interface ReportSection {
  readonly name: string; // e.g. 'findings', 'impression', or '' for text before any heading
  readonly start: number;
  readonly end: number;
}

export interface NegationResult {
  readonly negated: boolean;
  readonly uncertain: boolean;
  /** Trigger phrases that decided the flags, with spans relative to the sentence text. */
  readonly triggers: readonly { readonly phrase: string; readonly kind: 'pre-negation' | 'post-negation' | 'pseudo' | 'termination' | 'uncertainty'; readonly span: Span }[];
}

export interface LocationMatch {
  readonly phrase: string;
  readonly span: Span; // relative to the sentence text
  readonly zones: readonly LungZone[];
  readonly tags: readonly string[]; // e.g. 'perihilar', 'retrocardiac', 'costophrenic', 'apex', 'base', 'bilateral'
}

export interface ParsedSentence {
  readonly index: number; // 0-based over the whole report
  readonly text: string;
  readonly span: Span; // in the report text
  readonly section: string;
  readonly negated: boolean;
  readonly uncertain: boolean;
  readonly negation: NegationResult;
  readonly locations: readonly LocationMatch[];
  readonly zones: readonly LungZone[]; // union of the locations' zones
}

export interface ParsedReport {
  readonly sections: readonly ReportSection[];
  readonly sentences: readonly ParsedSentence[];
}
