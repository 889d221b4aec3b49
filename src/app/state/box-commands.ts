import { zoneOfPoint, zonesFromLungs } from '../../core/lung-zones';
import type { ImageRect, ZoneLabel } from '../../core/types';
import { ZONE_LABELS } from '../../dataset/sample-set';
import type { LungTemplate, ReferenceBox } from '../../dataset/types';
import { recordChange } from './history';
import { findStudy, rectProblem, sentenceKeyOf } from './queries';
import type { AppState, RecordDiff } from './records';
import type { AppStore } from './store';

function boxesDiff(pairs: Record<string, readonly [ReferenceBox | undefined, ReferenceBox | undefined]>): RecordDiff {
  return { boxes: pairs, lungs: {} };
}

function requireBox(state: AppState, id: string): ReferenceBox {
  const b = state.boxes[id];
  if (!b) throw new RangeError(`'id' must name a box of the store; got '${id}'`);
  return b;
}

function requireRect(state: AppState, study: string, rect: ImageRect): void {
  const wrong = rectProblem(rect, findStudy(state, study)?.imageSize);
  if (wrong) throw new RangeError(`'rect': ${wrong}`);
}

/** A box id not yet used in the state: 'box-1', 'box-2', ... */
export function nextBoxId(state: AppState): string {
  const used = new Set([...Object.keys(state.boxes), ...state.stale.map((s) => s.box.id), ...state.held.map((b) => b.id)]);
  let n = Object.keys(state.boxes).length + 1;
  while (used.has(`box-${n}`)) n++;
  return `box-${n}`;
}

/** The zone for a new box: the sentence's one parsed zone, else the lung-template zone of its centre, else 'other'. */
export function defaultZone(state: AppState, study: string, sentenceIndex: number, rect: ImageRect): ZoneLabel {
  const sentence = findStudy(state, study)?.parsed.sentences.find((s) => s.index === sentenceIndex);
  if (sentence && sentence.zones.length === 1) return sentence.zones[0];
  const lungs = state.lungs[study];
  if (lungs) return zoneOfPoint(zonesFromLungs(lungs), { x: rect.x + rect.w / 2, y: rect.y + rect.h / 2 }) ?? 'other';
  return 'other';
}

export interface AddBoxArgs {
  readonly rect: ImageRect;
  /** Default: the selected study and sentence. */
  readonly study?: string;
  readonly sentenceIndex?: number;
  /** Default: defaultZone. */
  readonly zone?: ZoneLabel;
  readonly id?: string;
}

/**
 * Adds a reference box for a sentence (one undo step), stamped with the view's annotator and the
 * store's time, and selects it. RangeError when no study or sentence is given or selected, the
 * sentence does not exist, the zone is unknown, the id is taken, or the rect is empty or outside
 * the image (when its size is known).
 */
export function addBox(store: AppStore, args: AddBoxArgs): ReferenceBox {
  const state = store.get();
  const studyId = args.study ?? state.selection.studyId;
  const index = args.sentenceIndex ?? state.selection.sentenceIndex;
  const study = findStudy(state, studyId);
  if (!study) throw new RangeError(`'study' must name a loaded study (or one must be selected); got ${studyId === undefined ? 'none' : `'${studyId}'`}`);
  const sentence = study.parsed.sentences.find((s) => s.index === index);
  if (!sentence) throw new RangeError(`'sentenceIndex' must name a sentence of study '${study.id}' (or one must be selected); got ${index ?? 'none'}`);
  requireRect(state, study.id, args.rect);
  const zone = args.zone ?? defaultZone(state, study.id, sentence.index, args.rect);
  if (!ZONE_LABELS.includes(zone)) throw new RangeError(`'zone' must be one of ${ZONE_LABELS.join(', ')}; got '${zone}'`);
  const id = args.id ?? nextBoxId(state);
  if (state.boxes[id]) throw new RangeError(`'id' must be a new box id; got '${id}', which is taken`);
  const box: ReferenceBox = {
    id,
    study: study.id,
    sentence: sentenceKeyOf(sentence),
    zone,
    box: { x: args.rect.x, y: args.rect.y, w: args.rect.w, h: args.rect.h },
    annotator: state.view.annotator,
    created: store.now(),
  };
  store.update((s) => {
    const next = recordChange(s, 'addBox', boxesDiff({ [id]: [undefined, box] }));
    return { ...next, selection: { ...next.selection, studyId: study.id, sentenceIndex: sentence.index, boxId: id } };
  });
  return box;
}

