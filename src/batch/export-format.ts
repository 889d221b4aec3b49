import { LUNG_ZONES, type HitRule } from '../core/types';
import type { ScoreSummary } from './types';

/** Shared number formatting and ordering for the score exporters, so every output file agrees. */

export const HIT_RULE_ORDER: readonly HitRule[] = ['centre', 'overlap', 'upsampled'];

const ZONE_ORDER: readonly string[] = [...LUNG_ZONES, 'cardiac', 'mediastinal', 'other'];

/**
 * `x` rounded to `digits` significant digits (default 6), as a number; integers pass through
 * unchanged so counts stay exact; -0 becomes 0; NaN and infinities give undefined.
 */
export function roundSignificant(x: number, digits = 6): number | undefined {
  if (!Number.isInteger(digits) || digits < 1 || digits > 21) throw new RangeError(`'digits' must be an integer in [1, 21]; got ${digits}`);
  if (!Number.isFinite(x)) return undefined;
  if (Number.isInteger(x)) return x === 0 ? 0 : x;
  const r = Number(x.toPrecision(digits));
  return r === 0 ? 0 : r;
}

/** `x` rounded to `places` decimal places (default 6), -0 as 0; NaN and infinities give undefined. */
export function roundDecimals(x: number, places = 6): number | undefined {
  if (!Number.isInteger(places) || places < 0 || places > 15) throw new RangeError(`'places' must be an integer in [0, 15]; got ${places}`);
  if (!Number.isFinite(x)) return undefined;
  const scale = 10 ** places;
  const r = Math.round(x * scale) / scale;
  // Past 2^53 / scale the product loses integer precision; the value is already as exact as a double allows.
  const out = Number.isFinite(r) && Math.abs(x) < Number.MAX_SAFE_INTEGER / scale ? r : x;
  return out === 0 ? 0 : out;
}

/** Zone keys in display order: the six lung zones right then left, upper to lower, then others by code point. */
export function orderZoneKeys(keys: Iterable<string>): string[] {
  return [...keys].sort((a, b) => {
    const ia = ZONE_ORDER.indexOf(a);
    const ib = ZONE_ORDER.indexOf(b);
    if (ia >= 0 || ib >= 0) return (ia < 0 ? Infinity : ia) - (ib < 0 ? Infinity : ib);
    return a < b ? -1 : a > b ? 1 : 0;
  });
}

/** Finding (or any other) keys by code point, independent of insertion order and locale. */
export function orderKeys(keys: Iterable<string>): string[] {
  return [...keys].sort((a, b) => (a < b ? -1 : a > b ? 1 : 0));
}

/** The footer every table file carries. */
export function researchFooter(summary: Pick<ScoreSummary, 'synthetic_set'>): string {
  return summary.synthetic_set
    ? 'Research use only; not a medical device. The sample set is synthetic.'
    : 'Research use only; not a medical device.';
}

/** One CSV field per RFC 4180: quoted when it holds a quote, comma, CR or LF (or edge spaces), quotes doubled. */
export function csvField(value: string): string {
  return /[",\r\n]|^\s|\s$/.test(value) ? `"${value.replace(/"/g, '""')}"` : value;
}

/** One CSV record terminated by CRLF, as RFC 4180 specifies. */
export function csvLine(fields: readonly string[]): string {
  return fields.map(csvField).join(',') + '\r\n';
}

/** A CSV cell for a number: 6 significant digits, empty for undefined, NaN or infinities. */
export function csvNumber(x: number | undefined): string {
  const r = x === undefined ? undefined : roundSignificant(x);
  return r === undefined ? '' : String(r);
}

/** A CSV cell for a flag: 1 or 0, empty for undefined. */
export function csvFlag(x: boolean | undefined): string {
  return x === undefined ? '' : x ? '1' : '0';
}
