import { findLocations, sentenceZones } from './locations';
import { detectNegation } from './negation';
import { splitReport } from './split-report';
import type { ParsedReport, ParsedSentence } from './types';

/**
 * Parses report text into sections and sentence records: splitReport for sections and sentences,
 * detectNegation for the negation and uncertainty flags, findLocations and sentenceZones for the
 * lung zones. Sentence indices are 0-based over the whole report, in text order; sentence spans
 * index `text`, location and trigger spans index the sentence text. The one entry point for the
 * batch pipeline, the phantom generator's tests and the explorer. Empty or whitespace-only text
 * gives { sections: [], sentences: [] }.
 */
export function parseReport(text: string): ParsedReport {
  if (typeof text !== 'string') throw new TypeError(`'text' must be a string; got ${typeof text}`);
  const { sections, sentences } = splitReport(text);
  const parsed: ParsedSentence[] = sentences.map((s, index) => {
    const negation = detectNegation(s.text);
    const locations = findLocations(s.text);
    return {
      index,
      text: s.text,
      span: s.span,
      section: s.section,
      negated: negation.negated,
      uncertain: negation.uncertain,
      negation,
      locations,
      zones: sentenceZones(locations),
    };
  });
  return { sections, sentences: parsed };
}
