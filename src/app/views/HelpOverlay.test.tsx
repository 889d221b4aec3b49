import { describe, expect, it, vi } from 'vitest';
import { HelpOverlay } from './HelpOverlay';
import { KEY_BINDINGS, ZONE_KEYS } from './key-bindings';
import { click, pressKey, renderForTest } from './render-for-test';

describe('HelpOverlay', () => {
  it('HelpOverlay lists every key binding as a dialog', () => {
    const r = renderForTest(<HelpOverlay open onClose={() => {}} />);
    const dialog = r.container.querySelector('[role="dialog"]') as HTMLElement;
    expect(dialog.getAttribute('aria-modal')).toBe('true');
    const listed = [...dialog.querySelectorAll('kbd')].map((k) => k.textContent);
    for (const b of KEY_BINDINGS) for (const k of b.keys) expect(listed).toContain(k);
    for (const b of KEY_BINDINGS) expect(dialog.textContent).toContain(b.action);
    r.unmount();
  });

  it('HelpOverlay lists the zone keys 1 to 7 and names the colour scale', () => {
    const r = renderForTest(<HelpOverlay open onClose={() => {}} />);
    const text = r.container.textContent ?? '';
    expect(Object.keys(ZONE_KEYS)).toEqual(['1', '2', '3', '4', '5', '6', '7']);
    expect(text).toContain('right upper');
    expect(text).toContain('left lower');
    expect(text).toContain('cardiac');
    expect(text).toContain('cividis');
    r.unmount();
  });

  it('HelpOverlay focuses Close and closes on Esc and on the button', () => {
    const onClose = vi.fn();
    const r = renderForTest(<HelpOverlay open onClose={onClose} />);
    const close = r.container.querySelector('button') as HTMLButtonElement;
    expect(document.activeElement).toBe(close);
    expect(close.textContent).toBe('Close');
    pressKey(close, 'Escape');
    expect(onClose).toHaveBeenCalledTimes(1);
    click(close);
    expect(onClose).toHaveBeenCalledTimes(2);
    r.unmount();
  });

  it('HelpOverlay renders nothing when closed', () => {
    const r = renderForTest(<HelpOverlay open={false} onClose={() => {}} />);
    expect(r.container.innerHTML).toBe('');
    r.unmount();
  });
});
