import { useEffect, useMemo, useState } from 'react';
import type { HitRule } from '../../core/types';
import type { AppState } from '../state';
import { boxesOfSentence, boxesOfStudy, proposalsFor, selectedStudy, summariseStudy } from '../state';
import type { OpenedModel } from '../inference/inference-client';
import type { ReportRow } from './ReportPanel';
import type { NavigatorStudy, StudyTally } from './StudyNavigator';
import { computeStudySimilarity, groundStudy, type SentenceAnalysis, type StudySimilarity } from './study-analysis';
import type { StudyEncoding } from './use-study-encoding';
import type { BatchResult } from './use-batch-scoring';
import { summariseRate } from '../../core/rate-summary';

export interface StudyViewModel {
  readonly similarity?: StudySimilarity;
  readonly analysis?: readonly SentenceAnalysis[];
  readonly selectedAnalysis?: SentenceAnalysis;
  readonly rows: readonly ReportRow[];
  readonly navigator: readonly NavigatorStudy[];
  readonly problem?: string;
}

function tallyFromBatch(result: BatchResult | undefined, hitRule: HitRule): Map<string, StudyTally> {
  const out = new Map<string, StudyTally>();
  if (!result) return out;
  const by = new Map<string, { hits: number; n: number; chance: number }>();
  for (const r of result.records) {
    const t = by.get(r.study) ?? { hits: 0, n: 0, chance: 0 };
    by.set(r.study, t);
    if (!r.scored) continue;
    t.n++;
    if (r.hits[hitRule]) t.hits++;
    t.chance += r.chance[hitRule];
  }
  for (const [study, t] of by) out.set(study, summariseRate(t.hits, t.n, t.chance));
  return out;
}

/**
 * Everything the study views show, from the store's records and the selected study's kept
 * embeddings: similarities once per encoding, pooling and grounding again whenever the
 * aggregator, top-k, hit rule or boxes change (never a new encoding).
 */
export function useStudyViewModel(state: AppState, encoding: StudyEncoding, model: OpenedModel | undefined, hitRule: HitRule, batch: BatchResult | undefined): StudyViewModel {
  const study = selectedStudy(state);
  const ready = encoding.status.kind === 'ready' && encoding.studyId === study?.id && encoding.modelHash === model?.hash;

  const similarity = useMemo(() => {
    if (!ready || !model || !study || !encoding.image || !encoding.cells || !encoding.sentences) return undefined;
    const m = model.manifest;
    try {
      return computeStudySimilarity({
        cellEmbeddings: encoding.cells,
        sentenceEmbeddings: encoding.sentences,
        nSentences: study.parsed.sentences.length,
        dim: m.embedding_dim,
        grid: model.grid,
        input: { width: m.image.input.width, height: m.image.input.height, resize: m.image.input.resize },
        imageSize: { width: encoding.image.width, height: encoding.image.height },
      });
    } catch (err) {
      return { error: (err as Error).message };
    }
  }, [ready, model, study, encoding.image, encoding.cells, encoding.sentences]);

  const { boxes } = state;
  const { aggregator, topK } = state.view;
  const analysis = useMemo(() => {
    if (!similarity || 'error' in similarity || !study) return undefined;
    try {
      return groundStudy({
        similarity,
        sentences: study.parsed.sentences,
        boxesOf: (i) => boxesOfSentence(state, study.id, i).map((b) => b.box),
        aggregator,
        hitRule,
        topK,
      });
    } catch (err) {
      return { error: (err as Error).message };
    }
    // The analysis depends on the boxes, not on the rest of the state.
  }, [similarity, study, boxes, aggregator, hitRule, topK]);

  const [live, setLive] = useState<ReadonlyMap<string, StudyTally>>(new Map());
  const analysed = analysis && !('error' in analysis) ? analysis : undefined;
  useEffect(() => {
    if (!analysed || !study) return;
    // Scored for grounding: not negated, with at least one box (the batch pipeline's rule).
    const scored = analysed.filter((a) => a.outcome === 'hit' || a.outcome === 'miss');
    const { rate } = summariseStudy(scored.map((a) => ({ index: a.sentence.index, grounding: a.grounding })), { rule: hitRule });
    setLive((m) => new Map(m).set(study.id, rate));
  }, [analysed, study, hitRule]);
  useEffect(() => setLive(new Map()), [model, hitRule]);
  const fromBatch = useMemo(() => tallyFromBatch(batch, hitRule), [batch, hitRule]);

  const proposalSentences = new Set(proposalsFor(state).map((p) => p.sentence.index));
  const rows: ReportRow[] = (study?.parsed.sentences ?? []).map((sentence, i) => ({
    sentence,
    score: analysed?.[i].score,
    outcome: analysed?.[i].outcome ?? 'not-encoded',
    boxCount: study ? boxesOfSentence(state, study.id, sentence.index).length : 0,
    hasProposal: proposalSentences.has(sentence.index),
  }));

  const navigator = useMemo(
    () =>
      state.studies.map((s) => ({
        id: s.id,
        sentenceCount: s.parsed.sentences.length,
        boxCount: boxesOfStudy(state, s.id).length,
        tally: live.get(s.id) ?? fromBatch.get(s.id),
      })),
    // Box counts change with the boxes only.
    [state.studies, boxes, live, fromBatch],
  );

  const problem = similarity && 'error' in similarity ? similarity.error : analysis && 'error' in analysis ? analysis.error : undefined;
  return {
    similarity: similarity && !('error' in similarity) ? similarity : undefined,
    analysis: analysed,
    selectedAnalysis: analysed?.find((a) => a.sentence.index === state.selection.sentenceIndex),
    rows,
    navigator,
    problem,
  };
}
