import { access, mkdir, readFile, writeFile } from 'node:fs/promises';
import { dirname, isAbsolute, join, normalize, sep } from 'node:path';
import type { FileSink, FileSource } from './types';

/** Resolves a '/'-separated relative path inside `root`; refuses absolute paths and '..' escapes. */
function inside(root: string, path: string): string {
  if (typeof path !== 'string' || path === '') throw new TypeError(`'path' must be a non-empty relative path; got ${JSON.stringify(path)}`);
  if (isAbsolute(path) || path.startsWith('/') || /^[A-Za-z]:/.test(path)) throw new RangeError(`'path' must be relative to ${root}; got '${path}'`);
  const full = normalize(join(root, ...path.split('/')));
  const base = normalize(root.endsWith(sep) ? root : root + sep);
  if (!full.startsWith(base)) throw new RangeError(`'path' must stay inside ${root}; got '${path}'`);
  return full;
}

/** A FileSource over a folder on disk (Node only). `label` is the folder path as given. */
export function createNodeFileSource(dir: string): FileSource {
  return {
    label: dir,
    async readBytes(path: string): Promise<Uint8Array> {
      const buf = await readFile(inside(dir, path));
      return new Uint8Array(buf.buffer, buf.byteOffset, buf.byteLength);
    },
    async readText(path: string): Promise<string> {
      return readFile(inside(dir, path), 'utf8');
    },
    async exists(path: string): Promise<boolean> {
      try {
        await access(inside(dir, path));
        return true;
      } catch (err) {
        if (err instanceof RangeError || err instanceof TypeError) throw err;
        return false;
      }
    },
  };
}

/** A FileSink writing into a folder on disk (Node only), creating parent folders as needed. */
export function createNodeFileSink(dir: string): FileSink {
  return {
    async writeFile(path: string, data: Uint8Array | string): Promise<void> {
      const full = inside(dir, path);
      await mkdir(dirname(full), { recursive: true });
      await writeFile(full, data);
    },
  };
}
