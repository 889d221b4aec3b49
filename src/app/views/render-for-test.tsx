import { act, type ReactElement } from 'react';
import { createRoot, type Root } from 'react-dom/client';

(globalThis as { IS_REACT_ACT_ENVIRONMENT?: boolean }).IS_REACT_ACT_ENVIRONMENT = true;

export interface Rendered {
  readonly container: HTMLElement;
  rerender(element: ReactElement): void;
  unmount(): void;
}

/** Renders into a fresh container attached to document.body, inside act(). */
export function renderForTest(element: ReactElement): Rendered {
  const container = document.createElement('div');
  document.body.appendChild(container);
  let root: Root | undefined;
  act(() => {
    root = createRoot(container);
    root.render(element);
  });
  return {
    container,
    rerender(next) {
      act(() => root?.render(next));
    },
    unmount() {
      act(() => root?.unmount());
      container.remove();
    },
  };
}

/** Dispatches a keydown on the element inside act(). */
export function pressKey(el: Element, key: string, init: KeyboardEventInit = {}): void {
  act(() => {
    el.dispatchEvent(new KeyboardEvent('keydown', { key, bubbles: true, cancelable: true, ...init }));
  });
}

export function click(el: Element): void {
  act(() => {
    el.dispatchEvent(new MouseEvent('click', { bubbles: true, cancelable: true }));
  });
}

/** Sets an input's or select's value the way React notices, then fires the event. */
export function changeValue(el: HTMLInputElement | HTMLSelectElement, value: string, eventName: 'input' | 'change'): void {
  const proto = el instanceof HTMLSelectElement ? HTMLSelectElement.prototype : HTMLInputElement.prototype;
  const setter = Object.getOwnPropertyDescriptor(proto, 'value')?.set;
  act(() => {
    setter?.call(el, value);
    el.dispatchEvent(new Event(eventName, { bubbles: true }));
  });
}
