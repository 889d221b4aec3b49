/**
 * Sentence-text normalisation and a stable content hash, used to key reference boxes to report
 * sentences so that an edited report is detected rather than silently mismatched.
 */

/**
 * Normalises sentence text for comparison: trims both ends and collapses every run of whitespace
 * (spaces, tabs, line breaks, Unicode spaces) to one ASCII space. Empty or whitespace-only text
 * gives ''. Case and punctuation are kept: a changed letter is a changed sentence.
 */
export function normaliseSentenceText(text: string): string {
  if (typeof text !== 'string') throw new TypeError(`'text' must be a string; got ${typeof text}`);
  return text.trim().replace(/\s+/g, ' ');
}

/** Appends the UTF-8 bytes of one code point; lone surrogates become U+FFFD, as the WHATWG encoder does. */
function utf8Bytes(text: string): number[] {
  const bytes: number[] = [];
  for (let i = 0; i < text.length; i++) {
    let cp = text.charCodeAt(i);
    if (cp >= 0xd800 && cp <= 0xdbff) {
      const next = i + 1 < text.length ? text.charCodeAt(i + 1) : 0;
      if (next >= 0xdc00 && next <= 0xdfff) {
        cp = 0x10000 + ((cp - 0xd800) << 10) + (next - 0xdc00);
        i++;
      } else {
        cp = 0xfffd;
      }
    } else if (cp >= 0xdc00 && cp <= 0xdfff) {
      cp = 0xfffd;
    }
    if (cp < 0x80) bytes.push(cp);
    else if (cp < 0x800) bytes.push(0xc0 | (cp >> 6), 0x80 | (cp & 0x3f));
    else if (cp < 0x10000) bytes.push(0xe0 | (cp >> 12), 0x80 | ((cp >> 6) & 0x3f), 0x80 | (cp & 0x3f));
    else bytes.push(0xf0 | (cp >> 18), 0x80 | ((cp >> 12) & 0x3f), 0x80 | ((cp >> 6) & 0x3f), 0x80 | (cp & 0x3f));
  }
  return bytes;
}

/**
 * Hashes sentence text: FNV-1a 64-bit (Fowler, Noll and Vo; offset basis 0xcbf29ce484222325,
 * prime 0x100000001b3) over the UTF-8 bytes of normaliseSentenceText(text), as 16 lower-case
 * hex digits. Texts that differ only in surrounding or repeated whitespace hash alike; empty
 * text hashes to the offset basis, 'cbf29ce484222325'. Not a cryptographic hash.
 */
export function hashSentenceText(text: string): string {
  const bytes = utf8Bytes(normaliseSentenceText(text));
  // The 64-bit state is kept as four 16-bit limbs so every product stays exact in a double.
  let h0 = 0x2325;
  let h1 = 0x8422;
  let h2 = 0x9ce4;
  let h3 = 0xcbf2;
  for (const byte of bytes) {
    h0 ^= byte;
    // Multiply by the prime 2^40 + 0x1b3: the 0x1b3 part limb-wise, the 2^40 part as a shift by 2.5 limbs.
    const t0 = h0 * 0x1b3;
    const t1 = h1 * 0x1b3;
    const t2 = h2 * 0x1b3;
    const t3 = h3 * 0x1b3;
    // h << 40 contributes (h0 << 8) to limb 2 and (h1 << 8 | h0 >> 8) to limb 3.
    let c = t0;
    const n0 = c & 0xffff;
    c = t1 + Math.floor(c / 0x10000);
    const n1 = c & 0xffff;
    c = t2 + (h0 << 8) + Math.floor(c / 0x10000);
    const n2 = c & 0xffff;
    c = t3 + (h1 << 8) + Math.floor(c / 0x10000);
    const n3 = c & 0xffff;
    h0 = n0;
    h1 = n1;
    h2 = n2;
    h3 = n3;
  }
  const hex = (limb: number): string => limb.toString(16).padStart(4, '0');
  return hex(h3) + hex(h2) + hex(h1) + hex(h0);
}
