import { describe, expect, it, vi } from 'vitest';
import { summariseRate } from '../../core/rate-summary';
import { StudyNavigator, type NavigatorStudy } from './StudyNavigator';
import { click, pressKey, renderForTest } from './render-for-test';

const STUDIES: NavigatorStudy[] = [
  { id: 'a', sentenceCount: 4, boxCount: 2, tally: summariseRate(1, 2, 0.2) },
  { id: 'b', sentenceCount: 3, boxCount: 0, tally: summariseRate(0, 0, 0) },
  { id: 'c', sentenceCount: 5, boxCount: 1 },
];

describe('StudyNavigator', () => {
  it('StudyNavigator states hits, misses and chance in words, or that a study is not encoded', () => {
    const r = renderForTest(<StudyNavigator studies={STUDIES} selectedId="a" onSelect={() => {}} />);
    const items = [...r.container.querySelectorAll('[role="option"]')].map((e) => e.textContent);
    expect(items[0]).toContain('1 hit · 1 miss · chance 10%');
    expect(items[1]).toContain('nothing to score');
    expect(items[2]).toContain('not encoded');
    r.unmount();
  });

  it('StudyNavigator selects by arrows, Home, End and click, stopping at the ends', () => {
    const onSelect = vi.fn();
    const r = renderForTest(<StudyNavigator studies={STUDIES} selectedId="b" onSelect={onSelect} />);
    const list = r.container.querySelector('[role="listbox"]') as HTMLElement;
    pressKey(list, 'ArrowDown');
    expect(onSelect).toHaveBeenLastCalledWith('c');
    pressKey(list, 'ArrowUp');
    expect(onSelect).toHaveBeenLastCalledWith('a');
    pressKey(list, 'End');
    expect(onSelect).toHaveBeenLastCalledWith('c');
    pressKey(list, 'Home');
    expect(onSelect).toHaveBeenLastCalledWith('a');
    r.rerender(<StudyNavigator studies={STUDIES} selectedId="c" onSelect={onSelect} />);
    pressKey(list, 'ArrowDown');
    expect(onSelect).toHaveBeenLastCalledWith('c');
    click(r.container.querySelectorAll('[role="option"]')[1]);
    expect(onSelect).toHaveBeenLastCalledWith('b');
    r.unmount();
  });

  it('StudyNavigator says so when no set is open', () => {
    const r = renderForTest(<StudyNavigator studies={[]} selectedId={undefined} onSelect={() => {}} />);
    expect(r.container.textContent).toContain('No sample set is open');
    r.unmount();
  });
});
