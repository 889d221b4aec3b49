// External check: outputs of both ONNX Runtime builds against PyTorch, and the tokenizer against an
// independent WordPiece implementation. Reference made once by
// `/usr/bin/python3 tests/fixtures/make-tiny-model.py` (tests/fixtures/*/reference-outputs.json).
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { expectClose } from '../../tests/support/expect-close';
import type { DecodedImage } from '../dataset/types';
import { createOrtNodeEngine } from './adapters/ort-node';
import { createOrtWebEngine } from './adapters/ort-web';
import { createTokenizerFromJson } from './adapters/hf-tokenizer';
import type { DualEncoder } from './encoders';
import { openModelFolder } from './model-folder';
import { FIXTURES, ORT_WEB_WASM_DIR, memoryFileSource, readFixtureFolder, readReference, type ReferenceOutputs } from './testing/fixture-folder';
import type { InferenceEngine } from './types';

const TOL = 1e-4;

function referenceImage(r: ReferenceOutputs, i: number): DecodedImage {
  const im = r.images[i];
  return { width: im.width, height: im.height, data: Float32Array.from(im.data), format: 'png', bitDepth: 8, valueRange: im.valueRange, synthetic: true };
}

/** The BDHW reference rearranged to cells x D per image, as encodeImage returns it. */
function referenceCells(r: ReferenceOutputs, layout: 'BDHW' | 'BND', i: number): number[] {
  const dims = r.image_output.dims;
  if (layout === 'BND') {
    const per = dims[1] * dims[2];
    return r.image_output.data.slice(i * per, (i + 1) * per);
  }
  const [, d, h, w] = dims;
  const out: number[] = [];
  for (let c = 0; c < h * w; c++) for (let k = 0; k < d; k++) out.push(r.image_output.data[((i * d + k) * h * w) + c]);
  return out;
}

const engines: Record<string, () => Promise<InferenceEngine>> = {
  'onnxruntime-node': () => createOrtNodeEngine({ threads: 2 }),
  'onnxruntime-web': () => createOrtWebEngine({ wasmPaths: ORT_WEB_WASM_DIR, threads: 2 }),
};

const variants = [
  { folder: 'tiny-model', layout: 'BDHW' as const },
  { folder: 'tiny-model-bnd', layout: 'BND' as const },
];

describe.each(Object.keys(engines))('%s against the PyTorch reference', (engineName) => {
  describe.each(variants)('$folder', ({ folder, layout }) => {
    let encoder: DualEncoder;
    let ref: ReferenceOutputs;
    let engine: InferenceEngine;
    beforeAll(async () => {
      ref = await readReference(folder);
      engine = await engines[engineName]();
      encoder = await openModelFolder(memoryFileSource(folder, await readFixtureFolder(folder)), engine, { tokenizerFactory: createTokenizerFromJson });
    });
    afterAll(() => encoder.release());

    it('session.run on the reference pixel tensor gives the PyTorch image output to 1e-4', async () => {
      const bytes = new Uint8Array(readFileSync(join(FIXTURES, folder, 'image-encoder.onnx')));
      const session = await engine.createSession(bytes);
      const px = new Float32Array(ref.images.flatMap((im) => im.data.map((v) => (v / 255 - 0.5) / 0.25)));
      const out = await session.run({ pixel_values: { type: 'float32', data: px, dims: [2, 1, 64, 64] } });
      const t = out[session.outputNames[0]];
      expect(t.dims).toEqual(ref.image_output.dims);
      expectClose(t.data as Float32Array, ref.image_output.data, TOL);
      await session.release();
    });

    it('encodeImage(image) matches the reference cells x D for both images', async () => {
      for (const i of [0, 1]) {
        const enc = await encoder.encodeImage(referenceImage(ref, i));
        expect(enc.grid).toEqual({ h: 7, w: 7 });
        expect(enc.cells).toHaveLength(49);
        expectClose(enc.embeddings, referenceCells(ref, layout, i), TOL);
      }
    });

    it('encodeImages(images, { batchSize: 2 }) equals one-by-one encoding', async () => {
      const images = [referenceImage(ref, 0), referenceImage(ref, 1)];
      const batch = await encoder.encodeImages(images, { batchSize: 2 });
      for (const i of [0, 1]) expectClose(batch[i].embeddings, referenceCells(ref, layout, i), TOL);
    });

    it('encodeSentences(texts) matches the PyTorch sentence embeddings', async () => {
      const emb = await encoder.encodeSentences(ref.sentences);
      expect(emb.length).toBe(ref.sentence_embeddings.data.length);
      expectClose(emb, ref.sentence_embeddings.data, TOL);
    });

    it('encodeSentences one at a time equals the padded batch (padding does not leak)', async () => {
      const emb = await encoder.encodeSentences([ref.sentences[0]]);
      expectClose(emb, ref.sentence_embeddings.data.slice(0, 16), TOL);
    });
  });
});

describe('onnxruntime-web and onnxruntime-node parity', () => {
  it('both runtimes give the same embeddings for the same folder to 1e-5', async () => {
    const files = await readFixtureFolder('tiny-model');
    const ref = await readReference('tiny-model');
    const results = [];
    for (const make of Object.values(engines)) {
      const enc = await openModelFolder(memoryFileSource('tiny-model', files), await make(), { tokenizerFactory: createTokenizerFromJson });
      results.push({ image: (await enc.encodeImage(referenceImage(ref, 1))).embeddings, text: await enc.encodeSentences(ref.sentences), hash: enc.hash });
      await enc.release();
    }
    expect(results[0].hash).toBe(results[1].hash);
    expectClose(results[0].image, results[1].image, 1e-5);
    expectClose(results[0].text, results[1].text, 1e-5);
  });
});

describe('createTokenizerFromJson against the reference WordPiece', () => {
  it('encode(sentences, 16) gives the reference ids and mask, keeping [SEP] when truncating', async () => {
    const dir = join(FIXTURES, 'tiny-model');
    const tok = createTokenizerFromJson(JSON.parse(readFileSync(join(dir, 'tokenizer.json'), 'utf8')), JSON.parse(readFileSync(join(dir, 'tokenizer_config.json'), 'utf8')));
    const ref = await readReference('tiny-model');
    const { ids, mask, dims } = tok.encode(ref.sentences, 16);
    expect([...dims]).toEqual(ref.input_ids.dims);
    expect(Array.from(ids, Number)).toEqual(ref.input_ids.data);
    expect(Array.from(mask, Number)).toEqual(ref.attention_mask.data);
    // The long sentence is cut to 16 tokens and still ends with [SEP] (id 3).
    expect(Number(ids[2 * 16 + 15])).toBe(3);
  });
});
