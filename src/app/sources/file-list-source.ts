import type { FileSource } from '../../dataset/types';
import { createBlobMapSource } from './blob-map-source';

/**
 * A FileSource over the files of an <input type="file" webkitdirectory> (each File carries its
 * webkitRelativePath, 'folder/sub/name'); paths are taken relative to the chosen folder.
 * Throws RangeError when the list is empty or spans more than one top folder.
 */
export function createFileListSource(files: ArrayLike<File>): FileSource {
  const list = Array.from(files);
  if (list.length === 0) throw new RangeError(`'files' must hold the files of one folder; got an empty list (the folder may be empty)`);
  const map = new Map<string, Blob>();
  let top: string | undefined;
  for (const f of list) {
    const rel = (f.webkitRelativePath || f.name).replace(/\\/g, '/');
    const slash = rel.indexOf('/');
    const head = slash < 0 ? '' : rel.slice(0, slash);
    if (top === undefined) top = head;
    else if (head !== top) throw new RangeError(`'files' must come from one folder; got files from '${top}' and '${head}'`);
    map.set(slash < 0 ? rel : rel.slice(slash + 1), f);
  }
  return createBlobMapSource(top || 'chosen files', map);
}
