import { mkdir, readFile, rename, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import type { EmbeddingCache } from '../types';

const KEY = /^[A-Za-z0-9_-]{1,400}$/;

/** Thrown when a cache file cannot be read back as float32 values. */
export class EmbeddingCacheError extends Error {
  override readonly name = 'EmbeddingCacheError';
  constructor(readonly code: 'cache-corrupt' | 'cache-unwritable', readonly file: string, message: string, options: { cause?: unknown } = {}) {
    super(message, { cause: options.cause });
  }
}

/**
 * An EmbeddingCache on disk for the CLI: one file per key, `<dir>/<key>.f32`, holding the values as
 * little-endian float32. Writes go to a temporary file first, so an interrupted run leaves no half file.
 */
export function createDiskEmbeddingCache(dir: string): EmbeddingCache {
  const pathOf = (key: string): string => {
    if (!KEY.test(key)) throw new TypeError(`'key' must match [A-Za-z0-9_-]{1,400} (see embeddingCacheKey); got '${key}'`);
    return join(dir, `${key}.f32`);
  };
  return {
    async get(key) {
      const file = pathOf(key);
      let bytes: Buffer;
      try {
        bytes = await readFile(file);
      } catch (cause) {
        if ((cause as NodeJS.ErrnoException).code === 'ENOENT') return undefined;
        throw cause;
      }
      if (bytes.byteLength % 4 !== 0) {
        throw new EmbeddingCacheError('cache-corrupt', file, `embedding cache file ${file} holds ${bytes.byteLength} bytes, not a whole number of float32 values; delete it and run again.`);
      }
      const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
      const out = new Float32Array(bytes.byteLength / 4);
      for (let i = 0; i < out.length; i++) out[i] = view.getFloat32(i * 4, true);
      return out;
    },
    async set(key, value) {
      const file = pathOf(key);
      const bytes = new Uint8Array(value.length * 4);
      const view = new DataView(bytes.buffer);
      for (let i = 0; i < value.length; i++) view.setFloat32(i * 4, value[i], true);
      try {
        await mkdir(dir, { recursive: true });
        const tmp = `${file}.${process.pid}.${Math.random().toString(36).slice(2)}.tmp`;
        await writeFile(tmp, bytes);
        await rename(tmp, file);
      } catch (cause) {
        throw new EmbeddingCacheError('cache-unwritable', file, `cannot write the embedding cache file ${file}: ${(cause as Error).message}. Check that ${dir} is writable, or choose another cache folder.`, { cause });
      }
    },
  };
}
