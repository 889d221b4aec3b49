import type { Aggregator, GridShape, HitRule, ImageRect, ResizeTransform } from '../core/types';
import type { DecodedImage } from '../dataset/types';
import type { SentenceRecord, SimilarityDump } from './types';
import type { StudyEmbeddings } from '../core/study-score-matrix';
import { createRng } from '../core/seeded-random';
import { findingOfSentence } from './sentence-finding';
import { computeStudySimilarity, groundStudySentences } from './study-similarity';
import { loadStudy, viewBoxes, type LoadedStudy, type OpenedSet } from './study-inputs';

/** What the pipeline needs of a model: the shape of src/model's DualEncoder. */
export interface StudyEncoder {
  readonly id: string;
  readonly hash: string;
  readonly grid: GridShape;
  readonly embeddingDim: number;
  readonly input: { readonly width: number; readonly height: number; readonly resize: ResizeTransform['policy'] };
  encodeImage(image: DecodedImage): Promise<Float32Array>; // cells * D, row-major cells
  encodeSentences(texts: readonly string[]): Promise<Float32Array>; // S * D
}

/** An image-embedding store keyed by model hash and image content (disk in the CLI, IndexedDB in the browser). */
export interface ImageEmbeddingStore {
  get(modelHash: string, imageBytes: Uint8Array): Promise<Float32Array | undefined>;
  set(modelHash: string, imageBytes: Uint8Array, embeddings: Float32Array): Promise<void>;
}

export interface ScoreOptions {
  readonly aggregator?: Aggregator;
  readonly hitRule?: HitRule;
  readonly tolerancePx?: number;
  readonly topK?: number;
  readonly dumpSimilarity?: boolean;
  /** Studies used for the retrieval metrics: all when the set is no larger, else a seeded sample. */
  readonly retrievalPool?: number;
  readonly seed?: number;
  /** 1-based shard index and shard count: this run scores studies with position % count === index - 1. */
  readonly shard?: { readonly index: number; readonly count: number };
  readonly signal?: AbortSignal;
  readonly store?: ImageEmbeddingStore;
  readonly onProgress?: (p: { readonly model: string; readonly done: number; readonly total: number; readonly study: string }) => void;
}

/** One model's raw results over the studies this run scored. */
export interface ModelRun {
  readonly model: string;
  readonly records: SentenceRecord[];
  /** Retrieval-pool studies, by their position in the set. */
  readonly pool: { readonly position: number; readonly study: string; readonly embeddings: StudyEmbeddings }[];
  readonly dumps: SimilarityDump[];
  readonly dim: number;
}

export interface SetRun {
  readonly runs: ModelRun[];
  /** Studies left out when the set was opened. */
  readonly setSkipped: readonly { readonly study: string; readonly reason: string }[];
  /** Studies that failed during this run, with their positions. */
  readonly failures: { readonly study: string; readonly reason: string; readonly position: number }[];
  /** Positions (in manifest order of scorable studies) that this run covered. */
  readonly positions: number[];
  /** Studies scored by every model, with their positions. */
  readonly scored: { readonly study: string; readonly position: number }[];
  readonly nStudies: number;
  /** Image encodings this run computed, and those it read from the store. */
  readonly encodings: { computed: number; fromStore: number };
}

/** The retrieval pool: all positions when n <= size, else a seeded sample of `size`, ascending. */
export function retrievalPoolPositions(n: number, size: number, seed: number): Set<number> {
  if (n <= size) return new Set(Array.from({ length: n }, (_, i) => i));
  const rng = createRng(seed ^ 0x5eed);
  const idx = Array.from({ length: n }, (_, i) => i);
  for (let i = n - 1; i > 0; i--) {
    const j = rng.int(i + 1);
    [idx[i], idx[j]] = [idx[j], idx[i]];
  }
  return new Set(idx.slice(0, size));
}

const round6 = (v: number): number => Math.round(v * 1e6) / 1e6;
const rectTuple = (r: ImageRect): [number, number, number, number] => [round6(r.x), round6(r.y), round6(r.w), round6(r.h)];

