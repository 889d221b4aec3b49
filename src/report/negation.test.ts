import { describe, expect, it } from 'vitest';
import { analyseNegation, detectNegation, isNormalStatement } from './negation';

function flags(sentence: string): [boolean, boolean] {
  const r = detectNegation(sentence);
  return [r.negated, r.uncertain];
}
function kinds(sentence: string): string[] {
  return detectNegation(sentence).triggers.map((t) => `${t.kind}:${t.phrase.toLowerCase()}`);
}

// Worked examples, one group per trigger category of NegEx (Chapman et al., "A simple algorithm for
// identifying negated findings and diseases in discharge summaries", J Biomed Inform 2001;34:301-10).
// The sentences are our own.
describe('detectNegation: NegEx trigger categories (Chapman et al. 2001)', () => {
  it('detectNegation(sentence) negates findings after a pre-negation trigger', () => {
    for (const s of [
      'No pneumothorax.',
      'No pneumothorax or pleural effusion.',
      'There is no evidence of focal consolidation.',
      'Lungs are clear without focal consolidation.',
      'Negative for acute fracture.',
      'The costophrenic angles are free of effusion.',
      'Absence of the previously described nodule.',
      'Resolved right apical pneumothorax.',
      'The heart is not enlarged.',
      'The study rules out a pneumothorax.',
    ]) {
      expect(flags(s), s).toEqual([true, false]);
    }
  });

  it('detectNegation(sentence) negates findings before a post-negation trigger', () => {
    for (const s of [
      'A pneumothorax is not seen.',
      'Pleural effusions are absent.',
      'The left basal effusion has resolved.',
      'Focal consolidation is not identified.',
      'Free subdiaphragmatic air is not present.',
      'Rib fractures were excluded on the dedicated views.',
    ]) {
      expect(flags(s), s).toEqual([true, false]);
    }
    expect(kinds('A pneumothorax is not seen.')).toEqual(['post-negation:is not seen']);
  });

  it('detectNegation(sentence) does not negate after a pseudo-trigger', () => {
    for (const s of [
      'No change in the small left effusion.',
      'No increase in the right basal opacity.',
      'No significant change in the cardiomegaly.',
      'Stable nodule without change since the prior film.',
      'Not only atelectasis but also consolidation is present.',
    ]) {
      expect(detectNegation(s).negated, s).toBe(false);
    }
    expect(kinds('No change in the small left effusion.')).toEqual(['pseudo:no change']);
  });

  it('detectNegation(sentence) marks "not certain if" as pseudo and uncertain', () => {
    expect(flags('It is not certain if there is an effusion.')).toEqual([false, true]);
    expect(kinds('It is not certain if there is an effusion.')).toEqual(['pseudo:not certain if', 'uncertainty:not certain if']);
  });

  it('detectNegation(sentence) ends a negation scope at a termination term', () => {
    for (const s of [
      'No effusion but a small right apical pneumothorax.',
      'No pneumothorax; however, there is a left basal effusion.',
      'No focal consolidation, although there is mild basal atelectasis.',
      'No new opacity except a small nodule at the left base.',
      'No effusion aside from a trace of fluid in the fissure.',
    ]) {
      expect(detectNegation(s).negated, s).toBe(false);
    }
    const r = analyseNegation('No effusion but a small right apical pneumothorax.');
    expect(r.findings.map((f) => [f.phrase, f.negated])).toEqual([
      ['effusion', true],
      ['pneumothorax', false],
    ]);
    expect(r.triggers.map((t) => t.kind)).toEqual(['pre-negation', 'termination']);
  });

  it('detectNegation(sentence) flags uncertainty triggers without negating', () => {
    for (const s of [
      'Possible small right effusion.',
      'Opacity at the left base may represent atelectasis.',
      'Findings are suggestive of early oedema.',
      'A small pneumothorax cannot be excluded.',
      'Questionable nodule in the right mid zone.',
      'Atelectasis versus consolidation at the left base.',
      'Appearances are concerning for a mass.',
      'Density suspicious for pneumonia in the lingula.',
      'The opacity could represent consolidation.',
      'Probable left lower lobe collapse.',
      'Likely atelectasis.',
    ]) {
      expect(flags(s), s).toEqual([false, true]);
    }
  });
});

