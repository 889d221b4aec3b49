import 'fake-indexeddb/auto';
import { afterEach, describe, expect, it } from 'vitest';
import { addBox, loadSet, moveBox, setImageSize, setLungTemplate } from './commands';
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
    const req = indexedDB.open(db, 1);
    await new Promise((r) => (req.onsuccess = r));
    const tx = req.result.transaction('annotations', 'readwrite');
    tx.objectStore('annotations').put({ set: 'test-set', text: '{"schema":"tessera.annotations/99","set":"test-set","boxes":[]}', saved: 'T' });
    await new Promise((r) => (tx.oncomplete = r));
    req.result.close();
    await expect(saveA.restore()).rejects.toThrow(/version 99/);
    expect(a.get().notices.at(-1)?.text).toMatch(/kept in storage as "test-set \(unreadable, saved T\)"/);
    expect(await saveA.readSaved('test-set (unreadable, saved T)')).toContain('/99');
  });
});
