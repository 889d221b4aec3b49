import { describe, expect, it, vi } from 'vitest';
import { act, useState } from 'react';
import type { Aggregator } from '../../core/types';
import { AggregatorControl } from './AggregatorControl';
import { changeValue, pressKey, renderForTest } from './render-for-test';

function Harness({ onChange, initial = { kind: 'max' } }: { onChange: (a: Aggregator) => void; initial?: Aggregator }) {
  const [value, setValue] = useState<Aggregator>(initial);
  return (
    <AggregatorControl
      value={value}
      cellCount={49}
      onChange={(a) => {
        onChange(a);
        setValue(a);
      }}
    />
  );
}

const select = (c: HTMLElement) => c.querySelector('select') as HTMLSelectElement;
const param = (c: HTMLElement) => c.querySelector('input[type="number"]') as HTMLInputElement | null;

describe('AggregatorControl', () => {
  it('AggregatorControl switches kind with a default parameter for each', () => {
    const onChange = vi.fn();
    const r = renderForTest(<Harness onChange={onChange} />);
    expect(param(r.container)).toBeNull();
    changeValue(select(r.container), 'softmax', 'change');
    expect(onChange).toHaveBeenLastCalledWith({ kind: 'softmax', temperature: 0.1 });
    changeValue(select(r.container), 'lse', 'change');
    expect(onChange).toHaveBeenLastCalledWith({ kind: 'lse', sharpness: 5 });
    changeValue(select(r.container), 'topk', 'change');
    expect(onChange).toHaveBeenLastCalledWith({ kind: 'topk', k: 5 });
    expect(param(r.container)?.value).toBe('5');
    changeValue(select(r.container), 'max', 'change');
    expect(onChange).toHaveBeenLastCalledWith({ kind: 'max' });
    r.unmount();
  });

  it('AggregatorControl commits a parameter on Enter and labels the field', () => {
    const onChange = vi.fn();
    const r = renderForTest(<Harness onChange={onChange} initial={{ kind: 'lse', sharpness: 5 }} />);
    const input = param(r.container) as HTMLInputElement;
    const label = r.container.querySelector(`label[for="${input.id}"]`);
    expect(label?.textContent).toBe('Sharpness r');
    changeValue(input, '10', 'input');
    expect(onChange).not.toHaveBeenCalled();
    pressKey(input, 'Enter');
    expect(onChange).toHaveBeenLastCalledWith({ kind: 'lse', sharpness: 10 });
    r.unmount();
  });

  it('AggregatorControl refuses T <= 0 and k beyond the grid with the core message', () => {
    const onChange = vi.fn();
    const r = renderForTest(<Harness onChange={onChange} initial={{ kind: 'softmax', temperature: 0.1 }} />);
    const input = param(r.container) as HTMLInputElement;
    changeValue(input, '0', 'input');
    pressKey(input, 'Enter');
    expect(onChange).not.toHaveBeenCalled();
    expect(r.container.querySelector('[role="alert"]')?.textContent).toContain("'temperature' must be a finite number > 0; got 0");
    expect(input.getAttribute('aria-invalid')).toBe('true');
    changeValue(select(r.container), 'topk', 'change');
    const k = param(r.container) as HTMLInputElement;
    changeValue(k, '50', 'input');
    act(() => {
      k.dispatchEvent(new FocusEvent('focusout', { bubbles: true }));
    });
    expect(onChange).toHaveBeenLastCalledWith({ kind: 'topk', k: 5 });
    expect(r.container.querySelector('[role="alert"]')?.textContent).toContain("'k' must be an integer in [1, 49]; got 50");
    changeValue(k, '2.5', 'input');
    pressKey(k, 'Enter');
    expect(r.container.querySelector('[role="alert"]')?.textContent).toContain("'k' must be an integer >= 1; got 2.5");
    r.unmount();
  });
});
