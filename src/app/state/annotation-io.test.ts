import { describe, expect, it } from 'vitest';
import { hashSentenceText } from '../../core/text-hash';
import { acceptProposal, addBox, loadSet, selectSentence, setImageSize, setLungTemplate, undo } from './commands';
import { exportAnnotations, exportCocoJson, importAnnotations } from './annotation-io';
import { createAppStore } from './store';
import { LUNGS, makeTestStore, STUDIES } from './test-support';

function drawSome() {
  const store = makeTestStore();
  setLungTemplate(store, 'study-a', LUNGS);
  addBox(store, { rect: { x: 60, y: 170, w: 50, h: 40 } });
  selectSentence(store, 2);
  acceptProposal(store);
  addBox(store, { rect: { x: 250.5, y: 200.25, w: 30, h: 20 }, study: 'study-b', sentenceIndex: 0, zone: 'left-lower' });
  return store;
}

describe('annotation import and export', () => {
  it('exportAnnotations then importAnnotations into a fresh store gives identical records', () => {
    const a = drawSome();
    const text = exportAnnotations(a.get());
    const b = makeTestStore();
    const report = importAnnotations(b, text, 'annotations.json');
    expect(report.ok).toBe(true);
    expect(report.problems).toEqual([]);
    expect(b.get().boxes).toEqual(a.get().boxes);
    expect(b.get().lungs).toEqual(a.get().lungs);
    expect(exportAnnotations(b.get())).toBe(text);
    expect(b.get().notices.at(-1)?.level).toBe('info');
  });

  it('exportCocoJson then importAnnotations gives identical boxes', () => {
    const a = drawSome();
    const b = makeTestStore();
    const report = importAnnotations(b, exportCocoJson(a.get()), 'boxes.coco.json');
    expect(report.added).toHaveLength(4);
    expect(b.get().boxes).toEqual(a.get().boxes);
  });

  it('importAnnotations of the same file twice adds nothing the second time', () => {
    const a = drawSome();
    const text = exportAnnotations(a.get());
    const report = importAnnotations(a, text, 'annotations.json');
    expect(report.added).toEqual([]);
    expect(report.unchanged).toHaveLength(4);
  });

  it('importAnnotations is one undo step', () => {
    const text = exportAnnotations(drawSome().get());
    const b = makeTestStore();
    importAnnotations(b, text, 'annotations.json');
    undo(b);
    expect(b.get().boxes).toEqual({});
  });

  it('importAnnotations of a newer version keeps existing boxes and says why', () => {
    const a = drawSome();
    const before = a.get().boxes;
    const report = importAnnotations(a, JSON.stringify({ schema: 'tessera.annotations/9', set: 'test-set', boxes: [] }), 'new.json');
    expect(report.ok).toBe(false);
    expect(a.get().boxes).toBe(before);
    expect(report.notice.level).toBe('error');
    expect(report.notice.text).toMatch(/Nothing was imported from new\.json/);
    expect(report.notice.items[0]).toMatch(/new\.json \(schema\): the annotations are in version 9/);
  });

  it('importAnnotations of text that is not JSON keeps existing boxes', () => {
    const a = drawSome();
    const report = importAnnotations(a, '{ nope', 'bad.json');
    expect(report.ok).toBe(false);
    expect(report.notice.items[0]).toMatch(/bad\.json: the file is not JSON/);
    expect(Object.keys(a.get().boxes)).toHaveLength(4);
  });

  it('importAnnotations of a file for other studies lists each box and adds none of them', () => {
    const other = createAppStore({ view: { annotator: 'x' } }, { now: () => '2024-01-01T00:00:00.000Z' });
    loadSet(other, { name: 'other-set', studies: [{ id: 'study-z', image: 'z.png', report: 'Left lower zone opacity.' }] });
    setImageSize(other, 'study-z', { width: 100, height: 100 });
    addBox(other, { rect: { x: 1, y: 1, w: 5, h: 5 } });
    addBox(other, { rect: { x: 10, y: 10, w: 5, h: 5 } });
    const mine = drawSome();
    const before = mine.get().boxes;
    const report = importAnnotations(mine, exportAnnotations(other.get()), 'other.json');
    expect(report.added).toEqual([]);
    expect(mine.get().boxes).toEqual(before);
    expect(report.notice.level).toBe('warning');
    // The headline itself says why nothing came in, not only the folded list.
    expect(report.notice.text).toMatch(/^Nothing usable in other\.json: .*other-set/);
    expect(report.notice.items.join('\n')).toMatch(/set "other-set", not "test-set"/);
    expect(report.notice.items.filter((i) => /study "study-z" is not in the set/.test(i))).toHaveLength(2);
    expect(report.notice.items.some((i) => i.includes('(box-1)')) && report.notice.items.some((i) => i.includes('(box-2)'))).toBe(true);
  });

  it('importAnnotations gives a box whose id is taken by a different box a new id', () => {
    const a = makeTestStore();
    addBox(a, { rect: { x: 1, y: 1, w: 5, h: 5 } });
    const b = makeTestStore();
    addBox(b, { rect: { x: 100, y: 100, w: 9, h: 9 } });
    const report = importAnnotations(b, exportAnnotations(a.get()), 'a.json');
    expect(report.renamed).toEqual([{ from: 'box-1', to: 'box-2' }]);
    expect(b.get().boxes['box-1'].box.x).toBe(100);
    expect(b.get().boxes['box-2'].box.x).toBe(1);
  });

  it('importAnnotations flags a box whose sentence was edited as stale and does not attach it', () => {
    const a = makeTestStore();
    addBox(a, { rect: { x: 1, y: 1, w: 5, h: 5 } });
    const edited = createAppStore({}, { now: () => '2024-01-01T00:00:00.000Z' });
    loadSet(edited, { name: 'test-set', studies: [{ ...STUDIES[0], report: STUDIES[0].report.replace('Patchy', 'Dense') }, STUDIES[1]] });
    const report = importAnnotations(edited, exportAnnotations(a.get()), 'a.json');
    expect(report.added).toEqual([]);
    expect(report.stale).toEqual(['box-1']);
    expect(edited.get().boxes).toEqual({});
    expect(edited.get().stale[0]).toMatchObject({ reason: 'edited', currentText: 'Dense opacity in the right lower zone.' });
    expect(edited.get().stale[0].box.sentence.hash).toBe(hashSentenceText('Patchy opacity in the right lower zone.'));
    expect(exportAnnotations(edited.get())).toContain('Patchy opacity');
  });
});
