import type { EmbeddingCache } from '../../model/types';

export interface IdbCacheOptions {
  /** The IndexedDB factory; the page's by default, fake-indexeddb in tests. */
  readonly indexedDB?: IDBFactory;
  readonly name?: string;
}

const STORE = 'embeddings';

/**
 * An EmbeddingCache in IndexedDB for the page: one record per key (see embeddingCacheKey), the
 * value a Float32Array. Entries survive a reload, so reopening a study does not encode again.
 * Failing to open the database is an error with the fix, never a silent in-memory fallback.
 */
export async function openIdbEmbeddingCache({ indexedDB = globalThis.indexedDB, name = 'tessera-embeddings' }: IdbCacheOptions = {}): Promise<EmbeddingCache & { clear(): Promise<void>; close(): void }> {
  if (indexedDB === undefined) {
    throw new Error('this browser offers no IndexedDB, so embeddings cannot be kept between visits; open the page in a current Chromium or Firefox, outside a private window.');
  }
  const db = await new Promise<IDBDatabase>((resolve, reject) => {
    const req = indexedDB.open(name, 1);
    req.onupgradeneeded = () => req.result.createObjectStore(STORE);
    req.onsuccess = () => resolve(req.result);
    req.onerror = () => reject(new Error(`could not open the embedding cache (IndexedDB "${name}"): ${req.error?.message ?? 'unknown error'}; allow site data for this page or clear it and reload.`, { cause: req.error }));
    req.onblocked = () => reject(new Error(`the embedding cache (IndexedDB "${name}") is held by another tab with an older version; close the other Tessera tabs and reload.`));
  });
  const tx = <T>(mode: IDBTransactionMode, act: (s: IDBObjectStore) => IDBRequest<T>): Promise<T> =>
    new Promise<T>((resolve, reject) => {
      const t = db.transaction(STORE, mode);
      const req = act(t.objectStore(STORE));
      t.oncomplete = () => resolve(req.result);
      t.onerror = () => reject(new Error(`embedding cache (IndexedDB "${name}"): ${t.error?.message ?? 'transaction failed'}`, { cause: t.error }));
      t.onabort = () => reject(new Error(`embedding cache (IndexedDB "${name}"): ${t.error?.message ?? 'transaction aborted'} (the disk may be full)`, { cause: t.error }));
    });
  return {
    async get(key) {
      const v = await tx<unknown>('readonly', (s) => s.get(key));
      if (v === undefined) return undefined;
      if (!(v instanceof Float32Array)) {
        throw new Error(`embedding cache entry ${key} is not a Float32Array; clear this page's site data and open the study again.`);
      }
      return v;
    },
    async set(key, value) {
      if (!(value instanceof Float32Array)) throw new TypeError(`'value' must be a Float32Array; got ${Object.prototype.toString.call(value)}`);
      await tx('readwrite', (s) => s.put(value, key));
    },
    async clear() {
      await tx('readwrite', (s) => s.clear());
    },
    close: () => db.close(),
  };
}
