import type { FileSource } from '../dataset/types';
import { ModelContractError, describeValue, validateManifest, type Problem } from './contract';
import { createDualEncoder, type DualEncoder } from './encoders';
import { checkImageOutput, checkTextOutput } from './output-checks';
import { preprocessImage } from './preprocess';
import { sha256Hex, sha256HexOfText } from './sha256';
import type { InferenceEngine, InferenceSession, ModelManifest, SentenceTokenizer } from './types';

export const MANIFEST_FILE = 'tessera-model.json';

/** Builds a SentenceTokenizer from a parsed tokenizer.json and optional tokenizer_config.json. */
export type TokenizerFactory = (tokenizerJson: object, config?: object) => SentenceTokenizer;

export interface OpenModelOptions {
  /** Threads per session (intra-op); the machine may be shared, so the default is small. */
  readonly threads?: number;
  readonly tokenizerFactory: TokenizerFactory;
}

/** A model folder read and checked, but not yet probed: the parts openModelFolder and inspectModel share. */
export interface LoadedModelFolder {
  readonly manifest: ModelManifest;
  readonly hash: string;
  readonly imageSession: InferenceSession;
  readonly textSession: InferenceSession;
  readonly tokenizer: SentenceTokenizer;
}

/** Parses and validates tessera-model.json; throws ModelContractError('manifest-invalid') with every problem. */
export async function readManifest(source: FileSource): Promise<ModelManifest> {
  const file = `${source.label}/${MANIFEST_FILE}`;
  if (!(await source.exists(MANIFEST_FILE))) {
    throw new ModelContractError('manifest-invalid', file, [{
      file, path: '', expected: `a ${MANIFEST_FILE} manifest in the model folder`, got: 'no such file',
      fix: `choose the folder that holds ${MANIFEST_FILE}, or write one (see models/recipe/ and src/model/schemas/model.schema.json).`,
    }]);
  }
  const text = await source.readText(MANIFEST_FILE);
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (cause) {
    throw new ModelContractError('manifest-invalid', file, [{
      file, path: '', expected: 'valid JSON', got: `a JSON syntax error (${(cause as Error).message})`,
      fix: 'correct the JSON syntax (a trailing comma or a missing quote is common).',
    }], { cause });
  }
  const problems = validateManifest(json, file);
  if (problems.length > 0) throw new ModelContractError('manifest-invalid', file, problems);
  return json as ModelManifest;
}

/** The tokenizer config read beside tokenizer.json, when the folder has one. */
export function tokenizerConfigPath(tokenizerPath: string): string {
  const slash = tokenizerPath.lastIndexOf('/');
  return `${slash < 0 ? '' : tokenizerPath.slice(0, slash + 1)}tokenizer_config.json`;
}

/**
 * Content hash of a model: sha256 over the manifest's settings (all but description and hashes)
 * and the sha256 of each file, in name order. Equal hashes mean equal embeddings for equal inputs.
 */
export async function modelHash(manifest: ModelManifest, files: Readonly<Record<string, Uint8Array>>): Promise<string> {
  const { description: _d, hashes: _h, ...settings } = manifest;
  const names = Object.keys(files).sort();
  const fileHashes = await Promise.all(names.map(async (n) => `${n}:${await sha256Hex(files[n])}`));
  return sha256HexOfText(`${canonicalJson(settings)}\n${fileHashes.join('\n')}`);
}

function canonicalJson(v: unknown): string {
  if (Array.isArray(v)) return `[${v.map(canonicalJson).join(',')}]`;
  if (typeof v === 'object' && v !== null) {
    const o = v as Record<string, unknown>;
    return `{${Object.keys(o).sort().filter((k) => o[k] !== undefined).map((k) => `${JSON.stringify(k)}:${canonicalJson(o[k])}`).join(',')}}`;
  }
  return JSON.stringify(v);
}

/**
 * Reads a model folder: the manifest, every named file (which must exist and match its hash if
 * one is given), the two sessions (whose input and output names must match the manifest) and the
 * tokenizer. Throws ModelContractError listing every problem found at the first stage that fails.
 */
