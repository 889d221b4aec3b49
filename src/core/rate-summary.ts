import { wilsonInterval } from './wilson-interval';

/** A hit rate with its Wilson 95% interval, its chance level and the lift over chance. */
export interface RateWithChance {
  readonly n: number;
  readonly hits: number;
  /** hits / n; undefined when n = 0. */
  readonly rate: number | undefined;
  /** Wilson score interval at 95%; undefined when n = 0. */
  readonly wilson95: [number, number] | undefined;
  /** Mean chance level over the n items, chanceSum / n; undefined when n = 0. */
  readonly chance: number | undefined;
  /** rate / chance; undefined when n = 0 or the chance level is 0. */
  readonly lift: number | undefined;
}

/**
 * Summarises a group of scored items: n items, hits among them, and chanceSum, the sum over the items of
 * each one's chance of a hit (the share of cells or pixels that would hit at random).
 * Fields that are statistically undefined (no items, zero chance for the lift) are undefined.
 * Throws RangeError as wilsonInterval does for the counts, and for chanceSum outside [0, n] or NaN.
 * The interval is the Wilson score interval (Wilson 1927; Newcombe 1998, method 3).
 */
export function summariseRate(hits: number, n: number, chanceSum: number): RateWithChance {
  const wilson95 = wilsonInterval(hits, n, 0.95);
  // A small tolerance admits sums of n chance levels that each equal 1 but round above n.
  if (!(chanceSum >= 0 && chanceSum <= n * (1 + 1e-12))) {
    throw new RangeError(`'chanceSum' must be in [0, n = ${n}]; got ${chanceSum}`);
  }
  if (n === 0) return { n, hits, rate: undefined, wilson95, chance: undefined, lift: undefined };
  const rate = hits / n;
  const chance = Math.min(1, chanceSum / n);
  return { n, hits, rate, wilson95, chance, lift: chance > 0 ? rate / chance : undefined };
}
