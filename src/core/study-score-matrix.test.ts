import { describe, expect, it } from 'vitest';
import { Matrix } from 'ml-matrix';
import { createRng } from './seeded-random';
import { globalStudyScoreMatrix, localStudyScoreMatrix, type StudyEmbeddings } from './study-score-matrix';
import type { Aggregator } from './types';

const unit = (rows: number[][]): Float32Array => Float32Array.from(rows.flatMap((r) => r.map((v) => v / Math.hypot(...r))));

function randomStudies(seed: number, n: number, dim: number): StudyEmbeddings[] {
  const rng = createRng(seed);
  const rows = (k: number): number[][] => Array.from({ length: k }, () => Array.from({ length: dim }, () => rng.normal()));
  return Array.from({ length: n }, (_, i) => {
    const nCells = 4 + (i % 3), nSentences = i === 2 ? 0 : 1 + (i % 4);
    return { cells: unit(rows(nCells)), nCells, sentences: unit(rows(nSentences)), nSentences };
  });
}

/** Reference: per pair, ml-matrix's product of the sentence rows with the cell rows, pooled by hand. */
function reference(studies: StudyEmbeddings[], dim: number, pool: (row: number[]) => number): number[][] {
  const asMatrix = (data: Float32Array, rows: number): Matrix => new Matrix(Array.from({ length: rows }, (_, r) => Array.from(data.subarray(r * dim, (r + 1) * dim))));
  return studies.map((img) =>
    studies.map((rep) => {
      if (rep.nSentences === 0) return Number.NaN;
      const sim = asMatrix(rep.sentences, rep.nSentences).mmul(asMatrix(img.cells, img.nCells).transpose());
      return sim.to2DArray().reduce((acc, row) => acc + pool(row), 0) / rep.nSentences;
    }),
  );
}

describe('localStudyScoreMatrix', () => {
  it('worked example: max over cells, mean over sentences (hand-computed)', () => {
    // Image 0 cells: x and y axes; image 1 cell: the x-y diagonal. Report 0: "x"; report 1: "y" and "-x".
    const studies: StudyEmbeddings[] = [
      { cells: unit([[1, 0], [0, 1]]), nCells: 2, sentences: unit([[1, 0]]), nSentences: 1 },
      { cells: unit([[1, 1]]), nCells: 1, sentences: unit([[0, 1], [-1, 0]]), nSentences: 2 },
    ];
    const m = localStudyScoreMatrix(studies, 2);
    const d = Math.SQRT1_2;
    // [0][1]: y -> max(0, 1) = 1; -x -> max(-1, 0) = 0; mean 0.5. [1][1]: (d + -d) / 2 = 0.
    const expected = [1, 0.5, d, 0];
    expected.forEach((v, k) => expect(m.data[k]).toBeCloseTo(v, 6));
  });

  it('matches an ml-matrix product pooled per sentence, for max, softmax and top-k, with NaN for a report without sentences', () => {
    const dim = 16;
    const studies = randomStudies(5, 7, dim);
    const softmax = (t: number) => (row: number[]): number => {
      const m = Math.max(...row);
      const w = row.map((v) => Math.exp((v - m) / t));
      return row.reduce((a, v, k) => a + v * w[k], 0) / w.reduce((a, b) => a + b, 0);
    };
    const cases: [Aggregator, (row: number[]) => number][] = [
      [{ kind: 'max' }, (row) => Math.max(...row)],
      [{ kind: 'softmax', temperature: 0.1 }, softmax(0.1)],
      [{ kind: 'topk', k: 2 }, (row) => [...row].sort((a, b) => b - a).slice(0, 2).reduce((a, b) => a + b, 0) / 2],
    ];
    for (const [aggregator, pool] of cases) {
      const got = localStudyScoreMatrix(studies, dim, aggregator);
      const want = reference(studies, dim, pool);
      expect([got.rows, got.cols]).toEqual([7, 7]);
      want.forEach((row, i) => row.forEach((v, j) => {
        if (Number.isNaN(v)) expect(got.data[i * 7 + j]).toBeNaN();
        else expect(got.data[i * 7 + j], `${aggregator.kind} [${i}][${j}]`).toBeCloseTo(v, 5);
      }));
    }
  });
});

describe('globalStudyScoreMatrix', () => {
  it('is the cosine of the mean cell direction and the mean sentence direction', () => {
    const studies: StudyEmbeddings[] = [
      { cells: unit([[1, 0], [0, 1]]), nCells: 2, sentences: unit([[1, 0]]), nSentences: 1 },
      { cells: unit([[1, 0]]), nCells: 1, sentences: unit([[0, 1]]), nSentences: 1 },
    ];
    const m = globalStudyScoreMatrix(studies, 2);
    const d = Math.SQRT1_2;
    [d, d, 1, 0].forEach((v, k) => expect(m.data[k]).toBeCloseTo(v, 6));
  });
});
