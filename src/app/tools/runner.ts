import { cancelDrag } from '../state/commands';
import type { ToolContext, ToolEvent, ToolState } from './types';

/** Holds a tool's current state for a view: feed it events, read `state`, subscribe to changes. */
export interface ToolRunner {
  readonly state: ToolState;
  dispatch(event: ToolEvent): void;
  /** Switches tool (e.g. boxIdle() or lungAwaiting('right')); an open drag is cancelled first. */
  reset(state: ToolState): void;
  subscribe(listener: (state: ToolState) => void): () => void;
}

export function createToolRunner(initial: ToolState, context: () => ToolContext): ToolRunner {
  let state = initial;
  const listeners = new Set<(s: ToolState) => void>();
  const set = (next: ToolState): void => {
    if (next === state) return;
    state = next;
    for (const l of [...listeners]) l(state);
  };
  return {
    get state() {
      return state;
    },
    dispatch(event) {
      set(state.handle(context(), event));
    },
    reset(next) {
      const { store } = context();
      if (store.get().history.drag) cancelDrag(store);
      set(next);
    },
    subscribe(listener) {
      listeners.add(listener);
      return () => {
        listeners.delete(listener);
      };
    },
  };
}
