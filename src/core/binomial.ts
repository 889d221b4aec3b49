/**
 * Exact binomial probabilities in log space, stable for n far beyond 1e5.
 * Point probabilities use Loader's saddle-point form (Stirling-series error terms and the deviance bd0),
 * which avoids the cancellation of lgamma differences: C. Loader (2000), "Fast and Accurate Computation of
 * Binomial Probabilities". Tails sum point probabilities outward from k, scaled by the term at k.
 */

const LOG_2PI = Math.log(2 * Math.PI);
const LOG_SQRT_2PI = 0.5 * LOG_2PI;
const S0 = 1 / 12;
const S1 = 1 / 360;
const S2 = 1 / 1260;
const S3 = 1 / 1680;
const S4 = 1 / 1188;

/** Ratios below this share of the running sum no longer change a double. */
const TAIL_EPS = 1e-17;

function checkArgs(k: number, n: number, p: number): void {
  if (!Number.isSafeInteger(n) || n < 0) throw new RangeError(`'n' must be a non-negative integer; got ${n}`);
  if (!(p >= 0 && p <= 1)) throw new RangeError(`'p' must be a probability in [0, 1]; got ${p}`);
  if (!Number.isSafeInteger(k)) throw new RangeError(`'k' must be an integer; got ${k}`);
}

/** Stirling error log(m!) - log(sqrt(2 pi m) (m / e)^m) for an integer m >= 0. */
function stirlingError(m: number): number {
  if (m === 0) return 0;
  if (m <= 15) {
    let logFactorial = 0;
    for (let i = 2; i <= m; i++) logFactorial += Math.log(i);
    return logFactorial - (m + 0.5) * Math.log(m) + m - LOG_SQRT_2PI;
  }
  const mm = m * m;
  if (m > 500) return (S0 - S1 / mm) / m;
  if (m > 80) return (S0 - (S1 - S2 / mm) / mm) / m;
  if (m > 35) return (S0 - (S1 - (S2 - S3 / mm) / mm) / mm) / m;
  return (S0 - (S1 - (S2 - (S3 - S4 / mm) / mm) / mm) / mm) / m;
}

/** Deviance term x log(x / mu) + mu - x, by a series when x is close to mu. */
function deviance(x: number, mu: number): number {
  if (Math.abs(x - mu) < 0.1 * (x + mu)) {
    let v = (x - mu) / (x + mu);
    let s = (x - mu) * v;
    let ej = 2 * x * v;
    v *= v;
    for (let j = 1; j < 1000; j++) {
      ej *= v;
      const s1 = s + ej / (2 * j + 1);
      if (s1 === s) return s1;
      s = s1;
    }
    return s;
  }
  return x * Math.log(x / mu) + mu - x;
}

/**
 * log P(X = k) for X ~ Binomial(n, p). Returns -Infinity where the probability is 0 (k outside [0, n],
 * or p at 0 or 1 with k elsewhere). Throws RangeError for a non-integer k or n, n < 0, or p outside [0, 1].
 * Method: Loader (2000), see the file header.
 */
export function binomialLogPmf(k: number, n: number, p: number): number {
  checkArgs(k, n, p);
  if (k < 0 || k > n) return -Infinity;
  const q = 1 - p;
  if (p === 0) return k === 0 ? 0 : -Infinity;
  if (q === 0) return k === n ? 0 : -Infinity;
  if (k === 0) return p < 0.1 ? -deviance(n, n * q) - n * p : n * Math.log(q);
  if (k === n) return q < 0.1 ? -deviance(n, n * p) - n * q : n * Math.log(p);
  const lc = stirlingError(n) - stirlingError(k) - stirlingError(n - k) - deviance(k, n * p) - deviance(n - k, n * q);
  const lf = LOG_2PI + Math.log(k) + Math.log1p(-k / n);
  return lc - 0.5 * lf;
}

/**
 * Sums P(X = i) / P(X = k) outward from k, the direction in which terms shrink:
 * downward (i <= k) when k is at or below the mean, upward (i > k) otherwise.
 */
function relativeTail(k: number, n: number, p: number, downward: boolean): number {
  const q = 1 - p;
  let term = 1;
  let sum = 0;
  if (downward) {
    sum = 1;
    for (let i = k; i >= 1; i--) {
      term *= (i / (n - i + 1)) * (q / p);
      sum += term;
      if (term < sum * TAIL_EPS) break;
    }
  } else {
    for (let i = k; i < n; i++) {
      term *= ((n - i) / (i + 1)) * (p / q);
      sum += term;
      if (term < sum * TAIL_EPS) break;
    }
  }
  return sum;
}

/**
 * log P(X <= k) for X ~ Binomial(n, p): 0 for k >= n, -Infinity for k < 0.
 * Keeps precision where P(X <= k) underflows a double (e.g. far lower tails at n = 1e5).
 * Throws RangeError as binomialLogPmf does.
 */
export function binomialLogCdf(k: number, n: number, p: number): number {
  checkArgs(k, n, p);
  if (k < 0) return -Infinity;
  if (k >= n || p === 0) return 0;
  if (p === 1) return -Infinity;
  if (k <= n * p) return binomialLogPmf(k, n, p) + Math.log(relativeTail(k, n, p, true));
  // Above the mean the upper tail is below about one half, so 1 - upper loses no relative precision.
  const upper = Math.exp(binomialLogPmf(k, n, p)) * relativeTail(k, n, p, false);
  return Math.log1p(-Math.min(upper, 1));
}

/**
 * P(X <= k) for X ~ Binomial(n, p), exact up to rounding: 1 for k >= n, 0 for k < 0.
 * Throws RangeError for a non-integer k or n, n < 0, or p outside [0, 1].
 * Method: Loader (2000) point probabilities summed in scaled form.
 */
export function binomialCdf(k: number, n: number, p: number): number {
  return Math.exp(binomialLogCdf(k, n, p));
}
