import type { Aggregator, GridShape, ImageRect, Matrix, ResizePolicy, ResizeTransform, Size } from '../core/types';
import { computeSimilarityWithNormalisedCells, l2Normalise } from '../core/similarity-matrix';
import { computeResizeTransform } from '../core/resize-transform';
import { gridCellRects } from '../core/grid-geometry';
import { prepareStudyGeometry, type StudyGeometry } from '../core/hit-rules';
import { poolRegions } from '../core/pool-regions';
import { groundSentence, type SentenceGrounding } from '../core/ground-sentence';

/** One study's encoded similarities and grid geometry: kept while the aggregator or the boxes change. */
export interface StudySimilarity {
  readonly grid: GridShape;
  readonly transform: ResizeTransform;
  readonly cells: readonly ImageRect[];
  /** Owned by one caller at a time (its scratch arrays are reused by groundSentence). */
  readonly geometry: StudyGeometry;
  /** L2-normalised cell embeddings, nCells x dim. */
  readonly normalisedCells: Float32Array;
  /** L2-normalised sentence embeddings, nSentences x dim. */
  readonly normalisedSentences: Float32Array;
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
 * The similarity matrix and grid geometry of one study: the resize transform from the image to the
 * encoder input, each cell's image rectangle, and the cosine of normalised sentence and cell
 * embeddings. The one implementation used by the CLI pipeline and the browser.
 */
export function computeStudySimilarity(a: StudySimilarityArgs): StudySimilarity {
  const nCells = a.grid.h * a.grid.w;
  const transform = computeResizeTransform(a.imageSize, { width: a.input.width, height: a.input.height }, a.input.resize);
  const cells = gridCellRects(transform, a.grid);
  const geometry = prepareStudyGeometry(transform, a.grid, cells);
  const normalisedCells = l2Normalise(a.cellEmbeddings, nCells, a.dim);
  const normalisedSentences = l2Normalise(a.sentenceEmbeddings, a.nSentences, a.dim);
  const sim = computeSimilarityWithNormalisedCells(normalisedSentences, a.nSentences, normalisedCells, nCells, a.dim);
  return { grid: a.grid, transform, cells, geometry, normalisedCells, normalisedSentences, dim: a.dim, sim };
}

/** One sentence's row of the similarity matrix, its pooled score and its grounding. */
export interface SentenceScore {
  readonly values: Float32Array;
  readonly score: number;
  readonly grounding: SentenceGrounding;
}

/**
 * Pools and grounds every sentence (rows of the similarity matrix, in order) against its boxes:
 * re-pooling after an aggregator change needs no new encoding.
 */
export function groundStudySentences(
  similarity: StudySimilarity,
  boxesOfRow: (row: number) => readonly ImageRect[],
  { aggregator = { kind: 'max' } as Aggregator, tolerancePx = 0, topK = 5 } = {},
): SentenceScore[] {
  const { sim, grid, cells, transform, geometry } = similarity;
  const nCells = sim.cols;
  const out: SentenceScore[] = [];
  for (let row = 0; row < sim.rows; row++) {
    const values = sim.data.subarray(row * nCells, (row + 1) * nCells);
    const grounding = groundSentence({ values, grid, cells, transform, imageSize: transform.source, boxes: boxesOfRow(row), tolerancePx, topK: Math.min(topK, nCells), geometry });
    out.push({ values, score: poolRegions(values, aggregator), grounding });
  }
  return out;
}