export async function loadModelFolder(source: FileSource, engine: InferenceEngine, { threads = 2, tokenizerFactory }: OpenModelOptions): Promise<LoadedModelFolder> {
  if (!Number.isInteger(threads) || threads < 1) throw new RangeError(`'threads' must be an integer >= 1; got ${threads}`);
  const manifest = await readManifest(source);
  const label = source.label;
  const problems: Problem[] = [];
  const named = [manifest.image.file, manifest.text.file, manifest.text.tokenizer];
  const present = await Promise.all(named.map((f) => source.exists(f)));
  named.forEach((f, i) => {
    if (!present[i]) {
      problems.push({
        file: `${label}/${f}`, path: '', expected: 'the file named in the manifest', got: 'no such file',
        fix: `copy ${f} into the model folder, or correct its name in ${MANIFEST_FILE}.`,
      });
    }
  });
  if (problems.length > 0) throw new ModelContractError('folder-invalid', label, problems);

  const files: Record<string, Uint8Array> = {};
  for (const f of named) files[f] = await source.readBytes(f);
  const configPath = tokenizerConfigPath(manifest.text.tokenizer);
  if (await source.exists(configPath)) files[configPath] = await source.readBytes(configPath);

  for (const [f, expected] of Object.entries(manifest.hashes ?? {})) {
    const got = await sha256Hex(files[f]);
    if (got !== expected) {
      problems.push({
        file: `${label}/${f}`, path: `${MANIFEST_FILE} hashes.${f}`, expected: `sha256 ${expected}`, got: `sha256 ${got}`,
        fix: `the file changed since the manifest was written: restore the original, or set hashes["${f}"] to "${got}" if the new file is intended.`,
      });
    }
  }

  const sessions = await Promise.all([
    createSessionOrProblem(engine, files[manifest.image.file], threads, `${label}/${manifest.image.file}`, problems),
    createSessionOrProblem(engine, files[manifest.text.file], threads, `${label}/${manifest.text.file}`, problems),
  ]);
  const [imageSession, textSession] = sessions;
  if (imageSession) problems.push(...checkImageNames(manifest, imageSession, label));
  if (textSession) problems.push(...checkTextNames(manifest, textSession, label));

  const tokenizer = buildTokenizer(manifest, files, configPath, tokenizerFactory, label, problems);
  if (problems.length > 0 || !imageSession || !textSession || !tokenizer) {
    await Promise.all(sessions.map((s) => s?.release()));
    throw new ModelContractError('folder-invalid', label, problems);
  }
  const hash = await modelHash(manifest, files);
  return { manifest, hash, imageSession, textSession, tokenizer };
}

/**
 * Opens a model folder as a DualEncoder: everything loadModelFolder checks, then one probe image and
 * one probe sentence through the encoders, checking output ranks, shapes, the embedding dimension of
 * both encoders against embedding_dim, and finite values. Throws ModelContractError with every problem.
 */
export async function openModelFolder(source: FileSource, engine: InferenceEngine, options: OpenModelOptions): Promise<DualEncoder> {
  const loaded = await loadModelFolder(source, engine, options);
  const { problems } = await probeModel(loaded);
  if (problems.length > 0) {
    await Promise.all([loaded.imageSession.release(), loaded.textSession.release()]);
    throw new ModelContractError('output-invalid', source.label, problems);
  }
  return createDualEncoder(loaded);
}

/** The probe sentence: plain report wording, short enough for any max_tokens. */
export const PROBE_SENTENCE = 'No focal consolidation.';

/** A smooth synthetic image at the encoder's input size, values in [0, 1]. */
export function probeImage(width: number, height: number) {
  const data = new Float32Array(width * height);
  for (let y = 0; y < height; y++) for (let x = 0; x < width; x++) data[y * width + x] = (x + y) / Math.max(1, width + height - 2);
  return { width, height, data, format: 'png' as const, bitDepth: 8, valueRange: [0, 1] as const, synthetic: true };
}

/** What one probe run through an encoder gave. */
export interface ProbeRun {
  readonly inputs: Readonly<Record<string, readonly number[]>>;
  readonly output?: { readonly name: string; readonly dims: readonly number[] };
  readonly ms: number;
}

export interface ProbeResult {
  readonly problems: Problem[];
  readonly image?: ProbeRun;
  readonly text?: ProbeRun;
}

/**
 * Runs one probe image and one probe sentence and returns every output problem (shape, D across
 * encoders, non-finite values) with the shapes seen. `now` is a millisecond clock for timings.
 */
