import type { AppStore } from '../state';
import type { Autosave } from '../state/autosave';
import type { DemoSources } from '../sources/demo-sources';
import type { InferenceClient } from './inference-client';

/** What the composition root (main.tsx) hands the app: created once, passed down, never re-created. */
export interface AppServices {
  readonly store: AppStore;
  readonly client: InferenceClient;
  /** The bundled demo (same-origin); rejects with a message when the build lacks it. */
  readonly demo: Promise<DemoSources>;
  /** Problems setting up the page (e.g. no IndexedDB), shown to the user; the page still runs. */
  readonly setupProblems: readonly string[];
  /** Saves boxes and lung templates to IndexedDB on every change; absent when IndexedDB is not available. */
  readonly autosave?: Autosave;
}
