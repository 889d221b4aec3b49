/**
 * The page's handle on the inference Web Worker (src/app/inference/inference-worker.ts), which owns
 * onnxruntime-web, the tokenizer and every opened model. main.tsx creates one client; components get
 * it passed down and never create a worker or a session.
 *
 *   const client = createInferenceClient(new Worker(new URL('./inference/inference-worker.ts', import.meta.url), { type: 'module' }),
 *                                         { cache: await openIdbEmbeddingCache() });
 *   const model = await client.openModel(source);          // {manifest, hash, grid}; throws ModelContractError (.problems)
 *   const cells = await client.encodeImage(model.hash, image, await contentHashOf(bytes), { signal, onProgress });
 *                                                          // Float32Array, grid.h * grid.w * D, row-major cells, not normalised
 *   const sents = await client.encodeSentences(model.hash, texts, { signal });   // Float32Array, S * D, not normalised
 *   client.imageStore                                      // ImageEmbeddingStore for src/batch scoreSet (same cache entries)
 *   await client.runtimeInfo()                             // {crossOriginIsolated, threads, wasmPaths} as the worker sees them
 *   await client.releaseModel(model.hash); client.terminate();
 *
 * Images are encoded with the file's own VOI window (DICOM) or its value range, exactly as the CLI's
 * `score` does, so a map in the page equals the CLI's for the same model, study and sentence. The
 * window and level the viewer sets are for display only.
 *
 * Cache: with `cache`, image embeddings are stored under embeddingCacheKey(model hash, sha256 of the
 * image file's bytes, 'image'), the key the CLI's disk store uses, so reopening a study or the page
 * does not encode again. Pass `contentHash` undefined to bypass it. Sentence embeddings are kept in
 * memory per client.
 *
 * Cancel: aborting `signal` rejects at once with the signal's reason and drops the request in the
 * worker if it has not started; an ONNX run already under way finishes and its result is discarded.
 * Progress: onProgress('queued' | 'running' | 'done').
 */
import type { DecodedImage, FileSource } from '../../dataset/types';
import type { ImageEmbeddingStore } from '../../batch/score-set';
import { ModelContractError, type ModelContractCode } from '../../model/contract';
import { embeddingCacheKey } from '../../model/embedding-cache-key';
import { MANIFEST_FILE, tokenizerConfigPath } from '../../model/model-folder';
import { sha256Hex } from '../../model/sha256';
import type { EmbeddingCache } from '../../model/types';
import type { EncodeStage, ImagePayload, OpenedModel, RuntimeInfo, WorkerFailure, WorkerRequest, WorkerResponse } from './protocol';

export type { EncodeStage, OpenedModel, RuntimeInfo } from './protocol';

/** The part of a Worker the client uses (a fake in tests). */
export interface WorkerLike {
  postMessage(message: WorkerRequest, transfer?: Transferable[]): void;
  addEventListener(type: 'message', listener: (event: MessageEvent<WorkerResponse>) => void): void;
  terminate(): void;
}

export interface RequestOptions {
  readonly signal?: AbortSignal;
  readonly onProgress?: (stage: EncodeStage) => void;
}

export interface InferenceClient {
  openModel(source: FileSource): Promise<OpenedModel>;
  encodeImage(modelHash: string, image: DecodedImage, contentHash: string | undefined, options?: RequestOptions): Promise<Float32Array>;
  encodeSentences(modelHash: string, texts: readonly string[], options?: RequestOptions): Promise<Float32Array>;
  readonly imageStore: ImageEmbeddingStore;
  runtimeInfo(): Promise<RuntimeInfo>;
  releaseModel(modelHash: string): Promise<void>;
  terminate(): void;
}

/** The content hash the cache keys on: sha256 of the image file's bytes, as hex. */
export function contentHashOf(bytes: Uint8Array): Promise<string> {
  return sha256Hex(bytes);
}

