import 'fake-indexeddb/auto';
import { afterEach, describe, expect, it } from 'vitest';
import { addBox, loadSet, moveBox, setAggregator, setHitRule, setImageSize, setLungTemplate, setOverlay, setWindow } from './commands';
import { createAutosave, type Autosave } from './autosave';
import { exportAnnotations } from './annotation-io';
import { createAppStore } from './store';
import { LUNGS, makeTestStore, STUDIES } from './test-support';

let dbCount = 0;
const open: Autosave[] = [];
function autosaveFor(store: ReturnType<typeof makeTestStore>, dbName: string, delayMs = 10_000): Autosave {
  const a = createAutosave(store, { dbName, delayMs });
  open.push(a);
  return a;
}

afterEach(async () => {
  for (const a of open.splice(0)) await a.dispose();
});

describe('createAutosave', () => {
  it('createAutosave(store).flush() writes the annotation file; restore() on a new store gives the same records', async () => {
    const db = `t-${++dbCount}`;
    const a = makeTestStore();
    const saveA = autosaveFor(a, db);
    setLungTemplate(a, 'study-a', LUNGS);
    const box = addBox(a, { rect: { x: 5, y: 6, w: 7, h: 8 } });
    await saveA.flush();
    expect(await saveA.readSaved('test-set')).toBe(exportAnnotations(a.get()));

    const b = makeTestStore();
    const saveB = autosaveFor(b, db);
    const loaded = await saveB.restore();
    expect(loaded?.boxes).toEqual([box]);
    expect(b.get().boxes).toEqual(a.get().boxes);
    expect(b.get().lungs).toEqual(a.get().lungs);
  });

  it('restore() with nothing saved returns undefined and changes nothing', async () => {
    const s = makeTestStore();
    const before = s.get();
    expect(await autosaveFor(s, `t-${++dbCount}`).restore()).toBeUndefined();
    expect(s.get()).toBe(before);
  });

  it('a change is written after the quiet time without flush()', async () => {
    const db = `t-${++dbCount}`;
    const s = makeTestStore();
    const save = autosaveFor(s, db, 5);
    const box = addBox(s, { rect: { x: 5, y: 6, w: 7, h: 8 } });
    moveBox(s, box.id, { x: 50, y: 60 });
    await new Promise((r) => setTimeout(r, 60));
    await save.flush();
    expect(await save.readSaved('test-set')).toContain('"x": 50');
  });

  it('restore() flags a box whose sentence text changed as stale, never re-attached, and keeps it on the next save', async () => {
    const db = `t-${++dbCount}`;
    const a = makeTestStore();
    const saveA = autosaveFor(a, db);
    addBox(a, { rect: { x: 5, y: 6, w: 7, h: 8 } });
    addBox(a, { rect: { x: 9, y: 9, w: 7, h: 8 }, sentenceIndex: 2 });
    await saveA.flush();

    const b = createAppStore({}, { now: () => '2024-07-01T00:00:00.000Z' });
    loadSet(b, { name: 'test-set', studies: [{ ...STUDIES[0], report: STUDIES[0].report.replace('Patchy', 'Faint') }, STUDIES[1]] });
    setImageSize(b, 'study-a', { width: 400, height: 300 });
    const saveB = autosaveFor(b, db);
    await saveB.restore();
    expect(Object.keys(b.get().boxes)).toEqual(['box-2']);
    expect(b.get().stale.map((s) => [s.box.id, s.reason])).toEqual([['box-1', 'edited']]);
    expect(b.get().notices.at(-1)?.items[0]).toMatch(/drawn on "Patchy opacity in the right lower zone\."/);
    addBox(b, { rect: { x: 100, y: 100, w: 7, h: 8 }, sentenceIndex: 3 });
    await saveB.flush();
    const saved = await saveB.readSaved('test-set');
    expect(saved).toContain('"id": "box-1"');
    expect(saved).toContain('"id": "box-3"');
  });

  it('restore() of an unreadable saved file keeps a copy under its own key and says so', async () => {
    const db = `t-${++dbCount}`;
    const a = makeTestStore();
    const saveA = autosaveFor(a, db);
    const req = indexedDB.open(db);
    await new Promise((r) => (req.onsuccess = r));
    const tx = req.result.transaction('annotations', 'readwrite');
    tx.objectStore('annotations').put({ set: 'test-set', text: '{"schema":"tessera.annotations/99","set":"test-set","boxes":[]}', saved: 'T' });
    await new Promise((r) => (tx.oncomplete = r));
    req.result.close();
    await expect(saveA.restore()).rejects.toThrow(/version 99/);
    expect(a.get().notices.at(-1)?.text).toMatch(/kept in storage as "test-set \(unreadable, saved T\)"/);
    expect(await saveA.readSaved('test-set (unreadable, saved T)')).toContain('/99');
  });

  it('the hit rule and the aggregator are saved after a change and restoreView() brings them back on a new store', async () => {
    const db = `t-${++dbCount}`;
    const a = makeTestStore();
    const saveA = autosaveFor(a, db, 5);
    setAggregator(a, { kind: 'softmax', temperature: 0.2 });
    setHitRule(a, 'overlap');
    setOverlay(a, 'features');
    setWindow(a, { centre: 100, width: 50 });
    await new Promise((r) => setTimeout(r, 60));
    await saveA.flush();
    const text = await saveA.readSavedView();
    expect(JSON.parse(text ?? '{}')).toMatchObject({ schema: 'tessera.view/1', hitRule: 'overlap', aggregator: { kind: 'softmax', temperature: 0.2 }, overlay: 'features' });
    // The display window belongs to one image and is not kept.
    expect(text).not.toContain('window');

    const b = makeTestStore();
    const saveB = autosaveFor(b, db);
    expect(b.get().view.hitRule).toBe('centre');
    const applied = await saveB.restoreView();
    expect(applied).toMatchObject({ hitRule: 'overlap', overlay: 'features' });
    expect(b.get().view).toMatchObject({ hitRule: 'overlap', aggregator: { kind: 'softmax', temperature: 0.2 }, overlay: 'features', annotator: 'tester' });
    expect(b.get().view.window).toBeUndefined();
    expect(b.get().notices).toEqual([]);
  });

  it('restoreView() with nothing saved, or after the view already changed, leaves the view as it is', async () => {
    const db = `t-${++dbCount}`;
    const a = makeTestStore();
    const saveA = autosaveFor(a, db);
    expect(await saveA.restoreView()).toBeUndefined();
    setHitRule(a, 'upsampled');
    await saveA.flush();

    const b = makeTestStore();
    const saveB = autosaveFor(b, db);
    setHitRule(b, 'overlap');
    expect(await saveB.restoreView()).toBeUndefined();
    expect(b.get().view.hitRule).toBe('overlap');
  });

  it('restoreView() applies the fields its commands accept and names the refused ones in a warning', async () => {
    const db = `t-${++dbCount}`;
    const a = makeTestStore();
    const saveA = autosaveFor(a, db);
    await saveA.flush();
    const req = indexedDB.open(db);
    await new Promise((r) => (req.onsuccess = r));
    const tx = req.result.transaction('view', 'readwrite');
    const text = JSON.stringify({ schema: 'tessera.view/1', hitRule: 'middle', aggregator: { kind: 'topk', k: 3 }, opacity: 2, showGrid: 'yes' });
    tx.objectStore('view').put({ key: 'settings', text, saved: 'T' });
    await new Promise((r) => (tx.oncomplete = r));
    req.result.close();

    const b = makeTestStore();
    const applied = await autosaveFor(b, db).restoreView();
    expect(applied).toEqual({ aggregator: { kind: 'topk', k: 3 } });
    expect(b.get().view).toMatchObject({ hitRule: 'centre', aggregator: { kind: 'topk', k: 3 }, opacity: 0.5, showGrid: true });
    const notice = b.get().notices.at(-1);
    expect(notice?.level).toBe('warning');
    expect(notice?.items).toEqual([
      expect.stringMatching(/^hitRule: 'rule' must be one of/),
      expect.stringMatching(/^opacity: 'opacity' must be a number in \[0, 1\]; got 2/),
      expect.stringMatching(/^showGrid: 'showGrid' must be true or false; got "yes"/),
    ]);
  });

  it('restoreView() of text that is not a view record warns and changes nothing', async () => {
    const db = `t-${++dbCount}`;
    const a = makeTestStore();
    await autosaveFor(a, db).flush();
    const req = indexedDB.open(db);
    await new Promise((r) => (req.onsuccess = r));
    const tx = req.result.transaction('view', 'readwrite');
    tx.objectStore('view').put({ key: 'settings', text: '{"schema":"tessera.view/9","hitRule":"overlap"}', saved: 'T' });
    await new Promise((r) => (tx.oncomplete = r));
    req.result.close();
    const b = makeTestStore();
    const before = b.get().view;
    expect(await autosaveFor(b, db).restoreView()).toEqual({});
    expect(b.get().view).toBe(before);
    expect(b.get().notices.at(-1)?.items[0]).toMatch(/schema "tessera.view\/1"/);
  });
});
