import { describe, expect, it } from 'vitest';
import Ajv2020 from 'ajv/dist/2020';
import annotationsSchema from './schemas/annotations.schema.json';
import { hashSentenceText } from '../core/text-hash';
import { loadAnnotations, serialiseAnnotations, type AnnotationContext } from './annotations';
import { DatasetError } from './errors';
import type { ReferenceBox } from './types';

const sentences = ['Right lower lobe consolidation.', 'Small left effusion.', 'Heart size is normal.'];
const ctx: AnnotationContext = {
  imageSizes: new Map([['s1', { width: 100, height: 80 }]]),
  sentencesByStudy: new Map([['s1', sentences.map((text, index) => ({ index, text }))]]),
};

function box(id: string, index: number, over: Partial<ReferenceBox> = {}): ReferenceBox {
  const text = sentences[index];
  return {
    id,
    study: 's1',
    sentence: { index, text, hash: hashSentenceText(text) },
    zone: 'right-lower',
    box: { x: 10, y: 20, w: 30, h: 15 },
    annotator: 'tester',
    created: '2024-01-02T03:04:05Z',
    ...over,
  };
}

const doc = (boxes: unknown[], extra: Record<string, unknown> = {}): Record<string, unknown> => ({ schema: 'tessera.annotations/2', set: 'demo', boxes, ...extra });
const validateSchema = new Ajv2020({ allErrors: true }).compile(annotationsSchema);

