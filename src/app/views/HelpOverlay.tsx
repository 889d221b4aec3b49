import { useEffect, useRef } from 'react';
import { KEY_BINDINGS, type KeyBinding } from './key-bindings';
import { CIVIDIS_SOURCE } from './MapLegend';

export interface HelpOverlayProps {
  readonly open: boolean;
  readonly onClose: () => void;
}

const GROUPS: readonly KeyBinding['group'][] = ['Report and studies', 'Reference boxes', 'View', 'General'];

/** Modal list of every key binding, opened with '?', closed with Esc or the button. */
export function HelpOverlay({ open, onClose }: HelpOverlayProps) {
  const closeRef = useRef<HTMLButtonElement>(null);
  useEffect(() => {
    if (open) closeRef.current?.focus();
  }, [open]);
  if (!open) return null;
  return (
    <div className="t-overlay" role="presentation" onClick={onClose}>
      <div
        className="t-help"
        role="dialog"
        aria-modal="true"
        aria-labelledby="t-help-title"
        onClick={(e) => e.stopPropagation()}
        onKeyDown={(e) => {
          if (e.key === 'Escape') {
            e.stopPropagation();
            onClose();
          }
        }}
      >
        <div className="t-help__head">
          <h2 id="t-help-title">Keys</h2>
          <button ref={closeRef} type="button" className="t-button" onClick={onClose}>
            Close
          </button>
        </div>
        <div className="t-help__cols">
          {GROUPS.map((group) => (
            <section key={group}>
              <h3>{group}</h3>
              <dl>
                {KEY_BINDINGS.filter((b) => b.group === group).map((b) => (
                  <div className="t-help__row" key={b.keys.join('|') + b.action}>
                    <dt>
                      {b.keys.map((k, i) => (
                        <span key={k}>
                          {i > 0 ? ' or ' : ''}
                          <kbd>{k}</kbd>
                        </span>
                      ))}
                    </dt>
                    <dd>{b.action}</dd>
                  </div>
                ))}
              </dl>
            </section>
          ))}
        </div>
        <p className="t-help__note">
          The similarity map uses the cividis colour scale ({CIVIDIS_SOURCE}), which stays readable with the common forms
          of colour-vision deficiency. Research tool — not a medical device; not for diagnosis.
        </p>
      </div>
    </div>
  );
}
