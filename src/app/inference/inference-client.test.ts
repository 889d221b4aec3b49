// @vitest-environment node
// Node's realm: jsdom's typed arrays are not accepted by Node's Web Crypto, which the hashing uses.
import 'fake-indexeddb/auto';
import { IDBFactory } from 'fake-indexeddb';
import { describe, expect, test } from 'vitest';
import type { DecodedImage } from '../../dataset/types';
import { ModelContractError } from '../../model/contract';
import { memorySource } from '../sources/memory-source.test-util';
import { contentHashOf, createInferenceClient, imageCacheKey } from './inference-client';
import { openIdbEmbeddingCache } from './idb-embedding-cache';
import { D, GRID, fakeEngine, fakeModelFiles, inThreadWorker } from './test-doubles';

const image = (v: number, width = 10, height = 6): DecodedImage => ({
  width, height, data: new Float32Array(width * height).fill(v), format: 'png', bitDepth: 8, valueRange: [0, 1],
});

describe('createInferenceClient', () => {
  test('openModel(source) returns the manifest, hash and grid the worker checked', async () => {
    const client = createInferenceClient(inThreadWorker());
    const m = await client.openModel(memorySource('fake', fakeModelFiles()));
    expect(m.manifest.id).toBe('fake-model');
    expect(m.hash).toMatch(/^[0-9a-f]{64}$/);
    expect(m.grid).toEqual(GRID);
  });

  test('openModel(source) rejects with ModelContractError listing every missing file', async () => {
    const files = fakeModelFiles();
    files.delete('image.onnx');
    files.delete('tokenizer.json');
    const client = createInferenceClient(inThreadWorker());
    const err = await client.openModel(memorySource('broken', files)).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(ModelContractError);
    expect((err as ModelContractError).problems.map((p) => p.file)).toEqual(['broken/image.onnx', 'broken/tokenizer.json']);
  });

  test('openModel(source) of a folder without a manifest names the manifest', async () => {
    const client = createInferenceClient(inThreadWorker());
    const err = (await client.openModel(memorySource('empty', new Map())).catch((e: unknown) => e)) as ModelContractError;
    expect(err.code).toBe('manifest-invalid');
    expect(err.problems[0].file).toBe('empty/tessera-model.json');
  });

  test('encodeImage(hash, image, undefined) gives cells x D values, different for different images', async () => {
    const client = createInferenceClient(inThreadWorker());
    const m = await client.openModel(memorySource('fake', fakeModelFiles()));
    const a = await client.encodeImage(m.hash, image(0.2), undefined);
    const b = await client.encodeImage(m.hash, image(0.8), undefined);
    expect(a).toBeInstanceOf(Float32Array);
    expect(a.length).toBe(GRID.h * GRID.w * D);
    expect(Array.from(a)).not.toEqual(Array.from(b));
  });

  test('encodeImage(hash, image, contentHash) reads a second request from the IndexedDB cache', async () => {
    const counts = { image: 0, text: 0 };
    const cache = await openIdbEmbeddingCache({ indexedDB: new IDBFactory() });
    const client = createInferenceClient(inThreadWorker(fakeEngine(counts)), { cache });
    const m = await client.openModel(memorySource('fake', fakeModelFiles()));
    const runsAfterOpen = counts.image; // the probe
    const hash = await contentHashOf(new Uint8Array([9, 9, 9]));
    const stages: string[] = [];
    const first = await client.encodeImage(m.hash, image(0.5), hash, { onProgress: (s) => stages.push(s) });
    const second = await client.encodeImage(m.hash, image(0.5), hash);
    expect(counts.image - runsAfterOpen).toBe(1);
    expect(Array.from(second)).toEqual(Array.from(first));
    expect(stages).toEqual(['queued', 'running', 'done']);
    expect(await cache.get(imageCacheKey(m.hash, hash))).toEqual(first);
  });

  test('a second client over the same database does not encode again (a page reload)', async () => {
    const factory = new IDBFactory();
    const hash = await contentHashOf(new Uint8Array([1]));
    const counts = { image: 0, text: 0 };
    const c1 = createInferenceClient(inThreadWorker(), { cache: await openIdbEmbeddingCache({ indexedDB: factory }) });
    const m1 = await c1.openModel(memorySource('fake', fakeModelFiles()));
    const first = await c1.encodeImage(m1.hash, image(0.3), hash);
    const c2 = createInferenceClient(inThreadWorker(fakeEngine(counts)), { cache: await openIdbEmbeddingCache({ indexedDB: factory }) });
    const m2 = await c2.openModel(memorySource('fake', fakeModelFiles()));
    const before = counts.image;
    expect(Array.from(await c2.encodeImage(m2.hash, image(0.3), hash))).toEqual(Array.from(first));
    expect(counts.image).toBe(before);
  });

  test('a cached entry of the wrong length is an error naming the fix, never reused', async () => {
    const cache = await openIdbEmbeddingCache({ indexedDB: new IDBFactory() });
    const client = createInferenceClient(inThreadWorker(), { cache });
    const m = await client.openModel(memorySource('fake', fakeModelFiles()));
    const hash = await contentHashOf(new Uint8Array([2]));
    await cache.set(imageCacheKey(m.hash, hash), new Float32Array(3));
    await expect(client.encodeImage(m.hash, image(0.1), hash)).rejects.toThrow(/expected cells x D = 24.*clear the site data/);
  });

  test('encodeImage with an aborted signal rejects with its reason and the worker drops the request', async () => {
    const counts = { image: 0, text: 0 };
    const worker = inThreadWorker(fakeEngine(counts));
    const client = createInferenceClient(worker);
    const m = await client.openModel(memorySource('fake', fakeModelFiles()));
    const before = counts.image;
    const ac = new AbortController();
    const p = client.encodeImage(m.hash, image(0.4), undefined, { signal: ac.signal });
    ac.abort(new Error('study changed'));
    await expect(p).rejects.toThrow('study changed');
    await new Promise((r) => setTimeout(r, 10));
    expect(worker.sent.some((r) => r.type === 'cancel')).toBe(true);
    expect(counts.image).toBe(before);
    await expect(client.encodeImage(m.hash, image(0.4), undefined, { signal: ac.signal })).rejects.toThrow('study changed');
  });

  test('encodeSentences(hash, texts) gives S x D values and runs the encoder once per new sentence', async () => {
    const counts = { image: 0, text: 0 };
    const client = createInferenceClient(inThreadWorker(fakeEngine(counts)));
    const m = await client.openModel(memorySource('fake', fakeModelFiles()));
    const before = counts.text;
    const a = await client.encodeSentences(m.hash, ['Left effusion.', 'No pneumothorax.']);
    const b = await client.encodeSentences(m.hash, ['No pneumothorax.', 'Left effusion.']);
    expect(a.length).toBe(2 * D);
    expect(Array.from(b.subarray(0, D))).toEqual(Array.from(a.subarray(D)));
    expect(counts.text - before).toBe(1);
    expect((await client.encodeSentences(m.hash, [])).length).toBe(0);
  });

  test('encodeImage(hash) of a model this client did not open is a RangeError naming modelHash', async () => {
    const client = createInferenceClient(inThreadWorker());
    await expect(client.encodeImage('ab'.repeat(32), image(0), undefined)).rejects.toThrow(RangeError);
    await expect(client.encodeImage('ab'.repeat(32), image(0), undefined)).rejects.toThrow(/'modelHash'/);
  });

  test('releaseModel(hash) makes later requests fail; terminate() rejects what is pending', async () => {
    const client = createInferenceClient(inThreadWorker());
    const m = await client.openModel(memorySource('fake', fakeModelFiles()));
    await client.releaseModel(m.hash);
    await expect(client.encodeSentences(m.hash, ['x'])).rejects.toThrow(RangeError);
    const m2 = await client.openModel(memorySource('fake', fakeModelFiles()));
    const p = client.encodeSentences(m2.hash, ['y']);
    client.terminate();
    await expect(p).rejects.toThrow(/stopped/);
    await expect(client.runtimeInfo()).rejects.toThrow(/stopped/);
  });

  test('imageStore keys on the image bytes, so batch runs and the study view share entries', async () => {
    const cache = await openIdbEmbeddingCache({ indexedDB: new IDBFactory() });
    const client = createInferenceClient(inThreadWorker(), { cache });
    const m = await client.openModel(memorySource('fake', fakeModelFiles()));
    const bytes = new Uint8Array([7, 7]);
    expect(await client.imageStore.get(m.hash, bytes)).toBeUndefined();
    const emb = await client.encodeImage(m.hash, image(0.6), await contentHashOf(bytes));
    expect(Array.from((await client.imageStore.get(m.hash, bytes)) as Float32Array)).toEqual(Array.from(emb));
  });
});
