import { describe, expect, it } from 'vitest';
import { hashSentenceText } from '../core/text-hash';
import { CSV_HEADER, exportCoco, exportCsv, importCoco, importCsv, parseCsv } from './interchange';
import { serialiseAnnotations } from './annotations';
import { DatasetError } from './errors';
import type { AnnotationFile, ReferenceBox } from './types';

function box(id: string, study: string, index: number, text: string, over: Partial<ReferenceBox> = {}): ReferenceBox {
  return { id, study, sentence: { index, text, hash: hashSentenceText(text) }, zone: 'right-lower', box: { x: 10.5, y: 20, w: 30, h: 15.25 }, annotator: 'a, "quoted" one', created: '2024-01-02T03:04:05Z', ...over };
}

const file: AnnotationFile = {
  schema: 'tessera.annotations/2',
  set: 'demo',
  boxes: [
    box('b2', 's2', 0, 'Left upper lobe nodule,\nmeasuring 8 mm.', { zone: 'left-upper' }),
    box('b1', 's1', 1, 'Heart size is "normal".', { zone: 'cardiac', box: { x: 0, y: 0, w: 1e-7, h: 123456.789 } }),
    box('b3', 's1', 0, 'Right lower consolidation.'),
  ],
};
const images = new Map([
  ['s1', { file: 'images/s1.png', width: 512, height: 512 }],
  ['s2', { file: 'images/s2.dcm', width: 256, height: 300 }],
]);

describe('interchange', () => {
  it('exportCoco/importCoco round-trip is lossless (same serialised annotations)', () => {
    const coco = exportCoco(file, images);
    expect(coco.images.map((i) => [i.id, i.tessera_study, i.width])).toEqual([[1, 's1', 512], [2, 's2', 256]]);
    expect(coco.categories).toHaveLength(9);
    const a = coco.annotations.find((x) => x.tessera.box_id === 'b1');
    expect(a?.bbox).toEqual([0, 0, 1e-7, 123456.789]);
    expect(coco.categories.find((c) => c.id === a?.category_id)?.name).toBe('cardiac');
    const back = importCoco(JSON.parse(JSON.stringify(coco)), 'boxes.coco.json');
    expect(back.problems).toEqual([]);
    expect(serialiseAnnotations(back.file)).toBe(serialiseAnnotations(file));
  });

  it('exportCoco(file, images without a study) throws a RangeError naming the study', () => {
    expect(() => exportCoco(file, new Map([['s1', images.get('s1')!]]))).toThrow(/'s2'/);
  });

  it('importCoco(foreign COCO without sentence keys) reports each annotation and keeps none', () => {
    const foreign = {
      images: [{ id: 7, file_name: 'x/s9.png', width: 10, height: 10 }],
      annotations: [{ id: 1, image_id: 7, category_id: 3, bbox: [1, 1, 2, 2] }, { id: 2, image_id: 8, category_id: 3, bbox: [1, 1, 2, 2] }, { id: 3, image_id: 7, category_id: 99, bbox: [1, 1, 2, 2] }],
      categories: [{ id: 3, name: 'right-lower' }],
    };
    const r = importCoco(foreign, 'f.json', { set: 'demo' });
    expect(r.file.boxes).toEqual([]);
    expect(r.problems.map((p) => p.item)).toEqual(['annotation 1', 'annotation 2', 'annotation 3']);
    expect(r.problems[0].message).toMatch(/sentence key/);
    expect(() => importCoco({ images: [] }, 'f.json')).toThrow(DatasetError);
  });

  it('exportCsv(file) writes the header and RFC 4180 quoting', () => {
    const csv = exportCsv(file);
    const lines = csv.split('\r\n');
    expect(lines[0]).toBe(CSV_HEADER.join(','));
    expect(csv).toContain('"Heart size is ""normal""."');
    expect(csv).toContain('"Left upper lobe nodule,\nmeasuring 8 mm."');
    expect(csv).toContain('"a, ""quoted"" one"');
    expect(csv.endsWith('\r\n')).toBe(true);
    expect(exportCsv({ ...file, boxes: [] })).toBe(CSV_HEADER.join(',') + '\r\n');
  });

  it('exportCsv/importCsv round-trip keeps every field but the box id, and ids are stable', () => {
    const csv = exportCsv(file);
    const back = importCsv(csv, 'boxes.csv', { set: 'demo' });
    expect(back.problems).toEqual([]);
    const strip = (f: AnnotationFile): unknown => JSON.parse(serialiseAnnotations(f)).boxes.map((b: Record<string, unknown>) => ({ ...b, id: undefined }));
    expect(strip(back.file)).toEqual(strip(file));
    expect(exportCsv(back.file)).toBe(csv);
    expect(importCsv(csv, 'boxes.csv', { set: 'demo' }).file.boxes.map((b) => b.id)).toEqual(back.file.boxes.map((b) => b.id));
    expect(new Set(back.file.boxes.map((b) => b.id)).size).toBe(3);
  });

  it('parseCsv(text) handles quotes, embedded newlines, LF endings and empty fields', () => {
    expect(parseCsv('a,"b,c","d""e"\n,,\n"x\r\ny",z')).toEqual([['a', 'b,c', 'd"e'], ['', '', ''], ['x\r\ny', 'z']]);
    expect(parseCsv('')).toEqual([]);
    expect(() => parseCsv('"open')).toThrow(SyntaxError);
  });

  it('importCsv(bad rows / bad header) reports each row by line and throws for a header without the columns', () => {
    const text = [CSV_HEADER.join(','), 's1,0,,Text.,right-lower,1,2,3,4,me,2024', 's1,x,,Text.,right-lower,1,2,3,4,me,2024', 's1,0,,Text.,upper,1,2,3,4,me,2024', 's1,0,,Text.,right-lower,1,2,,4,me,2024', 's1,0'].join('\n');
    const r = importCsv(text, 'b.csv', { set: 'demo' });
    expect(r.file.boxes).toHaveLength(1);
    expect(r.file.boxes[0].sentence.hash).toBe(hashSentenceText('Text.'));
    expect(r.problems.map((p) => p.item)).toEqual(['line 3', 'line 4', 'line 5', 'line 6']);
    expect(() => importCsv('study,zone\n', 'b.csv', { set: 'demo' })).toThrow(/sentence_index/);
    expect(() => importCsv('"open', 'b.csv', { set: 'demo' })).toThrow(DatasetError);
  });
});
