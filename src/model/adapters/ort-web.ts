import type { InferenceEngine } from '../types';
import { wrapOrtSession } from './ort-tensors';

type OrtWeb = typeof import('onnxruntime-web/wasm');

/**
 * An InferenceEngine over onnxruntime-web (WASM backend), for the browser and for Node parity
 * tests. The module is imported dynamically: a static import breaks its thread workers in a Vite
 * build. `wasmPaths` is the folder (URL prefix, ending in '/') our own build serves the .wasm/.mjs
 * files from; in Node, point it at node_modules/onnxruntime-web/dist/ if the default lookup fails.
 * The runtime's env is global to the page, so the first engine's settings win.
 */
export async function createOrtWebEngine({ wasmPaths, threads = 2 }: { wasmPaths?: string; threads?: number } = {}): Promise<InferenceEngine> {
  if (!Number.isInteger(threads) || threads < 1) {
    throw new RangeError(`'threads' must be an integer >= 1; got ${threads}`);
  }
  const ort: OrtWeb = await import('onnxruntime-web/wasm');
  if (wasmPaths !== undefined) ort.env.wasm.wasmPaths = wasmPaths;
  // Threads need cross-origin isolation (SharedArrayBuffer); without it the runtime uses one thread.
  const isolated = (globalThis as { crossOriginIsolated?: boolean }).crossOriginIsolated === true;
  const isNode = typeof (globalThis as { process?: { versions?: { node?: string } } }).process?.versions?.node === 'string';
  ort.env.wasm.numThreads = isolated || isNode ? threads : 1;
  return {
    name: 'onnxruntime-web',
    // Threads are set once for the runtime (above); a per-session count is not supported by the WASM backend.
    async createSession(model) {
      try {
        const session = await ort.InferenceSession.create(model, {
          executionProviders: ['wasm'],
          graphOptimizationLevel: 'all',
        });
        return wrapOrtSession(session, (t) => new ort.Tensor(t.type, t.data, t.dims));
      } catch (cause) {
        const message = (cause as Error).message ?? String(cause);
        if (/no available backend/i.test(message)) {
          throw new Error(
            `onnxruntime-web could not load its WebAssembly files (wasmPaths = ${String(ort.env.wasm.wasmPaths ?? 'default')}): ${message}. ` +
              (isNode
                ? "In Node pass { wasmPaths: '<repository>/node_modules/onnxruntime-web/dist/' } to createOrtWebEngine."
                : 'Serve the ort-wasm-simd-threaded .wasm and .mjs files from the app build and pass their folder as wasmPaths.'),
            { cause },
          );
        }
        throw cause;
      }
    },
  };
}