/** The cache key of one image's embeddings; shared with the CLI's disk store. */
export function imageCacheKey(modelHash: string, contentHash: string): string {
  return embeddingCacheKey(modelHash, contentHash, 'image');
}

interface Pending {
  resolve(value: unknown): void;
  reject(reason: unknown): void;
  onProgress?: (stage: EncodeStage) => void;
}

/** Wraps the inference worker in a promise API with progress, cancel and an embedding cache. */
export function createInferenceClient(worker: WorkerLike, { cache }: { cache?: EmbeddingCache } = {}): InferenceClient {
  let nextId = 1;
  const pending = new Map<number, Pending>();
  const models = new Map<string, OpenedModel>();
  const sentenceMemo = new Map<string, Map<string, Float32Array>>();
  let terminated = false;

  worker.addEventListener('message', (event) => {
    const msg = event.data;
    const p = pending.get(msg.id);
    if (!p) return; // cancelled or unknown: the late answer is dropped
    if (msg.type === 'progress') {
      p.onProgress?.(msg.stage);
      return;
    }
    pending.delete(msg.id);
    if (msg.type === 'result') p.resolve(msg.value);
    else p.reject(reviveFailure(msg.error));
  });

  function request<T>(build: (id: number) => WorkerRequest, { signal, onProgress }: RequestOptions = {}, transfer: Transferable[] = []): Promise<T> {
    if (terminated) return Promise.reject(new Error('the inference worker was stopped; reload the page to start it again.'));
    if (signal?.aborted) return Promise.reject(signal.reason);
    const id = nextId++;
    return new Promise<T>((resolve, reject) => {
      const onAbort = (): void => {
        if (!pending.delete(id)) return;
        worker.postMessage({ id: nextId++, type: 'cancel', target: id });
        reject(signal?.reason);
      };
      pending.set(id, {
        resolve: (v) => {
          signal?.removeEventListener('abort', onAbort);
          resolve(v as T);
        },
        reject: (e) => {
          signal?.removeEventListener('abort', onAbort);
          reject(e);
        },
        onProgress,
      });
      signal?.addEventListener('abort', onAbort, { once: true });
      worker.postMessage(build(id), transfer);
    });
  }

  function modelOf(modelHash: string): OpenedModel {
    const m = models.get(modelHash);
    if (!m) throw new RangeError(`'modelHash' must name a model opened by this client; got '${modelHash}'`);
    return m;
  }

  async function encodeRaw(model: OpenedModel, image: DecodedImage, options: RequestOptions): Promise<Float32Array> {
    const payload: ImagePayload = {
      width: image.width,
      height: image.height,
      data: image.data.slice(),
      format: image.format,
      bitDepth: image.bitDepth,
      valueRange: image.valueRange,
      ...(image.window ? { window: image.window } : {}),
    };
    return request<Float32Array>((id) => ({ id, type: 'encode-image', modelHash: model.hash, image: payload }), options, [payload.data.buffer]);
  }

  const imageStore: ImageEmbeddingStore = {
    async get(modelHash, bytes) {
      if (!cache) return undefined;
      return checkedHit(modelOf(modelHash), await cache.get(imageCacheKey(modelHash, await contentHashOf(bytes))));
    },
    async set(modelHash, bytes, embeddings) {
      if (cache) await cache.set(imageCacheKey(modelHash, await contentHashOf(bytes)), embeddings);
    },
  };

  return {
    async openModel(source) {
      const files = await readModelFiles(source);
      const opened = await request<OpenedModel>(
        (id) => ({ id, type: 'open-model', label: source.label, files }),
        {},
        Object.values(files).map((f) => f.buffer as ArrayBuffer),
      );
      models.set(opened.hash, opened);
      return opened;
    },

    async encodeImage(modelHash, image, contentHash, options = {}) {
      const model = modelOf(modelHash);
      const key = contentHash !== undefined && cache ? imageCacheKey(modelHash, contentHash) : undefined;
      if (key !== undefined && cache) {
        const hit = checkedHit(model, await cache.get(key));
        options.signal?.throwIfAborted();
        if (hit) {
          options.onProgress?.('done');
          return hit;
        }
      }
      const embeddings = await encodeRaw(model, image, options);
      if (key !== undefined && cache) await cache.set(key, embeddings);
      return embeddings;
    },

    async encodeSentences(modelHash, texts, options = {}) {
      const model = modelOf(modelHash);
      const d = model.manifest.embedding_dim;
      let memo = sentenceMemo.get(modelHash);
      if (!memo) sentenceMemo.set(modelHash, (memo = new Map()));
      const missing = [...new Set(texts.filter((t) => !memo.has(t)))];
      if (missing.length > 0) {
        const out = await request<Float32Array>((id) => ({ id, type: 'encode-sentences', modelHash, texts: missing }), options);
        missing.forEach((t, i) => memo.set(t, out.slice(i * d, (i + 1) * d)));
      } else {
        options.onProgress?.('done');
      }
      const result = new Float32Array(texts.length * d);
      texts.forEach((t, i) => result.set(memo.get(t) as Float32Array, i * d));
      return result;
    },

    imageStore,
    runtimeInfo: () => request<RuntimeInfo>((id) => ({ id, type: 'runtime-info' })),

    async releaseModel(modelHash) {
      modelOf(modelHash);
      await request<void>((id) => ({ id, type: 'release-model', modelHash }));
      models.delete(modelHash);
      sentenceMemo.delete(modelHash);
    },

    terminate() {
      terminated = true;
      worker.terminate();
      const reason = new Error('the inference worker was stopped');
      for (const p of pending.values()) p.reject(reason);
      pending.clear();
    },
  };
}

