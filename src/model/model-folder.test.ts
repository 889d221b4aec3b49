import { beforeAll, describe, expect, it } from 'vitest';
import { createOrtNodeEngine } from './adapters/ort-node';
import { createTokenizerFromJson } from './adapters/hf-tokenizer';
import { ModelContractError, formatProblem, type Problem } from './contract';
import { MANIFEST_FILE, modelHash, openModelFolder, readManifest, tokenizerConfigPath } from './model-folder';
import { instrumentEngine, memoryFileSource, readFixtureFolder, withManifest, type FolderFiles } from './testing/fixture-folder';
import type { InferenceEngine, ModelManifest, NamedTensor } from './types';

let files: FolderFiles;
let engine: InferenceEngine;
beforeAll(async () => {
  files = await readFixtureFolder('tiny-model');
  engine = await createOrtNodeEngine({ threads: 1 });
});

const open = (f: FolderFiles, e: InferenceEngine = engine) =>
  openModelFolder(memoryFileSource('models/tiny', f), e, { tokenizerFactory: createTokenizerFromJson, threads: 1 });

async function contractError(p: Promise<unknown>): Promise<ModelContractError> {
  try {
    await p;
  } catch (e) {
    if (e instanceof ModelContractError) return e;
    throw e;
  }
  throw new Error('expected a ModelContractError');
}

const lines = (e: ModelContractError): string[] => e.problems.map(formatProblem);

describe('openModelFolder on the fixture', () => {
  it('openModelFolder(tiny-model) opens with its grid, manifest and a 64-hex hash', async () => {
    const enc = await open(files);
    expect(enc.grid).toEqual({ h: 7, w: 7 });
    expect(enc.manifest.embedding_dim).toBe(16);
    expect(enc.hash).toMatch(/^[0-9a-f]{64}$/);
    await enc.release();
    await expect(enc.encodeSentences(['x'])).rejects.toThrow(/was released/);
  });

  it('openModelFolder rejects threads that are not a positive integer', async () => {
    await expect(openModelFolder(memoryFileSource('m', files), engine, { tokenizerFactory: createTokenizerFromJson, threads: 0 })).rejects.toThrow(RangeError);
  });
});

