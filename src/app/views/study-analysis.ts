import type { Aggregator, GridShape, HitRule, ImageRect, Matrix, ResizePolicy, ResizeTransform, Size } from '../../core/types';
import { computeSimilarityWithNormalisedCells, l2Normalise } from '../../core/similarity-matrix';
import { computeResizeTransform } from '../../core/resize-transform';
import { gridCellRects } from '../../core/grid-geometry';
import { prepareStudyGeometry, type StudyGeometry } from '../../core/hit-rules';
import { poolRegions } from '../../core/pool-regions';
import { groundSentence, type SentenceGrounding } from '../../core/ground-sentence';
import type { ParsedSentence } from '../../report/types';
import type { SentenceOutcome } from './ReportPanel';

/** One study's encoded similarities: kept while the aggregator or the boxes change. */
export interface StudySimilarity {
  readonly grid: GridShape;
  readonly transform: ResizeTransform;
  readonly cells: readonly ImageRect[];
  readonly geometry: StudyGeometry;
  /** L2-normalised cell embeddings, nCells x dim. */
  readonly normalisedCells: Float32Array;
  readonly dim: number;
  /** Sentences x cells cosine similarities, rows in report order. */
  readonly sim: Matrix;
}

export interface StudySimilarityArgs {
  readonly cellEmbeddings: Float32Array; // nCells * dim, as encoded
  readonly sentenceEmbeddings: Float32Array; // nSentences * dim
  readonly nSentences: number;
  readonly dim: number;
  readonly grid: GridShape;
  readonly input: { readonly width: number; readonly height: number; readonly resize: ResizePolicy };
  readonly imageSize: Size;
}

/**
 * The similarity matrix and grid geometry of one study, as src/batch scoreStudy computes them
 * (normalise cells and sentences, then cosine), so the page shows the CLI's numbers.
 */
export function computeStudySimilarity(a: StudySimilarityArgs): StudySimilarity {
  const nCells = a.grid.h * a.grid.w;
  const transform = computeResizeTransform(a.imageSize, { width: a.input.width, height: a.input.height }, a.input.resize);
  const cells = gridCellRects(transform, a.grid);
  const geometry = prepareStudyGeometry(transform, a.grid, cells);
  const normalisedCells = l2Normalise(a.cellEmbeddings, nCells, a.dim);
  const sentences = l2Normalise(a.sentenceEmbeddings, a.nSentences, a.dim);
  const sim = computeSimilarityWithNormalisedCells(sentences, a.nSentences, normalisedCells, nCells, a.dim);
  return { grid: a.grid, transform, cells, geometry, normalisedCells, dim: a.dim, sim };
}

/** One sentence, pooled and grounded. */
export interface SentenceAnalysis {
  readonly sentence: ParsedSentence;
  readonly values: Float32Array;
  readonly score: number;
  readonly grounding: SentenceGrounding;
  readonly boxes: readonly ImageRect[];
  readonly outcome: SentenceOutcome;
}

export interface StudyGroundingArgs {
  readonly similarity: StudySimilarity;
  readonly sentences: readonly ParsedSentence[];
  /** Reference boxes of each sentence, by sentence index. */
  readonly boxesOf: (sentenceIndex: number) => readonly ImageRect[];
  readonly aggregator: Aggregator;
  readonly hitRule: HitRule;
  readonly topK: number;
}

/** Re-pools and re-grounds every sentence from kept similarities (src/core poolRegions, groundSentence). */
export function groundStudy(a: StudyGroundingArgs): SentenceAnalysis[] {
  const { sim, grid, cells, transform, geometry } = a.similarity;
  const nCells = sim.cols;
  return a.sentences.map((sentence, row) => {
    const values = sim.data.subarray(row * nCells, (row + 1) * nCells);
    const boxes = a.boxesOf(sentence.index);
    const grounding = groundSentence({
      values,
      grid,
      cells,
      transform,
      imageSize: transform.source,
      boxes,
      topK: Math.min(a.topK, nCells),
      geometry,
    });
    const outcome: SentenceOutcome = sentence.negated ? 'negated' : boxes.length === 0 ? 'no-boxes' : grounding.hits[a.hitRule] ? 'hit' : 'miss';
    return { sentence, values, score: poolRegions(values, a.aggregator), grounding, boxes, outcome };
  });
}
