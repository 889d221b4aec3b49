import { mkdtemp, readdir, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { createOrtNodeEngine } from '../adapters/ort-node';
import { createTokenizerFromJson } from '../adapters/hf-tokenizer';
import { encodeImageCached } from '../cached-encoding';
import { embeddingCacheKey } from '../embedding-cache-key';
import { openModelFolder } from '../model-folder';
import { sha256Hex } from '../sha256';
import { instrumentEngine, memoryFileSource, readFixtureFolder, readReference } from '../testing/fixture-folder';
import { EmbeddingCacheError, createDiskEmbeddingCache } from './disk-embedding-cache';

let dir: string;
beforeEach(async () => { dir = await mkdtemp(join(tmpdir(), 'tessera-cache-')); });
afterEach(() => rm(dir, { recursive: true, force: true }));

const key = (n: number): string => embeddingCacheKey('ab'.repeat(32), n.toString(16).padStart(8, '0'), 'image');

describe('createDiskEmbeddingCache', () => {
  it('get(key) after set(key, v) returns the same float32 values, bit for bit', async () => {
    const cache = createDiskEmbeddingCache(join(dir, 'nested', 'cache'));
    const v = Float32Array.from([0, -0, 1.5, -3e38, 3e38, 1e-45, NaN, Infinity]);
    await cache.set(key(1), v);
    const back = await cache.get(key(1));
    expect(back).toBeInstanceOf(Float32Array);
    expect(new Uint8Array(back!.buffer)).toEqual(new Uint8Array(v.buffer));
  });

  it('get(unknown key) is undefined; an empty vector round-trips', async () => {
    const cache = createDiskEmbeddingCache(dir);
    expect(await cache.get(key(2))).toBeUndefined();
    await cache.set(key(3), new Float32Array(0));
    expect(await cache.get(key(3))).toEqual(new Float32Array(0));
  });

  it('set leaves no temporary file behind', async () => {
    const cache = createDiskEmbeddingCache(dir);
    await cache.set(key(4), Float32Array.from([1, 2]));
    expect(await readdir(dir)).toEqual([`${key(4)}.f32`]);
  });

  it('get(key) of a truncated file throws EmbeddingCacheError naming the file and the fix', async () => {
    const cache = createDiskEmbeddingCache(dir);
    await writeFile(join(dir, `${key(5)}.f32`), new Uint8Array(6));
    const err = await cache.get(key(5)).catch((e) => e);
    expect(err).toBeInstanceOf(EmbeddingCacheError);
    expect(err.code).toBe('cache-corrupt');
    expect(err.message).toMatch(/holds 6 bytes.*delete it and run again/);
  });

  it('a key with path characters is refused', async () => {
    const cache = createDiskEmbeddingCache(dir);
    await expect(cache.get('../x')).rejects.toThrow(TypeError);
  });
});

describe('encodeImageCached over the disk cache', () => {
  it('encodeImageCached: a second run over the same image does not run the image encoder again', async () => {
    const engine = instrumentEngine(await createOrtNodeEngine({ threads: 1 }));
    const files = await readFixtureFolder('tiny-model');
    const ref = await readReference('tiny-model');
    const im = ref.images[0];
    const image = { width: im.width, height: im.height, data: Float32Array.from(im.data), format: 'png' as const, bitDepth: 8, valueRange: im.valueRange };
    const contentHash = await sha256Hex(new Uint8Array(image.data.buffer));

    const first = await openModelFolder(memoryFileSource('m', files), engine, { tokenizerFactory: createTokenizerFromJson });
    const afterOpen = engine.runs;
    const a = await encodeImageCached(first, createDiskEmbeddingCache(dir), image, contentHash);
    expect(engine.runs).toBe(afterOpen + 1);
    await first.release();

    // A new process would reopen the folder: same hash, so the cache hits.
    const second = await openModelFolder(memoryFileSource('m', files), engine, { tokenizerFactory: createTokenizerFromJson });
    const afterReopen = engine.runs;
    const b = await encodeImageCached(second, createDiskEmbeddingCache(dir), image, contentHash);
    expect(engine.runs).toBe(afterReopen);
    expect(b.embeddings).toEqual(a.embeddings);
    expect(b.cells).toEqual(a.cells);
    expect(b.transform).toEqual(a.transform);

    // Another window is other preprocessing: a miss, one more run.
    await encodeImageCached(second, createDiskEmbeddingCache(dir), image, contentHash, { window: { centre: 128, width: 128 } });
    expect(engine.runs).toBe(afterReopen + 1);
    await second.release();
  });

  it('encodeImageCached refuses a cached entry of the wrong length', async () => {
    const engine = await createOrtNodeEngine({ threads: 1 });
    const enc = await openModelFolder(memoryFileSource('m', await readFixtureFolder('tiny-model')), engine, { tokenizerFactory: createTokenizerFromJson });
    const cache = { get: async () => new Float32Array(3), set: async () => undefined };
    const image = { width: 64, height: 64, data: new Float32Array(4096), format: 'png' as const, bitDepth: 8, valueRange: [0, 255] as const };
    await expect(encodeImageCached(enc, cache, image, 'ab'.repeat(32))).rejects.toThrow(/holds 3 values, expected cells x D = 784/);
    await enc.release();
  });
});
