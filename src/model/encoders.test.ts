import { describe, expect, it } from 'vitest';
import { expectClose } from '../../tests/support/expect-close';
import { ModelContractError } from './contract';
import { createDualEncoder, imageOutputToCells, poolTokenStates } from './encoders';
import type { InferenceSession, ModelManifest, NamedTensor, SentenceTokenizer } from './types';

const manifest = (over: { layout?: 'BDHW' | 'BND'; kind?: 'sentence' | 'tokens'; pooling?: 'cls' | 'mean'; d?: number } = {}): ModelManifest => ({
  schema: 'tessera.model/1',
  id: 'fake',
  image: {
    file: 'image.onnx',
    input: { name: 'px', channels: 1, height: 4, width: 6, scale: 1, mean: [0], std: [1], resize: 'stretch' },
    output: { name: 'cells', layout: over.layout ?? 'BDHW', grid: { h: 2, w: 3 } },
  },
  text: {
    file: 'text.onnx',
    tokenizer: 'tokenizer.json',
    input: { ids: 'ids', mask: 'mask' },
    max_tokens: 8,
    output: { name: 'out', kind: over.kind ?? 'tokens', ...(over.kind === 'sentence' ? {} : { pooling: over.pooling ?? 'mean' }) },
  },
  embedding_dim: over.d ?? 2,
  similarity: 'cosine',
});

const session = (run: (feeds: Readonly<Record<string, NamedTensor>>) => Record<string, NamedTensor>): InferenceSession & { released: number; calls: number } => {
  const s = {
    inputNames: [], outputNames: [], released: 0, calls: 0,
    run: async (feeds: Readonly<Record<string, NamedTensor>>) => { s.calls++; return run(feeds); },
    release: async () => { s.released++; },
  };
  return s;
};

// Two sentences: lengths 3 and 1, padded to 3 tokens.
const tokenizer: SentenceTokenizer = {
  encode: (sentences) => {
    const t = 3;
    const ids = new BigInt64Array(sentences.length * t);
    const mask = new BigInt64Array(sentences.length * t);
    sentences.forEach((s, i) => { for (let j = 0; j < Math.min(t, s.length); j++) { ids[i * t + j] = 5n; mask[i * t + j] = 1n; } });
    return { ids, mask, dims: [sentences.length, t] };
  },
};

const f32 = (xs: number[], dims: number[]): NamedTensor => ({ type: 'float32', data: Float32Array.from(xs), dims });
const image = { width: 6, height: 4, data: new Float32Array(24).fill(0.5), format: 'png' as const, bitDepth: 8, valueRange: [0, 1] as const };

describe('imageOutputToCells', () => {
  it('imageOutputToCells(BDHW [1, 2, 2, 3]) transposes to cells x D', () => {
    // Channel 0 holds cell indices 0..5, channel 1 holds 10..15.
    const t = f32([0, 1, 2, 3, 4, 5, 10, 11, 12, 13, 14, 15], [1, 2, 2, 3]);
    expect(Array.from(imageOutputToCells(t, manifest()))).toEqual([0, 10, 1, 11, 2, 12, 3, 13, 4, 14, 5, 15]);
  });

  it('imageOutputToCells(BDHW batch of 2) keeps images apart', () => {
    const t = f32([...Array(12).keys()].map((i) => i), [2, 1, 2, 3]);
    expect(Array.from(imageOutputToCells(t, manifest({ d: 1 })))).toEqual([...Array(12).keys()]);
  });

  it('imageOutputToCells(BND) is already cells x D and returns a copy', () => {
    const t = f32([1, 2, 3, 4], [1, 2, 2]);
    const out = imageOutputToCells(t, manifest({ layout: 'BND' }));
    expect(Array.from(out)).toEqual([1, 2, 3, 4]);
    expect(out).not.toBe(t.data);
  });

  it('imageOutputToCells(BDHW) with one cell and one channel is the identity', () => {
    const m = { ...manifest({ d: 1 }), image: { ...manifest().image, output: { name: 'cells', layout: 'BDHW' as const, grid: { h: 1, w: 1 } } } };
    expect(Array.from(imageOutputToCells(f32([7], [1, 1, 1, 1]), m))).toEqual([7]);
  });
});

describe('poolTokenStates', () => {
  // Sentence 0: tokens (1, 2), (3, 4), (5, 6); sentence 1: (7, 8), then padding (100, 100) x 2.
  const states = Float32Array.from([1, 2, 3, 4, 5, 6, 7, 8, 100, 100, 100, 100]);
  const mask = BigInt64Array.from([1n, 1n, 1n, 1n, 0n, 0n]);

  it("poolTokenStates(states, mask, 'mean') averages the masked tokens only", () => {
    expectClose(poolTokenStates(states, mask, 2, 3, 2, 'mean'), [3, 4, 7, 8], 1e-6);
  });

  it("poolTokenStates(states, mask, 'cls') takes token 0", () => {
    expectClose(poolTokenStates(states, mask, 2, 3, 2, 'cls'), [1, 2, 7, 8], 0);
  });

  it("poolTokenStates with an all-zero mask gives zeros, not NaN", () => {
    expectClose(poolTokenStates(states, new BigInt64Array(6), 2, 3, 2, 'mean'), [0, 0, 0, 0], 0);
  });

  it('poolTokenStates keeps precision for huge values (float64 accumulation)', () => {
    const big = Float32Array.from([3e38, 3e38, 3e38, 3e38]);
    expectClose(poolTokenStates(big, BigInt64Array.from([1n, 1n]), 1, 2, 2, 'mean'), [3e38, 3e38], 1e32);
  });

  it('poolTokenStates(no sentences) is empty', () => {
    expect(poolTokenStates(new Float32Array(0), new BigInt64Array(0), 0, 0, 2, 'mean')).toHaveLength(0);
  });
});

