import * as ort from 'onnxruntime-node';
import type { InferenceEngine } from '../types';
import { wrapOrtSession } from './ort-tensors';

/** An InferenceEngine over onnxruntime-node (CPU), for the CLI. Node only. */
export async function createOrtNodeEngine({ threads = 2 }: { threads?: number } = {}): Promise<InferenceEngine> {
  checkThreads(threads);
  return {
    name: 'onnxruntime-node',
    async createSession(model, options = {}) {
      const n = options.threads ?? threads;
      checkThreads(n);
      const session = await ort.InferenceSession.create(model, {
        executionProviders: ['cpu'],
        intraOpNumThreads: n,
        interOpNumThreads: 1,
        graphOptimizationLevel: 'all',
      });
      return wrapOrtSession(session, (t) => new ort.Tensor(t.type, t.data, t.dims));
    },
  };
}

function checkThreads(threads: number): void {
  if (!Number.isInteger(threads) || threads < 1) {
    throw new RangeError(`'threads' must be an integer >= 1; got ${threads}`);
  }
}

