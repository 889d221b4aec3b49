import type { FileSource } from '../../dataset/types';
import { createBlobMapSource } from './blob-map-source';

/** The parts of the File and Directory Entries API a drop gives (webkitGetAsEntry). */
interface EntryLike {
  readonly isFile: boolean;
  readonly isDirectory: boolean;
  readonly name: string;
}
interface FileEntryLike extends EntryLike {
  file(success: (f: File) => void, failure?: (e: unknown) => void): void;
}
interface DirectoryEntryLike extends EntryLike {
  createReader(): { readEntries(success: (entries: EntryLike[]) => void, failure?: (e: unknown) => void): void };
}
interface ItemLike {
  readonly kind: string;
  webkitGetAsEntry(): EntryLike | null;
}

/**
 * One FileSource per folder dropped on the page (DataTransferItem.webkitGetAsEntry), each holding
 * every file below it by relative path. Call it inside the drop handler: the items are only
 * readable then. Dropped single files are refused with a message: a model or a set is a folder.
 */
export async function sourcesFromDrop(items: ArrayLike<ItemLike>): Promise<{ sources: FileSource[]; problems: string[] }> {
  // Entries must be taken synchronously, before the first await, or the browser empties the list.
  const entries = Array.from(items, (it) => (it.kind === 'file' ? it.webkitGetAsEntry() : null));
  const sources: FileSource[] = [];
  const problems: string[] = [];
  for (const entry of entries) {
    if (entry === null) continue;
    if (!entry.isDirectory) {
      problems.push(`${entry.name} is a file; drop the folder that holds it (a model folder with tessera-model.json, or a sample set with set.json).`);
      continue;
    }
    const files = new Map<string, Blob>();
    await collect(entry as DirectoryEntryLike, '', files);
    sources.push(createBlobMapSource(entry.name, files));
  }
  return { sources, problems };
}

async function collect(dir: DirectoryEntryLike, prefix: string, out: Map<string, Blob>): Promise<void> {
  const reader = dir.createReader();
  // readEntries returns the listing in batches until an empty one.
  for (;;) {
    const batch = await new Promise<EntryLike[]>((resolve, reject) => reader.readEntries(resolve, reject));
    if (batch.length === 0) return;
    for (const e of batch) {
      const path = `${prefix}${e.name}`;
      if (e.isDirectory) await collect(e as DirectoryEntryLike, `${path}/`, out);
      else out.set(path, await new Promise<File>((resolve, reject) => (e as FileEntryLike).file(resolve, reject)));
    }
  }
}
