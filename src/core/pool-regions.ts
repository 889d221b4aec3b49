import type { Aggregator, Matrix } from './types';

const AGGREGATOR_FORMS = "one of 'max', 'softmax:T' (T > 0), 'lse:R' (R > 0), 'topk:K' (integer K >= 1)";
const NUMBER_TEXT = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

/** Throws a RangeError naming the parameter when an aggregator's parameter is out of range. */
export function validateAggregator(aggregator: Aggregator): void {
  switch (aggregator.kind) {
    case 'max':
      return;
    case 'softmax':
      if (!(Number.isFinite(aggregator.temperature) && aggregator.temperature > 0)) {
        throw new RangeError(`'temperature' must be a finite number > 0; got ${aggregator.temperature}`);
      }
      return;
    case 'lse':
      if (!(Number.isFinite(aggregator.sharpness) && aggregator.sharpness > 0)) {
        throw new RangeError(`'sharpness' must be a finite number > 0; got ${aggregator.sharpness}`);
      }
      return;
    case 'topk':
      if (!(Number.isInteger(aggregator.k) && aggregator.k >= 1)) {
        throw new RangeError(`'k' must be an integer >= 1; got ${aggregator.k}`);
      }
      return;
    default:
      throw new RangeError(`'aggregator.kind' must be max, softmax, lse or topk; got ${String((aggregator as { kind: unknown }).kind)}`);
  }
}

function maxOf(v: ArrayLike<number>): number {
  let m = -Infinity;
  for (let i = 0; i < v.length; i++) {
    const x = v[i];
    if (x > m) m = x;
    else if (x !== x) return Number.NaN;
  }
  return m;
}

function softmaxMean(v: ArrayLike<number>, temperature: number): number {
  const m = maxOf(v);
  // An infinite maximum takes all the weight (the limit of the stable form); NaN propagates.
  if (!Number.isFinite(m)) return m;
  let wSum = 0;
  let wDev = 0;
  for (let i = 0; i < v.length; i++) {
    const d = v[i] - m;
    const w = Math.exp(d / temperature);
    // Deviations from the max, not raw values, keep the weighted sum finite for huge inputs.
    if (w > 0) {
      wSum += w;
      wDev += w * d;
    }
  }
  return m + wDev / wSum;
}

function logMeanExp(v: ArrayLike<number>, sharpness: number): number {
  const m = maxOf(v);
  if (!Number.isFinite(m)) return m;
  let s = 0;
  for (let i = 0; i < v.length; i++) s += Math.exp(sharpness * (v[i] - m));
  return m + Math.log(s / v.length) / sharpness;
}

function topKMean(v: ArrayLike<number>, k: number): number {
  const n = v.length;
  if (k > n) throw new RangeError(`'k' must be an integer in [1, ${n}]; got ${k}`);
  if (k === n || k > 32) {
    const sorted = Float64Array.from(v as ArrayLike<number>);
    for (let i = 0; i < n; i++) if (sorted[i] !== sorted[i]) return Number.NaN;
    sorted.sort();
    let s = 0;
    for (let i = n - k; i < n; i++) s += sorted[i];
    return s / k;
  }
  // Small k: keep the k largest in a sorted buffer (descending), O(n k) without a full sort.
  const best = new Float64Array(k).fill(-Infinity);
  for (let i = 0; i < n; i++) {
    const x = v[i];
    if (x !== x) return Number.NaN;
    if (x <= best[k - 1]) continue;
    let p = k - 1;
    while (p > 0 && best[p - 1] < x) {
      best[p] = best[p - 1];
      p--;
    }
    best[p] = x;
  }
  let s = 0;
  for (let i = 0; i < k; i++) s += best[i];
  return s / k;
}

