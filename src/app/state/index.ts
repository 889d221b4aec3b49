// Public API of the explorer's record store: records, store, commands, history, queries.
export * from './records';
export { createAppStore, type AppStore, type AppStoreOptions, type StoreListener } from './store';
export * from './commands';
export { canRedo, canUndo, MAX_HISTORY_STEPS } from './history';
export {
  boxesOfSentence,
  boxesOfStudy,
  clampRectToImage,
  findStudy,
  rectProblem,
  selectedBox,
  selectedSentence,
  selectedStudy,
  sentenceKeyOf,
} from './queries';
export {
  annotationContextOf,
  annotationFileOf,
  exportAnnotations,
  exportCocoJson,
  importAnnotations,
  restoreAnnotations,
  type ImportReport,
} from './annotation-io';
export { createAutosave, type Autosave, type AutosaveOptions } from './autosave';
export { scoredSentences, summariseStudy, type SentenceResult, type StudySummary } from './study-summary';
