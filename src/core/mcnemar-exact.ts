import { binomialCdf } from './binomial';

/**
 * Exact (binomial) McNemar test for paired binary outcomes: two-sided p-value
 * min(1, 2 * P(X <= min(b, c))) with X ~ Binomial(b + c, 1/2), where b and c are the discordant counts
 * (a hit and b miss; b hit and a miss). Symmetric in b and c.
 * With no discordant pairs (b + c = 0) it returns 1, the value the formula itself gives and the
 * conventional one: the data hold no evidence of a difference. The result is therefore always a number.
 * Throws RangeError for negative or non-integer counts.
 * Method: exact conditional form of Q. McNemar (1947), Psychometrika 12:153-157; see A. Agresti,
 * Categorical Data Analysis (exact binomial test on the discordant pairs).
 */
export function mcnemarExact(b: number, c: number): number {
  if (!Number.isSafeInteger(b) || b < 0) throw new RangeError(`'b' must be a non-negative integer; got ${b}`);
  if (!Number.isSafeInteger(c) || c < 0) throw new RangeError(`'c' must be a non-negative integer; got ${c}`);
  const n = b + c;
  if (n === 0) return 1;
  return Math.min(1, 2 * binomialCdf(Math.min(b, c), n, 0.5));
}

/** The 2 x 2 table of paired binary outcomes of models a and b over the same items. */
export interface PairedCounts {
  readonly n: number;
  readonly both: number;
  /** a true, b false: McNemar's b. */
  readonly onlyA: number;
  /** b true, a false: McNemar's c. */
  readonly onlyB: number;
  readonly neither: number;
}

/**
 * Counts the paired outcomes of two equally long boolean sequences (item i of a pairs with item i of b).
 * Empty input gives all zeros. Throws RangeError when the lengths differ, TypeError for a non-boolean entry.
 */
export function pairedCounts(a: ArrayLike<boolean>, b: ArrayLike<boolean>): PairedCounts {
  if (a.length !== b.length) {
    throw new RangeError(`'a' and 'b' must have the same length; got ${a.length} and ${b.length}`);
  }
  let both = 0, onlyA = 0, onlyB = 0, neither = 0;
  for (let i = 0; i < a.length; i++) {
    const x = a[i], y = b[i];
    if (typeof x !== 'boolean') throw new TypeError(`'a[${i}]' must be a boolean; got ${String(x)}`);
    if (typeof y !== 'boolean') throw new TypeError(`'b[${i}]' must be a boolean; got ${String(y)}`);
    if (x && y) both++;
    else if (x) onlyA++;
    else if (y) onlyB++;
    else neither++;
  }
  return { n: a.length, both, onlyA, onlyB, neither };
}
