import { describe, expect, it } from 'vitest';
import { createRng } from '../core/seeded-random';
import { splitReport } from './split-report';

function texts(report: string): string[] {
  return splitReport(report).sentences.map((s) => s.text);
}

function expectExactSpans(report: string): void {
  const { sentences, sections } = splitReport(report);
  let previousEnd = 0;
  for (const s of sentences) {
    expect(s.span.start).toBeGreaterThanOrEqual(previousEnd);
    expect(s.span.end).toBeGreaterThan(s.span.start);
    expect(s.span.end).toBeLessThanOrEqual(report.length);
    expect(report.slice(s.span.start, s.span.end)).toBe(s.text);
    expect(s.text).toBe(s.text.trim());
    const section = sections.find((x) => x.name === s.section && x.start <= s.span.start && s.span.end <= x.end);
    expect(section, `sentence ${JSON.stringify(s.text)} lies in its section`).toBeDefined();
    previousEnd = s.span.end;
  }
}

describe('splitReport', () => {
  it('splitReport(empty or blank) gives no sections and no sentences', () => {
    expect(splitReport('')).toEqual({ sections: [], sentences: [] });
    expect(splitReport('  \n\n\t ')).toEqual({ sections: [], sentences: [] });
  });

  it('splitReport(non-string) throws a TypeError naming the parameter', () => {
    expect(() => splitReport(undefined as unknown as string)).toThrow(/'text' must be a string; got undefined/);
  });

  it('splitReport(one sentence without a full stop) gives that sentence in section ""', () => {
    const r = splitReport('  Heart size within normal limits  ');
    expect(r.sections).toEqual([{ name: '', start: 0, end: 35 }]);
    expect(r.sentences).toEqual([{ text: 'Heart size within normal limits', span: { start: 2, end: 33 }, section: '' }]);
  });

  it('splitReport(text) reads headings case-insensitively and leaves them out of the sentences', () => {
    const report =
      'Indication: Shortness of breath.\nCOMPARISON: Radiograph of last spring.\nTechnique: Single frontal view.\n' +
      'FINDINGS: The lungs are clear. The heart is not enlarged.\nimpression: No acute abnormality.';
    const r = splitReport(report);
    expect(r.sections.map((s) => s.name)).toEqual(['indication', 'comparison', 'technique', 'findings', 'impression']);
    expect(r.sentences.map((s) => [s.section, s.text])).toEqual([
      ['indication', 'Shortness of breath.'],
      ['comparison', 'Radiograph of last spring.'],
      ['technique', 'Single frontal view.'],
      ['findings', 'The lungs are clear.'],
      ['findings', 'The heart is not enlarged.'],
      ['impression', 'No acute abnormality.'],
    ]);
    expect(report.slice(r.sections[3].start, r.sections[3].start + 9)).toBe('FINDINGS:');
    expectExactSpans(report);
  });

  it('splitReport(text) puts text before the first heading in section "" and sections tile the rest', () => {
    const report = 'Portable study at the bedside.\n\nFINDINGS:\nStable tube position.\n\nIMPRESSIONS: Unchanged.';
    const r = splitReport(report);
    expect(r.sections.map((s) => s.name)).toEqual(['', 'findings', 'impression']);
    expect(r.sections[0].start).toBe(0);
    expect(r.sections[1].start).toBe(r.sections[0].end);
    expect(r.sections[2].start).toBe(r.sections[1].end);
    expect(r.sections[2].end).toBe(report.length);
    expect(texts(report)).toEqual(['Portable study at the bedside.', 'Stable tube position.', 'Unchanged.']);
  });

  it('splitReport(text) accepts a heading alone on its line and a capitalised heading after a sentence end', () => {
    expect(splitReport('FINDINGS\nMild cardiomegaly.').sentences).toEqual([
      { text: 'Mild cardiomegaly.', span: { start: 9, end: 27 }, section: 'findings' },
    ]);
    const flat = 'FINDINGS: Small left effusion. IMPRESSION: Effusion, otherwise clear.';
    expect(splitReport(flat).sentences.map((s) => [s.section, s.text])).toEqual([
      ['findings', 'Small left effusion.'],
      ['impression', 'Effusion, otherwise clear.'],
    ]);
  });

  it('splitReport(text) does not take a lower-case heading word inside a line for a heading', () => {
    expect(texts('The impression: a small effusion.')).toEqual(['The impression: a small effusion.']);
  });

  it('splitReport(text) keeps abbreviations inside the sentence', () => {
    expect(texts('Lines are in place, e.g. the right jugular catheter. Appearances, i.e. the pattern, are stable.')).toEqual([
      'Lines are in place, e.g. the right jugular catheter.',
      'Appearances, i.e. the pattern, are stable.',
    ]);
    expect(texts('The tip lies approx. 4 cm above the carina. Discussed with Dr. Patel at the time.')).toEqual([
      'The tip lies approx. 4 cm above the carina.',
      'Discussed with Dr. Patel at the time.',
    ]);
    expect(texts('Atelectasis vs. early consolidation. Stable.')).toEqual(['Atelectasis vs. early consolidation.', 'Stable.']);
    expect(texts('Drain No. 2 is unchanged. Lungs clear.')).toEqual(['Drain No. 2 is unchanged.', 'Lungs clear.']);
  });

  it('splitReport(text) ends a sentence after a unit only when a capital follows', () => {
    expect(texts('The nodule measures 8 mm. in diameter. It is calcified.')).toEqual([
      'The nodule measures 8 mm. in diameter.',
      'It is calcified.',
    ]);
    expect(texts('The mass is 3 cm. 4 mm satellite nodules lie beside it.')).toEqual([
      'The mass is 3 cm. 4 mm satellite nodules lie beside it.',
    ]);
    expect(texts('The mass is 3 cm. Nothing else.')).toEqual(['The mass is 3 cm.', 'Nothing else.']);
  });

  it('splitReport(text) keeps decimals, dotted projections and PA/AP inside a sentence', () => {
    expect(texts('A 2.5 cm nodule persists. P.A. and lateral views. PA/AP comparison is limited.')).toEqual([
      'A 2.5 cm nodule persists.',
      'P.A. and lateral views.',
      'PA/AP comparison is limited.',
    ]);
  });

  it('splitReport(text) starts each numbered item anew and strips the markers, spans exact', () => {
    const report = 'IMPRESSION: 1. Small effusion. 2. No pneumothorax.';
    const r = splitReport(report);
    expect(r.sentences.map((s) => s.text)).toEqual(['Small effusion.', 'No pneumothorax.']);
    expect(r.sentences[0].span).toEqual({ start: 15, end: 30 });
    expect(r.sentences[1].span).toEqual({ start: 34, end: 50 });
    expectExactSpans(report);
  });

  it('splitReport(text) splits numbered items on separate lines and items without full stops', () => {
    expect(texts('Impression:\n1) Mild oedema\n2) Cardiomegaly\n(3) Lines unchanged')).toEqual([
      'Mild oedema',
      'Cardiomegaly',
      'Lines unchanged',
    ]);
    expect(texts('1. Small effusion 2. No pneumothorax 3. Clear apices')).toEqual([
      'Small effusion',
      'No pneumothorax',
      'Clear apices',
    ]);
  });

  it('splitReport(text) does not read a number inside a sentence as a list item', () => {
    expect(texts('Three ribs show old fractures, 4. 5 and 6 are intact.')).toEqual(['Three ribs show old fractures, 4.', '5 and 6 are intact.']);
    expect(texts('Unchanged since 2019. No new opacity.')).toEqual(['Unchanged since 2019.', 'No new opacity.']);
  });

  it('splitReport(text) splits bullets and ends a bullet item at the next bullet line', () => {
    expect(texts('- Left basal atelectasis\n- Small left effusion.\n\u2022 Normal heart size')).toEqual([
      'Left basal atelectasis',
      'Small left effusion.',
      'Normal heart size',
    ]);
  });

  it('splitReport(text) ends a sentence at a blank line but not at a single line break', () => {
    expect(texts('There is patchy opacity in the\nright lower zone\n\nNo effusion')).toEqual([
      'There is patchy opacity in the\nright lower zone',
      'No effusion',
    ]);
    expect(texts('Heart normal\r\n \r\nLungs clear')).toEqual(['Heart normal', 'Lungs clear']);
  });

  it('splitReport(text) keeps semicolons inside and splits at question and exclamation marks', () => {
    expect(texts('Lungs clear; no effusion; heart normal. Pneumothorax? None seen! Reviewed.')).toEqual([
      'Lungs clear; no effusion; heart normal.',
      'Pneumothorax?',
      'None seen!',
      'Reviewed.',
    ]);
  });

  it('splitReport(text) treats a query written onto a word as part of the sentence', () => {
    expect(texts('Fever, ?pneumonia. Assess.')).toEqual(['Fever, ?pneumonia.', 'Assess.']);
  });

  it('splitReport(text) tolerates multiple spaces, closing brackets and ellipses', () => {
    expect(texts('Small   effusion   (left).    Clear   elsewhere.')).toEqual(['Small   effusion   (left).', 'Clear   elsewhere.']);
    expect(texts('Known nodule (stable.) Next line...')).toEqual(['Known nodule (stable.)', 'Next line...']);
  });

  it('splitReport(text) drops pieces without letters or digits', () => {
    expect(texts('---\n\n. . .\n\nLungs clear.')).toEqual(['Lungs clear.']);
  });

  it('splitReport(text) spans stay exact, ordered and in bounds on seeded random reports', () => {
    const pieces = [
      'FINDINGS:', 'Impression:', '1.', '2)', '-', 'Small', 'right', 'effusion', 'e.g.', 'approx.', 'Dr.', '2.5', 'cm.',
      'No.', '3', 'vs.', ';', '?', '!', '.', ',', '\n', '\n\n', '  ', 'lungs', 'clear', 'PA/AP', '(left)', 'Mild', 'oedema.',
    ];
    const rng = createRng(20240611);
    for (let trial = 0; trial < 300; trial++) {
      const n = 1 + rng.int(40);
      let report = '';
      for (let k = 0; k < n; k++) report += pieces[rng.int(pieces.length)] + (rng.next() < 0.7 ? ' ' : '');
      expectExactSpans(report);
    }
  });
});

describe('splitReport on huge input', () => {
  it('splitReport(huge text) stays linear: a 200 000-character sentence of decimals and many short sentences', () => {
    const longSentence = 'Values 2.5 '.repeat(20_000);
    const r = splitReport(longSentence);
    expect(r.sentences).toHaveLength(1);
    expect(r.sentences[0].text).toBe(longSentence.trim());
    const many = 'Small effusion. '.repeat(10_000);
    expect(splitReport(many).sentences).toHaveLength(10_000);
  });
});