/** Scores one loaded study with one model: one record per report sentence. */
export async function scoreStudy(
  encoder: StudyEncoder,
  loaded: LoadedStudy,
  embeddings: Float32Array,
  { aggregator = { kind: 'max' } as Aggregator, tolerancePx = 0, topK = 5, dumpSimilarity = false } = {},
): Promise<{ records: SentenceRecord[]; dumps: SimilarityDump[]; studyEmbeddings: StudyEmbeddings }> {
  const { grid, embeddingDim: dim } = encoder;
  const nCells = grid.h * grid.w;
  if (embeddings.length !== nCells * dim) {
    throw new RangeError(`image embeddings of model '${encoder.id}' for study '${loaded.study.id}' have ${embeddings.length} values; expected ${nCells} cells x ${dim}`);
  }
  const sentences = loaded.report.sentences;
  const similarity = computeStudySimilarity({
    cellEmbeddings: embeddings,
    sentenceEmbeddings: await encoder.encodeSentences(sentences.map((x) => x.text)),
    nSentences: sentences.length,
    dim,
    grid,
    input: encoder.input,
    imageSize: { width: loaded.image.width, height: loaded.image.height },
  });
  const { cells, normalisedCells: cellsNorm, normalisedSentences: sentNorm } = similarity;
  const boxViews = sentences.map((x) => viewBoxes(loaded.boxesBySentence.get(x.index)));
  const scores = groundStudySentences(similarity, (row) => boxViews[row].rects, { aggregator, tolerancePx, topK });
  const records: SentenceRecord[] = [];
  const dumps: SimilarityDump[] = [];
  const retrievalRows: number[] = [];
  for (let s = 0; s < sentences.length; s++) {
    const sentence = sentences[s];
    const boxes = boxViews[s];
    const { values, score, grounding: g } = scores[s];
    const scored = boxes.rects.length > 0 && !sentence.negated;
    if (!sentence.negated) retrievalRows.push(s);
    records.push({
      model: encoder.id,
      study: loaded.study.id,
      sentenceIndex: sentence.index,
      text: sentence.text,
      negated: sentence.negated,
      uncertain: sentence.uncertain,
      finding: findingOfSentence(sentence, loaded.study, boxes.zones),
      zones: boxes.zones,
      boxes: boxes.rects,
      scored,
      score,
      bestCell: { row: g.bestCell.row, col: g.bestCell.col },
      bestPoint: g.bestPoint,
      hits: g.hits,
      chance: g.chance,
      topKHit: g.topKHit,
      massInBoxes: g.massInBoxes,
      cnr: g.cnr,
      lateralitySwap: g.lateralitySwap,
    });
    if (dumpSimilarity) {
      dumps.push({
        model: encoder.id,
        study: loaded.study.id,
        sentence: sentence.index,
        negated: sentence.negated,
        grid: { h: grid.h, w: grid.w },
        values: Array.from(values, round6),
        cells: cells.map(rectTuple),
        boxes: boxes.rects.map(rectTuple),
      });
    }
  }
  // Retrieval describes a report by its non-negated sentences; a report of negations only keeps them all.
  const rows = retrievalRows.length > 0 ? retrievalRows : sentences.map((_, i) => i);
  const pooledSentences = new Float32Array(rows.length * dim);
  rows.forEach((r, i) => pooledSentences.set(sentNorm.subarray(r * dim, (r + 1) * dim), i * dim));
  return { records, dumps, studyEmbeddings: { cells: cellsNorm, nCells, sentences: pooledSentences, nSentences: rows.length } };
}

/**
 * Runs every model over the set (or one shard of it): decode, encode (through the store when given),
 * score each sentence. A study that fails to load or encode is skipped with its reason; the run goes on.
 * Cancelling through the signal throws the signal's reason after the study in progress.
 */
export async function scoreSet(set: OpenedSet, encoders: readonly StudyEncoder[], options: ScoreOptions = {}): Promise<SetRun> {
  const { aggregator = { kind: 'max' }, tolerancePx = 0, topK = 5, dumpSimilarity = false, retrievalPool = 256, seed = 0, shard, signal, store, onProgress } = options;
  const n = set.studies.length;
  const poolSet = retrievalPoolPositions(n, retrievalPool, seed);
  const positions = Array.from({ length: n }, (_, i) => i).filter((i) => !shard || i % shard.count === shard.index - 1);
  const runs: ModelRun[] = encoders.map((e) => ({ model: e.id, records: [], pool: [], dumps: [], dim: e.embeddingDim }));
  const failures: { study: string; reason: string; position: number }[] = [];
  const scored: { study: string; position: number }[] = [];
  const encodings = { computed: 0, fromStore: 0 };
  let done = 0;
  for (const position of positions) {
    signal?.throwIfAborted();
    const study = set.studies[position];
    let loaded: LoadedStudy;
    try {
      loaded = await loadStudy(set, study);
    } catch (err) {
      failures.push({ study: study.id, reason: (err as Error).message, position });
      continue;
    }
    const perModel: Awaited<ReturnType<typeof scoreStudy>>[] = [];
    try {
      for (const encoder of encoders) {
        let embeddings = store ? await store.get(encoder.hash, loaded.bytes) : undefined;
        if (embeddings) encodings.fromStore++;
        else {
          embeddings = await encoder.encodeImage(loaded.image);
          encodings.computed++;
          if (store) await store.set(encoder.hash, loaded.bytes, embeddings);
        }
        perModel.push(await scoreStudy(encoder, loaded, embeddings, { aggregator, tolerancePx, topK, dumpSimilarity }));
      }
    } catch (err) {
      // One study's failure must not leave a model with records the others lack: pairing needs all.
      failures.push({ study: study.id, reason: (err as Error).message, position });
      continue;
    }
    perModel.forEach((r, m) => {
      runs[m].records.push(...r.records);
      runs[m].dumps.push(...r.dumps);
      if (poolSet.has(position)) runs[m].pool.push({ position, study: study.id, embeddings: r.studyEmbeddings });
    });
    scored.push({ study: study.id, position });
    done++;
    onProgress?.({ model: encoders.map((e) => e.id).join(', '), done, total: positions.length, study: study.id });
  }
  return { runs, setSkipped: set.skipped, failures, positions, scored, nStudies: n, encodings };
}
