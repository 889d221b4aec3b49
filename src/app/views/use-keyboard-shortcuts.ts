import { useEffect, useRef } from 'react';
import type { AppStore } from '../state';
import { acceptProposal, deleteBox, redo, setBoxZone, setShowGrid, setShowLinks, stepSentence, stepStudy, undo } from '../state';
import { ZONE_KEYS } from './key-bindings';

/** The tool the pointer drives on the study canvas. */
export type ToolMode = 'inspect' | 'box' | 'lungs';

export interface ShortcutHandlers {
  readonly openHelp: () => void;
  readonly escape: () => void;
  readonly setTool: (tool: ToolMode) => void;
  readonly toggleMap: () => void;
  readonly zoom: (how: 'in' | 'out' | 'fit') => void;
  /** Reports a command's refusal (RangeError message) to the researcher. */
  readonly onProblem: (message: string) => void;
}

function isTyping(target: EventTarget | null): boolean {
  if (!(target instanceof HTMLElement)) return false;
  const tag = target.tagName;
  return tag === 'INPUT' || tag === 'SELECT' || tag === 'TEXTAREA' || target.isContentEditable;
}

/**
 * The explorer's keys (listed in key-bindings.ts), on the window: ignored while typing in a field
 * or while a dialog is open, so the help overlay and the fields keep their own keys.
 */
export function useKeyboardShortcuts(store: AppStore, handlers: ShortcutHandlers): void {
  const ref = useRef(handlers);
  ref.current = handlers;
  useEffect(() => {
    const onKey = (e: KeyboardEvent) => {
      if (e.defaultPrevented || isTyping(e.target)) return;
      if (e.target instanceof HTMLElement && e.target.closest('[role="dialog"]')) return;
      const h = ref.current;
      const ctrl = e.ctrlKey || e.metaKey;
      const key = e.key;
      const run = (fn: () => void) => {
        e.preventDefault();
        try {
          fn();
        } catch (err) {
          h.onProblem((err as Error).message);
        }
      };
      if (ctrl && (key === 'z' || key === 'Z')) return run(() => (e.shiftKey ? redo(store) : undo(store)));
      if (ctrl && (key === 'y' || key === 'Y')) return run(() => redo(store));
      if (ctrl || e.altKey) return;
      const boxId = store.get().selection.boxId;
      switch (key) {
        case '?':
          return run(h.openHelp);
        case 'Escape':
          return run(h.escape);
        case 'ArrowUp':
        case 'ArrowDown':
          return run(() => stepSentence(store, key === 'ArrowUp' ? -1 : 1));
        case 'PageUp':
        case '[':
          return run(() => stepStudy(store, -1));
        case 'PageDown':
        case ']':
          return run(() => stepStudy(store, 1));
        case 'Enter':
          // Enter on a focused button or option keeps its own meaning.
          if (e.target instanceof HTMLElement && e.target.closest('button, a, [role="option"]')) return;
          return run(() => {
            if (acceptProposal(store).length === 0) h.onProblem('Nothing to accept: the selected sentence has no proposed box (it needs a zone word and a lung template).');
          });
        case 'Delete':
        case 'Backspace':
          if (boxId === undefined) return;
          return run(() => deleteBox(store, boxId));
        case 'g':
        case 'G':
          return run(() => setShowGrid(store, !store.get().view.showGrid));
        case 'k':
        case 'K':
          return run(() => setShowLinks(store, !store.get().view.showLinks));
        case 'm':
        case 'M':
          return run(h.toggleMap);
        case 'b':
        case 'B':
          return run(() => h.setTool('box'));
        case 'v':
        case 'V':
          return run(() => h.setTool('inspect'));
        case 'l':
        case 'L':
          return run(() => h.setTool('lungs'));
        case '+':
        case '=':
          return run(() => h.zoom('in'));
        case '-':
          return run(() => h.zoom('out'));
        case '0':
          return run(() => h.zoom('fit'));
      }
      const zone = ZONE_KEYS[key];
      if (zone !== undefined) {
        if (boxId === undefined) return run(() => h.onProblem(`Key ${key} sets the zone of the selected box; select a box first.`));
        return run(() => setBoxZone(store, boxId, zone));
      }
    };
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  }, [store]);
}
