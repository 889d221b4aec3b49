import { describe, expect, it } from 'vitest';
import {
  addBox,
  beginDrag,
  cancelDrag,
  deleteBox,
  endDrag,
  hoverCell,
  moveBox,
  redo,
  resizeBox,
  selectBox,
  selectSentence,
  selectStudy,
  setBoxZone,
  setLungTemplate,
  stepSentence,
  stepStudy,
  undo,
} from './commands';
import { canRedo, canUndo } from './history';
import { hashSentenceText } from '../../core/text-hash';
import { LUNGS, makeTestStore } from './test-support';

const R = { x: 10, y: 20, w: 30, h: 40 };

describe('box commands', () => {
  it('addBox(store, { rect }) ties the box to the selected sentence with annotator and time', () => {
    const store = makeTestStore();
    const b = addBox(store, { rect: R });
    expect(b).toEqual({
      id: 'box-1',
      study: 'study-a',
      sentence: { index: 0, text: 'Patchy opacity in the right lower zone.', hash: hashSentenceText('Patchy opacity in the right lower zone.') },
      zone: 'right-lower',
      box: R,
      annotator: 'tester',
      created: '2024-05-01T10:00:00.000Z',
    });
    expect(store.get().boxes['box-1']).toEqual(b);
    expect(store.get().selection.boxId).toBe('box-1');
  });

  it('addBox(store, ...) picks the lung-template zone of the centre when the sentence has no single zone', () => {
    const store = makeTestStore();
    setLungTemplate(store, 'study-a', LUNGS);
    selectSentence(store, 3);
    expect(addBox(store, { rect: { x: 250, y: 200, w: 20, h: 20 } }).zone).toBe('left-lower');
    expect(addBox(store, { rect: { x: 180, y: 10, w: 20, h: 20 } }).zone).toBe('other');
  });

  it('addBox(store, ...) refuses empty, NaN, huge or outside rects and unknown sentences', () => {
    const store = makeTestStore();
    expect(() => addBox(store, { rect: { x: 0, y: 0, w: 0, h: 5 } })).toThrow(/'rect'.*w and h must be > 0/);
    expect(() => addBox(store, { rect: { x: NaN, y: 0, w: 5, h: 5 } })).toThrow(/finite/);
    expect(() => addBox(store, { rect: { x: 0, y: 0, w: 1e12, h: 5 } })).toThrow(/inside the 400 x 300 image/);
    expect(() => addBox(store, { rect: R, sentenceIndex: 99 })).toThrow(/'sentenceIndex'/);
    expect(() => addBox(store, { rect: R, zone: 'belly' as never })).toThrow(/'zone'/);
    expect(Object.keys(store.get().boxes)).toEqual([]);
    expect(store.get().history.past).toEqual([]);
  });

  it('addBox then undo removes the box, redo brings the same record back', () => {
    const store = makeTestStore();
    const b = addBox(store, { rect: R });
    undo(store);
    expect(store.get().boxes).toEqual({});
    expect(store.get().selection.boxId).toBeUndefined();
    expect(canRedo(store.get())).toBe(true);
    redo(store);
    expect(store.get().boxes[b.id]).toEqual(b);
    expect(canRedo(store.get())).toBe(false);
  });

  it('moveBox, resizeBox, setBoxZone, deleteBox each undo to the record before', () => {
    const store = makeTestStore();
    const b = addBox(store, { rect: R });
    const snapshots = [store.get().boxes];
    moveBox(store, b.id, { x: 50, y: 60 });
    expect(store.get().boxes[b.id].box).toEqual({ x: 50, y: 60, w: 30, h: 40 });
    snapshots.push(store.get().boxes);
    resizeBox(store, b.id, { x: 1, y: 2, w: 3, h: 4 });
    snapshots.push(store.get().boxes);
    setBoxZone(store, b.id, 'cardiac');
    snapshots.push(store.get().boxes);
    deleteBox(store, b.id);
    expect(store.get().boxes).toEqual({});
    for (let i = snapshots.length - 1; i >= 0; i--) {
      undo(store);
      expect(store.get().boxes).toEqual(snapshots[i]);
    }
    undo(store);
    expect(store.get().boxes).toEqual({});
    expect(canUndo(store.get())).toBe(false);
  });

  it('undo and redo with nothing to do leave the state object unchanged', () => {
    const store = makeTestStore();
    const s = store.get();
    undo(store);
    redo(store);
    expect(store.get()).toBe(s);
  });

  it('a new change after undo clears redo, a selection change does not', () => {
    const store = makeTestStore();
    const b = addBox(store, { rect: R });
    moveBox(store, b.id, { x: 100, y: 100 });
    undo(store);
    selectSentence(store, 2);
    selectStudy(store, 'study-b');
    hoverCell(store, 7);
    stepSentence(store, 1);
    expect(canRedo(store.get())).toBe(true);
    redo(store);
    expect(store.get().boxes[b.id].box.x).toBe(100);
    undo(store);
    resizeBox(store, b.id, { x: 0, y: 0, w: 5, h: 5 });
    expect(canRedo(store.get())).toBe(false);
  });

  it('a drag of many moves is one undo step when it ends', () => {
    const store = makeTestStore();
    const b = addBox(store, { rect: R });
    beginDrag(store, 'move');
    for (let i = 1; i <= 20; i++) moveBox(store, b.id, { x: 10 + i, y: 20 + i });
    expect(store.get().history.past).toHaveLength(1);
    endDrag(store);
    expect(store.get().history.past).toHaveLength(2);
    expect(store.get().boxes[b.id].box).toEqual({ x: 30, y: 40, w: 30, h: 40 });
    undo(store);
    expect(store.get().boxes[b.id].box).toEqual(R);
    redo(store);
    expect(store.get().boxes[b.id].box).toEqual({ x: 30, y: 40, w: 30, h: 40 });
  });

  it('a drag that ends where it began adds no step; cancelDrag reverts the drag', () => {
    const store = makeTestStore();
    const b = addBox(store, { rect: R });
    beginDrag(store, 'move');
    moveBox(store, b.id, { x: 99, y: 99 });
    moveBox(store, b.id, { x: 10, y: 20 });
    endDrag(store);
    expect(store.get().history.past).toHaveLength(1);
    beginDrag(store, 'move');
    moveBox(store, b.id, { x: 70, y: 70 });
    cancelDrag(store);
    expect(store.get().boxes[b.id].box).toEqual(R);
    expect(store.get().history.past).toHaveLength(1);
    expect(store.get().history.drag).toBeUndefined();
  });

  it('undo during an open drag ends the drag and undoes it as one step', () => {
    const store = makeTestStore();
    const b = addBox(store, { rect: R });
    beginDrag(store, 'move');
    moveBox(store, b.id, { x: 60, y: 60 });
    undo(store);
    expect(store.get().boxes[b.id].box).toEqual(R);
    expect(store.get().history.drag).toBeUndefined();
  });

  it('setLungTemplate(store, study, lungs) refuses lungs in the wrong order and undoes to none', () => {
    const store = makeTestStore();
    expect(() => setLungTemplate(store, 'study-a', { right: LUNGS.left, left: LUNGS.right })).toThrow(/viewer's left/);
    setLungTemplate(store, 'study-a', LUNGS);
    expect(store.get().lungs['study-a']).toMatchObject({ ...LUNGS, annotator: 'tester', created: '2024-05-01T10:00:00.000Z' });
    undo(store);
    expect(store.get().lungs).toEqual({});
  });
});

describe('selection commands', () => {
  it('selectStudy(store, id) selects the first sentence; unknown ids throw', () => {
    const store = makeTestStore();
    selectStudy(store, 'study-b');
    expect(store.get().selection).toEqual({ studyId: 'study-b', sentenceIndex: 0 });
    expect(() => selectStudy(store, 'nope')).toThrow(/'id' must name a loaded study; got 'nope'/);
  });

  it('stepStudy and stepSentence stop at the ends', () => {
    const store = makeTestStore();
    stepStudy(store, -1);
    expect(store.get().selection.studyId).toBe('study-a');
    stepStudy(store, 5);
    expect(store.get().selection.studyId).toBe('study-b');
    stepSentence(store, 10);
    expect(store.get().selection.sentenceIndex).toBe(1);
    stepSentence(store, -10);
    expect(store.get().selection.sentenceIndex).toBe(0);
  });

  it('selectBox(store, id) also selects its study and sentence', () => {
    const store = makeTestStore();
    const b = addBox(store, { rect: R, sentenceIndex: 2 });
    selectStudy(store, 'study-b');
    selectBox(store, b.id);
    expect(store.get().selection).toMatchObject({ studyId: 'study-a', sentenceIndex: 2, boxId: b.id });
    selectBox(store, undefined);
    expect(store.get().selection.boxId).toBeUndefined();
    expect(() => selectBox(store, 'zzz')).toThrow(/'id'/);
  });

  it('hoverCell(store, cell) refuses negative and fractional cells', () => {
    const store = makeTestStore();
    hoverCell(store, 3);
    expect(store.get().selection.hoverCell).toBe(3);
    expect(() => hoverCell(store, -1)).toThrow(RangeError);
    expect(() => hoverCell(store, 1.5)).toThrow(RangeError);
    expect(() => hoverCell(store, NaN)).toThrow(RangeError);
  });
});
