import { MODEL_SCHEMA, type ModelManifest } from './types';

/** One way a model folder breaks the contract, in words a researcher can act on. */
export interface Problem {
  readonly file: string;
  /** Where in the file, e.g. 'image.input.mean'; '' for the file as a whole. */
  readonly path: string;
  readonly expected: string;
  readonly got: string;
  readonly fix: string;
}

export type ModelContractCode =
  | 'manifest-invalid' // tessera-model.json is missing, not JSON, or breaks the schema
  | 'folder-invalid' // a named file is missing, its hash differs, or a graph lacks a declared tensor
  | 'output-invalid'; // an encoder's output has the wrong shape or non-finite values

/** One line per problem: `file: path: expected X; got Y. Fix: Z`. */
export function formatProblem(p: Problem): string {
  const where = p.path === '' ? p.file : `${p.file}: ${p.path}`;
  return `${where}: expected ${p.expected}; got ${p.got}. Fix: ${p.fix}`;
}

/** A model folder that breaks the contract; carries every problem found, not just the first. */
export class ModelContractError extends Error {
  override readonly name = 'ModelContractError';
  readonly code: ModelContractCode;
  readonly file: string;
  readonly problems: readonly Problem[];

  constructor(code: ModelContractCode, file: string, problems: readonly Problem[], options: { cause?: unknown } = {}) {
    const lines = problems.map((p) => `  - ${formatProblem(p)}`);
    const count = problems.length === 1 ? '1 problem' : `${problems.length} problems`;
    super(`Model folder ${file} breaks the model contract (${count}):\n${lines.join('\n')}`, { cause: options.cause });
    this.code = code;
    this.file = file;
    this.problems = problems;
  }
}

/** Shows a JSON value briefly, for the 'got' part of a problem. */
export function describeValue(value: unknown): string {
  if (value === undefined) return 'nothing (the field is missing)';
  if (value === null) return 'null';
  if (typeof value === 'string') return value.length > 60 ? `the string "${value.slice(0, 57)}..."` : `the string "${value}"`;
  if (typeof value === 'number' || typeof value === 'boolean') return `${typeof value} ${String(value)}`;
  if (Array.isArray(value)) {
    const text = JSON.stringify(value);
    return `an array of ${value.length}${text.length <= 60 ? ` ${text}` : ''}`;
  }
  return 'an object';
}

const RESIZE_POLICIES = ['stretch', 'letterbox', 'centre-crop'] as const;
const HEX_SHA256 = /^[0-9a-f]{64}$/;

type Obj = Record<string, unknown>;

function isObject(v: unknown): v is Obj {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}

/** Collects problems while walking the manifest; every check records and carries on. */
class Checker {
  readonly problems: Problem[] = [];
  constructor(readonly file: string) {}

  add(path: string, expected: string, got: unknown, fix: string): void {
    this.problems.push({ file: this.file, path, expected, got: describeValue(got), fix });
  }

  object(parent: Obj, key: string, path: string, allowed: readonly string[], fix: string): Obj | undefined {
    const v = parent[key];
    if (!isObject(v)) {
      this.add(path, 'an object', v, fix);
      return undefined;
    }
    this.unknownKeys(v, path, allowed);
    return v;
  }

  unknownKeys(v: Obj, path: string, allowed: readonly string[]): void {
    for (const k of Object.keys(v)) {
      if (!allowed.includes(k)) {
        const at = path === '' ? k : `${path}.${k}`;
        this.add(at, `one of the fields ${allowed.join(', ')}`, `an unknown field "${k}"`, `remove "${k}" or correct its spelling.`);
      }
    }
  }

  string(parent: Obj, key: string, path: string, fix: string, { optional = false } = {}): string | undefined {
    const v = parent[key];
    if (v === undefined && optional) return undefined;
    if (typeof v !== 'string' || v.trim() === '') {
      this.add(path, 'a non-empty string', v, fix);
      return undefined;
    }
    return v;
  }

  relativeFile(parent: Obj, key: string, path: string, example: string): string | undefined {
    const v = this.string(parent, key, path, `give the file name inside the model folder, e.g. "${example}".`);
    if (v === undefined) return undefined;
    if (v.startsWith('/') || /^[a-zA-Z]:[\\/]/.test(v) || v.split(/[\\/]/).includes('..')) {
      this.add(path, 'a path inside the model folder (no leading "/", no "..")', v, `copy the file into the model folder and name it relative to it, e.g. "${example}".`);
      return undefined;
    }
    return v;
  }

  oneOf<T extends string>(parent: Obj, key: string, path: string, options: readonly T[], fix: string): T | undefined {
    const v = parent[key];
    if (typeof v !== 'string' || !options.includes(v as T)) {
      this.add(path, `one of ${options.map((o) => `"${o}"`).join(', ')}`, v, fix);
      return undefined;
    }
    return v as T;
  }

  positiveInteger(parent: Obj, key: string, path: string, fix: string, { min = 1, optional = false } = {}): number | undefined {
    const v = parent[key];
    if (v === undefined && optional) return undefined;
    if (typeof v !== 'number' || !Number.isInteger(v) || v < min) {
      this.add(path, `an integer >= ${min}`, v, fix);
      return undefined;
    }
    return v;
  }

