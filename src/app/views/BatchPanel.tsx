import type { BatchStatus } from './use-batch-scoring';

export interface BatchPanelProps {
  readonly status: BatchStatus;
  /** Why scoring cannot start (no model, no set), or undefined when it can. */
  readonly blocked: string | undefined;
  readonly description: string;
  readonly onStart: () => void;
  readonly onCancel: () => void;
  /** The models a run scores, as ticks; undefined: the open model only. */
  readonly picker?: BatchModelPicker;
}

/** The models a run may score and which are ticked; given by the Workbench, which holds the session. */
export interface BatchModelPicker {
  readonly choices: readonly { readonly key: string; readonly label: string; readonly ticked: boolean }[];
  readonly onToggle: (key: string) => void;
}

function ModelPicker({ picker, disabled }: { readonly picker: BatchModelPicker; readonly disabled: boolean }) {
  const ticked = picker.choices.filter((c) => c.ticked).length;
  return (
    <fieldset className="t-batch__models" disabled={disabled}>
      <legend>Models to score</legend>
      {picker.choices.map((c) => (
        <label key={c.key} className="t-batch__model" style={{ marginRight: '1.25em' }}>
          <input type="checkbox" checked={c.ticked} onChange={() => picker.onToggle(c.key)} /> {c.label}
        </label>
      ))}
      <p className="t-hint">
        {ticked >= 2
          ? 'Two or more models: Results adds their paired comparisons (difference, bootstrap interval, McNemar), as tessera score --model A --model B does.'
          : 'Tick two or more models to compare them pairwise on the same sentences.'}
      </p>
    </fieldset>
  );
}

/** Scores every study of the open set with the ticked models; progress bar and cancel. */
export function BatchPanel({ status, blocked, description, onStart, onCancel, picker }: BatchPanelProps) {
  const running = status.kind === 'running' || status.kind === 'opening';
  const noneTicked = picker !== undefined && !picker.choices.some((c) => c.ticked);
  return (
    <div className="t-batch">
      <p>{description}</p>
      {picker && picker.choices.length > 0 && <ModelPicker picker={picker} disabled={running} />}
      <div className="t-batch__actions">
        <button type="button" className="t-button t-button--primary" disabled={running || blocked !== undefined || noneTicked} onClick={onStart}>
          Score the set
        </button>
        <button type="button" className="t-button" disabled={!running} onClick={onCancel}>
          Cancel scoring
        </button>
      </div>
      {blocked && <p className="t-status">{blocked}</p>}
      {!blocked && noneTicked && <p className="t-status">Tick at least one model to score.</p>}
      {status.kind === 'opening' && (
        <p className="t-status" role="status">
          Opening {status.models.join(', ')}…
        </p>
      )}
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
