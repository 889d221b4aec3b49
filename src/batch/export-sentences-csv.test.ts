import { describe, expect, it } from 'vitest';
import { parseCsv } from './csv-parse.test-util';
import { csvField } from './export-format';
import { sentenceRecord, sentenceRecords } from './export-fixtures.test-util';
import { SENTENCES_CSV_COLUMNS, sentencesCsv } from './export-sentences-csv';

function asObjects(text: string): Record<string, string>[] {
  const [header, ...rows] = parseCsv(text);
  return rows.map((r) => Object.fromEntries(header.map((h, i) => [h, r[i]])));
}

describe('sentencesCsv', () => {
  it('sentencesCsv([]) is the header line alone', () => {
    expect(sentencesCsv([])).toBe(SENTENCES_CSV_COLUMNS.join(',') + '\r\n');
  });

  it('sentencesCsv(records) round-trips text with quotes, commas and newlines through an RFC 4180 reader', () => {
    const records = sentenceRecords();
    const rows = asObjects(sentencesCsv(records));
    expect(rows.length).toBe(records.length);
    rows.forEach((row, i) => {
      expect(Object.keys(row)).toEqual([...SENTENCES_CSV_COLUMNS]);
      expect(row.sentence_text).toBe(records[i].text);
      expect(row.model).toBe(records[i].model);
    });
    expect(rows[1].sentence_text).toContain('"no change"');
  });

  it('sentencesCsv writes flags as 1/0, zones joined by ";", empty cells for undefined and NaN', () => {
    const rows = asObjects(sentencesCsv(sentenceRecords()));
    expect(rows[0]).toMatchObject({ negated: '0', scored: '1', hit_centre: '1', hit_upsampled: '0', top_k_hit: '1', n_boxes: '1', zones: 'right-upper' });
    expect(rows[1]).toMatchObject({ zones: 'left-lower;left-middle', n_boxes: '2', cnr: '', laterality_swap: '1', finding: '' });
    expect(rows[2]).toMatchObject({ negated: '1', scored: '0', zones: '', n_boxes: '0', cnr: '' });
  });

  it('sentencesCsv rounds numbers to 6 significant digits and keeps grid indices exact', () => {
    const rows = asObjects(sentencesCsv([sentenceRecord({ score: 0.4123456789, bestCell: { row: 13, col: 0 }, bestPoint: { x: 1e7 + 0.5, y: 2.25 } })]));
    expect(rows[0]).toMatchObject({ score: '0.412346', best_row: '13', best_col: '0', best_x: '10000000', best_y: '2.25' });
  });

  it('sentencesCsv is deterministic: the same records give the same string', () => {
    expect(sentencesCsv(sentenceRecords())).toBe(sentencesCsv(sentenceRecords()));
  });

  it('csvField quotes only when needed and doubles embedded quotes', () => {
    expect(csvField('plain')).toBe('plain');
    expect(csvField('a,b')).toBe('"a,b"');
    expect(csvField('say "hi"')).toBe('"say ""hi"""');
    expect(csvField('line\r\nbreak')).toBe('"line\r\nbreak"');
    expect(csvField(' lead')).toBe('" lead"');
    expect(csvField('')).toBe('');
  });

  it('csvField output parses back to the input for awkward strings (property)', () => {
    const pieces = ['"', ',', '\n', '\r', '\r\n', ' ', 'a', 'é', ';', '""'];
    for (let seed = 0; seed < 300; seed++) {
      let s = '';
      for (let k = 0, x = seed; k < 6; k++, x = Math.floor(x / pieces.length) + k * 7) s += pieces[x % pieces.length];
      expect(parseCsv(csvField(s) + ',' + csvField(s) + '\r\n')).toEqual([[s, s]]);
    }
  });
});
