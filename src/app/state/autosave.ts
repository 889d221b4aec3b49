import { DatasetError } from '../../dataset/errors';
import { exportAnnotations, restoreAnnotations } from './annotation-io';
import type { LoadedAnnotations } from '../../dataset/annotations';
import type { AppState, Notice } from './records';
import type { AppStore } from './store';

const OBJECT_STORE = 'annotations';

/** One saved annotation file per sample set, keyed by the set's name. */
interface SavedRecord {
  readonly set: string;
  readonly text: string; // exportAnnotations(state)
  readonly saved: string; // ISO time
}

export interface AutosaveOptions {
  readonly dbName: string;
  /** Quiet time after the last change before writing, milliseconds. */
  readonly delayMs?: number;
  /** The IndexedDB factory; the page's by default, fake-indexeddb in tests. */
  readonly indexedDB?: IDBFactory;
}

export interface Autosave {
  /** The saved annotation file text of a set (or a kept unreadable copy), for inspection and tests. */
  readSaved(set: string): Promise<string | undefined>;
  /** Writes pending changes now; resolves when they are stored. */
  flush(): Promise<void>;
  /** Loads the saved file of the store's set into the store; undefined when none was saved. */
  restore(): Promise<LoadedAnnotations | undefined>;
  /** Stops watching the store (pending changes are written first) and closes the database. */
  dispose(): Promise<void>;
}

function request<T>(r: IDBRequest<T>): Promise<T> {
  return new Promise((resolve, reject) => {
    r.onsuccess = () => resolve(r.result);
    r.onerror = () => reject(r.error);
  });
}

function openDb(factory: IDBFactory, name: string): Promise<IDBDatabase> {
  const r = factory.open(name, 1);
  r.onupgradeneeded = () => {
    if (!r.result.objectStoreNames.contains(OBJECT_STORE)) r.result.createObjectStore(OBJECT_STORE, { keyPath: 'set' });
  };
  return request(r);
}

function annotationsChanged(a: AppState, b: AppState): boolean {
  return a.boxes !== b.boxes || a.lungs !== b.lungs || a.stale !== b.stale || a.held !== b.held || a.heldLungs !== b.heldLungs;
}

function failure(what: string, dbName: string, cause: unknown): Notice {
  const why = cause instanceof Error ? cause.message : String(cause);
  return { level: 'error', text: `${what} in the browser's storage ("${dbName}") failed: ${why}. Export the annotation file to keep your work.`, items: [] };
}

/**
 * Saves the store's annotations (boxes, lung templates, stale and held boxes, as the set's
 * annotation file) to IndexedDB after every change of them, debounced by delayMs and written at
 * once by flush(). restore() reads the set's saved file back through loadAnnotations, so a box
 * whose sentence text changed is flagged stale, never re-attached. A storage failure becomes an
 * error notice in the store and rejects flush().
 */
export function createAutosave(store: AppStore, { dbName, delayMs = 400, indexedDB = globalThis.indexedDB }: AutosaveOptions): Autosave {
  if (!indexedDB) throw new TypeError(`'indexedDB' must be an IndexedDB factory; got ${String(indexedDB)}`);
  const db = openDb(indexedDB, dbName);
  let timer: ReturnType<typeof setTimeout> | undefined;
  let dirty = false;
  let lastWritten: string | undefined;
  let writing: Promise<void> = Promise.resolve();

  const write = (): Promise<void> => {
    if (timer !== undefined) clearTimeout(timer);
    timer = undefined;
    if (!dirty) return writing;
    dirty = false;
    const state = store.get();
    const text = exportAnnotations(state);
    const key = `${state.setName}\u0000${text}`;
    writing = writing.then(async () => {
      if (key === lastWritten) return;
      const record: SavedRecord = { set: state.setName, text, saved: store.now() };
      try {
        const tx = (await db).transaction(OBJECT_STORE, 'readwrite');
        tx.objectStore(OBJECT_STORE).put(record);
        await new Promise<void>((resolve, reject) => {
          tx.oncomplete = () => resolve();
          tx.onerror = () => reject(tx.error);
          tx.onabort = () => reject(tx.error);
        });
        lastWritten = key;
      } catch (cause) {
        store.update((s) => ({ ...s, notices: [...s.notices, failure('Saving the annotations', dbName, cause)] }));
        throw cause;
      }
    });
    return writing;
  };

  const unsubscribe = store.subscribe((next, prev) => {
    if (!annotationsChanged(next, prev) && next.setName === prev.setName) return;
    dirty = true;
    if (timer !== undefined) clearTimeout(timer);
    // A failed write is already a notice; the timer has no caller to hand it to.
    timer = setTimeout(() => void write().catch(() => undefined), delayMs);
  });

  return {
    flush: write,
    async readSaved(set) {
      const tx = (await db).transaction(OBJECT_STORE, 'readonly');
      return ((await request(tx.objectStore(OBJECT_STORE).get(set))) as SavedRecord | undefined)?.text;
    },
    async restore() {
      const setName = store.get().setName;
      let saved: SavedRecord | undefined;
      try {
        const tx = (await db).transaction(OBJECT_STORE, 'readonly');
        saved = (await request(tx.objectStore(OBJECT_STORE).get(setName))) as SavedRecord | undefined;
      } catch (cause) {
        store.update((s) => ({ ...s, notices: [...s.notices, failure('Reading the saved annotations', dbName, cause)] }));
        throw cause;
      }
      if (!saved) return undefined;
      const source = `saved annotations of "${setName}" (browser storage "${dbName}", ${saved.saved})`;
      try {
        const loaded = restoreAnnotations(store, JSON.parse(saved.text), source);
        lastWritten = `${setName}\u0000${exportAnnotations(store.get())}`;
        return loaded;
      } catch (cause) {
        // Later saves overwrite the set's record, so the unreadable text is first kept under a key of its own.
        const backup = `${setName} (unreadable, saved ${saved.saved})`;
        const tx = (await db).transaction(OBJECT_STORE, 'readwrite');
        await request(tx.objectStore(OBJECT_STORE).put({ ...saved, set: backup }));
        const items = cause instanceof DatasetError ? cause.problems.map((p) => p.message) : [String(cause)];
        const text = `The ${source} could not be read; they are kept in storage as "${backup}".`;
        store.update((s) => ({ ...s, notices: [...s.notices, { level: 'error', text, items }] }));
        throw cause;
      }
    },
    async dispose() {
      unsubscribe();
      try {
        await write();
      } finally {
        (await db).close();
      }
    },
  };
}
