import { describe, expect, it } from 'vitest';
import { medianRank, recallAtK, retrievalRanks, retrievalSummary } from './retrieval-metrics';
import { createRng } from './seeded-random';
import type { Matrix } from './types';

const matrix = (rows: number[][]): Matrix => ({
  data: Float32Array.from(rows.flat()),
  rows: rows.length,
  cols: rows.length === 0 ? 0 : rows[0].length,
});

/** Brute-force rank by sorting the candidates, true item placed after every tie. */
function sortedRank(values: number[], truthIndex: number): number {
  const order = values.map((v, j) => ({ v, j })).sort((a, b) => b.v - a.v || (a.j === truthIndex ? 1 : b.j === truthIndex ? -1 : 0));
  return order.findIndex((o) => o.j === truthIndex) + 1;
}

describe('retrievalRanks', () => {
  // Image 0 finds its report first; image 1 ranks report 1 second; image 2 ranks report 2 third.
  const s = matrix([
    [0.9, 0.1, 0.2],
    [0.8, 0.5, 0.3],
    [0.6, 0.7, 0.4],
  ]);
  it("retrievalRanks(s, 'image-to-report') ranks each row's diagonal among its reports", () => {
    expect(Array.from(retrievalRanks(s, 'image-to-report'))).toEqual([1, 2, 3]);
  });
  it("retrievalRanks(s, 'report-to-image') ranks each column's diagonal among its images", () => {
    // Column 0: 0.9 is top. Column 1: 0.5 below 0.7. Column 2: 0.4 is top of 0.2, 0.3, 0.4.
    expect(Array.from(retrievalRanks(s, 'report-to-image'))).toEqual([1, 2, 1]);
  });
  it('retrievalRanks breaks ties pessimistically: a constant matrix ranks every true item last', () => {
    const flat = matrix([[1, 1, 1], [1, 1, 1], [1, 1, 1]]);
    expect(Array.from(retrievalRanks(flat, 'image-to-report'))).toEqual([3, 3, 3]);
    expect(Array.from(retrievalRanks(flat, 'report-to-image'))).toEqual([3, 3, 3]);
  });
  it("retrievalRanks(s, 'report-to-image') equals 'image-to-report' of the transposed matrix", () => {
    const rng = createRng(8);
    const n = 12;
    const rows = Array.from({ length: n }, () => Array.from({ length: n }, () => Math.round(rng.next() * 5) / 5));
    const t = rows.map((_, i) => rows.map((r) => r[i]));
    expect(retrievalRanks(matrix(rows), 'report-to-image')).toEqual(retrievalRanks(matrix(t), 'image-to-report'));
  });
  it('retrievalRanks agrees with a sort-based rank on random matrices with ties', () => {
    const rng = createRng(21);
    const n = 15;
    const rows = Array.from({ length: n }, () => Array.from({ length: n }, () => rng.int(4)));
    const ranks = retrievalRanks(matrix(rows), 'image-to-report');
    for (let i = 0; i < n; i++) expect(ranks[i]).toBe(sortedRank(rows[i], i));
  });
  it('retrievalRanks is unchanged by a positive affine rescaling of the scores', () => {
    const rng = createRng(4);
    const rows = Array.from({ length: 9 }, () => Array.from({ length: 9 }, () => rng.next()));
    const scaled = rows.map((r) => r.map((v) => 3 * v - 1));
    expect(retrievalRanks(matrix(scaled), 'image-to-report')).toEqual(retrievalRanks(matrix(rows), 'image-to-report'));
  });
  it('retrievalRanks of 0 x 0 is empty and of 1 x 1 is [1]', () => {
    expect(retrievalRanks(matrix([]), 'image-to-report').length).toBe(0);
    expect(Array.from(retrievalRanks(matrix([[0.2]]), 'report-to-image'))).toEqual([1]);
  });
  it('retrievalRanks rejects non-square matrices, short data, NaN and unknown directions', () => {
    expect(() => retrievalRanks({ data: new Float32Array(6), rows: 2, cols: 3 }, 'image-to-report')).toThrow(/square .*got 2 x 3/);
    expect(() => retrievalRanks({ data: new Float32Array(3), rows: 2, cols: 2 }, 'image-to-report')).toThrow(/rows \* cols = 4 values; got 3/);
    expect(() => retrievalRanks(matrix([[1, Number.NaN], [0, 1]]), 'image-to-report')).toThrow(/NaN at row 0, col 1/);
    expect(() => retrievalRanks(matrix([[1]]), 'sideways' as 'image-to-report')).toThrow(RangeError);
  });
});

