import { afterEach, describe, expect, it } from 'vitest';
import { CautionBanner } from './CautionBanner';
import { renderForTest, type Rendered } from './render-for-test';

describe('CautionBanner', () => {
  let r: Rendered | undefined;
  afterEach(() => r?.unmount());
  const text = (synthetic?: boolean): string => {
    r?.unmount();
    r = renderForTest(<CautionBanner synthetic={synthetic} />);
    return r.container.querySelector('[role="note"]')?.textContent ?? '';
  };

  it('always says research tool, not a medical device; says what the open set is', () => {
    for (const s of [undefined, true, false]) expect(text(s)).toMatch(/Research tool — not a medical device; not for diagnosis or treatment\./);
    expect(text(true)).toContain('is synthetic');
    expect(text(false)).toContain('not marked synthetic: treat it as patient data');
    expect(text(undefined)).not.toContain('synthetic');
  });
});