describe('annotations', () => {
  it('loadAnnotations(valid) keeps every box and agrees with annotations.schema.json', () => {
    const json = doc([box('b1', 0), box('b2', 1, { zone: 'left-lower' })], {
      lungs: [{ study: 's1', right: { x: 5, y: 5, w: 40, h: 60 }, left: { x: 55, y: 5, w: 40, h: 60 }, annotator: 't', created: '2024-01-01T00:00:00Z' }],
    });
    expect(validateSchema(json)).toBe(true);
    const r = loadAnnotations(json, 'annotations.json', ctx);
    expect(r.problems).toEqual([]);
    expect(r.boxes.map((b) => b.id)).toEqual(['b1', 'b2']);
    expect(r.lungs).toHaveLength(1);
    expect(r.stale).toEqual([]);
  });

  it('loadAnnotations(box outside image / zero area) reports each by box id and keeps it in the file', () => {
    const json = doc([box('out', 0, { box: { x: 90, y: 10, w: 20, h: 5 } }), box('neg', 0, { box: { x: -1, y: 0, w: 5, h: 5 } }), box('flat', 1, { box: { x: 10, y: 10, w: 0, h: 5 } }), box('ok', 2)]);
    expect(validateSchema(json)).toBe(true);
    const r = loadAnnotations(json, 'sets/demo/annotations.json', ctx);
    expect(r.problems.map((p) => [p.code, p.item])).toEqual([
      ['box-outside-image', 'out'],
      ['box-outside-image', 'neg'],
      ['box-zero-area', 'flat'],
    ]);
    expect(r.problems[0].message).toMatch(/^sets\/demo\/annotations\.json \(out\): .*100 x 80 image.*Fix: /);
    expect(r.boxes.map((b) => b.id)).toEqual(['ok']);
    expect(r.file.boxes).toHaveLength(4);
  });

  it('loadAnnotations(edited report) reports the box stale with the current text, never re-attaching it', () => {
    const edited: AnnotationContext = {
      ...ctx,
      sentencesByStudy: new Map([['s1', [
        { index: 0, text: 'Heart size is normal.' },
        { index: 1, text: 'Small left effusion.' },
        { index: 2, text: 'Right lower lobe consolidation.' },
      ]]]),
    };
    const r = loadAnnotations(doc([box('moved', 0), box('same', 1), box('gone', 2, { sentence: { index: 7, text: 'Gone.', hash: hashSentenceText('Gone.') } })]), 'a.json', edited);
    expect(r.boxes.map((b) => b.id)).toEqual(['same']);
    expect(r.stale.map((s) => [s.box.id, s.reason, s.suggestedIndex, s.currentText])).toEqual([
      ['moved', 'edited', 2, 'Heart size is normal.'],
      ['gone', 'missing', undefined, undefined],
    ]);
    expect(r.stale[0].box.sentence.index).toBe(0);
    expect(r.problems.map((p) => [p.code, p.item])).toEqual([['stale-annotation', 'moved'], ['stale-annotation', 'gone']]);
    expect(r.problems[0].message).toContain('the same text is now sentence 2');
    expect(r.problems[0].fix).toContain('confirm');
  });

  it('loadAnnotations(whitespace-only edit) still matches, because the hash normalises whitespace', () => {
    const spaced: AnnotationContext = { ...ctx, sentencesByStudy: new Map([['s1', [{ index: 0, text: '  Right lower   lobe consolidation. ' }]]]) };
    expect(loadAnnotations(doc([box('b', 0)]), 'a.json', spaced).boxes).toHaveLength(1);
  });

  it('loadAnnotations(version 1) migrates corners and resolves sentences by text', () => {
    const v1 = {
      schema: 'tessera.annotations/1',
      set: 'demo',
      boxes: [
        { id: 'a', study: 's1', sentence_text: 'Small left effusion.', zone: 'left-lower', bbox: [60, 50, 90, 70], annotator: 'old', created: '2020-01-01T00:00:00Z' },
        { id: 'b', study: 's1', sentence_text: 'A sentence no longer in the report.', zone: 'other', bbox: [1, 1, 5, 5], annotator: 'old', created: '2020-01-01T00:00:00Z' },
      ],
    };
    const r = loadAnnotations(v1, 'a.json', ctx);
    expect(r.migratedFrom).toBe('tessera.annotations/1');
    expect(r.file.schema).toBe('tessera.annotations/2');
    expect(r.boxes).toEqual([
      { id: 'a', study: 's1', sentence: { index: 1, text: 'Small left effusion.', hash: hashSentenceText('Small left effusion.') }, zone: 'left-lower', box: { x: 60, y: 50, w: 30, h: 20 }, annotator: 'old', created: '2020-01-01T00:00:00Z' },
    ]);
    expect(r.stale.map((s) => s.box.id)).toEqual(['b']);
    expect(r.problems[0].message).toContain('no sentence of the report has that text now');
    // The migrated file is valid version 2 and reloads to the same result.
    const again = JSON.parse(serialiseAnnotations(r.file));
    expect(validateSchema(again)).toBe(true);
    const r2 = loadAnnotations(again, 'a.json', ctx);
    expect(r2.boxes).toEqual(r.boxes);
    expect(r2.stale.map((s) => s.box.id)).toEqual(['b']);
  });

  it('loadAnnotations(unknown version / foreign file) throws annotation-version naming the file', () => {
    for (const schema of ['tessera.annotations/3', 'tessera.annotations/x', 'coco', undefined]) {
      try {
        loadAnnotations({ schema, set: 'demo', boxes: [] }, 'sets/demo/annotations.json', ctx);
        expect.unreachable();
      } catch (e) {
        expect(e).toBeInstanceOf(DatasetError);
        expect((e as DatasetError).code).toBe('annotation-version');
        expect((e as DatasetError).message).toContain('sets/demo/annotations.json');
      }
    }
    expect(() => loadAnnotations([], 'a.json', ctx)).toThrow(expect.objectContaining({ code: 'annotation-schema' }));
    expect(() => loadAnnotations(doc([]).boxes, 'a.json', ctx)).toThrow(DatasetError);
  });

  const malformed: Array<[string, unknown]> = [
    ['missing id', { ...box('x', 0), id: undefined }],
    ['bad zone', { ...box('x', 0), zone: 'upper' }],
    ['NaN-like box', { ...box('x', 0), box: { x: 'a', y: 0, w: 1, h: 1 } }],
    ['fractional index', { ...box('x', 0), sentence: { index: 0.5, text: 't', hash: hashSentenceText('t') } }],
    ['extra field', { ...box('x', 0), note: 'hi' }],
    ['missing created', { ...box('x', 0), created: undefined }],
  ];
  for (const [title, b] of malformed) {
    it(`loadAnnotations(${title}) reports annotation-schema, as annotations.schema.json (ajv) rejects it`, () => {
      const json = JSON.parse(JSON.stringify(doc([b, box('good', 0)])));
      expect(validateSchema(json)).toBe(false);
      const r = loadAnnotations(json, 'a.json', ctx);
      expect(r.problems.map((p) => p.code)).toEqual(['annotation-schema']);
      expect(r.boxes.map((x) => x.id)).toEqual(['good']);
    });
  }

  it('loadAnnotations(duplicate box ids, unknown study, hash not matching text) reports each', () => {
    const r = loadAnnotations(doc([box('d', 0), box('d', 1), box('u', 0, { study: 'nope' }), box('h', 0, { sentence: { index: 0, text: sentences[0], hash: 'deadbeef' } })]), 'a.json', ctx);
    expect(r.problems.map((p) => [p.code, p.item])).toEqual([['duplicate-box', 'd'], ['box-unknown-study', 'u'], ['annotation-schema', 'h']]);
    expect(r.boxes.map((b) => b.id)).toEqual(['d']);
  });

  it('serialiseAnnotations(file) is byte-identical for the same content in any order and key order', () => {
    const a = loadAnnotations(doc([box('b2', 1), box('b1', 0)]), 'a.json', ctx).file;
    const shuffled = { ...a, boxes: [...a.boxes].reverse().map((b) => ({ created: b.created, annotator: b.annotator, box: { h: b.box.h, w: b.box.w, y: b.box.y, x: b.box.x }, zone: b.zone, sentence: { hash: b.sentence.hash, text: b.sentence.text, index: b.sentence.index }, study: b.study, id: b.id })) };
    const s1 = serialiseAnnotations(a);
    expect(serialiseAnnotations(shuffled)).toBe(s1);
    expect(s1.endsWith('}\n')).toBe(true);
    expect(s1.indexOf('"b1"')).toBeLessThan(s1.indexOf('"b2"'));
    expect(serialiseAnnotations(loadAnnotations(JSON.parse(s1), 'a.json', ctx).file)).toBe(s1);
    expect(serialiseAnnotations({ schema: 'tessera.annotations/2', set: 'empty', boxes: [] })).toBe('{\n  "schema": "tessera.annotations/2",\n  "set": "empty",\n  "boxes": []\n}\n');
  });
});
