import { describe, expect, it } from 'vitest';
import { expectClose } from '../../tests/support/expect-close';
import { clusterBootstrapRate, pairedClusterBootstrapDiff, type RateCluster } from './cluster-bootstrap';
import { createRng, type Rng } from './seeded-random';

function binomialDraw(rng: Rng, m: number, p: number): number {
  let h = 0;
  for (let i = 0; i < m; i++) if (rng.next() < p) h++;
  return h;
}

/**
 * Studies of 5 to 15 sentences whose own hit rate is 0.1 or 0.5 with equal chance: the pooled truth is 0.3
 * and sentences of one study are correlated (intra-study correlation about 0.19).
 */
function clusteredStudies(rng: Rng, k: number): RateCluster[] {
  return Array.from({ length: k }, () => {
    const m = 5 + rng.int(11);
    return { hits: binomialDraw(rng, m, rng.next() < 0.5 ? 0.1 : 0.5), n: m };
  });
}

/** The same sentences with every one its own cluster: a bootstrap that ignores the study. */
function asSentences(clusters: readonly RateCluster[]): RateCluster[] {
  return clusters.flatMap((c) => Array.from({ length: c.n }, (_, i) => ({ hits: i < c.hits ? 1 : 0, n: 1 })));
}

const pooled = (cs: readonly RateCluster[]): number =>
  cs.reduce((s, c) => s + c.hits, 0) / cs.reduce((s, c) => s + c.n, 0);

describe('clusterBootstrapRate', () => {
  it('clusterBootstrapRate(clusters) covers the true rate about 95% of the time; a sentence-level bootstrap does not', () => {
    const rng = createRng(2024);
    const sims = 200;
    let covered = 0, coveredNaive = 0;
    for (let s = 0; s < sims; s++) {
      const data = clusteredStudies(rng, 30);
      const [lo, hi] = clusterBootstrapRate(data, { replicates: 400, seed: s })!;
      if (lo <= 0.3 && 0.3 <= hi) covered++;
      const [nlo, nhi] = clusterBootstrapRate(asSentences(data), { replicates: 400, seed: s })!;
      if (nlo <= 0.3 && 0.3 <= nhi) coveredNaive++;
    }
    // Monte Carlo standard error of a 95% coverage over 200 runs is about 0.015; percentile intervals over
    // 30 clusters run a little short of nominal.
    expect(covered / sims).toBeGreaterThan(0.89);
    expect(covered / sims).toBeLessThan(0.99);
    // Design effect about 2.7 here, so treating sentences as independent gives roughly 77% coverage.
    expect(coveredNaive / sims).toBeLessThan(0.86);
  });
  it('clusterBootstrapRate(clusters) contains the pooled rate total hits / total n', () => {
    const rng = createRng(5);
    for (let s = 0; s < 20; s++) {
      const data = clusteredStudies(rng, 3 + rng.int(40));
      const [lo, hi] = clusterBootstrapRate(data, { replicates: 500, seed: s })!;
      expect(lo).toBeLessThanOrEqual(pooled(data));
      expect(hi).toBeGreaterThanOrEqual(pooled(data));
      expect(lo).toBeGreaterThanOrEqual(0);
      expect(hi).toBeLessThanOrEqual(1);
    }
  });
  it('clusterBootstrapRate(clusters) is wider when sentences within a study agree than when they are independent', () => {
    const rng = createRng(11);
    // 40 studies of 10 sentences at rate 0.5: all-or-none per study versus independent sentences.
    const together = Array.from({ length: 40 }, (_, i) => ({ hits: i % 2 === 0 ? 10 : 0, n: 10 }));
    const apart = Array.from({ length: 40 }, () => ({ hits: binomialDraw(rng, 10, 0.5), n: 10 }));
    const width = (cs: RateCluster[]): number => { const [lo, hi] = clusterBootstrapRate(cs)!; return hi - lo; };
    // Design effect 1 + (10 - 1) * 1 = 10 for all-or-none, so the width ratio is near sqrt(10).
    expect(width(together) / width(apart)).toBeGreaterThan(2);
  });
  it('clusterBootstrapRate(clusters, { seed }) repeats for the same seed and moves with another', () => {
    const data = clusteredStudies(createRng(1), 25);
    const a = clusterBootstrapRate(data, { seed: 9 });
    expect(clusterBootstrapRate(data, { seed: 9 })).toEqual(a);
    expect(clusterBootstrapRate(data, { seed: 10 })).not.toEqual(a);
  });
  it('clusterBootstrapRate(clusters, { level }) narrows as the level falls', () => {
    const data = clusteredStudies(createRng(3), 30);
    const w = (level: number): number => { const [lo, hi] = clusterBootstrapRate(data, { level })!; return hi - lo; };
    expect(w(0.5)).toBeLessThan(w(0.8));
    expect(w(0.8)).toBeLessThan(w(0.99));
  });
  it('clusterBootstrapRate([]) and clusters with n = 0 only are undefined', () => {
    expect(clusterBootstrapRate([])).toBeUndefined();
    expect(clusterBootstrapRate([{ hits: 0, n: 0 }, { hits: 0, n: 0 }])).toBeUndefined();
  });
  it('clusterBootstrapRate of one cluster is the point [rate, rate]; empty clusters change nothing', () => {
    expect(clusterBootstrapRate([{ hits: 3, n: 8 }])).toEqual([0.375, 0.375]);
    const data = clusteredStudies(createRng(4), 12);
    expect(clusterBootstrapRate([...data, { hits: 0, n: 0 }], { seed: 2 })).toEqual(clusterBootstrapRate(data, { seed: 2 }));
  });
  it('clusterBootstrapRate handles a study of 1e6 sentences and all-hit data', () => {
    const [lo, hi] = clusterBootstrapRate([{ hits: 400_000, n: 1_000_000 }, { hits: 30, n: 100 }], { replicates: 200 })!;
    expect(lo).toBeGreaterThanOrEqual(0.3 - 1e-12);
    expect(hi).toBeLessThanOrEqual(0.4 + 1e-12);
    expect(clusterBootstrapRate([{ hits: 4, n: 4 }, { hits: 9, n: 9 }])).toEqual([1, 1]);
  });
  it('clusterBootstrapRate rejects hits > n, negatives, NaN and bad options with RangeError naming the field', () => {
    expect(() => clusterBootstrapRate([{ hits: 5, n: 4 }])).toThrow(/'clusters\[0\]\.hits' must be an integer in \[0, 4\]; got 5/);
    expect(() => clusterBootstrapRate([{ hits: 1, n: 4 }, { hits: 0, n: -1 }])).toThrow(/'clusters\[1\]\.n'/);
    expect(() => clusterBootstrapRate([{ hits: Number.NaN, n: 4 }])).toThrow(RangeError);
    expect(() => clusterBootstrapRate([{ hits: 1, n: 4 }], { replicates: 0 })).toThrow(/'replicates' must be an integer >= 1; got 0/);
    expect(() => clusterBootstrapRate([{ hits: 1, n: 4 }], { level: 1.2 })).toThrow(/'level' must be in \(0, 1\)/);
    expect(() => clusterBootstrapRate([{ hits: 1, n: 4 }], { seed: Number.NaN })).toThrow(TypeError);
  });
});

