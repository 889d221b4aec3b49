import { zonesFromLungs } from '../../core/lung-zones';
import type { LungZone } from '../../core/types';
import type { ReferenceBox } from '../../dataset/types';
import { nextBoxId } from './box-commands';
import { recordChange } from './history';
import { boxesOfSentence, selectedSentence, selectedStudy, sentenceKeyOf } from './queries';
import type { AppState, Proposal } from './records';
import type { AppStore } from './store';

/**
 * Boxes proposed for the selected sentence: when its parsed zones are known and its study has a
 * lung template, one proposal per zone (zonesFromLungs), leaving out zones the sentence already has
 * a box for. Negated sentences get none (they are not scored for grounding). No selection, no
 * zones or no template: [].
 */
export function proposalsFor(state: AppState): Proposal[] {
  const study = selectedStudy(state);
  const sentence = selectedSentence(state);
  if (!study || !sentence || sentence.negated || sentence.zones.length === 0) return [];
  const lungs = state.lungs[study.id];
  if (!lungs) return [];
  const zones = zonesFromLungs(lungs);
  const taken = new Set(boxesOfSentence(state, study.id, sentence.index).map((b) => b.zone));
  const key = sentenceKeyOf(sentence);
  return sentence.zones.filter((z) => !taken.has(z)).map((zone) => ({ study: study.id, sentence: key, zone, box: zones[zone] }));
}

/**
 * Turns the current proposals (all, or those of `zones`) into reference boxes labelled with their
 * zone, stamped with the view's annotator and the store's time: one undo step; the first new box
 * is selected. Returns the new boxes ([] when nothing is proposed).
 */
export function acceptProposal(store: AppStore, { zones }: { readonly zones?: readonly LungZone[] } = {}): ReferenceBox[] {
  const state = store.get();
  const chosen = proposalsFor(state).filter((p) => zones === undefined || zones.includes(p.zone));
  if (chosen.length === 0) return [];
  const created = store.now();
  const boxes: ReferenceBox[] = [];
  let scratch = state;
  for (const p of chosen) {
    const id = nextBoxId(scratch);
    const box: ReferenceBox = { id, study: p.study, sentence: p.sentence, zone: p.zone, box: { ...p.box }, annotator: state.view.annotator, created };
    boxes.push(box);
    scratch = { ...scratch, boxes: { ...scratch.boxes, [id]: box } };
  }
  store.update((s) => {
    const next = recordChange(s, 'acceptProposal', { boxes: Object.fromEntries(boxes.map((b) => [b.id, [undefined, b] as const])), lungs: {} });
    return { ...next, selection: { ...next.selection, boxId: boxes[0].id } };
  });
  return boxes;
}
