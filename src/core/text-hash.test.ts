import { describe, expect, it } from 'vitest';
import { hashSentenceText, normaliseSentenceText } from './text-hash';

/** Independent reference: textbook FNV-1a 64 over TextEncoder bytes with BigInt arithmetic. */
function referenceFnv1a64(text: string): string {
  const prime = 0x100000001b3n;
  const mask = (1n << 64n) - 1n;
  let h = 0xcbf29ce484222325n;
  for (const byte of new TextEncoder().encode(text)) {
    h ^= BigInt(byte);
    h = (h * prime) & mask;
  }
  return h.toString(16).padStart(16, '0');
}

describe('normaliseSentenceText', () => {
  it('normaliseSentenceText(text) trims and collapses whitespace runs', () => {
    expect(normaliseSentenceText('  Small   right\n\teffusion.  ')).toBe('Small right effusion.');
    expect(normaliseSentenceText('a\u00a0\u2003b')).toBe('a b');
  });
  it('normaliseSentenceText(empty or blank) gives the empty string', () => {
    expect(normaliseSentenceText('')).toBe('');
    expect(normaliseSentenceText(' \n\t ')).toBe('');
  });
  it('normaliseSentenceText(non-string) throws a TypeError naming the parameter', () => {
    expect(() => normaliseSentenceText(42 as unknown as string)).toThrow(/'text' must be a string; got number/);
  });
});

describe('hashSentenceText', () => {
  // FNV-1a 64 test vectors from the FNV reference by Fowler, Noll and Vo (from memory);
  // each is also checked against the independent BigInt loop above.
  const vectors: [string, string][] = [
    ['', 'cbf29ce484222325'],
    ['a', 'af63dc4c8601ec8c'],
    ['foobar', '85944171f73967e8'],
  ];
  for (const [input, expected] of vectors) {
    it(`hashSentenceText(${JSON.stringify(input)}) matches the FNV-1a 64 vector ${expected}`, () => {
      expect(referenceFnv1a64(input)).toBe(expected);
      expect(hashSentenceText(input)).toBe(expected);
    });
  }

  it('hashSentenceText(text) agrees with the BigInt reference on varied texts, incl. non-ASCII', () => {
    const texts = [
      'The lungs are clear.',
      'Kleiner Erguss rechts, Ödem möglich.',
      'Épanchement pleural — 2,5 cm.',
      '\u80ba\u91ce\u6e05\u6670',
      'Emoji \u{1f600} and \u{1d11e} outside the BMP.',
      'x'.repeat(5000),
    ];
    for (const t of texts) expect(hashSentenceText(t)).toBe(referenceFnv1a64(normaliseSentenceText(t)));
  });

  it('hashSentenceText(text) treats a lone surrogate as U+FFFD like TextEncoder', () => {
    const lone = 'edge \ud800 case';
    expect(hashSentenceText(lone)).toBe(referenceFnv1a64(lone));
    expect(hashSentenceText(lone)).toBe(hashSentenceText('edge \ufffd case'));
  });

  it('hashSentenceText(text) is 16 lower-case hex digits and ignores whitespace layout only', () => {
    const h = hashSentenceText('No pneumothorax.');
    expect(h).toMatch(/^[0-9a-f]{16}$/);
    expect(hashSentenceText('  No   pneumothorax.\n')).toBe(h);
    expect(hashSentenceText('No pneumothorax')).not.toBe(h);
    expect(hashSentenceText('no pneumothorax.')).not.toBe(h);
  });

  it('hashSentenceText(text) has no collisions over many short distinct texts', () => {
    const seen = new Set<string>();
    for (let i = 0; i < 3000; i++) seen.add(hashSentenceText(`sentence ${i}`));
    expect(seen.size).toBe(3000);
  });
});