describe('createDualEncoder with fake sessions', () => {
  const good = () => session(() => ({ cells: f32([...Array(12).keys()], [1, 2, 2, 3]) }));
  const text = (kind: 'tokens' | 'sentence') => session((feeds) => {
    const [s, t] = feeds.ids.dims;
    return { out: kind === 'tokens' ? f32(new Array(s * t * 2).fill(1), [s, t, 2]) : f32(new Array(s * 2).fill(2), [s, 2]) };
  });

  it('encodeImage(image) returns cells x D, the grid, the transform and one rectangle per cell', async () => {
    const enc = createDualEncoder({ manifest: manifest(), hash: 'h', imageSession: good(), textSession: text('tokens'), tokenizer });
    const out = await enc.encodeImage(image);
    expect(Array.from(out.embeddings)).toEqual([0, 6, 1, 7, 2, 8, 3, 9, 4, 10, 5, 11]);
    expect(out.grid).toEqual({ h: 2, w: 3 });
    expect(out.transform).toMatchObject({ scaleX: 1, scaleY: 1 });
    expect(out.cells).toEqual([
      { x: 0, y: 0, w: 2, h: 2 }, { x: 2, y: 0, w: 2, h: 2 }, { x: 4, y: 0, w: 2, h: 2 },
      { x: 0, y: 2, w: 2, h: 2 }, { x: 2, y: 2, w: 2, h: 2 }, { x: 4, y: 2, w: 2, h: 2 },
    ]);
  });

  it('encodeImage throws ModelContractError when the output shape breaks the manifest', async () => {
    const wrong = session(() => ({ cells: f32(new Array(24).fill(0), [1, 2, 3, 4]) }));
    const enc = createDualEncoder({ manifest: manifest(), hash: 'h', imageSession: wrong, textSession: text('tokens'), tokenizer });
    const err = await enc.encodeImage(image).catch((e) => e);
    expect(err).toBeInstanceOf(ModelContractError);
    expect(err.code).toBe('output-invalid');
    expect(err.message).toMatch(/expected shape \[B, D, h, w\] = \[1, 2, 2, 3\]; got shape \[1, 2, 3, 4\]/);
  });

  it('encodeImages(images, { batchSize }) runs ceil(n / batchSize) times and rejects a bad batchSize', async () => {
    const s = session((feeds) => {
      const b = feeds.px.dims[0];
      return { cells: f32(new Array(b * 12).fill(1), [b, 2, 2, 3]) };
    });
    const enc = createDualEncoder({ manifest: manifest(), hash: 'h', imageSession: s, textSession: text('tokens'), tokenizer });
    const out = await enc.encodeImages([image, image, image, image, image], { batchSize: 2 });
    expect(out).toHaveLength(5);
    expect(s.calls).toBe(3);
    expect(await enc.encodeImages([])).toEqual([]);
    await expect(enc.encodeImages([image], { batchSize: 0 })).rejects.toThrow(/'batchSize' must be an integer >= 1; got 0/);
  });

  it('encodeSentences pools token states with the declared pooling', async () => {
    const enc = createDualEncoder({ manifest: manifest(), hash: 'h', imageSession: good(), textSession: text('tokens'), tokenizer });
    expectClose(await enc.encodeSentences(['abc', 'a']), [1, 1, 1, 1], 0);
  });

  it("encodeSentences with kind 'sentence' returns the output as is", async () => {
    const enc = createDualEncoder({ manifest: manifest({ kind: 'sentence' }), hash: 'h', imageSession: good(), textSession: text('sentence'), tokenizer });
    expectClose(await enc.encodeSentences(['abc']), [2, 2], 0);
  });

  it('encodeSentences([]) is empty and does not run the text encoder', async () => {
    const t = text('tokens');
    const enc = createDualEncoder({ manifest: manifest(), hash: 'h', imageSession: good(), textSession: t, tokenizer });
    expect(await enc.encodeSentences([])).toHaveLength(0);
    expect(t.calls).toBe(0);
  });

  it('encodeSentences feeds zero type ids when the manifest declares them', async () => {
    let seen: string[] = [];
    const t = session((feeds) => { seen = Object.keys(feeds); return { out: f32([1, 1, 1, 1, 1, 1], [1, 3, 2]) }; });
    const m = manifest();
    const withTypes = { ...m, text: { ...m.text, input: { ...m.text.input, type_ids: 'types' } } };
    const enc = createDualEncoder({ manifest: withTypes, hash: 'h', imageSession: good(), textSession: t, tokenizer });
    await enc.encodeSentences(['abc']);
    expect(seen.sort()).toEqual(['ids', 'mask', 'types']);
  });

  it('encodeSentences reports a token-state output with NaN', async () => {
    const t = session(() => ({ out: f32([1, NaN, 1, 1, 1, 1], [1, 3, 2]) }));
    const enc = createDualEncoder({ manifest: manifest(), hash: 'h', imageSession: good(), textSession: t, tokenizer });
    await expect(enc.encodeSentences(['abc'])).rejects.toThrow(/1 of 6 values NaN or infinite/);
  });

  it('release() releases both sessions once, and later calls are refused', async () => {
    const i = good();
    const t = text('tokens');
    const enc = createDualEncoder({ manifest: manifest(), hash: 'h', imageSession: i, textSession: t, tokenizer });
    await enc.release();
    await enc.release();
    expect([i.released, t.released]).toEqual([1, 1]);
    await expect(enc.encodeImage(image)).rejects.toThrow(/was released/);
  });
});
