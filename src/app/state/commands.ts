import { beginDragState, cancelDragState, endDragState, redoState, undoState } from './history';
import type { AppStore } from './store';

// Every named command of the explorer; each takes the store first and changes it through update().
export {
  addBox,
  defaultZone,
  deleteBox,
  deleteLungTemplate,
  discardStaleBox,
  moveBox,
  nextBoxId,
  reattachStaleBox,
  resizeBox,
  setBoxZone,
  setLungTemplate,
  type AddBoxArgs,
} from './box-commands';
export { acceptProposal, proposalsFor } from './proposals';
export { hoverCell, selectBox, selectSentence, selectStudy, stepSentence, stepStudy } from './selection-commands';
export { setAggregator, setAnnotator, setHitRule, setOpacity, setOverlay, setShowGrid, setShowLinks, setTopK, setWindow } from './view-commands';
export { addNotice, dismissNotice, loadSet, setImageSize, toStudyEntry } from './study-commands';

export function undo(store: AppStore): void {
  store.update(undoState);
}

export function redo(store: AppStore): void {
  store.update(redoState);
}

/** Starts a drag: record changes until endDrag become one undo step. */
export function beginDrag(store: AppStore, label: string): void {
  store.update((s) => beginDragState(s, label));
}

export function endDrag(store: AppStore): void {
  store.update(endDragState);
}

/** Ends a drag and reverts its changes (Escape). */
export function cancelDrag(store: AppStore): void {
  store.update(cancelDragState);
}