/** Replaces a box's rectangle (one undo step, or part of an open drag). RangeError as addBox. */
export function resizeBox(store: AppStore, id: string, rect: ImageRect): void {
  const state = store.get();
  const b = requireBox(state, id);
  requireRect(state, b.study, rect);
  const box = { x: rect.x, y: rect.y, w: rect.w, h: rect.h };
  store.update((s) => recordChange(s, 'resizeBox', boxesDiff({ [id]: [b, { ...b, box }] })));
}

/** Moves a box so that its top-left corner is `to`, keeping its size. RangeError as addBox. */
export function moveBox(store: AppStore, id: string, to: { readonly x: number; readonly y: number }): void {
  const b = requireBox(store.get(), id);
  const rect = { x: to.x, y: to.y, w: b.box.w, h: b.box.h };
  requireRect(store.get(), b.study, rect);
  store.update((s) => recordChange(s, 'moveBox', boxesDiff({ [id]: [b, { ...b, box: rect }] })));
}

export function deleteBox(store: AppStore, id: string): void {
  const b = requireBox(store.get(), id);
  store.update((s) => recordChange(s, 'deleteBox', boxesDiff({ [id]: [b, undefined] })));
}

export function setBoxZone(store: AppStore, id: string, zone: ZoneLabel): void {
  if (!ZONE_LABELS.includes(zone)) throw new RangeError(`'zone' must be one of ${ZONE_LABELS.join(', ')}; got '${zone}'`);
  const b = requireBox(store.get(), id);
  store.update((s) => recordChange(s, 'setBoxZone', boxesDiff({ [id]: [b, { ...b, zone }] })));
}

/**
 * Sets a study's lung template from the patient's right lung (viewer's left) and left lung
 * (one undo step). RangeError when a rect is empty or outside the image, or the right lung does
 * not lie left of the left lung on screen (zonesFromLungs).
 */
export function setLungTemplate(store: AppStore, study: string, lungs: { readonly right: ImageRect; readonly left: ImageRect }): LungTemplate {
  const state = store.get();
  if (!findStudy(state, study)) throw new RangeError(`'study' must name a loaded study; got '${study}'`);
  requireRect(state, study, lungs.right);
  requireRect(state, study, lungs.left);
  zonesFromLungs({ right: lungs.right, left: lungs.left });
  const r = lungs.right;
  const l = lungs.left;
  const template: LungTemplate = {
    study,
    right: { x: r.x, y: r.y, w: r.w, h: r.h },
    left: { x: l.x, y: l.y, w: l.w, h: l.h },
    annotator: state.view.annotator,
    created: store.now(),
  };
  store.update((s) => recordChange(s, 'setLungTemplate', { boxes: {}, lungs: { [study]: [s.lungs[study], template] } }));
  return template;
}

export function deleteLungTemplate(store: AppStore, study: string): void {
  store.update((s) => recordChange(s, 'deleteLungTemplate', { boxes: {}, lungs: { [study]: [s.lungs[study], undefined] } }));
}

/**
 * Ties a stale box to a current sentence of its study, by the researcher's explicit choice: the
 * box leaves the stale list and comes back with the sentence's current key (one undo step for the
 * box; the stale entry does not return on undo). RangeError for an unknown box or sentence.
 */
export function reattachStaleBox(store: AppStore, boxId: string, sentenceIndex: number): ReferenceBox {
  const state = store.get();
  const entry = state.stale.find((s) => s.box.id === boxId);
  if (!entry) throw new RangeError(`'boxId' must name a stale box; got '${boxId}'`);
  const sentence = findStudy(state, entry.box.study)?.parsed.sentences.find((s) => s.index === sentenceIndex);
  if (!sentence) throw new RangeError(`'sentenceIndex' must name a sentence of study '${entry.box.study}'; got ${sentenceIndex}`);
  requireRect(state, entry.box.study, entry.box.box);
  const box: ReferenceBox = { ...entry.box, sentence: sentenceKeyOf(sentence) };
  store.update((s) => recordChange({ ...s, stale: s.stale.filter((x) => x.box.id !== boxId) }, 'reattachStaleBox', boxesDiff({ [boxId]: [undefined, box] })));
  return box;
}

/** Drops a stale box for good (it is not written on the next save). */
export function discardStaleBox(store: AppStore, boxId: string): void {
  store.update((s) => (s.stale.some((x) => x.box.id === boxId) ? { ...s, stale: s.stale.filter((x) => x.box.id !== boxId) } : s));
}
