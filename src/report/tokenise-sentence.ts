import type { Span } from './types';

/** A word or punctuation token of a sentence; `text` is lower case, `span` indexes the sentence. */
export interface SentenceToken {
  readonly text: string;
  readonly kind: 'word' | 'punct';
  readonly span: Span;
}

/**
 * Splits a sentence into lower-case word tokens (letters and digits, with inner apostrophes) and
 * one-character punctuation tokens. Hyphens and whitespace separate words but are not tokens, so
 * "left-sided" gives "left", "sided". Empty text gives [].
 */
export function tokeniseSentence(sentence: string): SentenceToken[] {
  const tokens: SentenceToken[] = [];
  for (const m of sentence.matchAll(/[\p{L}\p{N}]+(?:['\u2019][\p{L}]+)*|[^\s\p{L}\p{N}\-\u2010\u2011]/gu)) {
    const isWord = /[\p{L}\p{N}]/u.test(m[0]);
    tokens.push({
      text: m[0].toLowerCase(),
      kind: isWord ? 'word' : 'punct',
      span: { start: m.index, end: m.index + m[0].length },
    });
  }
  return tokens;
}
