import { findStudy } from './queries';
import type { AppStore } from './store';

// Selection lives outside undo history, so none of these clears redo.

/** Selects a study and its first sentence; clears the box and hovered cell. RangeError for an unknown id. */
export function selectStudy(store: AppStore, id: string): void {
  const study = findStudy(store.get(), id);
  if (!study) throw new RangeError(`'id' must name a loaded study; got '${id}'`);
  store.update((s) => ({ ...s, selection: { studyId: id, sentenceIndex: study.parsed.sentences[0]?.index } }));
}

/** Moves the study selection by `delta` in set order, stopping at the ends; selects the first study when none is. */
export function stepStudy(store: AppStore, delta: number): void {
  const { studies, selection } = store.get();
  if (studies.length === 0) return;
  const at = studies.findIndex((s) => s.id === selection.studyId);
  const to = at < 0 ? 0 : Math.max(0, Math.min(studies.length - 1, at + delta));
  if (to !== at) selectStudy(store, studies[to].id);
}

/** Selects a sentence of the selected study (undefined clears it); clears the box. RangeError for an unknown index. */
export function selectSentence(store: AppStore, index: number | undefined): void {
  const state = store.get();
  if (index !== undefined) {
    const study = findStudy(state, state.selection.studyId);
    if (!study?.parsed.sentences.some((s) => s.index === index)) {
      throw new RangeError(`'index' must name a sentence of the selected study${study ? ` '${study.id}'` : ' (none is selected)'}; got ${index}`);
    }
  }
  store.update((s) => ({ ...s, selection: { ...s.selection, sentenceIndex: index, boxId: undefined } }));
}

/** Moves the sentence selection by `delta`, stopping at the ends. */
export function stepSentence(store: AppStore, delta: number): void {
  const state = store.get();
  const sentences = findStudy(state, state.selection.studyId)?.parsed.sentences ?? [];
  if (sentences.length === 0) return;
  const at = sentences.findIndex((s) => s.index === state.selection.sentenceIndex);
  const to = at < 0 ? 0 : Math.max(0, Math.min(sentences.length - 1, at + delta));
  if (to !== at) selectSentence(store, sentences[to].index);
}

/** Selects a box and with it its study and sentence (undefined clears the box only). RangeError for an unknown id. */
export function selectBox(store: AppStore, id: string | undefined): void {
  if (id === undefined) {
    store.update((s) => (s.selection.boxId === undefined ? s : { ...s, selection: { ...s.selection, boxId: undefined } }));
    return;
  }
  const b = store.get().boxes[id];
  if (!b) throw new RangeError(`'id' must name a box of the store; got '${id}'`);
  store.update((s) => ({ ...s, selection: { ...s.selection, studyId: b.study, sentenceIndex: b.sentence.index, boxId: id } }));
}

/** Sets the hovered grid cell (row-major index), or clears it. RangeError for a negative or fractional index. */
export function hoverCell(store: AppStore, cell: number | undefined): void {
  if (cell !== undefined && !(Number.isInteger(cell) && cell >= 0)) throw new RangeError(`'cell' must be an integer >= 0 or undefined; got ${cell}`);
  store.update((s) => (s.selection.hoverCell === cell ? s : { ...s, selection: { ...s.selection, hoverCell: cell } }));
}
