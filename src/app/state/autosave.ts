import { DatasetError } from '../../dataset/errors';
import { exportAnnotations, restoreAnnotations } from './annotation-io';
import type { LoadedAnnotations } from '../../dataset/annotations';
import type { AppState, Notice, ViewSettings } from './records';
import type { AppStore } from './store';
import { setAggregator, setAnnotator, setHitRule, setOpacity, setOverlay, setShowGrid, setShowLinks, setTopK } from './view-commands';

const OBJECT_STORE = 'annotations';
/** Version 2 added the view settings' object store. */
const DB_VERSION = 2;
const VIEW_STORE = 'view';
const VIEW_KEY = 'settings';
const VIEW_SCHEMA = 'tessera.view/1';

/** The view settings kept across visits: all but the display window, which belongs to one image. */
export type SavedView = Omit<ViewSettings, 'window'>;

/** The one saved view record; `text` is JSON with `schema` and the SavedView fields. */
interface SavedViewRecord {
  readonly key: string;
  readonly text: string;
  readonly saved: string; // ISO time
}

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
  /** The saved view settings text, for inspection and tests. */
  readSavedView(): Promise<string | undefined>;
  /**
   * Applies the saved view settings (aggregator, hit rule, overlay, opacity, layers, top-k,
   * annotator) through the view commands. Resolves to the settings applied, or undefined when none
   * were saved or the view changed since the autosave was created (the researcher's choice wins).
   * A saved field that a command refuses is left as it is and named in a warning notice.
   */
  restoreView(): Promise<Partial<SavedView> | undefined>;
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
  const r = factory.open(name, DB_VERSION);
  r.onupgradeneeded = () => {
    if (!r.result.objectStoreNames.contains(OBJECT_STORE)) r.result.createObjectStore(OBJECT_STORE, { keyPath: 'set' });
    if (!r.result.objectStoreNames.contains(VIEW_STORE)) r.result.createObjectStore(VIEW_STORE, { keyPath: 'key' });
  };
  return request(r);
}

async function put(db: Promise<IDBDatabase>, objectStore: string, record: unknown): Promise<void> {
  const tx = (await db).transaction(objectStore, 'readwrite');
  tx.objectStore(objectStore).put(record);
  await new Promise<void>((resolve, reject) => {
    tx.oncomplete = () => resolve();
    tx.onerror = () => reject(tx.error);
    tx.onabort = () => reject(tx.error);
  });
}

function savedViewText(view: ViewSettings): string {
  const { window: _window, ...kept } = view;
  const saved: SavedView = kept;
  return JSON.stringify({ schema: VIEW_SCHEMA, ...saved });
}

function mustBeBoolean(value: unknown, name: string): boolean {
  if (typeof value !== 'boolean') throw new TypeError(`'${name}' must be true or false; got ${JSON.stringify(value)}`);
  return value;
}

/** Each saved field and the view command that applies it (and checks it). */
const VIEW_FIELDS: { readonly [K in keyof SavedView]-?: (store: AppStore, value: unknown) => void } = {
  aggregator: (s, v) => setAggregator(s, v as SavedView['aggregator']),
  hitRule: (s, v) => setHitRule(s, v as SavedView['hitRule']),
  overlay: (s, v) => setOverlay(s, v as SavedView['overlay']),
  opacity: (s, v) => setOpacity(s, v as number),
  showGrid: (s, v) => setShowGrid(s, mustBeBoolean(v, 'showGrid')),
  showLinks: (s, v) => setShowLinks(s, mustBeBoolean(v, 'showLinks')),
  topK: (s, v) => setTopK(s, v as number),
  annotator: (s, v) => setAnnotator(s, v as string),
};

function annotationsChanged(a: AppState, b: AppState): boolean {
  return a.boxes !== b.boxes || a.lungs !== b.lungs || a.stale !== b.stale || a.held !== b.held || a.heldLungs !== b.heldLungs;
}

function failure(what: string, dbName: string, cause: unknown): Notice {
  const why = cause instanceof Error ? cause.message : String(cause);
  return { level: 'error', text: `${what} in the browser's storage ("${dbName}") failed: ${why}. Export the annotation file to keep your work.`, items: [] };
}

/**
 * Saves the store's annotations (boxes, lung templates, stale and held boxes, as the set's
 * annotation file) and its view settings (SavedView, one record for all sets) to IndexedDB after
 * every change of them, debounced by delayMs and written at once by flush(). restore() reads the
 * set's saved file back through loadAnnotations, so a box whose sentence text changed is flagged
 * stale, never re-attached; restoreView() applies the saved view settings through the view
 * commands. A storage failure becomes an error notice in the store and rejects flush().
 */
