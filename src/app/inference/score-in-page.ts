import type { Aggregator, HitRule } from '../../core/types';
import { scoreSet, type SetRun } from '../../batch/score-set';
import { buildSummary } from '../../batch/summarise';
import type { OpenedSet } from '../../batch/study-inputs';
import type { ScoreSummary } from '../../batch/types';
import type { InferenceClient, OpenedModel } from './inference-client';
import { createPageStudyEncoder } from './page-study-encoder';

export interface PageScoreOptions {
  readonly aggregator?: Aggregator;
  readonly hitRule?: HitRule;
  readonly topK?: number;
  readonly seed?: number;
  readonly dumpSimilarity?: boolean;
  readonly signal?: AbortSignal;
  readonly onProgress?: (p: { readonly done: number; readonly total: number; readonly study: string }) => void;
}

/**
 * Scores an opened set with one or more opened models in the page through src/batch scoreSet and
 * buildSummary, with the defaults of the CLI's `score` (max, centre, top-5, seed 0), reading and
 * filling the embedding cache. Cancelling throws the signal's reason after the study in progress.
 */
export async function scoreInPage(
  client: InferenceClient,
  set: OpenedSet,
  models: readonly OpenedModel[],
  { aggregator = { kind: 'max' }, hitRule = 'centre', topK = 5, seed = 0, dumpSimilarity = false, signal, onProgress }: PageScoreOptions = {},
): Promise<{ run: SetRun; summary: ScoreSummary }> {
  const ids = new Set<string>();
  const encoders = models.map((m, i) => {
    // Two models with one id stay apart in tables, as the CLI keeps them apart by folder name.
    const id = ids.has(m.manifest.id) ? `${m.manifest.id}@${i + 1}` : m.manifest.id;
    ids.add(id);
    return createPageStudyEncoder(client, m, { id, signal });
  });
  const run = await scoreSet(set, encoders, { aggregator, hitRule, topK, seed, dumpSimilarity, signal, store: client.imageStore, onProgress });
  const summary = buildSummary(run.runs, {
    aggregator,
    hitRule,
    seed,
    setName: set.manifest.name,
    syntheticSet: set.manifest.synthetic,
    nStudies: run.nStudies,
    skipped: [...run.setSkipped, ...run.failures.map((f) => ({ study: f.study, reason: f.reason }))],
  });
  return { run, summary };
}
