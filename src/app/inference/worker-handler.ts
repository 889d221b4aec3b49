import type { FileSource } from '../../dataset/types';
import type { DualEncoder } from '../../model/encoders';
import { ModelContractError } from '../../model/contract';
import { openModelFolder, type TokenizerFactory } from '../../model/model-folder';
import type { InferenceEngine } from '../../model/types';
import type { OpenedModel, RuntimeInfo, WorkerFailure, WorkerRequest, WorkerResponse } from './protocol';

export interface WorkerHandlerDeps {
  /** Creates the runtime once, on the first model opened. */
  readonly createEngine: () => Promise<InferenceEngine>;
  readonly loadTokenizerFactory: () => Promise<TokenizerFactory>;
  readonly post: (message: WorkerResponse, transfer?: Transferable[]) => void;
  readonly runtimeInfo: () => RuntimeInfo;
  readonly threads?: number;
}

/**
 * The inference worker's message handling, apart from the worker globals so tests can drive it:
 * requests run one at a time in arrival order; a 'cancel' drops a request that has not started.
 */
export function createWorkerHandler({ createEngine, loadTokenizerFactory, post, runtimeInfo, threads = 2 }: WorkerHandlerDeps): (request: WorkerRequest) => void {
  const encoders = new Map<string, DualEncoder>();
  const cancelled = new Set<number>();
  let engine: Promise<InferenceEngine> | undefined;
  let tokenizerFactory: Promise<TokenizerFactory> | undefined;
  let queue: Promise<void> = Promise.resolve();

  const encoderOf = (hash: string): DualEncoder => {
    const e = encoders.get(hash);
    if (!e) throw new Error(`no model with hash ${hash} is open in the inference worker; open the model folder again.`);
    return e;
  };

  async function run(req: Exclude<WorkerRequest, { type: 'cancel' }>): Promise<{ value: unknown; transfer?: Transferable[] }> {
    switch (req.type) {
      case 'open-model': {
        engine ??= createEngine();
        tokenizerFactory ??= loadTokenizerFactory();
        const dual = await openModelFolder(memorySource(req.label, req.files), await engine, { threads, tokenizerFactory: await tokenizerFactory });
        const prior = encoders.get(dual.hash);
        if (prior) await dual.release();
        else encoders.set(dual.hash, dual);
        const opened: OpenedModel = { manifest: dual.manifest, hash: dual.hash, grid: dual.grid };
        return { value: opened };
      }
      case 'encode-image': {
        const { image } = req;
        // The file's own window decides what the encoder sees, as in the CLI (src/batch toStudyEncoder).
        const encoded = await encoderOf(req.modelHash).encodeImage(image, { window: image.window });
        return { value: encoded.embeddings, transfer: [encoded.embeddings.buffer] };
      }
      case 'encode-sentences': {
        const out = await encoderOf(req.modelHash).encodeSentences(req.texts);
        return { value: out, transfer: [out.buffer] };
      }
      case 'release-model': {
        const e = encoders.get(req.modelHash);
        encoders.delete(req.modelHash);
        await e?.release();
        return { value: undefined };
      }
      case 'runtime-info':
        return { value: runtimeInfo() };
    }
  }

  return (req) => {
    if (req.type === 'cancel') {
      cancelled.add(req.target);
      return;
    }
    post({ id: req.id, type: 'progress', stage: 'queued' });
    queue = queue.then(async () => {
      if (cancelled.delete(req.id)) return;
      post({ id: req.id, type: 'progress', stage: 'running' });
      try {
        const { value, transfer } = await run(req);
        post({ id: req.id, type: 'progress', stage: 'done' });
        post({ id: req.id, type: 'result', value }, transfer);
      } catch (err) {
        post({ id: req.id, type: 'error', error: toFailure(err) });
      }
      // A cancel that arrived while the request ran has nothing left to drop.
      cancelled.delete(req.id);
    });
  };
}

function memorySource(label: string, files: Readonly<Record<string, Uint8Array>>): FileSource {
  const get = (path: string): Uint8Array => {
    const bytes = files[path];
    if (bytes === undefined) throw new Error(`${label}/${path}: no such file in the model folder`);
    return bytes;
  };
  return {
    label,
    readBytes: async (path) => get(path),
    readText: async (path) => new TextDecoder().decode(get(path)),
    exists: async (path) => Object.prototype.hasOwnProperty.call(files, path),
  };
}

/** Turns a thrown value into a structured-clone-safe failure, keeping contract problems. */
export function toFailure(err: unknown): WorkerFailure {
  if (err instanceof ModelContractError) {
    return { name: err.name, message: err.message, code: err.code, file: err.file, problems: err.problems.map((p) => ({ ...p })) };
  }
  if (err instanceof Error) return { name: err.name, message: err.message };
  return { name: 'Error', message: String(err) };
}
