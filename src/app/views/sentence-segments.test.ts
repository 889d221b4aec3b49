import { describe, expect, it } from 'vitest';
import { parseReport } from '../../report/parse-report';
import { sentenceSegments } from './sentence-segments';

describe('sentenceSegments', () => {
  it('sentenceSegments(sentence) joins back to the sentence text and marks locations and triggers', () => {
    const report = parseReport('No effusion in the left lower zone. Possible consolidation at the right base. Heart size normal.');
    for (const s of report.sentences) {
      const segs = sentenceSegments(s);
      expect(segs.map((g) => g.text).join('')).toBe(s.text);
      expect(segs.filter((g) => g.kind === 'location').map((g) => g.text)).toEqual(s.locations.map((l) => s.text.slice(l.span.start, l.span.end)));
    }
    expect(sentenceSegments(report.sentences[0]).some((g) => g.kind === 'trigger' && g.text.toLowerCase() === 'no')).toBe(true);
    expect(sentenceSegments(report.sentences[2]).every((g) => g.kind === 'plain')).toBe(true);
  });
});
