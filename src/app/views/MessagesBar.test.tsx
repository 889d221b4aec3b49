import { describe, expect, it, vi } from 'vitest';
import { MessagesBar } from './MessagesBar';
import { click, renderForTest } from './render-for-test';

describe('MessagesBar', () => {
  it('MessagesBar shows an error notice with its items open, as an alert', () => {
    const notice = { level: 'error' as const, text: 'Nothing was imported from a.json; the boxes you have are unchanged.', items: ['a.json (schema): the annotations are in version 9'] };
    const r = renderForTest(<MessagesBar notices={[notice]} problems={[]} onDismissNotice={() => {}} onClearProblems={() => {}} />);
    const alert = r.container.querySelector('[role="alert"]') as HTMLElement;
    expect(alert.textContent).toContain('Nothing was imported from a.json');
    expect(alert.querySelector('details')?.open).toBe(true);
    expect(alert.querySelector('li')?.textContent).toBe('a.json (schema): the annotations are in version 9');
    r.unmount();
  });

  it('MessagesBar keeps the items of info and warning notices folded, and Dismiss names its notice', () => {
    const onDismiss = vi.fn();
    const notices = [
      { level: 'warning' as const, text: 'Imported 0 boxes from b.json.', items: ['b.json (set): the file is for set "x"'] },
      { level: 'info' as const, text: 'Imported 1 box from c.json.', items: [] },
    ];
    const r = renderForTest(<MessagesBar notices={notices} problems={[]} onDismissNotice={onDismiss} onClearProblems={() => {}} />);
    const statuses = [...r.container.querySelectorAll('[role="status"]')];
    expect(statuses).toHaveLength(2);
    expect(statuses[0].querySelector('details')?.open).toBe(false);
    expect(statuses[1].querySelector('details')).toBeNull();
    click(r.container.querySelector('[aria-label="Dismiss: Imported 1 box from c.json."]') as HTMLElement);
    expect(onDismiss).toHaveBeenCalledWith(1);
    r.unmount();
  });

  it('MessagesBar renders nothing without notices or problems', () => {
    const r = renderForTest(<MessagesBar notices={[]} problems={[]} onDismissNotice={() => {}} onClearProblems={() => {}} />);
    expect(r.container.innerHTML).toBe('');
    r.unmount();
  });
});
