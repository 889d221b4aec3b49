import type { BatchStatus } from './use-batch-scoring';

export interface BatchPanelProps {
  readonly status: BatchStatus;
  /** Why scoring cannot start (no model, no set), or undefined when it can. */
  readonly blocked: string | undefined;
  readonly description: string;
  readonly onStart: () => void;
  readonly onCancel: () => void;
}

/** Scores every study of the open set with the open model; progress bar and cancel. */
export function BatchPanel({ status, blocked, description, onStart, onCancel }: BatchPanelProps) {
  const running = status.kind === 'running';
  return (
    <div className="t-batch">
      <p>{description}</p>
      <div className="t-batch__actions">
        <button type="button" className="t-button t-button--primary" disabled={running || blocked !== undefined} onClick={onStart}>
          Score the set
        </button>
        <button type="button" className="t-button" disabled={!running} onClick={onCancel}>
          Cancel scoring
        </button>
      </div>
      {blocked && <p className="t-status">{blocked}</p>}
      {(status.kind === 'running' || status.kind === 'cancelled') && (
        <div className="t-batch__progress">
          <label htmlFor="t-batch-progress">
            {status.kind === 'running' ? 'Scoring' : 'Cancelled after'} {status.done} of {status.total} studies
            {status.kind === 'running' && status.study ? ` (last: ${status.study})` : ''}
          </label>
          <progress id="t-batch-progress" max={Math.max(1, status.total)} value={status.done} />
        </div>
      )}
      {status.kind === 'failed' && <p className="t-error">Scoring stopped: {status.message}</p>}
      {status.kind === 'finished' && (
        <div className="t-status" role="status">
          Finished. See Results for the tables and files.
          {status.failures.length > 0 && (
            <ul>
              {status.failures.map((f) => (
                <li key={f.study}>
                  {f.study}: {f.reason}
                </li>
              ))}
            </ul>
          )}
        </div>
      )}
    </div>
  );
}
