import { quantileSorted } from './sample-quantile';
import type { Matrix } from './types';

export type RetrievalDirection = 'image-to-report' | 'report-to-image';

/**
 * 1-based rank of the true item for each query of a square score matrix: scores.data[i * n + j] scores
 * image i against report j, and image i belongs with report i (the diagonal).
 * 'image-to-report' ranks row i's reports for image i; 'report-to-image' ranks column j's images for report j.
 * Ties are broken pessimistically: rank = 1 + the number of other candidates scoring >= the true pair, so
 * a constant matrix ranks every true item last, not first.
 * A 0 x 0 matrix gives an empty array. Throws RangeError for a non-square matrix, a data length that is not
 * rows * cols, or a NaN score (NaN has no order). Method: recall@K retrieval ranking (common practice).
 */
export function retrievalRanks(scores: Matrix, direction: RetrievalDirection): Int32Array {
  const n = checkSquare(scores);
  if (direction !== 'image-to-report' && direction !== 'report-to-image') {
    throw new RangeError(`'direction' must be 'image-to-report' or 'report-to-image'; got ${String(direction)}`);
  }
  const d = scores.data;
  const ranks = new Int32Array(n);
  const byRow = direction === 'image-to-report';
  for (let q = 0; q < n; q++) {
    const truth = d[q * n + q];
    let above = 0;
    for (let other = 0; other < n; other++) {
      if (other === q) continue;
      if ((byRow ? d[q * n + other] : d[other * n + q]) >= truth) above++;
    }
    ranks[q] = 1 + above;
  }
  return ranks;
}

/**
 * Recall at K: the share of queries whose true item ranks within the top k (rank <= k), in [0, 1].
 * Returns undefined for no ranks. Throws RangeError for k not an integer >= 1.
 */
export function recallAtK(ranks: ArrayLike<number>, k: number): number | undefined {
  if (!Number.isSafeInteger(k) || k < 1) throw new RangeError(`'k' must be an integer >= 1; got ${k}`);
  if (ranks.length === 0) return undefined;
  let hits = 0;
  for (let i = 0; i < ranks.length; i++) if (ranks[i] <= k) hits++;
  return hits / ranks.length;
}

/**
 * Median of the ranks (the mean of the middle two for an even count, so it may end in .5).
 * Returns undefined for no ranks. Throws RangeError for a NaN rank.
 */
export function medianRank(ranks: ArrayLike<number>): number | undefined {
  const sorted = Float64Array.from(ranks);
  if (sorted.some(Number.isNaN)) throw new RangeError(`'ranks' must not contain NaN`);
  sorted.sort();
  return quantileSorted(sorted, 0.5);
}

/** Retrieval in both directions, keyed as in summary.json. */
export interface RetrievalSummary {
  readonly image_to_report_r1: number | undefined;
  readonly image_to_report_r5: number | undefined;
  readonly image_to_report_r10: number | undefined;
  readonly report_to_image_r1: number | undefined;
  readonly report_to_image_r5: number | undefined;
  readonly report_to_image_r10: number | undefined;
  readonly image_to_report_median_rank: number | undefined;
  readonly report_to_image_median_rank: number | undefined;
}

/**
 * Recall at 1, 5 and 10 and the median rank in both directions for a square images x reports score matrix
 * with true pairs on the diagonal (pessimistic ties, as retrievalRanks). Every field is undefined for 0 x 0.
 * Recall at K counts K against the number of candidates as it is: with fewer than K studies it is 1.
 */
export function retrievalSummary(scores: Matrix): RetrievalSummary {
  const i2r = retrievalRanks(scores, 'image-to-report');
  const r2i = retrievalRanks(scores, 'report-to-image');
  return {
    image_to_report_r1: recallAtK(i2r, 1),
    image_to_report_r5: recallAtK(i2r, 5),
    image_to_report_r10: recallAtK(i2r, 10),
    report_to_image_r1: recallAtK(r2i, 1),
    report_to_image_r5: recallAtK(r2i, 5),
    report_to_image_r10: recallAtK(r2i, 10),
    image_to_report_median_rank: medianRank(i2r),
    report_to_image_median_rank: medianRank(r2i),
  };
}

function checkSquare(scores: Matrix): number {
  const { rows, cols, data } = scores;
  if (rows !== cols) throw new RangeError(`'scores' must be square (images x reports); got ${rows} x ${cols}`);
  if (data.length !== rows * cols) {
    throw new RangeError(`'scores.data' must hold rows * cols = ${rows * cols} values; got ${data.length}`);
  }
  for (let i = 0; i < data.length; i++) {
    if (Number.isNaN(data[i])) {
      throw new RangeError(`'scores' must not contain NaN; got NaN at row ${Math.floor(i / cols)}, col ${i % cols}`);
    }
  }
  return rows;
}
