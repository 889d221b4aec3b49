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

/** memorySource over a record of files given as bytes or text (text is stored as UTF-8). */
export function recordSource(label: string, files: Readonly<Record<string, Uint8Array | string>>): FileSource {
  const enc = new TextEncoder();
  return memorySource(label, new Map(Object.entries(files).map(([p, f]) => [p, typeof f === 'string' ? enc.encode(f) : f])));
}
