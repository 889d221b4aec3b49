import { describe, expect, it } from 'vitest';
import { expectClose } from '../../tests/support/expect-close';
import reference from '../../tests/fixtures/reference/roc-auc-sklearn.json';
import { rocAuc } from './roc-auc';
import { createRng } from './seeded-random';

/** Brute force over all positive-negative pairs, ties counting one half. */
function pairwiseAuc(scores: number[], labels: (0 | 1)[]): number {
  let wins = 0, pairs = 0;
  for (let i = 0; i < scores.length; i++) {
    if (labels[i] !== 1) continue;
    for (let j = 0; j < scores.length; j++) {
      if (labels[j] !== 0) continue;
      pairs++;
      wins += scores[i] > scores[j] ? 1 : scores[i] === scores[j] ? 0.5 : 0;
    }
  }
  return wins / pairs;
}

function randomCase(seed: number, n: number): { scores: number[]; labels: (0 | 1)[] } {
  const rng = createRng(seed);
  const labels = Array.from({ length: n }, (_, i) => (i < 2 ? (i as 0 | 1) : rng.next() < 0.4 ? 1 : 0));
  const scores = labels.map((l) => Math.round((rng.normal() + l) * 4) / 4);
  return { scores, labels };
}

describe('rocAuc', () => {
  it('rocAuc(scores, labels) is 0.74 on a ten-item example with one tie across classes (18.5 of 25 pairs, by hand)', () => {
    const scores = [0.1, 0.4, 0.35, 0.8, 0.2, 0.9, 0.6, 0.6, 0.3, 0.5];
    const labels = [0, 0, 1, 1, 0, 1, 1, 0, 1, 0] as const;
    expectClose(rocAuc(scores, labels)!, 0.74, 1e-15);
  });
  it('rocAuc(scores, labels) matches sklearn.metrics.roc_auc_score (fixture roc-auc-sklearn.json)', () => {
    expect(reference.source).toMatch(/scikit-learn/);
    for (const c of reference.cases) expectClose(rocAuc(c.scores, c.labels as (0 | 1)[])!, c.auc, 1e-12);
  });
  it('rocAuc agrees with the pairwise definition on random tied data', () => {
    for (let seed = 0; seed < 10; seed++) {
      const { scores, labels } = randomCase(seed, 40 + seed * 7);
      expectClose(rocAuc(scores, labels)!, pairwiseAuc(scores, labels), 1e-12);
    }
  });
  it('rocAuc(1 - scores) is 1 - rocAuc(scores)', () => {
    const { scores, labels } = randomCase(3, 80);
    expectClose(rocAuc(scores.map((s) => 1 - s), labels)!, 1 - rocAuc(scores, labels)!, 1e-12);
  });
  it('rocAuc is invariant under strictly increasing transforms of the scores', () => {
    const { scores, labels } = randomCase(5, 90);
    const auc = rocAuc(scores, labels)!;
    expect(rocAuc(scores.map((s) => 2.5 * s + 7), labels)).toBe(auc);
    expect(rocAuc(scores.map((s) => Math.exp(s)), labels)).toBe(auc);
    expect(rocAuc(scores.map((s) => s ** 3), labels)).toBe(auc);
  });
  it('rocAuc accepts boolean labels and typed-array scores', () => {
    const { scores, labels } = randomCase(9, 30);
    expect(rocAuc(Float64Array.from(scores), labels.map((l) => l === 1))).toBe(rocAuc(scores, labels));
  });
  it('rocAuc is 1 for perfect separation, 0 for reversed, 1/2 for constant scores', () => {
    expect(rocAuc([0.1, 0.2, 0.8, 0.9], [0, 0, 1, 1])).toBe(1);
    expect(rocAuc([0.9, 0.8, 0.2, 0.1], [0, 0, 1, 1])).toBe(0);
    expect(rocAuc([3, 3, 3, 3, 3], [0, 1, 1, 0, 1])).toBe(0.5);
    expect(rocAuc([-Infinity, Infinity], [0, 1])).toBe(1);
  });
  it('rocAuc is undefined for empty input, one element, or a single class', () => {
    expect(rocAuc([], [])).toBeUndefined();
    expect(rocAuc([0.3], [1])).toBeUndefined();
    expect(rocAuc([0.3, 0.4, 0.1], [0, 0, 0])).toBeUndefined();
  });
  it('rocAuc handles 1e5 items with huge scores', () => {
    const rng = createRng(12);
    const n = 100_000;
    const labels = Array.from({ length: n }, () => (rng.next() < 0.5 ? 1 : 0) as 0 | 1);
    const scores = labels.map((l) => 1e300 * (rng.next() + 0.2 * l));
    const auc = rocAuc(scores, labels)!;
    // Difference of two U(0, 1) shifted by 0.2: P(X + 0.2 > Y) = 1 - 0.8^2 / 2 = 0.68.
    expect(Math.abs(auc - 0.68)).toBeLessThan(0.01);
  });
  it('rocAuc rejects unequal lengths, NaN scores and bad labels with RangeError', () => {
    expect(() => rocAuc([1, 2], [1])).toThrow(/same length; got 2 and 1/);
    expect(() => rocAuc([1, Number.NaN], [0, 1])).toThrow(/'scores\[1\]' must be a number; got NaN/);
    expect(() => rocAuc([1, 2], [0, 2 as 1])).toThrow(/'labels\[1\]' must be 0, 1, true or false; got 2/);
  });
});
