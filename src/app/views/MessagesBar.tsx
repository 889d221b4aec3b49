import type { Notice } from '../state';

export interface MessagesBarProps {
  readonly notices: readonly Notice[];
  readonly problems: readonly string[];
  readonly onDismissNotice: (index: number) => void;
  readonly onClearProblems: () => void;
}

/**
 * Notices from the store (imports, restores, refused edits) and problems opening folders. An
 * error's items (why nothing was done) are shown open; other notices list theirs on request.
 */
export function MessagesBar({ notices, problems, onDismissNotice, onClearProblems }: MessagesBarProps) {
  if (notices.length === 0 && problems.length === 0) return null;
  return (
    <div className="t-messages" role="region" aria-label="Messages">
      {notices.map((n, i) => (
        <div key={i} className={`t-message t-message--${n.level}`} role={n.level === 'error' ? 'alert' : 'status'}>
          <span className="t-message__level">{n.level}</span>
          <span className="t-message__text">
            {n.text}
            {n.items.length > 0 && (
              <details open={n.level === 'error'}>
                <summary>{n.items.length} item{n.items.length === 1 ? '' : 's'}</summary>
                <ul>
                  {n.items.map((it, j) => (
                    <li key={j}>{it}</li>
                  ))}
                </ul>
              </details>
            )}
          </span>
          <button type="button" className="t-button" onClick={() => onDismissNotice(i)} aria-label={`Dismiss: ${n.text}`}>
            Dismiss
          </button>
        </div>
      ))}
      {problems.length > 0 && (
        <div className="t-message t-message--error" role="alert">
          <span className="t-message__level">problem</span>
          <span className="t-message__text">
            {problems.length === 1 ? problems[0] : `${problems.length} problems`}
            {problems.length > 1 && (
              <details>
                <summary>Show all</summary>
                <ul>
                  {problems.map((p, j) => (
                    <li key={j}>{p}</li>
                  ))}
                </ul>
              </details>
            )}
          </span>
          <button type="button" className="t-button" onClick={onClearProblems}>
            Dismiss
          </button>
        </div>
      )}
    </div>
  );
}