describe('detectNegation: sentence-level rule and edge cases', () => {
  it('detectNegation(empty) is neither negated nor uncertain', () => {
    expect(detectNegation('')).toEqual({ negated: false, uncertain: false, triggers: [] });
  });

  it('detectNegation(sentence) reports trigger spans relative to the sentence', () => {
    const s = 'There is no evidence of pneumothorax.';
    const [t] = detectNegation(s).triggers;
    expect(t).toEqual({ phrase: 'no evidence of', kind: 'pre-negation', span: { start: 9, end: 23 } });
    expect(s.slice(t.span.start, t.span.end)).toBe(t.phrase);
  });

  it('detectNegation(sentence) reads "no definite" as negated and uncertain', () => {
    expect(flags('No definite focal consolidation.')).toEqual([true, true]);
  });

  it('detectNegation(sentence) limits a scope to six words by default and honours the window option', () => {
    const s = 'No large focal area of dense patchy consolidation.';
    expect(detectNegation(s).negated).toBe(false);
    expect(detectNegation(s, { window: 7 }).negated).toBe(true);
    expect(detectNegation('No large focal area of dense consolidation.').negated).toBe(true);
  });

  it('detectNegation(sentence, { window }) rejects a window that is not a positive integer', () => {
    expect(() => detectNegation('No effusion.', { window: 0 })).toThrow(/'window' must be an integer >= 1; got 0/);
    expect(() => detectNegation('No effusion.', { window: Number.NaN })).toThrow(RangeError);
  });

  it('detectNegation(sentence) keeps a scope inside its clause', () => {
    expect(detectNegation('No effusion. Large pneumothorax').negated).toBe(false);
    expect(detectNegation('No effusion: large pneumothorax').negated).toBe(false);
  });

  it('detectNegation(sentence) lets a later positive finding outside the scope win', () => {
    expect(detectNegation('Pleural effusion has resolved but there is persistent left basal atelectasis.').negated).toBe(false);
    expect(detectNegation('No effusion, no change in the nodule.').negated).toBe(false);
  });

  it('detectNegation(sentence) negates a sentence whose only finding is outside the lexicon', () => {
    expect(detectNegation('No acute osseous injury.').negated).toBe(true);
    expect(detectNegation('No.').negated).toBe(false);
  });

  it('detectNegation(sentence) does not take "No. 3" or "May 2020" for triggers', () => {
    expect(detectNegation('Drain No. 3 remains in the pleural space.').triggers).toEqual([]);
    expect(detectNegation('Comparison with the study of May 2020.').uncertain).toBe(false);
    expect(detectNegation('The effusion may be loculated.').uncertain).toBe(true);
  });

  it('detectNegation(sentence) reads a query mark written onto a word as uncertainty', () => {
    expect(flags('Cough, ?pneumonia.')).toEqual([false, true]);
    expect(detectNegation('Is there a pneumothorax?').uncertain).toBe(false);
  });

  it('detectNegation(sentence) is case-insensitive and ignores surrounding whitespace', () => {
    expect(flags('  NO PNEUMOTHORAX.  ')).toEqual([true, false]);
    expect(flags('no\npneumothorax')).toEqual([true, false]);
  });

  it('detectNegation(sentence) leaves plain positive findings alone', () => {
    for (const s of ['Small right pleural effusion.', 'Moderate cardiomegaly.', 'Right upper lobe consolidation.']) {
      expect(flags(s), s).toEqual([false, false]);
    }
  });

  it('detectNegation(non-string) throws a TypeError naming the parameter', () => {
    expect(() => detectNegation(null as unknown as string)).toThrow(/'sentence' must be a string; got object/);
  });
});

describe('isNormalStatement', () => {
  it('isNormalStatement(sentence) recognises normal statements that are not negated', () => {
    for (const s of ['The lungs are clear.', 'Heart size is normal.', 'Cardiomediastinal silhouette is within normal limits.', 'Normal chest radiograph.']) {
      expect(isNormalStatement(s), s).toBe(true);
      expect(detectNegation(s).negated, s).toBe(false);
    }
  });

  it('isNormalStatement(sentence) is false when a positive finding is named', () => {
    expect(isNormalStatement('The lungs are clear except for a small nodule.')).toBe(false);
    expect(isNormalStatement('Small left effusion.')).toBe(false);
    expect(isNormalStatement('')).toBe(false);
  });

  it('isNormalStatement(sentence) accepts normal statements with negated findings', () => {
    expect(isNormalStatement('The lungs are clear without focal consolidation.')).toBe(true);
  });
});

describe('detectNegation on huge input', () => {
  it('detectNegation(huge sentence) finishes and negates a long run of negated findings', () => {
    const s = 'No effusion, '.repeat(5000) + 'no pneumothorax.';
    const r = detectNegation(s);
    expect(r.negated).toBe(true);
    expect(r.triggers).toHaveLength(5001);
  });
});
