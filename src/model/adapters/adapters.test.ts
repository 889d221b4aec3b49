import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { FIXTURES } from '../testing/fixture-folder';
import { createTokenizerFromJson } from './hf-tokenizer';
import { createOrtNodeEngine } from './ort-node';
import { checkFeed, toNamedTensor } from './ort-tensors';

const tokenizerJson = (): Record<string, unknown> => JSON.parse(readFileSync(join(FIXTURES, 'tiny-model', 'tokenizer.json'), 'utf8'));
const config = { pad_token: '[PAD]' };

describe('createTokenizerFromJson', () => {
  it('encode(sentences, maxTokens) pads to the longest sentence with mask 0', () => {
    const tok = createTokenizerFromJson(tokenizerJson(), config);
    const { ids, mask, dims } = tok.encode(['no', 'no focal'], 16);
    expect(dims).toEqual([2, 4]);
    // [CLS]=2 no=5 [SEP]=3 [PAD]=0 ; [CLS] no focal [SEP]
    expect(Array.from(ids, Number)).toEqual([2, 5, 3, 0, 2, 5, 6, 3]);
    expect(Array.from(mask, Number)).toEqual([1, 1, 1, 0, 1, 1, 1, 1]);
  });

  it('encode([], n) is an empty [0, 0] batch', () => {
    const r = createTokenizerFromJson(tokenizerJson(), config).encode([], 8);
    expect(r.dims).toEqual([0, 0]);
    expect(r.ids).toHaveLength(0);
  });

  it('encode(long, 3) keeps the special tokens and the first word; encode(long, 2) has no room and says so', () => {
    const tok = createTokenizerFromJson(tokenizerJson(), config);
    expect(Array.from(tok.encode(['no focal consolidation'], 3).ids, Number)).toEqual([2, 5, 3]);
    expect(() => tok.encode(['no focal consolidation'], 2)).toThrow(/max_tokens 2 leaves no room for words after the tokenizer's 2 special tokens/);
    // A short sentence fits even at 2 tokens.
    expect(Array.from(tok.encode([''], 8).ids, Number)).toEqual([2, 3]);
  });

  it('encode(unknown word) maps it to [UNK] (WordPiece, whole word)', () => {
    const tok = createTokenizerFromJson(tokenizerJson(), config);
    expect(Array.from(tok.encode(['no ünïcode€'], 8).ids, Number)).toEqual([2, 5, 1, 3]);
  });

  it('encode rejects maxTokens below 2 and a non-string sentence', () => {
    const tok = createTokenizerFromJson(tokenizerJson(), config);
    expect(() => tok.encode(['x'], 1)).toThrow(/'maxTokens' must be an integer >= 2; got 1/);
    expect(() => tok.encode([3 as unknown as string], 8)).toThrow(/'sentences\[0\]' must be a string/);
  });

  it('createTokenizerFromJson reads the pad token from tokenizer.json padding when no config names one', () => {
    const json = { ...tokenizerJson(), padding: { pad_token: '[PAD]', pad_id: 0 } };
    expect(Array.from(createTokenizerFromJson(json).encode(['no', ''], 8).ids, Number)).toEqual([2, 5, 3, 2, 3, 0]);
  });

  it('createTokenizerFromJson without any pad token says where to declare one', () => {
    expect(() => createTokenizerFromJson(tokenizerJson())).toThrow(/add "pad_token".*tokenizer_config.json/);
  });
});

describe('ort tensor conversion', () => {
  it('toNamedTensor copies float32, int64 and int32 data and rejects other types', () => {
    const data = Float32Array.from([1, 2]);
    const t = toNamedTensor({ type: 'float32', data, dims: [2] }, 'out');
    expect(t.data).not.toBe(data);
    expect(t).toEqual({ type: 'float32', data, dims: [2] });
    expect(toNamedTensor({ type: 'int64', data: BigInt64Array.from([1n]), dims: [1] }, 'o').type).toBe('int64');
    expect(() => toNamedTensor({ type: 'float16', data: new Uint16Array(1), dims: [1] }, "output 'x'")).toThrow(/output 'x': expected a float32, int64 or int32 tensor on the CPU; got type 'float16'/);
  });

  it('checkFeed rejects data whose length is not the product of dims', () => {
    expect(() => checkFeed('px', { type: 'float32', data: new Float32Array(3), dims: [1, 2, 2] })).toThrow(/feed 'px' must hold 4 values for dims \[1, 2, 2\]; got 3/);
    expect(() => checkFeed('px', { type: 'float32', data: new Float32Array(0), dims: [0, 3] })).not.toThrow();
  });

  it('createOrtNodeEngine rejects threads that are not a positive integer', async () => {
    await expect(createOrtNodeEngine({ threads: 1.5 })).rejects.toThrow(/'threads' must be an integer >= 1; got 1.5/);
  });
});

describe('createOrtWebEngine in Node', () => {
  it('createOrtWebEngine rejects threads that are not a positive integer', async () => {
    const { createOrtWebEngine } = await import('./ort-web');
    await expect(createOrtWebEngine({ threads: 0 })).rejects.toThrow(/'threads' must be an integer >= 1; got 0/);
  });
});
