import type { FileSource } from '../../dataset/types';
import { pathSegments } from './source-path';

/** The parts of the File System Access API the page uses. */
interface FileHandleLike {
  getFile(): Promise<File>;
}
export interface DirectoryHandleLike {
  readonly name: string;
  getDirectoryHandle(name: string): Promise<DirectoryHandleLike>;
  getFileHandle(name: string): Promise<FileHandleLike>;
}

type PickerWindow = { showDirectoryPicker?: (options?: { mode?: 'read' }) => Promise<DirectoryHandleLike> };

/** Whether this browser offers window.showDirectoryPicker (Chromium does; others use the file input). */
export function directoryPickerAvailable(win: unknown = globalThis): boolean {
  return typeof (win as PickerWindow).showDirectoryPicker === 'function';
}

/**
 * Asks the user for a folder with the directory picker, read-only. Resolves undefined when the user
 * closes the picker; throws with the alternative when the browser has no picker.
 */
export async function pickDirectory(win: unknown = globalThis): Promise<FileSource | undefined> {
  const picker = (win as PickerWindow).showDirectoryPicker;
  if (typeof picker !== 'function') {
    throw new Error('this browser has no folder picker; use "Choose folder" (the file input) or drop the folder on the page.');
  }
  try {
    return createDirectoryHandleSource(await picker.call(win, { mode: 'read' }));
  } catch (err) {
    if ((err as Error).name === 'AbortError') return undefined;
    throw err;
  }
}

/** A FileSource over a directory handle; files are read in place, nothing is uploaded. */
export function createDirectoryHandleSource(root: DirectoryHandleLike): FileSource {
  async function fileOf(path: string): Promise<File> {
    const parts = pathSegments(path);
    let dir = root;
    for (const p of parts.slice(0, -1)) dir = await dir.getDirectoryHandle(p);
    return (await dir.getFileHandle(parts[parts.length - 1])).getFile();
  }
  async function read(path: string): Promise<File> {
    try {
      return await fileOf(path);
    } catch (cause) {
      throw new Error(`${root.name}/${path}: ${(cause as Error).name === 'NotFoundError' ? 'no such file' : (cause as Error).message}; choose the folder that holds it.`, { cause });
    }
  }
  return {
    label: root.name,
    readBytes: async (path) => new Uint8Array(await (await read(path)).arrayBuffer()),
    readText: async (path) => (await read(path)).text(),
    async exists(path) {
      try {
        await fileOf(path);
        return true;
      } catch (err) {
        const name = (err as Error).name;
        if (name === 'NotFoundError' || name === 'TypeMismatchError') return false;
        throw err;
      }
    },
  };
}
