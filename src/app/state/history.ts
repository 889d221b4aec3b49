import type { LungTemplate, ReferenceBox } from '../../dataset/types';
import type { AppState, HistoryStep, RecordDiff } from './records';

/** Steps kept for undo; older ones are dropped. */
export const MAX_HISTORY_STEPS = 500;

type Pair<T> = readonly [T | undefined, T | undefined];

export const EMPTY_DIFF: RecordDiff = { boxes: {}, lungs: {} };

function sameRecord(a: unknown, b: unknown): boolean {
  return a === b || (a !== undefined && b !== undefined && JSON.stringify(a) === JSON.stringify(b));
}

function dropNoOps<T>(pairs: Readonly<Record<string, Pair<T>>>): Record<string, Pair<T>> {
  const out: Record<string, Pair<T>> = {};
  for (const [k, p] of Object.entries(pairs)) if (!sameRecord(p[0], p[1])) out[k] = p;
  return out;
}

export function isEmptyDiff(d: RecordDiff): boolean {
  return Object.keys(d.boxes).length === 0 && Object.keys(d.lungs).length === 0;
}

/** The diff that undoes `d`: before and after swapped. */
export function invertDiff(d: RecordDiff): RecordDiff {
  const swap = <T>(pairs: Readonly<Record<string, Pair<T>>>): Record<string, Pair<T>> =>
    Object.fromEntries(Object.entries(pairs).map(([k, [a, b]]) => [k, [b, a] as const]));
  return { boxes: swap(d.boxes), lungs: swap(d.lungs) };
}

/** `a` then `b` as one diff: the earliest before, the latest after; records back where they began drop out. */
export function mergeDiffs(a: RecordDiff, b: RecordDiff): RecordDiff {
  const merge = <T>(x: Readonly<Record<string, Pair<T>>>, y: Readonly<Record<string, Pair<T>>>): Record<string, Pair<T>> => {
    const out: Record<string, Pair<T>> = { ...x };
    for (const [k, [before, after]] of Object.entries(y)) out[k] = [k in x ? x[k][0] : before, after];
    return dropNoOps(out);
  };
  return { boxes: merge(a.boxes, b.boxes), lungs: merge(a.lungs, b.lungs) };
}

function applyPairs<T>(records: Readonly<Record<string, T>>, pairs: Readonly<Record<string, Pair<T>>>): Record<string, T> {
  const out: Record<string, T> = { ...records };
  for (const [k, [, after]] of Object.entries(pairs)) {
    if (after === undefined) delete out[k];
    else out[k] = after;
  }
  return out;
}

/** The state with each record of `d` set to its after value; selection of a removed box is cleared. */
export function applyDiff(state: AppState, d: RecordDiff): AppState {
  if (isEmptyDiff(d)) return state;
  const boxes = applyPairs<ReferenceBox>(state.boxes, d.boxes);
  const lungs = applyPairs<LungTemplate>(state.lungs, d.lungs);
  const sel = state.selection;
  const selection = sel.boxId !== undefined && !(sel.boxId in boxes) ? { ...sel, boxId: undefined } : sel;
  return { ...state, boxes, lungs, selection };
}

/**
 * Applies a command's diff and records it: inside an open drag it joins the drag's step;
 * otherwise it becomes a new undo step and clears redo. An empty diff changes nothing.
 */
export function recordChange(state: AppState, label: string, diff: RecordDiff): AppState {
  const d = { boxes: dropNoOps(diff.boxes), lungs: dropNoOps(diff.lungs) };
  if (isEmptyDiff(d)) return state;
  const next = applyDiff(state, d);
  const h = state.history;
  if (h.drag) return { ...next, history: { ...h, drag: { label: h.drag.label, diff: mergeDiffs(h.drag.diff, d) } } };
  return { ...next, history: { past: [...h.past, { label, diff: d }].slice(-MAX_HISTORY_STEPS), future: [] } };
}

/** Opens a drag: later changes gather into one step until endDragState. An open drag is ended first. */
export function beginDragState(state: AppState, label: string): AppState {
  const s = endDragState(state);
  return { ...s, history: { ...s.history, drag: { label, diff: EMPTY_DIFF } } };
}

/** Closes the drag; its net change becomes one undo step (none when nothing changed). */
export function endDragState(state: AppState): AppState {
  const { drag, past, future } = state.history;
  if (!drag) return state;
  if (isEmptyDiff(drag.diff)) return { ...state, history: { past, future } };
  return { ...state, history: { past: [...past, drag].slice(-MAX_HISTORY_STEPS), future: [] } };
}

/** Closes the drag and reverts what it changed; history is as before the drag began. */
export function cancelDragState(state: AppState): AppState {
  const { drag, past, future } = state.history;
  if (!drag) return state;
  return { ...applyDiff(state, invertDiff(drag.diff)), history: { past, future } };
}

/** Undoes the last step (an open drag is ended first); unchanged when there is nothing to undo. */
export function undoState(state: AppState): AppState {
  const s = endDragState(state);
  const { past, future } = s.history;
  const step: HistoryStep | undefined = past[past.length - 1];
  if (!step) return s;
  return { ...applyDiff(s, invertDiff(step.diff)), history: { past: past.slice(0, -1), future: [...future, step] } };
}

/** Redoes the last undone step; unchanged when there is nothing to redo. */
export function redoState(state: AppState): AppState {
  const s = endDragState(state);
  const { past, future } = s.history;
  const step: HistoryStep | undefined = future[future.length - 1];
  if (!step) return s;
  return { ...applyDiff(s, step.diff), history: { past: [...past, step], future: future.slice(0, -1) } };
}

export function canUndo(state: AppState): boolean {
  return state.history.past.length > 0 || (state.history.drag !== undefined && !isEmptyDiff(state.history.drag.diff));
}

export function canRedo(state: AppState): boolean {
  return state.history.future.length > 0;
}
