// External check: the bundled demo encoders and the untrained control, run through both ONNX Runtime
// builds and our whole path (decoded pixels -> preprocessing -> encoder; sentence -> tokenizer ->
// encoder), against the PyTorch outputs the recipe stored in each folder's reference-outputs.json
// (made by models/recipe/export.py).
import { resolve } from 'node:path';
import { readFileSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DecodedImage } from '../dataset/types';
import { createNodeFileSource } from '../dataset/node-file-source';
import { createOrtNodeEngine } from './adapters/ort-node';
import { createOrtWebEngine } from './adapters/ort-web';
import { createTokenizerFromJson } from './adapters/hf-tokenizer';
import type { DualEncoder } from './encoders';
import { openModelFolder } from './model-folder';
import { ORT_WEB_WASM_DIR } from './testing/fixture-folder';
import type { InferenceEngine } from './types';

interface Blob64 { dims: number[]; base64: string }
interface RecipeReference {
  tolerance: number;
  image: { pixels: Blob64; output: Blob64 };
  text: { sentences: string[]; input_ids: { values: number[][] }; attention_mask: { values: number[][] }; output: Blob64 };
}

const FOLDERS = ['models/demo-local', 'models/demo-global', 'models/demo-widefield', 'tests/fixtures/untrained-control'];

const bytesOf = (b: Blob64): Uint8Array => new Uint8Array(Buffer.from(b.base64, 'base64'));
const floatsOf = (b: Blob64): Float32Array => {
  const u = bytesOf(b);
  return new Float32Array(u.buffer, u.byteOffset, u.byteLength / 4);
};

function maxAbsDiff(a: ArrayLike<number>, b: ArrayLike<number>): number {
  expect(a.length).toBe(b.length);
  let worst = 0;
  for (let i = 0; i < a.length; i++) worst = Math.max(worst, Math.abs(a[i] - b[i]));
  return worst;
}

const engines: Record<string, () => Promise<InferenceEngine>> = {
  'onnxruntime-node': () => createOrtNodeEngine({ threads: 2 }),
  'onnxruntime-web': () => createOrtWebEngine({ wasmPaths: ORT_WEB_WASM_DIR, threads: 2 }),
};

describe.each(Object.keys(engines))('%s on the bundled demo models', (engineName) => {
  describe.each(FOLDERS)('%s', (folder) => {
    let encoder: DualEncoder;
    let ref: RecipeReference;
    beforeAll(async () => {
      ref = JSON.parse(readFileSync(resolve(folder, 'reference-outputs.json'), 'utf8')) as RecipeReference;
      encoder = await openModelFolder(createNodeFileSource(resolve(folder)), await engines[engineName](), { tokenizerFactory: createTokenizerFromJson });
    });
    afterAll(() => encoder.release());

    it('encodeImage(decoded 8-bit pixels) matches the PyTorch region embeddings to 1e-4', async () => {
      const [n, h, w] = ref.image.pixels.dims;
      const pixels = bytesOf(ref.image.pixels);
      const out = floatsOf(ref.image.output); // [n, D, gh, gw]
      const [, d, gh, gw] = ref.image.output.dims;
      for (let i = 0; i < n; i++) {
        const image: DecodedImage = { width: w, height: h, data: Float32Array.from(pixels.subarray(i * h * w, (i + 1) * h * w)), format: 'png', bitDepth: 8, valueRange: [0, 255] };
        const { embeddings } = await encoder.encodeImage(image);
        const expected = new Float32Array(gh * gw * d);
        for (let c = 0; c < gh * gw; c++) for (let k = 0; k < d; k++) expected[c * d + k] = out[(i * d + k) * gh * gw + c];
        expect(maxAbsDiff(embeddings, expected)).toBeLessThanOrEqual(ref.tolerance);
      }
    });

    it('encodeSentences(text) tokenises as the recipe did and matches the PyTorch sentence embeddings to 1e-4', async () => {
      const got = await encoder.encodeSentences(ref.text.sentences);
      expect(maxAbsDiff(got, floatsOf(ref.text.output))).toBeLessThanOrEqual(ref.tolerance);
    });
  });
});
