import type { FileSource } from '../../dataset/types';

/** A FileSource over bytes in memory, for the app's tests. */
export function memorySource(label: string, files: ReadonlyMap<string, Uint8Array>): FileSource {
  const get = (path: string): Uint8Array => {
    const b = files.get(path);
    if (b === undefined) throw new Error(`${label}/${path}: no such file`);
    return b.slice();
  };
  return {
    label,
    readBytes: async (p) => get(p),
    readText: async (p) => new TextDecoder().decode(get(p)),
    exists: async (p) => files.has(p),
  };
}
