import { describe, expect, it } from 'vitest';
import { tokeniseSentence } from './tokenise-sentence';

describe('tokeniseSentence', () => {
  it('tokeniseSentence("") is []', () => {
    expect(tokeniseSentence('')).toEqual([]);
  });

  it('tokeniseSentence(sentence) lower-cases words, keeps punctuation apart and drops hyphens', () => {
    const s = 'Left-sided 2.5 cm Effusion; stable.';
    const tokens = tokeniseSentence(s);
    expect(tokens.map((t) => `${t.kind[0]}:${t.text}`)).toEqual([
      'w:left', 'w:sided', 'w:2', 'p:.', 'w:5', 'w:cm', 'w:effusion', 'p:;', 'w:stable', 'p:.',
    ]);
    for (const t of tokens) expect(s.slice(t.span.start, t.span.end).toLowerCase()).toBe(t.text);
  });

  it("tokeniseSentence(sentence) keeps inner apostrophes and non-ASCII letters in a word", () => {
    expect(tokeniseSentence("patient's Ödem").map((t) => t.text)).toEqual(["patient's", 'ödem']);
  });
});