  positiveNumber(parent: Obj, key: string, path: string, fix: string, { optional = false } = {}): number | undefined {
    const v = parent[key];
    if (v === undefined && optional) return undefined;
    if (typeof v !== 'number' || !Number.isFinite(v) || v <= 0) {
      this.add(path, 'a finite number > 0', v, fix);
      return undefined;
    }
    return v;
  }
}

/**
 * Checks a parsed tessera-model.json against the model contract and returns every problem found
 * (an empty list when the manifest is valid). Mirrors src/model/schemas/model.schema.json and adds
 * the cross-field rules a schema cannot say well (one mean/std per channel, pooling for token outputs,
 * hashes only for named files).
 */
export function validateManifest(json: unknown, file = 'tessera-model.json'): Problem[] {
  const c = new Checker(file);
  if (!isObject(json)) {
    c.add('', 'a JSON object (the model manifest)', json, 'write the manifest as one JSON object; see src/model/schemas/model.schema.json.');
    return c.problems;
  }
  c.unknownKeys(json, '', ['schema', 'id', 'description', 'synthetic_demo', 'image', 'text', 'embedding_dim', 'similarity', 'temperature', 'hashes']);

  if (json.schema !== MODEL_SCHEMA) {
    const newer = typeof json.schema === 'string' && json.schema.startsWith('tessera.model/');
    c.add('schema', `"${MODEL_SCHEMA}"`, json.schema, newer
      ? `this version of Tessera reads "${MODEL_SCHEMA}" only; rewrite the manifest for it or update Tessera.`
      : `add "schema": "${MODEL_SCHEMA}" as the first field.`);
  }
  c.string(json, 'id', 'id', 'give the model a short name, e.g. "my-cxr-model-v2"; it labels results.');
  if (json.description !== undefined && typeof json.description !== 'string') {
    c.add('description', 'a string', json.description, 'write the description as text, or remove it.');
  }
  if (json.synthetic_demo !== undefined && typeof json.synthetic_demo !== 'boolean') {
    c.add('synthetic_demo', 'true or false', json.synthetic_demo, 'write true or false without quotes, or remove it.');
  }

  const files: string[] = [];
  const image = c.object(json, 'image', 'image', ['file', 'input', 'output', 'receptive_field_px'], 'add an "image" object with "file", "input" and "output".');
  if (image) {
    const f = c.relativeFile(image, 'file', 'image.file', 'image-encoder.onnx');
    if (f) files.push(f);
    checkImageInput(c, image);
    const output = c.object(image, 'output', 'image.output', ['name', 'layout', 'grid'], 'add "output": {"name", "layout", "grid"} describing the image encoder output.');
    if (output) {
      c.string(output, 'name', 'image.output.name', 'give the name of the region-embedding output tensor in the image encoder graph.');
      c.oneOf(output, 'layout', 'image.output.layout', ['BDHW', 'BND'], 'use "BDHW" for an output shaped [batch, D, h, w] or "BND" for [batch, h*w, D].');
      const grid = c.object(output, 'grid', 'image.output.grid', ['h', 'w'], 'add "grid": {"h": rows, "w": columns} of the region grid.');
      if (grid) {
        c.positiveInteger(grid, 'h', 'image.output.grid.h', 'give the number of grid rows the encoder outputs.');
        c.positiveInteger(grid, 'w', 'image.output.grid.w', 'give the number of grid columns the encoder outputs.');
      }
    }
    c.positiveNumber(image, 'receptive_field_px', 'image.receptive_field_px', 'give the receptive field in input pixels, or remove the field.', { optional: true });
  }

  const text = c.object(json, 'text', 'text', ['file', 'tokenizer', 'input', 'max_tokens', 'output'], 'add a "text" object with "file", "tokenizer", "input", "max_tokens" and "output".');
  if (text) {
    const f = c.relativeFile(text, 'file', 'text.file', 'text-encoder.onnx');
    if (f) files.push(f);
    const t = c.relativeFile(text, 'tokenizer', 'text.tokenizer', 'tokenizer.json');
    if (t) files.push(t);
    const input = c.object(text, 'input', 'text.input', ['ids', 'mask', 'type_ids'], 'add "input": {"ids": "input_ids", "mask": "attention_mask"} naming the text encoder inputs.');
    if (input) {
      c.string(input, 'ids', 'text.input.ids', 'give the name of the token-id input of the text encoder graph, e.g. "input_ids".');
      c.string(input, 'mask', 'text.input.mask', 'give the name of the attention-mask input of the text encoder graph, e.g. "attention_mask".');
      c.string(input, 'type_ids', 'text.input.type_ids', 'give the name of the token-type input, or remove the field if the graph has none.', { optional: true });
    }
    // Two tokens at least: the tokenizer's opening and closing special tokens.
    c.positiveInteger(text, 'max_tokens', 'text.max_tokens', 'give the longest token sequence the text encoder accepts, special tokens included (e.g. 128).', { min: 2 });
    const output = c.object(text, 'output', 'text.output', ['name', 'kind', 'pooling'], 'add "output": {"name", "kind"} describing the text encoder output.');
    if (output) {
      c.string(output, 'name', 'text.output.name', 'give the name of the text encoder output tensor.');
      const kind = c.oneOf(output, 'kind', 'text.output.kind', ['sentence', 'tokens'], 'use "sentence" for one vector per sentence [batch, D] or "tokens" for token states [batch, tokens, D].');
      if (kind === 'tokens') {
        c.oneOf(output, 'pooling', 'text.output.pooling', ['cls', 'mean'], 'token states need a pooling: "cls" (first token) or "mean" (mean over the attention mask).');
      } else if (kind === 'sentence' && output.pooling !== undefined) {
        c.add('text.output.pooling', 'no pooling when kind is "sentence"', output.pooling, 'remove "pooling", or set "kind": "tokens" if the output is per token.');
      }
    }
  }

  c.positiveInteger(json, 'embedding_dim', 'embedding_dim', 'give D, the length of each region and sentence embedding (e.g. 512).');
  if (json.similarity !== 'cosine') c.add('similarity', '"cosine"', json.similarity, 'set "similarity": "cosine"; it is the only similarity Tessera computes.');
  c.positiveNumber(json, 'temperature', 'temperature', 'give the positive softmax temperature the model was trained with, or remove it.', { optional: true });

  if (json.hashes !== undefined) {
    if (!isObject(json.hashes)) {
      c.add('hashes', 'an object of file name -> sha256 hex', json.hashes, 'write "hashes": {"image-encoder.onnx": "<64 hex digits>", ...}, or remove it.');
    } else {
      for (const [name, hash] of Object.entries(json.hashes)) {
        if (!files.includes(name)) {
          c.add(`hashes.${name}`, `a file named in the manifest (${files.join(', ')})`, name, 'remove this entry or correct the file name.');
        }
        if (typeof hash !== 'string' || !HEX_SHA256.test(hash)) {
          c.add(`hashes.${name}`, '64 lower-case hex digits (sha256)', hash, `recompute it, e.g. with \`sha256sum ${name}\`.`);
        }
      }
    }
  }
  return c.problems;
}