export async function probeModel(m: LoadedModelFolder, now: () => number = () => 0): Promise<ProbeResult> {
  const { manifest } = m;
  const problems: Problem[] = [];
  const input = manifest.image.input;
  const { tensor } = preprocessImage(probeImage(input.width, input.height), input);
  let t0 = now();
  const imageOut = await runOrProblem(m.imageSession, { [input.name]: tensor }, manifest.image.file, problems);
  const imageMs = now() - t0;
  const imageTensor = imageOut?.[manifest.image.output.name];
  if (imageOut) problems.push(...checkImageOutput(manifest, imageTensor, 1));
  const enc = m.tokenizer.encode([PROBE_SENTENCE], manifest.text.max_tokens);
  const feeds = {
    [manifest.text.input.ids]: { type: 'int64' as const, data: enc.ids, dims: enc.dims },
    [manifest.text.input.mask]: { type: 'int64' as const, data: enc.mask, dims: enc.dims },
    ...(manifest.text.input.type_ids ? { [manifest.text.input.type_ids]: { type: 'int64' as const, data: new BigInt64Array(enc.ids.length), dims: enc.dims } } : {}),
  };
  t0 = now();
  const textOut = await runOrProblem(m.textSession, feeds, manifest.text.file, problems);
  const textMs = now() - t0;
  const textTensor = textOut?.[manifest.text.output.name];
  if (textOut) problems.push(...checkTextOutput(manifest, textTensor, enc.dims[0], enc.dims[1]));
  // D is compared only when each output has the rank its declared layout gives, else its axis is unknown.
  const dImage = manifest.image.output.layout === 'BDHW' ? embeddingDimOf(imageTensor?.dims, 4, 1) : embeddingDimOf(imageTensor?.dims, 3, 2);
  const dText = manifest.text.output.kind === 'sentence' ? embeddingDimOf(textTensor?.dims, 2, 1) : embeddingDimOf(textTensor?.dims, 3, 2);
  if (dImage !== undefined && dText !== undefined && dImage !== dText) {
    problems.push({
      file: MANIFEST_FILE, path: 'embedding_dim', expected: 'the same D from both encoders',
      got: `D = ${dImage} from the image encoder and D = ${dText} from the text encoder (embedding_dim = ${manifest.embedding_dim})`,
      fix: 'export both encoders with their projection heads into the shared embedding space, so both give the same D.',
    });
  }
  const run = (inputs: Record<string, { dims: readonly number[] }>, name: string, t: { dims: readonly number[] } | undefined, ms: number): ProbeRun => ({
    inputs: Object.fromEntries(Object.entries(inputs).map(([k, v]) => [k, [...v.dims]])),
    ...(t ? { output: { name, dims: [...t.dims] } } : {}),
    ms,
  });
  return {
    problems,
    ...(imageOut ? { image: run({ [input.name]: tensor }, manifest.image.output.name, imageTensor, imageMs) } : {}),
    ...(textOut ? { text: run(feeds, manifest.text.output.name, textTensor, textMs) } : {}),
  };
}

function embeddingDimOf(dims: readonly number[] | undefined, rank: number, axis: number): number | undefined {
  return dims !== undefined && dims.length === rank ? dims[axis] : undefined;
}

async function runOrProblem(session: InferenceSession, feeds: Parameters<InferenceSession['run']>[0], file: string, problems: Problem[]) {
  try {
    return await session.run(feeds);
  } catch (cause) {
    const shapes = Object.entries(feeds).map(([k, t]) => `${k} [${t.dims.join(', ')}] ${t.type}`).join(', ');
    problems.push({
      file, path: 'run', expected: `a run on the inputs ${shapes}`, got: `an error: ${(cause as Error).message}`,
      fix: 'check the input size, channels and dtypes in the manifest against the graph inputs.',
    });
    return undefined;
  }
}

async function createSessionOrProblem(engine: InferenceEngine, bytes: Uint8Array, threads: number, file: string, problems: Problem[]): Promise<InferenceSession | undefined> {
  try {
    return await engine.createSession(bytes, { threads });
  } catch (cause) {
    problems.push({
      file, path: '', expected: `an ONNX graph ${engine.name} can load`, got: `an error: ${(cause as Error).message}`,
      fix: 'check that the file is a complete .onnx export (not a Git LFS pointer) with an opset the runtime supports.',
    });
    return undefined;
  }
}