describe('pairedClusterBootstrapDiff', () => {
  function pairedStudies(seed: number, k: number, pa: number, pb: number): { a: number; b: number; n: number }[] {
    const rng = createRng(seed);
    return Array.from({ length: k }, () => {
      const n = 4 + rng.int(8);
      // A shared study difficulty makes the two models' hits correlated within a study.
      const shift = rng.next() < 0.5 ? -0.2 : 0.2;
      return { a: binomialDraw(rng, n, pa + shift), b: binomialDraw(rng, n, pb + shift), n };
    });
  }
  const diff = (cs: readonly { a: number; b: number; n: number }[]): number =>
    cs.reduce((s, c) => s + c.a - c.b, 0) / cs.reduce((s, c) => s + c.n, 0);

  it('pairedClusterBootstrapDiff(clusters) contains the observed difference and excludes 0 for a clear gap', () => {
    const data = pairedStudies(1, 60, 0.7, 0.4);
    const [lo, hi] = pairedClusterBootstrapDiff(data)!;
    expect(lo).toBeLessThanOrEqual(diff(data));
    expect(hi).toBeGreaterThanOrEqual(diff(data));
    expect(lo).toBeGreaterThan(0);
  });
  it('pairedClusterBootstrapDiff(clusters) negates when a and b swap, and is [0, 0] for identical models', () => {
    const data = pairedStudies(2, 30, 0.5, 0.45);
    const [lo, hi] = pairedClusterBootstrapDiff(data, { seed: 4 })!;
    const [slo, shi] = pairedClusterBootstrapDiff(data.map((c) => ({ a: c.b, b: c.a, n: c.n })), { seed: 4 })!;
    expectClose([slo, shi], [-hi, -lo], 1e-12);
    expect(pairedClusterBootstrapDiff(data.map((c) => ({ a: c.a, b: c.a, n: c.n })))).toEqual([0, 0]);
  });
  it('pairedClusterBootstrapDiff(clusters) resamples the same studies as clusterBootstrapRate for one model', () => {
    // With b = 0 the difference is model a's rate, so the two intervals must agree exactly for one seed.
    const data = pairedStudies(3, 20, 0.6, 0.3);
    expect(pairedClusterBootstrapDiff(data.map((c) => ({ a: c.a, b: 0, n: c.n })), { seed: 8 }))
      .toEqual(clusterBootstrapRate(data.map((c) => ({ hits: c.a, n: c.n })), { seed: 8 }));
  });
  it('pairedClusterBootstrapDiff is narrower than the widths of the two rates added, because the pairing is kept', () => {
    const data = pairedStudies(6, 50, 0.55, 0.5);
    const w = (ci: [number, number] | undefined): number => ci![1] - ci![0];
    const wa = w(clusterBootstrapRate(data.map((c) => ({ hits: c.a, n: c.n }))));
    const wb = w(clusterBootstrapRate(data.map((c) => ({ hits: c.b, n: c.n }))));
    expect(w(pairedClusterBootstrapDiff(data))).toBeLessThan(Math.hypot(wa, wb));
  });
  it('pairedClusterBootstrapDiff([]) is undefined and it rejects a > n', () => {
    expect(pairedClusterBootstrapDiff([])).toBeUndefined();
    expect(pairedClusterBootstrapDiff([{ a: 0, b: 0, n: 0 }])).toBeUndefined();
    expect(() => pairedClusterBootstrapDiff([{ a: 5, b: 1, n: 4 }])).toThrow(/'clusters\[0\]\.a' must be an integer in \[0, 4\]; got 5/);
    expect(() => pairedClusterBootstrapDiff([{ a: 1, b: 1.5, n: 4 }])).toThrow(/'clusters\[0\]\.b'/);
  });
});