describe('recallAtK', () => {
  it('recallAtK(ranks, k) is the share of ranks <= k', () => {
    const ranks = [1, 2, 3, 7, 11];
    expect(recallAtK(ranks, 1)).toBe(0.2);
    expect(recallAtK(ranks, 5)).toBe(0.6);
    expect(recallAtK(ranks, 10)).toBe(0.8);
    expect(recallAtK(ranks, 11)).toBe(1);
  });
  it('recallAtK(ranks, k) does not fall as k grows', () => {
    const ranks = Array.from({ length: 50 }, (_, i) => 1 + ((i * 7) % 23));
    let prev = 0;
    for (let k = 1; k <= 30; k++) { const r = recallAtK(ranks, k)!; expect(r).toBeGreaterThanOrEqual(prev); prev = r; }
  });
  it('recallAtK([], k) is undefined and it rejects k < 1 or a non-integer k', () => {
    expect(recallAtK([], 1)).toBeUndefined();
    expect(() => recallAtK([1], 0)).toThrow(/'k' must be an integer >= 1; got 0/);
    expect(() => recallAtK([1], 1.5)).toThrow(RangeError);
    expect(() => recallAtK([1], Number.NaN)).toThrow(RangeError);
  });
});

describe('medianRank', () => {
  it('medianRank(ranks) is the middle rank, or the mean of the middle two', () => {
    expect(medianRank(Int32Array.from([5, 1, 3]))).toBe(3);
    expect(medianRank([4, 1, 2, 10])).toBe(3);
    expect(medianRank([1, 2])).toBe(1.5);
  });
  it('medianRank([]) is undefined, one rank is itself, and NaN throws', () => {
    expect(medianRank([])).toBeUndefined();
    expect(medianRank([7])).toBe(7);
    expect(() => medianRank([1, Number.NaN])).toThrow(RangeError);
  });
});

describe('retrievalSummary', () => {
  it('retrievalSummary(identity-like scores) gives recall 1 and median rank 1 both ways', () => {
    const n = 20;
    const rows = Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => (i === j ? 1 : 0.1 * ((i + j) % 5))));
    expect(retrievalSummary(matrix(rows))).toEqual({
      image_to_report_r1: 1, image_to_report_r5: 1, image_to_report_r10: 1,
      report_to_image_r1: 1, report_to_image_r5: 1, report_to_image_r10: 1,
      image_to_report_median_rank: 1, report_to_image_median_rank: 1,
    });
  });
  it('retrievalSummary(reversed scores) puts every true pair last: recall at 10 is 0 over 20 studies', () => {
    const n = 20;
    const rows = Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => (i === j ? -1 : 0.5)));
    const s = retrievalSummary(matrix(rows));
    expect(s.image_to_report_r10).toBe(0);
    expect(s.report_to_image_median_rank).toBe(20);
  });
  it('retrievalSummary of random scores sits near chance: recall at 5 of 100 about 0.05', () => {
    const rng = createRng(77);
    const n = 100;
    const rows = Array.from({ length: n }, () => Array.from({ length: n }, () => rng.next()));
    const s = retrievalSummary(matrix(rows));
    expect(s.image_to_report_r5!).toBeLessThan(0.15);
    expect(Math.abs(s.image_to_report_median_rank! - 50.5)).toBeLessThan(15);
  });
  it('retrievalSummary of 0 x 0 is all undefined', () => {
    const s = retrievalSummary(matrix([]));
    expect(Object.values(s).every((v) => v === undefined)).toBe(true);
    expect(Object.keys(s)).toHaveLength(8);
  });
});