function missingName(file: string, path: string, kind: string, name: string, have: readonly string[], fix: string): Problem {
  return { file, path, expected: `a graph ${kind} named "${name}"`, got: `${kind}s ${have.map((n) => `"${n}"`).join(', ') || 'none'}`, fix };
}

function checkImageNames(m: ModelManifest, s: InferenceSession, label: string): Problem[] {
  const file = `${label}/${m.image.file}`;
  const problems: Problem[] = [];
  if (!s.inputNames.includes(m.image.input.name)) {
    problems.push(missingName(file, `${MANIFEST_FILE} image.input.name`, 'input', m.image.input.name, s.inputNames, `set image.input.name to ${s.inputNames.length === 1 ? `"${s.inputNames[0]}"` : 'the pixel input of the graph'}.`));
  }
  for (const n of s.inputNames) {
    if (n !== m.image.input.name && s.inputNames.includes(m.image.input.name)) {
      problems.push({ file, path: 'inputs', expected: 'the pixel input only', got: `also an input "${n}"`, fix: 'export the image encoder with the pixel tensor as its only input.' });
    }
  }
  if (!s.outputNames.includes(m.image.output.name)) {
    problems.push(missingName(file, `${MANIFEST_FILE} image.output.name`, 'output', m.image.output.name, s.outputNames, 'set image.output.name to the region-embedding output of the graph.'));
  }
  return problems;
}

function checkTextNames(m: ModelManifest, s: InferenceSession, label: string): Problem[] {
  const file = `${label}/${m.text.file}`;
  const problems: Problem[] = [];
  const declared = [
    ['ids', m.text.input.ids],
    ['mask', m.text.input.mask],
    ...(m.text.input.type_ids ? [['type_ids', m.text.input.type_ids]] : []),
  ] as const;
  for (const [key, name] of declared) {
    if (!s.inputNames.includes(name)) {
      problems.push(missingName(file, `${MANIFEST_FILE} text.input.${key}`, 'input', name, s.inputNames, `set text.input.${key} to the matching graph input.`));
    }
  }
  for (const n of s.inputNames) {
    if (!declared.some(([, name]) => name === n)) {
      problems.push({
        file, path: 'inputs', expected: 'only the inputs declared in text.input', got: `an undeclared graph input "${n}"`,
        fix: /type/i.test(n) ? `add "type_ids": "${n}" to text.input (Tessera feeds zeros).` : `declare "${n}" in text.input, or export the graph without it.`,
      });
    }
  }
  if (!s.outputNames.includes(m.text.output.name)) {
    problems.push(missingName(file, `${MANIFEST_FILE} text.output.name`, 'output', m.text.output.name, s.outputNames, 'set text.output.name to the sentence or token-state output of the graph.'));
  }
  return problems;
}

function buildTokenizer(m: ModelManifest, files: Record<string, Uint8Array>, configPath: string, factory: TokenizerFactory, label: string, problems: Problem[]): SentenceTokenizer | undefined {
  const file = `${label}/${m.text.tokenizer}`;
  const decoder = new TextDecoder();
  let json: unknown;
  try {
    json = JSON.parse(decoder.decode(files[m.text.tokenizer]));
  } catch (cause) {
    problems.push({ file, path: '', expected: 'a tokenizer.json (JSON)', got: `a JSON syntax error (${(cause as Error).message})`, fix: 'save the tokenizer with tokenizer.save_pretrained() and copy its tokenizer.json.' });
    return undefined;
  }
  if (typeof json !== 'object' || json === null || Array.isArray(json)) {
    problems.push({ file, path: '', expected: 'a JSON object', got: describeValue(json), fix: 'copy the tokenizer.json written by tokenizer.save_pretrained().' });
    return undefined;
  }
  let config: object | undefined;
  if (files[configPath]) {
    try {
      config = JSON.parse(decoder.decode(files[configPath]));
    } catch (cause) {
      problems.push({ file: `${label}/${configPath}`, path: '', expected: 'valid JSON', got: `a JSON syntax error (${(cause as Error).message})`, fix: 'correct the JSON syntax or remove the file.' });
      return undefined;
    }
  }
  try {
    return factory(json, config);
  } catch (cause) {
    problems.push({ file, path: '', expected: 'a tokenizer transformers.js can build', got: `an error: ${(cause as Error).message}`, fix: 'check that tokenizer.json comes from the same model as the text encoder and was saved by a recent tokenizers library.' });
    return undefined;
  }
}