function checkedHit(model: OpenedModel, hit: Float32Array | undefined): Float32Array | undefined {
  if (hit === undefined) return undefined;
  const expected = model.grid.h * model.grid.w * model.manifest.embedding_dim;
  if (hit.length !== expected) {
    throw new Error(
      `the stored embeddings for model "${model.manifest.id}" hold ${hit.length} values, expected cells x D = ${expected}; ` +
        'clear the site data of this page (the embedding cache) and open the study again.',
    );
  }
  return hit;
}

/**
 * Reads the files of a model folder the worker needs: the manifest and, when it parses, the files it
 * names (those that exist). Checking is left to openModelFolder in the worker, which reports every problem.
 */
async function readModelFiles(source: FileSource): Promise<Record<string, Uint8Array>> {
  const files: Record<string, Uint8Array> = {};
  if (!(await source.exists(MANIFEST_FILE))) return files;
  // Copies: their buffers are transferred to the worker, which detaches them.
  files[MANIFEST_FILE] = (await source.readBytes(MANIFEST_FILE)).slice();
  let names: string[] = [];
  try {
    const m = JSON.parse(new TextDecoder().decode(files[MANIFEST_FILE])) as { image?: { file?: unknown }; text?: { file?: unknown; tokenizer?: unknown } };
    names = [m.image?.file, m.text?.file, m.text?.tokenizer].filter((n): n is string => typeof n === 'string' && n !== '');
    if (typeof m.text?.tokenizer === 'string') names.push(tokenizerConfigPath(m.text.tokenizer));
  } catch {
    // The worker reports the syntax error with the file and the fix.
  }
  for (const name of new Set(names)) {
    if (await source.exists(name)) files[name] = (await source.readBytes(name)).slice();
  }
  return files;
}

function reviveFailure(f: WorkerFailure): Error {
  if (f.name === 'ModelContractError' && f.problems && f.code && f.file !== undefined) {
    return new ModelContractError(f.code as ModelContractCode, f.file, f.problems);
  }
  const err = new Error(f.message);
  if (f.name !== 'Error') err.name = f.name;
  return err;
}
