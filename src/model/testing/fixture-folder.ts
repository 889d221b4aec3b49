// Test support for the inference tests (Node only): fixture folders in memory, engines that count
// or tamper with runs. Not part of the model API.
import { readdir, readFile } from 'node:fs/promises';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { FileSource } from '../../dataset/types';
import type { InferenceEngine, InferenceSession, NamedTensor } from '../types';

export const FIXTURES = fileURLToPath(new URL('../../../tests/fixtures', import.meta.url));
/** Where onnxruntime-web finds its .wasm/.mjs files when run in Node. */
export const ORT_WEB_WASM_DIR = fileURLToPath(new URL('../../../node_modules/onnxruntime-web/dist/', import.meta.url));

export type FolderFiles = Map<string, Uint8Array>;

/** Reads every file of a fixture folder (flat) into memory. */
export async function readFixtureFolder(name: string): Promise<FolderFiles> {
  const dir = join(FIXTURES, name);
  const files: FolderFiles = new Map();
  for (const f of await readdir(dir)) files.set(f, new Uint8Array(await readFile(join(dir, f))));
  return files;
}

/** A FileSource over files held in memory. */
export function memoryFileSource(label: string, files: FolderFiles): FileSource {
  const get = (path: string): Uint8Array => {
    const bytes = files.get(path);
    if (bytes === undefined) throw new Error(`${label}/${path}: no such file`);
    return bytes;
  };
  return {
    label,
    readBytes: async (path) => get(path),
    readText: async (path) => new TextDecoder().decode(get(path)),
    exists: async (path) => files.has(path),
  };
}

/** A copy of the folder with tessera-model.json rewritten by `edit` (which may mutate the parsed JSON). */
export function withManifest(files: FolderFiles, edit: (m: Record<string, any>) => void): FolderFiles { // eslint-disable-line @typescript-eslint/no-explicit-any
  const copy = new Map(files);
  const m = JSON.parse(new TextDecoder().decode(files.get('tessera-model.json')));
  edit(m);
  copy.set('tessera-model.json', new TextEncoder().encode(JSON.stringify(m)));
  return copy;
}

export interface ReferenceTensor {
  readonly dims: number[];
  readonly data: number[];
}

export interface ReferenceOutputs {
  readonly made_by: string;
  readonly images: { width: number; height: number; valueRange: [number, number]; data: number[] }[];
  readonly image_output: ReferenceTensor;
  readonly sentences: string[];
  readonly input_ids: ReferenceTensor;
  readonly attention_mask: ReferenceTensor;
  readonly text_output: ReferenceTensor;
  readonly sentence_embeddings: ReferenceTensor;
}

export async function readReference(name: string): Promise<ReferenceOutputs> {
  return JSON.parse(await readFile(join(FIXTURES, name, 'reference-outputs.json'), 'utf8'));
}

/** Wraps an engine: counts runs per session and lets a test rewrite outputs. */
export function instrumentEngine(
  engine: InferenceEngine,
  rewrite: (out: Record<string, NamedTensor>) => Record<string, NamedTensor> = (o) => o,
): InferenceEngine & { runs: number } {
  const wrapped = {
    name: engine.name,
    runs: 0,
    async createSession(model: Uint8Array, options?: { readonly threads?: number }): Promise<InferenceSession> {
      const s = await engine.createSession(model, options);
      return {
        inputNames: s.inputNames,
        outputNames: s.outputNames,
        run: async (feeds) => {
          wrapped.runs++;
          return rewrite(await s.run(feeds));
        },
        release: () => s.release(),
      };
    },
  };
  return wrapped;
}