function checkImageInput(c: Checker, image: Obj): void {
  const input = c.object(image, 'input', 'image.input', ['name', 'channels', 'height', 'width', 'scale', 'mean', 'std', 'resize', 'pad_value'], 'add "input" describing the image encoder input tensor.');
  if (!input) return;
  c.string(input, 'name', 'image.input.name', 'give the name of the pixel input tensor in the image encoder graph, e.g. "pixel_values".');
  const channels = input.channels;
  if (channels !== 1 && channels !== 3) {
    c.add('image.input.channels', '1 or 3', channels, 'use 1 for a grey input or 3 when the encoder expects the grey image copied into three channels.');
  }
  c.positiveInteger(input, 'height', 'image.input.height', 'give the input height in pixels the encoder expects (e.g. 224).');
  c.positiveInteger(input, 'width', 'image.input.width', 'give the input width in pixels the encoder expects (e.g. 224).');
  c.positiveNumber(input, 'scale', 'image.input.scale', 'give the factor applied after mapping intensities to [0, 1]: 1 for [0, 1] inputs, 255 for [0, 255].');
  const n = channels === 1 || channels === 3 ? channels : undefined;
  for (const key of ['mean', 'std'] as const) {
    const path = `image.input.${key}`;
    const v = input[key];
    const positive = key === 'std';
    const ok = Array.isArray(v) && v.every((x) => typeof x === 'number' && Number.isFinite(x) && (!positive || x > 0));
    if (!ok) {
      c.add(path, `an array of finite numbers${positive ? ' > 0' : ''}, one per channel`, v, `write e.g. "${key}": [${key === 'mean' ? '0.5' : '0.25'}] for one channel.`);
    } else if (n !== undefined && v.length !== n) {
      c.add(path, `${n} value${n === 1 ? '' : 's'} (one per channel, channels = ${n})`, v, `give exactly ${n} ${key} value${n === 1 ? '' : 's'}, or correct "channels".`);
    }
  }
  c.oneOf(input, 'resize', 'image.input.resize', RESIZE_POLICIES, 'use "stretch" (scale both axes to fit), "letterbox" (keep aspect, pad) or "centre-crop" (keep aspect, crop).');
  const pad = input.pad_value;
  if (pad !== undefined && (typeof pad !== 'number' || !(pad >= 0 && pad <= 1))) {
    c.add('image.input.pad_value', 'a number in [0, 1] (intensity before scale, mean and std)', pad, 'use 0 for black padding, or remove the field.');
  }
}

/** Narrows a manifest that validateManifest accepted; throws ModelContractError with every problem otherwise. */
export function parseManifest(json: unknown, file = 'tessera-model.json'): ModelManifest {
  const problems = validateManifest(json, file);
  if (problems.length > 0) throw new ModelContractError('manifest-invalid', file, problems);
  return json as ModelManifest;
}
