import { describe, expect, it } from 'vitest';
import { DEFAULT_VIEW } from './records';
import { setAggregator, setAnnotator, setHitRule, setOpacity, setOverlay, setShowGrid, setTopK, setWindow } from './commands';
import { makeTestStore } from './test-support';

describe('view commands', () => {
  it('setOpacity(store, v) accepts [0, 1] and refuses NaN and values outside', () => {
    const store = makeTestStore();
    setOpacity(store, 0);
    setOpacity(store, 1);
    expect(store.get().view.opacity).toBe(1);
    for (const bad of [-0.1, 1.01, NaN, Infinity]) expect(() => setOpacity(store, bad)).toThrow(/'opacity' must be a number in \[0, 1\]/);
  });

  it('setWindow(store, w) needs width >= 1; undefined goes back to the image window', () => {
    const store = makeTestStore();
    setWindow(store, { centre: 100, width: 50 });
    expect(store.get().view.window).toEqual({ centre: 100, width: 50 });
    expect(() => setWindow(store, { centre: 100, width: 0.5 })).toThrow(/width >= 1/);
    setWindow(store, undefined);
    expect(store.get().view.window).toBeUndefined();
  });

  it('setAggregator(store, a) validates through the core', () => {
    const store = makeTestStore();
    setAggregator(store, { kind: 'topk', k: 3 });
    expect(store.get().view.aggregator).toEqual({ kind: 'topk', k: 3 });
    expect(() => setAggregator(store, { kind: 'softmax', temperature: -1 })).toThrow(RangeError);
  });

  it('setTopK, setShowGrid and setAnnotator change the view and never the undo history', () => {
    const store = makeTestStore();
    setTopK(store, 3);
    setShowGrid(store, false);
    setAnnotator(store, '  ana ');
    expect(store.get().view).toMatchObject({ topK: 3, showGrid: false, annotator: 'ana' });
    expect(store.get().history.past).toEqual([]);
    expect(() => setTopK(store, 0)).toThrow(/'k' must be an integer >= 1; got 0/);
  });

  it('setHitRule(store, r) keeps the rule in the view beside the aggregator and refuses unknown names', () => {
    const store = makeTestStore();
    expect(store.get().view.hitRule).toBe(DEFAULT_VIEW.hitRule);
    expect(DEFAULT_VIEW.hitRule).toBe('centre');
    setHitRule(store, 'upsampled');
    expect(store.get().view).toMatchObject({ hitRule: 'upsampled', aggregator: { kind: 'max' } });
    const before = store.get();
    setHitRule(store, 'upsampled');
    expect(store.get()).toBe(before);
    expect(() => setHitRule(store, 'center' as never)).toThrow(/'rule' must be one of centre, overlap, upsampled; got "center"/);
    expect(store.get().view.hitRule).toBe('upsampled');
    expect(store.get().history.past).toEqual([]);
  });

  it('setOverlay(store, o) switches between the similarity map and the region features', () => {
    const store = makeTestStore();
    expect(store.get().view.overlay).toBe('map');
    setOverlay(store, 'features');
    expect(store.get().view.overlay).toBe('features');
    expect(() => setOverlay(store, 'pca' as never)).toThrow(/'overlay' must be one of map, features; got "pca"/);
    expect(store.get().view.overlay).toBe('features');
  });
});
