import { quantileSorted } from './sample-quantile';
import { createRng } from './seeded-random';

/** Options of the study-level bootstrap. */
export interface ClusterBootstrapOptions {
  /** Number of bootstrap replicates. */
  readonly replicates?: number;
  /** Seed of the resampling (createRng); same input and seed give the same interval. */
  readonly seed?: number;
  /** Two-sided confidence level in (0, 1). */
  readonly level?: number;
}

/** One cluster (study) of a rate: hits among n scored items. */
export interface RateCluster {
  readonly hits: number;
  readonly n: number;
}

/** One cluster (study) of a paired comparison: hits of model a and of model b among the same n items. */
export interface PairedCluster {
  readonly a: number;
  readonly b: number;
  readonly n: number;
}

/**
 * Seeded study-level (cluster) percentile bootstrap interval for a pooled rate, total hits / total n
 * (the ratio estimator). Each replicate draws as many clusters as there are, with replacement, so
 * the correlation of sentences within a study is kept. Clusters with n = 0 carry no items and are left out.
 * Returns undefined when no cluster has n > 0; a single cluster gives [rate, rate].
 * Percentiles use linear interpolation between order statistics (Hyndman and Fan 1996, type 7).
 * Method: percentile bootstrap, B. Efron and R. J. Tibshirani (1993), An Introduction to the Bootstrap,
 * ch. 13; resampling whole clusters, A. C. Davison and D. V. Hinkley (1997), Bootstrap Methods and their
 * Application, section 3.8.
 */
export function clusterBootstrapRate(
  clusters: readonly RateCluster[],
  { replicates = 2000, seed = 0, level = 0.95 }: ClusterBootstrapOptions = {},
): [number, number] | undefined {
  checkOptions(replicates, seed, level);
  const num: number[] = [];
  const den: number[] = [];
  clusters.forEach((c, i) => {
    checkCount(c.n, `clusters[${i}].n`, Infinity);
    checkCount(c.hits, `clusters[${i}].hits`, c.n);
    if (c.n > 0) {
      num.push(c.hits);
      den.push(c.n);
    }
  });
  return resampleRatio(Float64Array.from(num), Float64Array.from(den), replicates, seed, level);
}

/**
 * Seeded study-level percentile bootstrap interval for a paired difference of rates,
 * (total a - total b) / total n, where a and b count the hits of two models on the same n items of a study.
 * Both models see the same resampled clusters in every replicate, so their correlation is kept.
 * Clusters with n = 0 are left out; returns undefined when none has n > 0. Swapping a and b negates the interval.
 * Method and sources as clusterBootstrapRate.
 */
export function pairedClusterBootstrapDiff(
  clusters: readonly PairedCluster[],
  { replicates = 2000, seed = 0, level = 0.95 }: ClusterBootstrapOptions = {},
): [number, number] | undefined {
  checkOptions(replicates, seed, level);
  const num: number[] = [];
  const den: number[] = [];
  clusters.forEach((c, i) => {
    checkCount(c.n, `clusters[${i}].n`, Infinity);
    checkCount(c.a, `clusters[${i}].a`, c.n);
    checkCount(c.b, `clusters[${i}].b`, c.n);
    if (c.n > 0) {
      num.push(c.a - c.b);
      den.push(c.n);
    }
  });
  return resampleRatio(Float64Array.from(num), Float64Array.from(den), replicates, seed, level);
}

function checkOptions(replicates: number, seed: number, level: number): void {
  if (!Number.isSafeInteger(replicates) || replicates < 1) {
    throw new RangeError(`'replicates' must be an integer >= 1; got ${replicates}`);
  }
  if (typeof seed !== 'number' || !Number.isFinite(seed)) throw new TypeError(`'seed' must be a finite number; got ${seed}`);
  if (!(level > 0 && level < 1)) throw new RangeError(`'level' must be in (0, 1); got ${level}`);
}

function checkCount(value: number, name: string, max: number): void {
  if (!Number.isSafeInteger(value) || value < 0 || value > max) {
    const range = max === Infinity ? 'a non-negative integer' : `an integer in [0, ${max}]`;
    throw new RangeError(`'${name}' must be ${range}; got ${value}`);
  }
}

/** Percentile interval of sum(num[idx]) / sum(den[idx]) over resampled index sets; every den is > 0. */
function resampleRatio(
  num: Float64Array,
  den: Float64Array,
  replicates: number,
  seed: number,
  level: number,
): [number, number] | undefined {
  const k = num.length;
  if (k === 0) return undefined;
  const rng = createRng(seed);
  const stats = new Float64Array(replicates);
  for (let r = 0; r < replicates; r++) {
    let sn = 0, sd = 0;
    for (let j = 0; j < k; j++) {
      const pick = rng.int(k);
      sn += num[pick];
      sd += den[pick];
    }
    stats[r] = sn / sd;
  }
  stats.sort();
  const alpha = (1 - level) / 2;
  return [quantileSorted(stats, alpha)!, quantileSorted(stats, 1 - alpha)!];
}
