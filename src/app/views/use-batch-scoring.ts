import { useCallback, useEffect, useRef, useState } from 'react';
import type { Aggregator, HitRule } from '../../core/types';
import type { OpenedSet } from '../../batch/study-inputs';
import type { ScoreSummary, SentenceRecord } from '../../batch/types';
import type { InferenceClient, OpenedModel } from '../inference/inference-client';
import { scoreInPage } from '../inference/score-in-page';

export interface BatchResult {
  readonly summary: ScoreSummary;
  readonly records: readonly SentenceRecord[];
}

export type BatchStatus =
  | { readonly kind: 'idle' }
  | { readonly kind: 'running'; readonly done: number; readonly total: number; readonly study?: string }
  | { readonly kind: 'cancelled'; readonly done: number; readonly total: number }
  | { readonly kind: 'failed'; readonly message: string }
  | { readonly kind: 'finished'; readonly failures: readonly { readonly study: string; readonly reason: string }[] };

export interface BatchInputs {
  readonly client: InferenceClient;
  readonly set: OpenedSet;
  readonly models: readonly OpenedModel[];
  readonly aggregator: Aggregator;
  readonly hitRule: HitRule;
  readonly topK: number;
}

/**
 * Progress and cancel around the inference helper's scoreInPage (src/batch scoreSet and
 * buildSummary, the CLI's pipeline); a cancel stops after the study in progress.
 */
export function useBatchScoring(onResult: (r: BatchResult) => void) {
  const [status, setStatus] = useState<BatchStatus>({ kind: 'idle' });
  const controller = useRef<AbortController | undefined>(undefined);
  useEffect(() => () => controller.current?.abort(), []);

  const start = useCallback(
    async ({ client, set, models, aggregator, hitRule, topK }: BatchInputs) => {
      controller.current?.abort();
      const ac = new AbortController();
      controller.current = ac;
      const total = set.studies.length;
      let done = 0;
      setStatus({ kind: 'running', done: 0, total });
      try {
        const { run, summary } = await scoreInPage(client, set, models, {
          aggregator,
          hitRule,
          topK,
          signal: ac.signal,
          onProgress: (p) => {
            done = p.done;
            setStatus({ kind: 'running', done: p.done, total: p.total, study: p.study });
          },
        });
        onResult({ summary, records: run.runs.flatMap((r) => r.records) });
        setStatus({ kind: 'finished', failures: run.failures });
      } catch (err) {
        if (ac.signal.aborted) setStatus({ kind: 'cancelled', done, total });
        else setStatus({ kind: 'failed', message: (err as Error).message });
      }
    },
    [onResult],
  );

  const cancel = useCallback(() => controller.current?.abort(new DOMException('Scoring was cancelled.', 'AbortError')), []);
  return { status, start, cancel };
}
