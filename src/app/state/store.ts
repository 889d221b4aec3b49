import { createInitialState, type AppState, type InitialState } from './records';

export type StoreListener = (state: AppState, previous: AppState) => void;

/** A holder of one immutable AppState; every change replaces the whole record. */
export interface AppStore {
  get(): AppState;
  /** Replaces the state with fn(state); listeners run only when the result is a new object. */
  update(fn: (state: AppState) => AppState): void;
  subscribe(listener: StoreListener): () => void;
  /** The time written into new records, ISO 8601. */
  now(): string;
}

export interface AppStoreOptions {
  /** Source of record times; the composition root passes the clock, tests a fixed time. */
  readonly now?: () => Date | string;
}

/**
 * Creates a store of plain immutable records outside React (use with useSyncExternalStore).
 * Each store owns its state and listeners; nothing is shared between stores.
 */
export function createAppStore(initial: InitialState = {}, { now = () => new Date() }: AppStoreOptions = {}): AppStore {
  let state = createInitialState(initial);
  const listeners = new Set<StoreListener>();
  return {
    get: () => state,
    update(fn) {
      const previous = state;
      const next = fn(previous);
      if (next === previous) return;
      state = next;
      for (const l of [...listeners]) l(state, previous);
    },
    subscribe(listener) {
      listeners.add(listener);
      return () => {
        listeners.delete(listener);
      };
    },
    now() {
      const t = now();
      return typeof t === 'string' ? t : t.toISOString();
    },
  };
}
