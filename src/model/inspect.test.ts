import { beforeAll, describe, expect, it } from 'vitest';
import { createOrtNodeEngine } from './adapters/ort-node';
import { createTokenizerFromJson } from './adapters/hf-tokenizer';
import { formatInspectReport, inspectModel } from './inspect';
import { memoryFileSource, readFixtureFolder, withManifest, type FolderFiles } from './testing/fixture-folder';
import type { InferenceEngine } from './types';

let files: FolderFiles;
let engine: InferenceEngine;
beforeAll(async () => {
  files = await readFixtureFolder('tiny-model');
  engine = await createOrtNodeEngine({ threads: 1 });
});

/** A clock that advances 2.5 ms per reading, so timings are exact. */
const fakeClock = () => {
  let t = 0;
  return () => (t += 2.5);
};

const inspect = (f: FolderFiles) => inspectModel(memoryFileSource('models/tiny', f), engine, { tokenizerFactory: createTokenizerFromJson, now: fakeClock(), threads: 1 });

describe('inspectModel', () => {
  it('inspectModel(tiny-model) is ok and reports shapes, timings and the dynamic batch axis', async () => {
    const r = await inspect(files);
    expect(r.ok).toBe(true);
    expect(r.problems).toEqual([]);
    expect(r.engine).toBe('onnxruntime-node');
    expect(r.image).toEqual({ inputs: { pixel_values: [1, 1, 64, 64] }, output: { name: 'patch_embeddings', dims: [1, 16, 7, 7] }, ms: 2.5 });
    expect(r.text).toEqual({ inputs: { input_ids: [1, 6], attention_mask: [1, 6] }, output: { name: 'token_states', dims: [1, 6, 16] }, ms: 2.5 });
    expect(r.loadMs).toBe(2.5);
    expect(r.batchOfTwo).toBe(true);
    expect(r.hash).toMatch(/^[0-9a-f]{64}$/);
  });

  it('formatInspectReport(ok report) gives one line per finding and the verdict last', async () => {
    const text = formatInspectReport(await inspect(files));
    const lines = text.trimEnd().split('\n');
    expect(lines).toContain('Image encoder image-encoder.onnx: pixel_values [1, 1, 64, 64] -> patch_embeddings [1, 16, 7, 7] in 2.5 ms');
    expect(lines).toContain('Text encoder text-encoder.onnx: input_ids [1, 6], attention_mask [1, 6] -> token_states [1, 6, 16] in 2.5 ms');
    expect(lines).toContain('Batch of 2 images: accepted');
    expect(lines.at(-1)).toBe('Result: OK, the folder meets the model contract.');
  });

  it('inspectModel(broken manifest) returns every problem without throwing', async () => {
    const r = await inspect(withManifest(files, (m) => { m.embedding_dim = 'sixteen'; m.image.input.resize = 'fit'; }));
    expect(r.ok).toBe(false);
    expect(r.manifest).toBeUndefined();
    expect(r.problems.map((p) => p.path)).toEqual(['image.input.resize', 'embedding_dim']);
    const lines = formatInspectReport(r).trimEnd().split('\n');
    expect(lines.slice(-4)).toEqual([
      'Problems (2):',
      expect.stringMatching(/^ {2}- models\/tiny\/tessera-model.json: image.input.resize: expected one of "stretch", "letterbox", "centre-crop"; got the string "fit"/),
      expect.stringMatching(/^ {2}- models\/tiny\/tessera-model.json: embedding_dim: expected an integer >= 1; got the string "sixteen"/),
      'Result: the folder does not meet the model contract.',
    ]);
  });

  it('inspectModel(output shape mismatch) keeps the shapes seen beside the problem', async () => {
    const r = await inspect(withManifest(files, (m) => { m.image.output.grid = { h: 14, w: 14 }; }));
    expect(r.ok).toBe(false);
    expect(r.image?.output?.dims).toEqual([1, 16, 7, 7]);
    expect(r.problems).toHaveLength(1);
    expect(r.batchOfTwo).toBeUndefined();
  });

  it('inspectModel(no hashes) notes that changed files will not be detected', async () => {
    const r = await inspect(withManifest(files, (m) => { delete m.hashes; }));
    expect(r.ok).toBe(true);
    expect(r.notes).toEqual(['The manifest gives no file hashes: add "hashes" so a changed file is detected.']);
  });
});
