import { computeResizeTransform } from '../core/resize-transform';
import { gridCellRects } from '../core/grid-geometry';
import type { DecodedImage } from '../dataset/types';
import { embeddingCacheKey } from './embedding-cache-key';
import type { DualEncoder, EncodeImageOptions, EncodedImage } from './encoders';
import { preprocessingTag } from './preprocess';
import type { EmbeddingCache } from './types';

/**
 * Encodes an image through an EmbeddingCache: the key is the model hash, the image content hash
 * and the preprocessing, so a second run over the same files does not run the encoder again. The
 * geometry (transform, cells) is pure and recomputed on a hit. A cached entry of the wrong length
 * for this model is an error, never silently re-used.
 */
export async function encodeImageCached(
  encoder: DualEncoder,
  cache: EmbeddingCache,
  image: DecodedImage,
  imageContentHash: string,
  opts: EncodeImageOptions = {},
): Promise<EncodedImage> {
  const input = encoder.manifest.image.input;
  const key = embeddingCacheKey(encoder.hash, imageContentHash, preprocessingTag(input, opts.window));
  const hit = await cache.get(key);
  const expected = encoder.grid.h * encoder.grid.w * encoder.manifest.embedding_dim;
  if (hit !== undefined) {
    if (hit.length !== expected) {
      throw new Error(`embedding cache entry ${key} holds ${hit.length} values, expected cells x D = ${expected}; delete the cache entry (or folder) and run again.`);
    }
    const transform = computeResizeTransform({ width: image.width, height: image.height }, { width: input.width, height: input.height }, input.resize);
    return { embeddings: hit, grid: encoder.grid, transform, cells: gridCellRects(transform, encoder.grid) };
  }
  const encoded = await encoder.encodeImage(image, opts);
  await cache.set(key, encoded.embeddings);
  return encoded;
}
