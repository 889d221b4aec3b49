import { describe, expect, it } from 'vitest';
import { zonesFromLungs } from '../../core/lung-zones';
import { acceptProposal, addBox, proposalsFor, selectSentence, setLungTemplate, undo } from './commands';
import { LUNGS, makeTestStore } from './test-support';

describe('proposals', () => {
  it('proposalsFor(state) is empty without a lung template, a zone, or for a negated sentence', () => {
    const store = makeTestStore();
    expect(proposalsFor(store.get())).toEqual([]);
    setLungTemplate(store, 'study-a', LUNGS);
    selectSentence(store, 1); // "No pleural effusion." is negated and has no zone
    expect(proposalsFor(store.get())).toEqual([]);
    selectSentence(store, 3);
    expect(proposalsFor(store.get())).toEqual([]);
  });

  it('proposalsFor(state) proposes each zone of the sentence from zonesFromLungs', () => {
    const store = makeTestStore();
    setLungTemplate(store, 'study-a', LUNGS);
    selectSentence(store, 2);
    const zones = zonesFromLungs(LUNGS);
    const p = proposalsFor(store.get());
    expect(p.map((x) => x.zone)).toEqual(['right-upper', 'left-upper']);
    expect(p[0].box).toEqual(zones['right-upper']);
    expect(p[1].box).toEqual(zones['left-upper']);
    expect(p[0].sentence.text).toBe('Nodule in the left upper lobe and right upper zone.');
  });

  it('acceptProposal(store) makes labelled boxes in one undo step and stops proposing them', () => {
    const store = makeTestStore(() => '2024-06-01T00:00:00.000Z');
    setLungTemplate(store, 'study-a', LUNGS);
    selectSentence(store, 2);
    const steps = store.get().history.past.length;
    const made = acceptProposal(store);
    expect(made.map((b) => [b.id, b.zone, b.annotator, b.created])).toEqual([
      ['box-1', 'right-upper', 'tester', '2024-06-01T00:00:00.000Z'],
      ['box-2', 'left-upper', 'tester', '2024-06-01T00:00:00.000Z'],
    ]);
    expect(store.get().history.past.length).toBe(steps + 1);
    expect(proposalsFor(store.get())).toEqual([]);
    expect(acceptProposal(store)).toEqual([]);
    undo(store);
    expect(store.get().boxes).toEqual({});
  });

  it('acceptProposal(store, { zones }) accepts only those zones; a hand-drawn box of a zone removes its proposal', () => {
    const store = makeTestStore();
    setLungTemplate(store, 'study-a', LUNGS);
    selectSentence(store, 2);
    addBox(store, { rect: { x: 50, y: 40, w: 10, h: 10 }, zone: 'right-upper' });
    expect(proposalsFor(store.get()).map((p) => p.zone)).toEqual(['left-upper']);
    expect(acceptProposal(store, { zones: ['right-lower'] })).toEqual([]);
    expect(acceptProposal(store, { zones: ['left-upper'] })).toHaveLength(1);
  });
});
