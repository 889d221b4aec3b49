import { describe, expect, it, vi } from 'vitest';
import { createAppStore, loadSet, selectSentence, setImageSize, setLungTemplate, selectedBox, type AppStore } from '../state';
import { useKeyboardShortcuts, type ShortcutHandlers } from './use-keyboard-shortcuts';
import { pressKey, renderForTest } from './render-for-test';

function Harness({ store, handlers }: { store: AppStore; handlers: ShortcutHandlers }) {
  useKeyboardShortcuts(store, handlers);
  return <input aria-label="a field" />;
}

function setup() {
  const store = createAppStore({}, { now: () => '2026-01-01T00:00:00.000Z' });
  loadSet(store, {
    name: 'k',
    studies: [
      { id: 's1', image: 'a.png', report: 'Heart size is normal. Consolidation in the right lower zone.' },
      { id: 's2', image: 'b.png', report: 'No pneumothorax.' },
    ],
  });
  setImageSize(store, 's1', { width: 100, height: 100 });
  setLungTemplate(store, 's1', { right: { x: 10, y: 10, w: 30, h: 60 }, left: { x: 60, y: 10, w: 30, h: 60 } });
  const handlers = { openHelp: vi.fn(), escape: vi.fn(), setTool: vi.fn(), toggleMap: vi.fn(), zoom: vi.fn(), onProblem: vi.fn() };
  return { store, handlers, r: renderForTest(<Harness store={store} handlers={handlers} />) };
}

describe('useKeyboardShortcuts', () => {
  it('useKeyboardShortcuts steps sentences and studies with arrows, ] and [', () => {
    const { store, handlers, r } = setup();
    pressKey(document.body, 'ArrowDown');
    expect(store.get().selection.sentenceIndex).toBe(1);
    pressKey(document.body, ']');
    expect(store.get().selection.studyId).toBe('s2');
    pressKey(document.body, 'PageUp');
    expect(store.get().selection.studyId).toBe('s1');
    pressKey(document.body, '?');
    expect(handlers.openHelp).toHaveBeenCalledTimes(1);
    r.unmount();
  });

  it('useKeyboardShortcuts accepts a proposal with Enter, relabels with 1-7 and undoes with Ctrl+Z', () => {
    const { store, handlers, r } = setup();
    selectSentence(store, 1);
    pressKey(document.body, 'Enter');
    const box = selectedBox(store.get());
    expect(box?.zone).toBe('right-lower');
    pressKey(document.body, '7');
    expect(selectedBox(store.get())?.zone).toBe('cardiac');
    pressKey(document.body, '4');
    expect(selectedBox(store.get())?.zone).toBe('left-upper');
    pressKey(document.body, 'z', { ctrlKey: true });
    expect(store.get().boxes[box!.id].zone).toBe('cardiac');
    pressKey(document.body, 'z', { ctrlKey: true, shiftKey: true });
    expect(store.get().boxes[box!.id].zone).toBe('left-upper');
    pressKey(document.body, 'Delete');
    expect(store.get().boxes[box!.id]).toBeUndefined();
    pressKey(document.body, 'Enter');
    pressKey(document.body, 'Enter');
    expect(handlers.onProblem).toHaveBeenLastCalledWith(expect.stringContaining('Nothing to accept'));
    r.unmount();
  });

  it('useKeyboardShortcuts leaves keys alone while typing in a field', () => {
    const { store, handlers, r } = setup();
    const field = r.container.querySelector('input') as HTMLInputElement;
    pressKey(field, 'ArrowDown');
    pressKey(field, '?');
    expect(store.get().selection.sentenceIndex).toBe(0);
    expect(handlers.openHelp).not.toHaveBeenCalled();
    r.unmount();
  });
});
