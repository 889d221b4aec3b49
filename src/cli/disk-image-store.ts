import { createHash } from 'node:crypto';
import type { ImageEmbeddingStore } from '../batch/score-set';
import { createDiskEmbeddingCache } from '../model/node/disk-embedding-cache';
import { embeddingCacheKey } from '../model/embedding-cache-key';

/** Image embeddings on disk, keyed by model hash and the sha256 of the image file's bytes. */
export function createDiskImageStore(dir: string): ImageEmbeddingStore {
  const cache = createDiskEmbeddingCache(dir);
  const key = (modelHash: string, bytes: Uint8Array): string =>
    embeddingCacheKey(modelHash, createHash('sha256').update(bytes).digest('hex'), 'image');
  return {
    get: (modelHash, bytes) => cache.get(key(modelHash, bytes)),
    set: (modelHash, bytes, embeddings) => cache.set(key(modelHash, bytes), embeddings),
  };
}
