import { gridCellRects } from '../core/grid-geometry';
import type { GridShape, ImageRect, ResizeTransform } from '../core/types';
import type { DecodedImage } from '../dataset/types';
import { ModelContractError } from './contract';
import { checkImageOutput, checkTextOutput } from './output-checks';
import { preprocessImage, stackImageTensors, type IntensityWindow } from './preprocess';
import type { InferenceSession, ModelManifest, NamedTensor, SentenceTokenizer } from './types';

/** Region embeddings of one image, with the geometry that maps each cell back to original pixels. */
export interface EncodedImage {
  /** cells x D, row-major over cells (index = row * grid.w + col), not normalised. */
  readonly embeddings: Float32Array;
  readonly grid: GridShape;
  readonly transform: ResizeTransform;
  /** Each cell's rectangle in original image pixels, in cell order. */
  readonly cells: readonly ImageRect[];
}

export interface EncodeImageOptions {
  /** VOI window in image units; without it the image's valueRange maps to [0, 1]. */
  readonly window?: IntensityWindow;
}

/** A loaded model folder: an image encoder and a text encoder sharing one embedding space. */
export interface DualEncoder {
  readonly manifest: ModelManifest;
  /** Content hash of the manifest and files (see modelHash); the embedding cache keys on it. */
  readonly hash: string;
  readonly grid: GridShape;
  encodeImage(image: DecodedImage, opts?: EncodeImageOptions): Promise<EncodedImage>;
  /** Encodes in batches of `batchSize` images per run (the graph needs a dynamic batch axis for > 1). */
  encodeImages(images: readonly DecodedImage[], opts?: EncodeImageOptions & { readonly batchSize?: number }): Promise<EncodedImage[]>;
  /** S x D sentence embeddings, row-major, not normalised; an empty list gives an empty array. */
  encodeSentences(texts: readonly string[]): Promise<Float32Array>;
  release(): Promise<void>;
}

export interface DualEncoderParts {
  readonly manifest: ModelManifest;
  readonly hash: string;
  readonly imageSession: InferenceSession;
  readonly textSession: InferenceSession;
  readonly tokenizer: SentenceTokenizer;
}

/** Builds a DualEncoder over two sessions already checked against the manifest (see openModelFolder). */
export function createDualEncoder({ manifest, hash, imageSession, textSession, tokenizer }: DualEncoderParts): DualEncoder {
  const grid: GridShape = { h: manifest.image.output.grid.h, w: manifest.image.output.grid.w };
  let released = false;
  const live = (): void => {
    if (released) throw new Error(`model "${manifest.id}" was released; open the model folder again to encode.`);
  };

  async function encodeBatch(images: readonly DecodedImage[], opts: EncodeImageOptions): Promise<EncodedImage[]> {
    const prepared = images.map((im) => preprocessImage(im, manifest.image.input, opts));
    const feed = stackImageTensors(prepared.map((p) => p.tensor));
    const out = await imageSession.run({ [manifest.image.input.name]: feed });
    const t = out[manifest.image.output.name];
    const problems = checkImageOutput(manifest, t, images.length);
    if (problems.length > 0) throw new ModelContractError('output-invalid', manifest.image.file, problems);
    const all = imageOutputToCells(t, manifest);
    const per = grid.h * grid.w * manifest.embedding_dim;
    return prepared.map((p, i) => ({
      embeddings: all.slice(i * per, (i + 1) * per),
      grid,
      transform: p.transform,
      cells: gridCellRects(p.transform, grid),
    }));
  }

  return {
    manifest,
    hash,
    grid,
    async encodeImage(image, opts = {}) {
      live();
      const [one] = await encodeBatch([image], opts);
      return one;
    },
    async encodeImages(images, { batchSize = 8, ...opts } = {}) {
      live();
      if (!Number.isInteger(batchSize) || batchSize < 1) {
        throw new RangeError(`'batchSize' must be an integer >= 1; got ${batchSize}`);
      }
      const result: EncodedImage[] = [];
      for (let i = 0; i < images.length; i += batchSize) {
        result.push(...(await encodeBatch(images.slice(i, i + batchSize), opts)));
      }
      return result;
    },
    async encodeSentences(texts) {
      live();
      if (texts.length === 0) return new Float32Array(0);
      const { ids, mask, dims } = tokenizer.encode(texts, manifest.text.max_tokens);
      const feeds: Record<string, NamedTensor> = {
        [manifest.text.input.ids]: { type: 'int64', data: ids, dims },
        [manifest.text.input.mask]: { type: 'int64', data: mask, dims },
      };
      if (manifest.text.input.type_ids !== undefined) {
        feeds[manifest.text.input.type_ids] = { type: 'int64', data: new BigInt64Array(ids.length), dims };
      }
      const out = await textSession.run(feeds);
      const t = out[manifest.text.output.name];
      const problems = checkTextOutput(manifest, t, dims[0], dims[1]);
      if (problems.length > 0) throw new ModelContractError('output-invalid', manifest.text.file, problems);
      return manifest.text.output.kind === 'sentence'
        ? (t.data as Float32Array).slice()
        : poolTokenStates(t.data as Float32Array, mask, dims[0], dims[1], manifest.embedding_dim, manifest.text.output.pooling ?? 'mean');
    },
    async release() {
      if (released) return;
      released = true;
      await Promise.all([imageSession.release(), textSession.release()]);
    },
  };
}

/**
 * Rearranges an image encoder output to (batch x cells) x D, cells row-major. BDHW [B, D, h, w] is
 * transposed; BND [B, h*w, D] is already in that order. Shapes must have been checked.
 */
export function imageOutputToCells(t: NamedTensor, manifest: ModelManifest): Float32Array {
  const src = t.data as Float32Array;
  if (manifest.image.output.layout === 'BND') return src.slice();
  const [b, d, h, w] = t.dims;
  const cells = h * w;
  const out = new Float32Array(b * cells * d);
  for (let n = 0; n < b; n++) {
    for (let k = 0; k < d; k++) {
      const from = (n * d + k) * cells;
      for (let c = 0; c < cells; c++) out[(n * cells + c) * d + k] = src[from + c];
    }
  }
  return out;
}

/**
 * Pools token states [S, T, D] to sentence vectors [S, D]: 'cls' takes token 0; 'mean' averages
 * the tokens whose mask is 1 (a sentence with an all-zero mask gives zeros, as no token counts).
 */
export function poolTokenStates(
  states: Float32Array,
  mask: BigInt64Array,
  s: number,
  t: number,
  d: number,
  pooling: 'cls' | 'mean',
): Float32Array {
  const out = new Float32Array(s * d);
  for (let i = 0; i < s; i++) {
    if (pooling === 'cls') {
      out.set(states.subarray(i * t * d, i * t * d + d), i * d);
      continue;
    }
    const acc = new Float64Array(d);
    let count = 0;
    for (let j = 0; j < t; j++) {
      if (mask[i * t + j] === 0n) continue;
      count++;
      const base = (i * t + j) * d;
      for (let k = 0; k < d; k++) acc[k] += states[base + k];
    }
    if (count > 0) for (let k = 0; k < d; k++) out[i * d + k] = acc[k] / count;
  }
  return out;
}
