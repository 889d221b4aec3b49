/// <reference lib="webworker" />
/// <reference types="vite/client" />
// The inference Web Worker: owns onnxruntime-web, the tokenizer and the opened models.
import type { TokenizerFactory } from '../../model/model-folder';
import type { WorkerRequest, WorkerResponse } from './protocol';
import { createWorkerHandler } from './worker-handler';

declare const self: DedicatedWorkerGlobalScope;

const THREADS = 2;
// Our own build serves the runtime's WebAssembly files under <base>/ort/ (see vite.config.ts).
const wasmPaths = new URL(`${import.meta.env.BASE_URL}ort/`, self.location.origin).href;

async function loadTokenizerFactory(): Promise<TokenizerFactory> {
  const [{ createTokenizerFromJson }, { env }] = await Promise.all([
    import('../../model/adapters/hf-tokenizer'),
    import('@huggingface/transformers'),
  ]);
  // transformers.js points its own onnxruntime copy at a CDN on import; it never runs a session here,
  // but its env is set to local files only so nothing can be fetched from outside the page.
  env.allowRemoteModels = false;
  env.allowLocalModels = false;
  const onnx = env.backends.onnx as { wasm?: { wasmPaths?: unknown } } | undefined;
  if (onnx?.wasm) onnx.wasm.wasmPaths = wasmPaths;
  return createTokenizerFromJson;
}

async function createEngine() {
  const { createOrtWebEngine } = await import('../../model/adapters/ort-web');
  return createOrtWebEngine({ wasmPaths, threads: THREADS });
}

const handle = createWorkerHandler({
  createEngine,
  loadTokenizerFactory,
  post: (message: WorkerResponse, transfer: Transferable[] = []) => self.postMessage(message, transfer),
  runtimeInfo: () => ({ crossOriginIsolated: self.crossOriginIsolated, threads: self.crossOriginIsolated ? THREADS : 1, wasmPaths }),
  threads: THREADS,
});

self.addEventListener('message', (event: MessageEvent<WorkerRequest>) => handle(event.data));
