import * as ort from 'onnxruntime-node';
import type { InferenceEngine, InferenceSession, NamedTensor } from '../types';
import { checkFeed, toNamedTensor } from './ort-tensors';

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
      return wrapSession(session);
    },
  };
}

function checkThreads(threads: number): void {
  if (!Number.isInteger(threads) || threads < 1) {
    throw new RangeError(`'threads' must be an integer >= 1; got ${threads}`);
  }
}

function wrapSession(session: ort.InferenceSession): InferenceSession {
  return {
    inputNames: [...session.inputNames],
    outputNames: [...session.outputNames],
    async run(feeds: Readonly<Record<string, NamedTensor>>) {
      const ortFeeds: Record<string, ort.Tensor> = {};
      for (const [name, t] of Object.entries(feeds)) {
        checkFeed(name, t);
        ortFeeds[name] = new ort.Tensor(t.type, t.data, t.dims);
      }
      const results = await session.run(ortFeeds);
      const out: Record<string, NamedTensor> = {};
      for (const [name, t] of Object.entries(results)) out[name] = toNamedTensor(t, `output '${name}'`);
      return out;
    },
    release: () => session.release(),
  };
}