/**
 * Pools one sentence's cell similarities into a region score (the aggregator):
 * - max: the largest value;
 * - softmax:T: softmax-weighted mean, sum_i softmax(v / T)_i * v_i, computed as
 *   m + sum_i w_i (v_i - m) / sum_i w_i with w_i = exp((v_i - m) / T) and m = max v (stable);
 *   T -> 0 gives the max, T -> infinity the mean;
 * - lse:R: log-mean-exp, (1 / R) log((1 / n) sum_i exp(R v_i)), computed as
 *   m + (1 / R) log((1 / n) sum_i exp(R (v_i - m))). Dividing by n (a mean, not a sum) keeps the
 *   score between the mean (R -> 0) and the max (R -> infinity), with no log(n) / R offset;
 * - topk:K: mean of the K largest values (K in [1, n], else RangeError).
 * Empty values throw a RangeError; any NaN gives NaN. LSE pooling as in GLoRIA (Huang et al.,
 * ICCV 2021); softmax and top-k pooling are common practice.
 */
export function poolRegions(values: ArrayLike<number>, aggregator: Aggregator): number {
  validateAggregator(aggregator);
  if (values.length === 0) throw new RangeError(`'values' must hold at least one cell; got 0`);
  switch (aggregator.kind) {
    case 'max':
      return maxOf(values);
    case 'softmax':
      return softmaxMean(values, aggregator.temperature);
    case 'lse':
      return logMeanExp(values, aggregator.sharpness);
    case 'topk':
      return topKMean(values, aggregator.k);
  }
}

/** Applies poolRegions to each row of a sentences x cells matrix; one float32 score per row. */
export function poolRegionsMatrix(sim: Matrix, aggregator: Aggregator): Float32Array {
  validateAggregator(aggregator);
  const out = new Float32Array(sim.rows);
  for (let r = 0; r < sim.rows; r++) {
    out[r] = poolRegions(sim.data.subarray(r * sim.cols, (r + 1) * sim.cols), aggregator);
  }
  return out;
}

function parseParameter(text: string, form: string, raw: string): number {
  if (!NUMBER_TEXT.test(raw)) throw new RangeError(`'aggregator' must be ${AGGREGATOR_FORMS}; got '${text}' (${form} needs a number)`);
  return Number(raw);
}

/**
 * Parses the command-line form of an aggregator: 'max', 'softmax:T', 'lse:R' or 'topk:K'
 * (as formatAggregator writes it). Throws a RangeError naming the form for anything else,
 * for T <= 0, R <= 0, or K that is not an integer >= 1.
 */
export function parseAggregator(text: string): Aggregator {
  if (typeof text !== 'string') throw new TypeError(`'aggregator' must be a string; got ${typeof text}`);
  if (text === 'max') return { kind: 'max' };
  const colon = text.indexOf(':');
  const name = colon < 0 ? text : text.slice(0, colon);
  const raw = colon < 0 ? '' : text.slice(colon + 1);
  let aggregator: Aggregator;
  switch (name) {
    case 'softmax':
      aggregator = { kind: 'softmax', temperature: parseParameter(text, 'softmax:T', raw) };
      break;
    case 'lse':
      aggregator = { kind: 'lse', sharpness: parseParameter(text, 'lse:R', raw) };
      break;
    case 'topk':
      aggregator = { kind: 'topk', k: parseParameter(text, 'topk:K', raw) };
      break;
    default:
      throw new RangeError(`'aggregator' must be ${AGGREGATOR_FORMS}; got '${text}'`);
  }
  validateAggregator(aggregator);
  return aggregator;
}

/** Formats an aggregator in the form parseAggregator reads ('max', 'softmax:0.1', 'lse:5', 'topk:5'). */
export function formatAggregator(aggregator: Aggregator): string {
  validateAggregator(aggregator);
  switch (aggregator.kind) {
    case 'max':
      return 'max';
    case 'softmax':
      return `softmax:${aggregator.temperature}`;
    case 'lse':
      return `lse:${aggregator.sharpness}`;
    case 'topk':
      return `topk:${aggregator.k}`;
  }
}
