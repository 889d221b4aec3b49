import { csvLine, csvNumber, HIT_RULE_ORDER, orderKeys, orderZoneKeys } from './export-format';
import type { ModelSummary, RateSummary, ScoreSummary } from './types';

/** Column names of summary.csv, in order. */
export const SUMMARY_CSV_COLUMNS = [
  'model', 'aggregator', 'hit_rule', 'group', 'n', 'hits', 'rate', 'wilson_lo', 'wilson_hi',
  'bootstrap_lo', 'bootstrap_hi', 'chance', 'lift',
] as const;

/** Column names of comparisons.csv, in order. */
export const COMPARISONS_CSV_COLUMNS = [
  'model_a', 'model_b', 'n_pairs', 'diff', 'bootstrap_lo', 'bootstrap_hi', 'mcnemar_p', 'a_hit_b_miss', 'b_hit_a_miss',
] as const;

function rateRow(m: ModelSummary, group: string, r: RateSummary, extra: { boot?: readonly [number, number]; lift: number | undefined }): string[] {
  return [
    m.id,
    m.aggregator,
    m.hit_rule,
    group,
    String(r.n),
    String(r.hits),
    csvNumber(r.rate),
    csvNumber(r.wilson95?.[0]),
    csvNumber(r.wilson95?.[1]),
    csvNumber(extra.boot?.[0]),
    csvNumber(extra.boot?.[1]),
    csvNumber(r.chance),
    csvNumber(extra.lift),
  ];
}

/**
 * summary.csv text: a header, then per model (in summary order) the groups 'overall',
 * 'zone:NAME' (anatomical order), 'finding:NAME' (code-point order) and 'rule:centre|overlap|upsampled'.
 * The study-bootstrap interval exists for 'overall' only and is empty elsewhere; lifts come from the
 * summary. RFC 4180, CRLF line ends.
 */
export function summaryCsv(summary: ScoreSummary): string {
  let out = csvLine(SUMMARY_CSV_COLUMNS);
  for (const m of summary.models) {
    out += csvLine(rateRow(m, 'overall', m.grounding, { boot: m.grounding.bootstrap95, lift: m.grounding.lift }));
    for (const z of orderZoneKeys(Object.keys(m.by_zone))) {
      const r = m.by_zone[z];
      out += csvLine(rateRow(m, `zone:${z}`, r, { lift: r.lift }));
    }
    for (const f of orderKeys(Object.keys(m.by_finding))) {
      const r = m.by_finding[f];
      out += csvLine(rateRow(m, `finding:${f}`, r, { lift: r.lift }));
    }
    for (const rule of HIT_RULE_ORDER) {
      const r = m.by_rule?.[rule];
      if (r) out += csvLine(rateRow(m, `rule:${rule}`, r, { lift: r.lift }));
    }
  }
  return out;
}

/**
 * comparisons.csv text: a header and one row per paired comparison (a - b over shared scored
 * sentences), with the study-bootstrap interval, exact McNemar p and both discordant counts.
 * With fewer than two models it is the header alone.
 */
export function comparisonsCsv(summary: ScoreSummary): string {
  let out = csvLine(COMPARISONS_CSV_COLUMNS);
  for (const c of summary.comparisons) {
    out += csvLine([
      c.a,
      c.b,
      String(c.n_pairs),
      csvNumber(c.diff),
      csvNumber(c.bootstrap95?.[0]),
      csvNumber(c.bootstrap95?.[1]),
      csvNumber(c.mcnemar_p),
      String(c.b_only_a),
      String(c.c_only_b),
    ]);
  }
  return out;
}
