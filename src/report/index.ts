export type { LocationMatch, NegationResult, ParsedReport, ParsedSentence, ReportSection, Span } from './types';
export { splitReport, type SplitReport, type SplitSentence } from './split-report';
export { analyseNegation, detectNegation, isNormalStatement, type FindingMention, type NegationAnalysis, type NegationOptions } from './negation';
export { findLocations, sentenceZones } from './locations';
export { parseReport } from './parse-report';
export { tokeniseSentence, type SentenceToken } from './tokenise-sentence';
export { FINDING_TERMS } from './finding-lexicon';
export { TRIGGER_RULES, type TriggerKind, type TriggerRule } from './negation-triggers';
