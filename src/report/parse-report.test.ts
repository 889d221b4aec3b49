import { describe, expect, it } from 'vitest';
import { createRng } from '../core/seeded-random';
import { parseReport } from './parse-report';
import * as report from './index';

const REPORT = [
  'INDICATION: Fever and cough, ?pneumonia.',
  '',
  'COMPARISON: Chest radiograph from two weeks earlier.',
  '',
  'FINDINGS: There is new consolidation in the right lower lobe. No pneumothorax or pleural effusion.',
  'The cardiac silhouette is not enlarged. Possible small nodule in the left upper zone.',
  '',
  'IMPRESSION:',
  '1. Right lower lobe pneumonia.',
  '2. No effusion but a small left apical pneumothorax.',
].join('\n');

describe('parseReport', () => {
  it('parseReport(empty or blank) gives no sections and no sentences', () => {
    expect(parseReport('')).toEqual({ sections: [], sentences: [] });
    expect(parseReport('\n   \n')).toEqual({ sections: [], sentences: [] });
  });

  it('parseReport(non-string) throws a TypeError naming the parameter', () => {
    expect(() => parseReport(3 as unknown as string)).toThrow(/'text' must be a string; got number/);
  });

  it('parseReport(text) combines sections, negation, uncertainty and zones per sentence', () => {
    const r = parseReport(REPORT);
    expect(r.sections.map((s) => s.name)).toEqual(['indication', 'comparison', 'findings', 'impression']);
    expect(
      r.sentences.map((s) => [s.index, s.section, s.text, s.negated, s.uncertain, s.zones.join(' ')]),
    ).toEqual([
      [0, 'indication', 'Fever and cough, ?pneumonia.', false, true, ''],
      [1, 'comparison', 'Chest radiograph from two weeks earlier.', false, false, ''],
      [2, 'findings', 'There is new consolidation in the right lower lobe.', false, false, 'right-lower'],
      [3, 'findings', 'No pneumothorax or pleural effusion.', true, false, ''],
      [4, 'findings', 'The cardiac silhouette is not enlarged.', true, false, ''],
      [5, 'findings', 'Possible small nodule in the left upper zone.', false, true, 'left-upper'],
      [6, 'impression', 'Right lower lobe pneumonia.', false, false, 'right-lower'],
      [7, 'impression', 'No effusion but a small left apical pneumothorax.', false, false, 'left-upper'],
    ]);
  });

  it('parseReport(text) keeps sentence spans on the report and nested spans on the sentence', () => {
    const r = parseReport(REPORT);
    for (const s of r.sentences) {
      expect(REPORT.slice(s.span.start, s.span.end)).toBe(s.text);
      expect(s.negated).toBe(s.negation.negated);
      expect(s.uncertain).toBe(s.negation.uncertain);
      for (const m of s.locations) expect(s.text.slice(m.span.start, m.span.end)).toBe(m.phrase);
      for (const t of s.negation.triggers) expect(s.text.slice(t.span.start, t.span.end)).toBe(t.phrase);
    }
  });

  it('parseReport(text) is deterministic and indexes sentences 0..n-1 on seeded random reports', () => {
    const lines = [
      'FINDINGS:', 'Impression:', '1. Small right effusion.', '2. No pneumothorax.', '- Bibasilar atelectasis',
      'Heart size is normal.', 'Possible left lower lobe consolidation', '', 'Lungs clear; no focal opacity.',
    ];
    const rng = createRng(99);
    for (let trial = 0; trial < 100; trial++) {
      const n = rng.int(12);
      const text = Array.from({ length: n }, () => lines[rng.int(lines.length)]).join(rng.next() < 0.5 ? '\n' : ' ');
      const a = parseReport(text);
      expect(parseReport(text)).toEqual(a);
      a.sentences.forEach((s, i) => {
        expect(s.index).toBe(i);
        expect(text.slice(s.span.start, s.span.end)).toBe(s.text);
        if (i > 0) expect(s.span.start).toBeGreaterThanOrEqual(a.sentences[i - 1].span.end);
      });
    }
  });

  it('index re-exports the public report API', () => {
    for (const name of ['parseReport', 'splitReport', 'detectNegation', 'analyseNegation', 'isNormalStatement', 'findLocations', 'sentenceZones', 'tokeniseSentence']) {
      expect(typeof (report as Record<string, unknown>)[name], name).toBe('function');
    }
  });
});
