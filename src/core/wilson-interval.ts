import { normalQuantile } from './normal-quantile';

/**
 * Wilson score interval for a binomial proportion hits / n at the given two-sided confidence level.
 * Returns [lo, hi] within [0, 1], with lo = 0 exactly when hits = 0 and hi = 1 exactly when hits = n;
 * undefined when n = 0 (no items, no interval). Throws RangeError for negative or non-integer counts,
 * hits > n, or a level outside (0, 1).
 * Method: E. B. Wilson (1927), "Probable inference, the law of succession, and statistical inference",
 * JASA 22:209-212; method 3 (score, no continuity correction) in R. G. Newcombe (1998),
 * Statistics in Medicine 17:857-872.
 */
export function wilsonInterval(hits: number, n: number, level = 0.95): [number, number] | undefined {
  if (!Number.isSafeInteger(n) || n < 0) throw new RangeError(`'n' must be a non-negative integer; got ${n}`);
  if (!Number.isSafeInteger(hits) || hits < 0 || hits > n) {
    throw new RangeError(`'hits' must be an integer in [0, n = ${n}]; got ${hits}`);
  }
  if (!(level > 0 && level < 1)) throw new RangeError(`'level' must be in (0, 1); got ${level}`);
  if (n === 0) return undefined;
  const z = normalQuantile(1 - (1 - level) / 2);
  return [wilsonLower(hits, n, z), 1 - wilsonLower(n - hits, n, z)];
}

/**
 * Lower Wilson bound written without subtraction: with A = 2x + z^2 and B = z * sqrt(z^2 + 4x(n - x)/n),
 * (A - B) / (2(n + z^2)) equals 2x^2 / (n(A + B)), which keeps full precision for tiny x / n.
 * Using the same expression for 1 - hi makes the interval exactly symmetric under hits -> n - hits.
 */
function wilsonLower(x: number, n: number, z: number): number {
  if (x === 0) return 0;
  const z2 = z * z;
  const a = 2 * x + z2;
  const b = z * Math.sqrt(z2 + (4 * x * (n - x)) / n);
  return (2 * x * (x / n)) / (a + b);
}
