import type { FileSource } from '../../dataset/types';
import { pathSegments } from './source-path';

/**
 * A FileSource over files the user handed to the page (a file list or a drop), keyed by their path
 * inside the chosen folder. The files are read where they lie; nothing is uploaded.
 */
export function createBlobMapSource(label: string, files: ReadonlyMap<string, Blob>): FileSource {
  const get = (path: string): Blob => {
    const blob = files.get(pathSegments(path).join('/'));
    if (blob === undefined) throw new Error(`${label}/${path}: no such file in the chosen folder; choose the folder that holds it.`);
    return blob;
  };
  return {
    label,
    readBytes: async (path) => new Uint8Array(await get(path).arrayBuffer()),
    readText: async (path) => get(path).text(),
    exists: async (path) => files.has(pathSegments(path).join('/')),
  };
}