export function createAutosave(store: AppStore, { dbName, delayMs = 400, indexedDB = globalThis.indexedDB }: AutosaveOptions): Autosave {
  if (!indexedDB) throw new TypeError(`'indexedDB' must be an IndexedDB factory; got ${String(indexedDB)}`);
  const db = openDb(indexedDB, dbName);
  const createdView = store.get().view;
  let timer: ReturnType<typeof setTimeout> | undefined;
  let dirty = false;
  let viewDirty = false;
  let lastWritten: string | undefined;
  let lastWrittenView: string | undefined;
  let writing: Promise<void> = Promise.resolve();

  const stored = (what: string, objectStore: string, record: unknown) =>
    put(db, objectStore, record).catch((cause: unknown) => {
      store.update((s) => ({ ...s, notices: [...s.notices, failure(what, dbName, cause)] }));
      throw cause;
    });

  const write = (): Promise<void> => {
    if (timer !== undefined) clearTimeout(timer);
    timer = undefined;
    const state = store.get();
    const started: Promise<void>[] = [];
    if (dirty) {
      dirty = false;
      const text = exportAnnotations(state);
      const key = `${state.setName}\u0000${text}`;
      // Each write is tried even when the one before failed (that failure is already a notice).
      writing = writing.catch(() => undefined).then(async () => {
        if (key === lastWritten) return;
        const record: SavedRecord = { set: state.setName, text, saved: store.now() };
        await stored('Saving the annotations', OBJECT_STORE, record);
        lastWritten = key;
      });
      started.push(writing);
    }
    if (viewDirty) {
      viewDirty = false;
      const text = savedViewText(state.view);
      writing = writing.catch(() => undefined).then(async () => {
        if (text === lastWrittenView) return;
        const record: SavedViewRecord = { key: VIEW_KEY, text, saved: store.now() };
        await stored('Saving the view settings', VIEW_STORE, record);
        lastWrittenView = text;
      });
      started.push(writing);
    }
    return started.length > 0 ? Promise.all(started).then(() => undefined) : writing;
  };

  const unsubscribe = store.subscribe((next, prev) => {
    const annotations = annotationsChanged(next, prev) || next.setName !== prev.setName;
    const view = next.view !== prev.view;
    if (!annotations && !view) return;
    dirty ||= annotations;
    viewDirty ||= view;
    if (timer !== undefined) clearTimeout(timer);
    // A failed write is already a notice; the timer has no caller to hand it to.
    timer = setTimeout(() => void write().catch(() => undefined), delayMs);
  });

  const readViewRecord = async (): Promise<SavedViewRecord | undefined> => {
    const tx = (await db).transaction(VIEW_STORE, 'readonly');
    return (await request(tx.objectStore(VIEW_STORE).get(VIEW_KEY))) as SavedViewRecord | undefined;
  };

  return {
    flush: write,
    readSavedView: async () => (await readViewRecord())?.text,
    async restoreView() {
      let saved: SavedViewRecord | undefined;
      try {
        saved = await readViewRecord();
      } catch (cause) {
        store.update((s) => ({ ...s, notices: [...s.notices, failure('Reading the saved view settings', dbName, cause)] }));
        throw cause;
      }
      if (!saved || store.get().view !== createdView) return undefined;
      const source = `saved view settings (browser storage "${dbName}", ${saved.saved})`;
      const problems: string[] = [];
      const applied: Record<string, unknown> = {};
      let fields: Record<string, unknown> = {};
      try {
        const parsed: unknown = JSON.parse(saved.text);
        if (typeof parsed !== 'object' || parsed === null || (parsed as { schema?: unknown }).schema !== VIEW_SCHEMA) {
          throw new TypeError(`expected an object with schema "${VIEW_SCHEMA}"; got ${saved.text.slice(0, 80)}`);
        }
        fields = parsed as Record<string, unknown>;
      } catch (cause) {
        problems.push((cause as Error).message);
      }
      for (const [name, apply] of Object.entries(VIEW_FIELDS)) {
        if (!(name in fields)) continue;
        try {
          apply(store, fields[name]);
          applied[name] = fields[name];
        } catch (cause) {
          problems.push(`${name}: ${(cause as Error).message}`);
        }
      }
      lastWrittenView = savedViewText(store.get().view);
      if (problems.length > 0) {
        const text = `Some ${source} could not be used; those settings keep their defaults.`;
        store.update((s) => ({ ...s, notices: [...s.notices, { level: 'warning', text, items: problems }] }));
      }
      return applied as Partial<SavedView>;
    },
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
