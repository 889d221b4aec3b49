import { useEffect, useId, useState } from 'react';
import type { Aggregator } from '../../core/types';
import { validateAggregator } from '../../core/pool-regions';

export interface AggregatorControlProps {
  readonly value: Aggregator;
  readonly onChange: (aggregator: Aggregator) => void;
  /** Number of cells of the grid; bounds top-k's k. */
  readonly cellCount?: number;
}

type Kind = Aggregator['kind'];

const KIND_LABELS: Readonly<Record<Kind, string>> = {
  max: 'Maximum',
  softmax: 'Softmax-weighted mean',
  lse: 'Log-sum-exp',
  topk: 'Mean of top k',
};

const PARAMETER: Readonly<Record<Exclude<Kind, 'max'>, { label: string; initial: number; step: number }>> = {
  softmax: { label: 'Temperature T', initial: 0.1, step: 0.01 },
  lse: { label: 'Sharpness r', initial: 5, step: 0.5 },
  topk: { label: 'Cells k', initial: 5, step: 1 },
};

function parameterOf(a: Aggregator): number | undefined {
  switch (a.kind) {
    case 'max':
      return undefined;
    case 'softmax':
      return a.temperature;
    case 'lse':
      return a.sharpness;
    case 'topk':
      return a.k;
  }
}

function build(kind: Kind, p: number): Aggregator {
  switch (kind) {
    case 'max':
      return { kind: 'max' };
    case 'softmax':
      return { kind: 'softmax', temperature: p };
    case 'lse':
      return { kind: 'lse', sharpness: p };
    case 'topk':
      return { kind: 'topk', k: p };
  }
}

/**
 * Chooses how a sentence's cell similarities are pooled into its score. Changing it re-pools the
 * kept similarities; nothing is encoded again.
 */
export function AggregatorControl({ value, onChange, cellCount }: AggregatorControlProps) {
  const id = useId();
  const [text, setText] = useState(String(parameterOf(value) ?? ''));
  const [problem, setProblem] = useState<string | undefined>();
  useEffect(() => {
    setText(String(parameterOf(value) ?? ''));
    setProblem(undefined);
  }, [value]);

  const commit = (kind: Kind, raw: string) => {
    const p = raw.trim() === '' ? Number.NaN : Number(raw);
    const next = build(kind, p);
    try {
      validateAggregator(next);
      if (next.kind === 'topk' && cellCount !== undefined && next.k > cellCount) {
        throw new RangeError(`'k' must be an integer in [1, ${cellCount}]; got ${next.k}`);
      }
    } catch (err) {
      setProblem((err as Error).message);
      return;
    }
    setProblem(undefined);
    onChange(next);
  };

  const kind = value.kind;
  return (
    <fieldset className="t-aggregator">
      <legend>Region pooling</legend>
      <label htmlFor={`${id}-kind`}>Pool cells by</label>
      <select
        id={`${id}-kind`}
        value={kind}
        onChange={(e) => {
          const k = e.target.value as Kind;
          commit(k, k === 'max' ? '' : String(PARAMETER[k].initial));
        }}
      >
        {(Object.keys(KIND_LABELS) as Kind[]).map((k) => (
          <option key={k} value={k}>
            {KIND_LABELS[k]}
          </option>
        ))}
      </select>
      {kind !== 'max' && (
        <>
          <label htmlFor={`${id}-param`}>{PARAMETER[kind].label}</label>
          <input
            id={`${id}-param`}
            type="number"
            inputMode="decimal"
            step={PARAMETER[kind].step}
            min={kind === 'topk' ? 1 : undefined}
            max={kind === 'topk' ? cellCount : undefined}
            value={text}
            aria-invalid={problem !== undefined}
            aria-describedby={problem ? `${id}-problem` : undefined}
            onChange={(e) => setText(e.target.value)}
            onBlur={() => commit(kind, text)}
            onKeyDown={(e) => {
              if (e.key === 'Enter') commit(kind, text);
            }}
          />
        </>
      )}
      {problem && (
        <span id={`${id}-problem`} role="alert" className="t-field-problem">
          {problem}
        </span>
      )}
    </fieldset>
  );
}
