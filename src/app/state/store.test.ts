import { describe, expect, it } from 'vitest';
import { createAppStore } from './store';
import { DEFAULT_VIEW } from './records';

describe('createAppStore', () => {
  it('createAppStore() starts with an empty state and default view settings', () => {
    const s = createAppStore().get();
    expect(s.studies).toEqual([]);
    expect(s.boxes).toEqual({});
    expect(s.view).toEqual(DEFAULT_VIEW);
    expect(s.history).toEqual({ past: [], future: [] });
  });

  it('createAppStore({ view }) merges partial view settings over the defaults', () => {
    const s = createAppStore({ view: { opacity: 0.2 } }).get();
    expect(s.view.opacity).toBe(0.2);
    expect(s.view.aggregator).toEqual({ kind: 'max' });
  });

  it('update(fn) notifies listeners with the new and previous state, and unsubscribe stops it', () => {
    const store = createAppStore();
    const seen: [string, string][] = [];
    const off = store.subscribe((next, prev) => seen.push([next.setName, prev.setName]));
    store.update((s) => ({ ...s, setName: 'one' }));
    off();
    store.update((s) => ({ ...s, setName: 'two' }));
    expect(seen).toEqual([['one', '']]);
    expect(store.get().setName).toBe('two');
  });

  it('update(fn) that returns the same object notifies no one', () => {
    const store = createAppStore();
    let calls = 0;
    store.subscribe(() => calls++);
    store.update((s) => s);
    expect(calls).toBe(0);
  });

  it('two stores share nothing', () => {
    const a = createAppStore();
    const b = createAppStore();
    a.update((s) => ({ ...s, setName: 'a' }));
    expect(b.get().setName).toBe('');
  });

  it('now() gives ISO text from a Date or a string clock', () => {
    expect(createAppStore({}, { now: () => new Date(Date.UTC(2024, 0, 2, 3, 4, 5)) }).now()).toBe('2024-01-02T03:04:05.000Z');
    expect(createAppStore({}, { now: () => '2020-01-01T00:00:00Z' }).now()).toBe('2020-01-01T00:00:00Z');
  });
});
