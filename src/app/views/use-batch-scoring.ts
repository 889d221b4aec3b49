import { useCallback, useEffect, useMemo, useRef, useState } from 'react';
import type { Aggregator, HitRule } from '../../core/types';
import type { OpenedSet } from '../../batch/study-inputs';
import type { ScoreSummary, SentenceRecord } from '../../batch/types';
import type { InferenceClient, OpenedModel } from '../inference/inference-client';
import { scoreInPage } from '../inference/score-in-page';
import type { DemoSources } from '../sources/demo-sources';

export interface BatchResult {
  readonly summary: ScoreSummary;
  readonly records: readonly SentenceRecord[];
  /** The models of the run in order: the id the records and tables use, and the model's content hash. */
  readonly models: readonly { readonly id: string; readonly hash: string }[];
}

export type BatchStatus =
  | { readonly kind: 'idle' }
  | { readonly kind: 'opening'; readonly models: readonly string[] }
  | { readonly kind: 'running'; readonly done: number; readonly total: number; readonly study?: string }
  | { readonly kind: 'cancelled'; readonly done: number; readonly total: number }
  | { readonly kind: 'failed'; readonly message: string }
  | { readonly kind: 'finished'; readonly failures: readonly { readonly study: string; readonly reason: string }[] };

/** A model the researcher may tick for a run: the open one, or a bundled demo model opened when a run needs it. */
export interface BatchModelChoice {
  readonly key: string;
  readonly label: string;
  open(): Promise<OpenedModel>;
}

export interface BatchInputs {
  readonly client: InferenceClient;
  readonly set: OpenedSet;
  /** In table order; two choices that open the same model (same hash) are scored once. */
  readonly models: readonly BatchModelChoice[];
  readonly aggregator: Aggregator;
  readonly hitRule: HitRule;
  readonly topK: number;
}

/** The key of the session's open model among the choices. */
export const OPEN_MODEL_KEY = 'open';

/**
 * Progress and cancel around the inference helper's scoreInPage (src/batch scoreSet and
 * buildSummary, the CLI's pipeline): opens the chosen models, then scores; with two or more
 * models the summary holds their paired comparisons, as `tessera score --model A --model B`.
 * A cancel stops after the study in progress.
 */
export function useBatchScoring(onResult: (r: BatchResult) => void) {
  const [status, setStatusState] = useState<BatchStatus>({ kind: 'idle' });
  const controller = useRef<AbortController | undefined>(undefined);
  useEffect(() => () => controller.current?.abort(), []);

  const start = useCallback(
    async ({ client, set, models, aggregator, hitRule, topK }: BatchInputs) => {
      controller.current?.abort();
      const ac = new AbortController();
      controller.current = ac;
      const total = set.studies.length;
      let done = 0;
      // A run replaced by a newer one reports nothing more.
      const setStatus = (s: BatchStatus) => {
        if (controller.current === ac) setStatusState(s);
      };
      try {
        if (models.length === 0) throw new RangeError('Tick at least one model to score.');
        setStatus({ kind: 'opening', models: models.map((m) => m.label) });
        const opened: OpenedModel[] = [];
        for (const m of await Promise.all(models.map((c) => c.open()))) {
          if (!opened.some((o) => o.hash === m.hash)) opened.push(m);
        }
        ac.signal.throwIfAborted();
        setStatus({ kind: 'running', done: 0, total });
        const { run, summary } = await scoreInPage(client, set, opened, {
          aggregator,
          hitRule,
          topK,
          signal: ac.signal,
          onProgress: (p) => {
            done = p.done;
            setStatus({ kind: 'running', done: p.done, total: p.total, study: p.study });
          },
        });
        // scoreSet keeps the encoders' order in its runs.
        onResult({ summary, records: run.runs.flatMap((r) => r.records), models: run.runs.map((r, i) => ({ id: r.model, hash: opened[i].hash })) });
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

export interface ModelChoicesArgs {
  readonly client: InferenceClient;
  readonly demo: Promise<DemoSources>;
  /** The session's open model and the label of its folder. */
  readonly model: OpenedModel | undefined;
  readonly modelLabel: string | undefined;
}

/**
 * The models a run may score: the session's open model, then every other model the bundled demo's
 * catalogue lists (a catalogue name equal to the open model's label is taken to be that model).
 * A demo model is opened in the inference worker the first time a run needs it and kept for later
 * runs; a failed open is tried again on the next run. The open model is ticked at first.
 */
export function useBatchModelChoices({ client, demo, model, modelLabel }: ModelChoicesArgs) {
  const [catalogue, setCatalogue] = useState<{ names: readonly string[]; sources: DemoSources } | undefined>();
  useEffect(() => {
    let live = true;
    // A demo that cannot be opened is already reported by the session; it only offers no extra models here.
    demo.then(
      (d) => live && setCatalogue({ names: d.catalogue.models, sources: d }),
      () => undefined,
    );
    return () => {
      live = false;
    };
  }, [demo]);

  const opening = useRef(new Map<string, Promise<OpenedModel>>());
  const choices = useMemo<BatchModelChoice[]>(() => {
    const out: BatchModelChoice[] = [];
    if (model) out.push({ key: OPEN_MODEL_KEY, label: `${modelLabel ?? model.manifest.id} (open)`, open: async () => model });
    for (const name of catalogue?.names ?? []) {
      if (model && name === modelLabel) continue;
      const sources = catalogue?.sources;
      if (!sources) continue;
      out.push({
        key: `demo:${name}`,
        label: name,
        open: () => {
          let p = opening.current.get(name);
          if (!p) {
            p = client.openModel(sources.modelSource(name)).catch((err: unknown) => {
              opening.current.delete(name);
              throw new Error(`the demo model ${name} could not be opened: ${(err as Error).message}`, { cause: err });
            });
            opening.current.set(name, p);
          }
          return p;
        },
      });
    }
    return out;
  }, [client, catalogue, model, modelLabel]);

  const [ticked, setTicked] = useState<ReadonlySet<string>>(() => new Set([OPEN_MODEL_KEY]));
  const toggle = useCallback((key: string) => {
    setTicked((t) => {
      const next = new Set(t);
      if (!next.delete(key)) next.add(key);
      return next;
    });
  }, []);
  const chosen = useMemo(() => choices.filter((c) => ticked.has(c.key)), [choices, ticked]);
  return { choices, ticked, toggle, chosen };
}
