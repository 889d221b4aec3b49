import type { Aggregator, Matrix } from './types';
import { poolRegions } from './pool-regions';
import { computeSimilarityWithNormalisedCells } from './similarity-matrix';

/** One study's embeddings, each row already L2-normalised. */
export interface StudyEmbeddings {
  readonly cells: Float32Array; // nCells * dim
  readonly nCells: number;
  readonly sentences: Float32Array; // nSentences * dim
  readonly nSentences: number;
}

function dotRows(a: Float32Array, ai: number, b: Float32Array, bi: number, dim: number): number {
  let s = 0;
  const ao = ai * dim;
  const bo = bi * dim;
  for (let k = 0; k < dim; k++) s += a[ao + k] * b[bo + k];
  return s;
}

/**
 * Local study score for every image x report pair: for image i and report j, each sentence of j is
 * pooled over the cells of i with the aggregator, and the pooled values are averaged over the
 * sentences (max-over-regions / mean-over-sentences, as in local contrastive alignment).
 * Rows are images, columns reports; the true pairs lie on the diagonal. A report with no sentences
 * scores NaN against every image. Shapes: studies.length x studies.length.
 */
export function localStudyScoreMatrix(
  studies: readonly StudyEmbeddings[],
  dim: number,
  aggregator: Aggregator = { kind: 'max' },
): Matrix {
  const n = studies.length;
  const out = new Float32Array(n * n);
  // Every report's sentences stacked once, so each image needs one blocked similarity pass
  // (the kernel of computeSimilarity) instead of a dot product per sentence and cell.
  const first = new Int32Array(n + 1);
  for (let j = 0; j < n; j++) first[j + 1] = first[j] + studies[j].nSentences;
  const total = first[n];
  const stacked = new Float32Array(total * dim);
  for (let j = 0; j < n; j++) stacked.set(studies[j].sentences.subarray(0, studies[j].nSentences * dim), first[j] * dim);
  for (let i = 0; i < n; i++) {
    const img = studies[i];
    const sim = computeSimilarityWithNormalisedCells(stacked, total, img.cells.subarray(0, img.nCells * dim), img.nCells, dim).data;
    for (let j = 0; j < n; j++) {
      const count = first[j + 1] - first[j];
      if (count === 0) {
        out[i * n + j] = Number.NaN;
        continue;
      }
      let sum = 0;
      for (let s = first[j]; s < first[j + 1]; s++) sum += poolRegions(sim.subarray(s * img.nCells, (s + 1) * img.nCells), aggregator);
      out[i * n + j] = sum / count;
    }
  }
  return { data: out, rows: n, cols: n };
}

function meanDirection(rows: Float32Array, count: number, dim: number): Float32Array {
  const m = new Float32Array(dim);
  for (let r = 0; r < count; r++) for (let k = 0; k < dim; k++) m[k] += rows[r * dim + k];
  let norm = 0;
  for (let k = 0; k < dim; k++) norm += m[k] * m[k];
  norm = Math.sqrt(norm);
  if (norm > 0) for (let k = 0; k < dim; k++) m[k] /= norm;
  return m;
}

/**
 * Global study score for every image x report pair: cosine of the mean-pooled (normalised) cell
 * embeddings and the mean-pooled (normalised) sentence embeddings. A report with no sentences
 * scores NaN. Shapes: studies.length x studies.length, images as rows.
 */
export function globalStudyScoreMatrix(studies: readonly StudyEmbeddings[], dim: number): Matrix {
  const n = studies.length;
  const imgs = studies.map((s) => meanDirection(s.cells, s.nCells, dim));
  const reps = studies.map((s) => (s.nSentences > 0 ? meanDirection(s.sentences, s.nSentences, dim) : undefined));
  const out = new Float32Array(n * n);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      const r = reps[j];
      out[i * n + j] = r === undefined ? Number.NaN : dotRows(imgs[i], 0, r, 0, dim);
    }
  }
  return { data: out, rows: n, cols: n };
}
