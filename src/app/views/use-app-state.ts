import { useSyncExternalStore } from 'react';
import type { AppState, AppStore } from '../state';

/** The store's current state; the component re-renders on every change. */
export function useAppState(store: AppStore): AppState {
  return useSyncExternalStore(store.subscribe, store.get, store.get);
}