describe('openModelFolder on broken folders', () => {
  it('openModelFolder(folder without tessera-model.json) says which file it wants', async () => {
    const f = new Map(files);
    f.delete(MANIFEST_FILE);
    const e = await contractError(open(f));
    expect(e.code).toBe('manifest-invalid');
    expect(lines(e)[0]).toMatch(/^models\/tiny\/tessera-model.json: expected a tessera-model.json manifest in the model folder; got no such file/);
  });

  it('openModelFolder(manifest with a JSON syntax error) names the file and keeps the cause', async () => {
    const f = new Map(files);
    f.set(MANIFEST_FILE, new TextEncoder().encode('{"schema": "tessera.model/1",}'));
    const e = await contractError(open(f));
    expect(e.code).toBe('manifest-invalid');
    expect(e.cause).toBeInstanceOf(SyntaxError);
    expect(e.problems[0].fix).toMatch(/trailing comma/);
  });

  it('openModelFolder(two files missing) lists both missing files at once', async () => {
    const f = new Map(files);
    f.delete('text-encoder.onnx');
    f.delete('tokenizer.json');
    const e = await contractError(open(f));
    expect(e.code).toBe('folder-invalid');
    expect(lines(e)).toEqual([
      'models/tiny/text-encoder.onnx: expected the file named in the manifest; got no such file. Fix: copy text-encoder.onnx into the model folder, or correct its name in tessera-model.json.',
      'models/tiny/tokenizer.json: expected the file named in the manifest; got no such file. Fix: copy tokenizer.json into the model folder, or correct its name in tessera-model.json.',
    ]);
  });

  it('openModelFolder(changed file) reports the hash mismatch with the new hash to paste', async () => {
    const f = withManifest(files, (m) => { m.hashes['tokenizer.json'] = '0'.repeat(64); });
    const e = await contractError(open(f));
    expect(e.code).toBe('folder-invalid');
    expect(e.problems).toHaveLength(1);
    expect(e.problems[0].path).toBe('tessera-model.json hashes.tokenizer.json');
    expect(e.problems[0].fix).toMatch(/set hashes\["tokenizer.json"\] to "[0-9a-f]{64}"/);
  });

  it('openModelFolder(wrong tensor names) lists every name the graphs lack, with the names they have', async () => {
    const f = withManifest(files, (m) => {
      m.image.input.name = 'image';
      m.text.input.mask = 'mask';
      m.text.output.name = 'pooled';
    });
    const e = await contractError(open(f));
    expect(e.code).toBe('folder-invalid');
    const got = e.problems.map((p: Problem) => [p.path, p.got]);
    expect(got).toEqual([
      ['tessera-model.json image.input.name', 'inputs "pixel_values"'],
      ['tessera-model.json text.input.mask', 'inputs "input_ids", "attention_mask"'],
      ['inputs', 'an undeclared graph input "attention_mask"'],
      ['tessera-model.json text.output.name', 'outputs "token_states"'],
    ]);
    expect(e.problems[0].fix).toBe('set image.input.name to "pixel_values".');
  });

  it('openModelFolder(a graph that is not ONNX) says the runtime cannot load it', async () => {
    const f = withManifest(files, (m) => { delete m.hashes; });
    f.set('image-encoder.onnx', new TextEncoder().encode('version https://git-lfs.github.com/spec/v1\n'));
    const e = await contractError(open(f));
    expect(e.problems.map((p) => p.file)).toEqual(['models/tiny/image-encoder.onnx']);
    expect(e.problems[0].fix).toMatch(/Git LFS pointer/);
  });

  it('openModelFolder(broken tokenizer.json) reports it beside the graphs', async () => {
    const f = withManifest(files, (m) => { delete m.hashes; });
    f.set('tokenizer.json', new TextEncoder().encode('{"model": '));
    const e = await contractError(open(f));
    expect(e.problems.map((p) => [p.file, p.expected])).toEqual([['models/tiny/tokenizer.json', 'a tokenizer.json (JSON)']]);
  });

  it('openModelFolder(layout BND for a BDHW output) reports the wrong rank and suggests the layout', async () => {
    const e = await contractError(open(withManifest(files, (m) => { m.image.output.layout = 'BND'; })));
    expect(e.code).toBe('output-invalid');
    expect(lines(e)).toEqual([
      'image-encoder.onnx: output "patch_embeddings": expected shape [B, h*w, D] = [1, 49, 16]; got shape [1, 16, 7, 7]. ' +
        'Fix: the output has rank 4: if it is [B, D, h, w], set image.output.layout to "BDHW".',
    ]);
  });

  it('openModelFolder(kind sentence for token states) reports the rank of the text output', async () => {
    const e = await contractError(open(withManifest(files, (m) => { m.text.output.kind = 'sentence'; delete m.text.output.pooling; })));
    expect(e.problems.map((p) => p.expected)).toEqual(['shape [B, D] = [1, 16]']);
    expect(e.problems[0].fix).toMatch(/set text.output.kind to "tokens"/);
  });

  it('openModelFolder(embedding_dim 32 for a D = 16 model) reports both encoders', async () => {
    const e = await contractError(open(withManifest(files, (m) => { m.embedding_dim = 32; })));
    expect(e.problems.map((p) => [p.file, p.expected, p.got])).toEqual([
      ['image-encoder.onnx', 'shape [B, D, h, w] = [1, 32, 7, 7]', 'shape [1, 16, 7, 7]'],
      ['text-encoder.onnx', 'shape [B, T, D] = [1, 6, 32]', 'shape [1, 6, 16]'],
    ]);
  });

  it('openModelFolder(wrong grid) suggests the grid the encoder gives', async () => {
    const e = await contractError(open(withManifest(files, (m) => { m.image.output.grid = { h: 8, w: 8 }; })));
    expect(e.problems[0].fix).toBe('set image.output.grid to {"h": 7, "w": 7}, or check the input size.');
  });

  it('openModelFolder(text encoder giving a different D) reports the D mismatch between the encoders', async () => {
    // The text output cut to D = 8, as a text encoder without its projection head would give.
    const cut = instrumentEngine(engine, (out) => {
      const t = out.token_states;
      if (!t) return out;
      const [b, n, d] = t.dims;
      const data = new Float32Array(b * n * 8);
      for (let i = 0; i < b * n; i++) data.set((t.data as Float32Array).subarray(i * d, i * d + 8), i * 8);
      return { token_states: { type: 'float32', data, dims: [b, n, 8] } as NamedTensor };
    });
    const e = await contractError(open(files, cut));
    expect(e.problems.map((p) => p.path)).toEqual(['output "token_states"', 'embedding_dim']);
    expect(e.problems[1].got).toBe('D = 16 from the image encoder and D = 8 from the text encoder (embedding_dim = 16)');
  });

  it('openModelFolder(encoder returning NaN) counts the non-finite values', async () => {
    const nan = instrumentEngine(engine, (out) => {
      const t = out.patch_embeddings;
      if (!t) return out;
      const data = (t.data as Float32Array).slice();
      data[5] = NaN;
      data[9] = Infinity;
      return { patch_embeddings: { ...t, data } };
    });
    const e = await contractError(open(files, nan));
    expect(e.code).toBe('output-invalid');
    expect(e.problems.map((p) => p.got)).toEqual(['2 of 784 values NaN or infinite (first at flat index 5, NaN)']);
  });
});

describe('modelHash and helpers', () => {
  it('modelHash changes with any file byte or setting, not with the description or the hashes field', async () => {
    const m = JSON.parse(new TextDecoder().decode(files.get(MANIFEST_FILE))) as ModelManifest;
    const named = { 'image-encoder.onnx': files.get('image-encoder.onnx')!, 'tokenizer.json': files.get('tokenizer.json')! };
    const h = await modelHash(m, named);
    expect(await modelHash({ ...m, description: 'other', hashes: {} }, named)).toBe(h);
    const flipped = named['tokenizer.json'].slice();
    flipped[10] ^= 1;
    expect(await modelHash(m, { ...named, 'tokenizer.json': flipped })).not.toBe(h);
    expect(await modelHash({ ...m, image: { ...m.image, input: { ...m.image.input, resize: 'letterbox' } } }, named)).not.toBe(h);
    expect(await modelHash({ ...m, embedding_dim: m.embedding_dim }, named)).toBe(h);
  });

  it('readManifest(valid folder) returns the parsed manifest', async () => {
    expect((await readManifest(memoryFileSource('m', files))).id).toBe('tiny-fixture-bdhw');
  });

  it('tokenizerConfigPath(path) sits beside the tokenizer', () => {
    expect(tokenizerConfigPath('tokenizer.json')).toBe('tokenizer_config.json');
    expect(tokenizerConfigPath('tok/tokenizer.json')).toBe('tok/tokenizer_config.json');
  });
});
