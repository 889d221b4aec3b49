import { describe, expect, it } from 'vitest';
import { createRng } from '../../core/seeded-random';
import { addBox, deleteBox, moveBox, redo, resizeBox, setBoxZone, undo } from './commands';
import { invertDiff, isEmptyDiff, mergeDiffs } from './history';
import { makeTestStore } from './test-support';
import type { ReferenceBox } from '../../dataset/types';

const box = (x: number): ReferenceBox => ({
  id: 'b',
  study: 's',
  sentence: { index: 0, text: 't', hash: 'h' },
  zone: 'other',
  box: { x, y: 0, w: 1, h: 1 },
  annotator: '',
  created: '',
});

describe('history', () => {
  it('invertDiff(invertDiff(d)) is d', () => {
    const d = { boxes: { b: [box(1), box(2)] as const }, lungs: {} };
    expect(invertDiff(invertDiff(d))).toEqual(d);
  });

  it('mergeDiffs(a, b) keeps the first before and last after, and drops records back where they began', () => {
    const a = { boxes: { b: [box(1), box(2)] as const }, lungs: {} };
    const b = { boxes: { b: [box(2), box(3)] as const }, lungs: {} };
    expect(mergeDiffs(a, b).boxes.b).toEqual([box(1), box(3)]);
    expect(isEmptyDiff(mergeDiffs(a, invertDiff(a)))).toBe(true);
  });

  it('undo all after a random command sequence gives the first state; redo all gives the last', () => {
    const rng = createRng(7);
    const store = makeTestStore();
    const start = store.get().boxes;
    for (let i = 0; i < 60; i++) {
      const ids = Object.keys(store.get().boxes);
      const r = rng.next();
      const id = ids[Math.floor(rng.next() * ids.length)];
      const x = Math.floor(rng.next() * 300);
      if (ids.length === 0 || r < 0.3) addBox(store, { rect: { x, y: 10, w: 20, h: 20 } });
      else if (r < 0.5) moveBox(store, id, { x, y: 5 });
      else if (r < 0.7) resizeBox(store, id, { x: 1, y: 1, w: 1 + x / 3, h: 9 });
      else if (r < 0.85) setBoxZone(store, id, rng.next() < 0.5 ? 'cardiac' : 'other');
      else deleteBox(store, id);
    }
    const end = store.get().boxes;
    const n = store.get().history.past.length;
    for (let i = 0; i < n; i++) undo(store);
    expect(store.get().boxes).toEqual(start);
    for (let i = 0; i < n; i++) redo(store);
    expect(store.get().boxes).toEqual(end);
  });
});
