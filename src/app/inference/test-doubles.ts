// Test doubles for the inference and view tests: a stand-in client, a fake engine with the tiny fixture's shapes, and a
// worker pair that runs the real worker handler in the same thread. Not used by the app.
import type { InferenceEngine, InferenceSession, NamedTensor, SentenceTokenizer } from '../../model/types';
import type { WorkerRequest, WorkerResponse } from './protocol';
import type { InferenceClient, WorkerLike } from './inference-client';
import { createWorkerHandler } from './worker-handler';

export const D = 4;
export const GRID = { h: 2, w: 3 };

/** A manifest for the fake engine: 8x8 one-channel input, BDHW [1, D, 2, 3], sentence output [B, D]. */
export function fakeManifest(id = 'fake-model'): Record<string, unknown> {
  return {
    schema: 'tessera.model/1',
    id,
    image: {
      file: 'image.onnx',
      input: { name: 'pixels', channels: 1, height: 8, width: 8, scale: 1, mean: [0], std: [1], resize: 'stretch' },
      output: { name: 'cells', layout: 'BDHW', grid: GRID },
    },
    text: { file: 'text.onnx', tokenizer: 'tokenizer.json', input: { ids: 'ids', mask: 'mask' }, max_tokens: 8, output: { name: 'sent', kind: 'sentence' } },
    embedding_dim: D,
    similarity: 'cosine',
  };
}

export function fakeModelFiles(id = 'fake-model'): Map<string, Uint8Array> {
  const enc = new TextEncoder();
  return new Map([
    ['tessera-model.json', enc.encode(JSON.stringify(fakeManifest(id)))],
    ['image.onnx', new Uint8Array([1, 2, 3])],
    ['text.onnx', new Uint8Array([4, 5, 6])],
    ['tokenizer.json', enc.encode('{}')],
  ]);
}

/** Counts runs; image cell values depend on the mean pixel so different images differ. */
export function fakeEngine(counts = { image: 0, text: 0 }): InferenceEngine {
  const session = (kind: 'image' | 'text'): InferenceSession => ({
    inputNames: kind === 'image' ? ['pixels'] : ['ids', 'mask'],
    outputNames: kind === 'image' ? ['cells'] : ['sent'],
    async run(feeds): Promise<Record<string, NamedTensor>> {
      counts[kind]++;
      if (kind === 'image') {
        const px = feeds.pixels.data as Float32Array;
        const b = feeds.pixels.dims[0];
        const mean = px.reduce((a, v) => a + v, 0) / px.length;
        const n = GRID.h * GRID.w;
        const data = new Float32Array(b * D * n).map((_, i) => Math.sin(i + 1) + mean);
        return { cells: { type: 'float32', data, dims: [b, D, GRID.h, GRID.w] } satisfies NamedTensor };
      }
      const ids = feeds.ids;
      const b = ids.dims[0];
      const data = new Float32Array(b * D).map((_, i) => Number((ids.data as BigInt64Array)[Math.floor(i / D) * ids.dims[1]]) + (i % D));
      return { sent: { type: 'float32', data, dims: [b, D] } satisfies NamedTensor };
    },
    release: async () => undefined,
  });
  return { name: 'fake', createSession: async (bytes) => session(bytes[0] === 1 ? 'image' : 'text') };
}

/** Token ids: the sentence length, then ones; enough to tell sentences apart. */
export const fakeTokenizerFactory = (): SentenceTokenizer => ({
  encode(sentences) {
    const t = 3;
    const ids = new BigInt64Array(sentences.length * t).fill(1n);
    sentences.forEach((s, i) => (ids[i * t] = BigInt(s.length)));
    return { ids, mask: new BigInt64Array(sentences.length * t).fill(1n), dims: [sentences.length, t] as const };
  },
});

/** A WorkerLike whose messages go through structured cloning to the real handler, as a worker's would. */
export function inThreadWorker(engine: InferenceEngine = fakeEngine()): WorkerLike & { sent: WorkerRequest[] } {
  const listeners: ((e: MessageEvent<WorkerResponse>) => void)[] = [];
  const sent: WorkerRequest[] = [];
  const handle = createWorkerHandler({
    createEngine: async () => engine,
    loadTokenizerFactory: async () => fakeTokenizerFactory,
    post: (message) => {
      const copy = structuredClone(message);
      queueMicrotask(() => listeners.forEach((l) => l({ data: copy } as MessageEvent<WorkerResponse>)));
    },
    runtimeInfo: () => ({ crossOriginIsolated: false, threads: 1, wasmPaths: '/ort/' }),
  });
  return {
    sent,
    postMessage(message) {
      sent.push(message);
      handle(structuredClone(message));
    },
    addEventListener: (_type, l) => listeners.push(l),
    terminate: () => undefined,
  };
}

/** An InferenceClient stand-in for view tests: the given encode and open functions, the rest inert. */
export function fakeClient(parts: Pick<InferenceClient, 'openModel' | 'encodeImage' | 'encodeSentences'>): InferenceClient {
  return {
    ...parts,
    imageStore: { get: async () => undefined, set: async () => {} },
    runtimeInfo: async () => ({ crossOriginIsolated: false, threads: 1, wasmPaths: '' }),
    releaseModel: async () => {},
    terminate: () => {},
  } as unknown as InferenceClient;
}
