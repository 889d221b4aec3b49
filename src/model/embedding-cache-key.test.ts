import { describe, expect, it } from 'vitest';
import { embeddingCacheKey, fnv1a64 } from './embedding-cache-key';
import { sha256Hex, sha256HexOfText } from './sha256';

const M = 'a'.repeat(64);
const I = 'b'.repeat(64);

describe('embeddingCacheKey', () => {
  it('embeddingCacheKey(model, image, tag) keeps a plain tag and is file-name safe', () => {
    expect(embeddingCacheKey(M, I, 'image')).toBe(`m${M}-i${I}-pimage`);
  });

  it('embeddingCacheKey hashes a tag with other characters, so distinct tags give distinct keys', () => {
    const a = embeddingCacheKey(M, I, 'c1|64x64|stretch');
    const b = embeddingCacheKey(M, I, 'c1|64x64|letterbox');
    expect(a).toMatch(new RegExp(`^m${M}-i${I}-ph[0-9a-f]{16}$`));
    expect(a).toBe(`m${M}-i${I}-ph${fnv1a64('c1|64x64|stretch')}`);
    expect(a).not.toBe(b);
  });

  it('embeddingCacheKey changes with each part', () => {
    const keys = new Set([embeddingCacheKey(M, I, 't'), embeddingCacheKey('c'.repeat(64), I, 't'), embeddingCacheKey(M, 'd'.repeat(64), 't'), embeddingCacheKey(M, I, 'u')]);
    expect(keys.size).toBe(4);
  });

  it('embeddingCacheKey rejects non-hex hashes and an empty tag, naming the parameter', () => {
    expect(() => embeddingCacheKey('XYZ', I, 't')).toThrow(/'modelHash' must be lower-case hex/);
    expect(() => embeddingCacheKey(M, '../etc', 't')).toThrow(/'imageContentHash'/);
    expect(() => embeddingCacheKey(M, I, '')).toThrow(/'preprocessingTag'/);
  });
});

describe('fnv1a64 and sha256Hex', () => {
  it('fnv1a64 matches the published FNV-1a 64-bit test vectors', () => {
    // Test vectors from the FNV reference page (Fowler, Noll, Vo): "" and "a".
    expect(fnv1a64('')).toBe('cbf29ce484222325');
    expect(fnv1a64('a')).toBe('af63dc4c8601ec8c');
  });

  it('sha256Hex matches the FIPS 180-2 example for "abc" and the empty message', async () => {
    // FIPS 180-2, Appendix B.1 (one-block message "abc").
    expect(await sha256HexOfText('abc')).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
    expect(await sha256Hex(new Uint8Array(0))).toBe('e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855');
  });

  it('sha256Hex of a view hashes only the viewed bytes', async () => {
    const buf = new TextEncoder().encode('xxabcxx');
    expect(await sha256Hex(buf.subarray(2, 5))).toBe(await sha256HexOfText('abc'));
  });
});
