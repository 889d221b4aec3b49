export { generatePhantomStudy, MIN_PHANTOM_SIZE, PHANTOM_ANNOTATOR, type PhantomStudy, type PhantomStudyOptions, type PhantomLabels, type PhantomFindingMask } from './generate-phantom-study';
export { writePhantomSet, studySeed, createdFromSeed, type PhantomSetResult } from './write-phantom-set';
export { phantomSetProblems, MAX_PHANTOM_SIZE, PHANTOM_FORMATS, MASK_BITS, type PhantomFormat, type PhantomSetOptions } from './phantom-set-options';
export { zoneOf, type ZoneRow } from './zone-names';
export type { FindingKind } from './plan-findings';
export type { ReportSentence, BoxTarget } from './compose-report';
