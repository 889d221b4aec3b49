import { orderKeys, orderZoneKeys } from './export-format';
import type { ModelSummary, RateSummary, ScoreSummary } from './types';

/**
 * The four score tables as plain text cells, shared by the Markdown and LaTeX writers so both
 * files show the same numbers. Cells are unescaped; each writer escapes for its format.
 */

export interface TableColumn {
  readonly md: string; // header as Markdown
  readonly tex: string; // header as LaTeX (already escaped)
  readonly align: 'l' | 'r'; // 'l' for names (free text), 'r' for numbers we format ourselves
}

export interface TableContent {
  readonly id: string; // 'Table 1' ...
  readonly title: string;
  readonly note: string; // one plain sentence under the table
  readonly columns: readonly TableColumn[];
  readonly rows: readonly (readonly string[])[];
  readonly empty: string; // said instead of the table when there are no rows
}

export const MISSING = 'n/a';

const col = (md: string, tex: string, align: 'l' | 'r' = 'r'): TableColumn => ({ md, tex, align });

const fixed = (x: number | undefined, places: number): string => (x === undefined || !Number.isFinite(x) ? MISSING : (x === 0 ? 0 : x).toFixed(places));
const rate3 = (x: number | undefined): string => fixed(x, 3);
const interval = (ci: readonly [number, number] | undefined): string => (ci ? `[${rate3(ci[0])}, ${rate3(ci[1])}]` : MISSING);
const signed3 = (x: number | undefined): string => (x === undefined || !Number.isFinite(x) ? MISSING : `${x > 0 ? '+' : ''}${fixed(x, 3)}`);

/** p-values at three decimals, '<0.001' below that (common practice for reporting). */
export function formatP(p: number | undefined): string {
  if (p === undefined || !Number.isFinite(p)) return MISSING;
  return p < 0.001 ? '<0.001' : p.toFixed(3);
}

function retrievalColumns(prefix: string, texPrefix: string): TableColumn[] {
  return [
    col(`${prefix}I→R R@1`, `${texPrefix}I$\\to$R R@1`),
    col(`${prefix}I→R R@5`, `${texPrefix}I$\\to$R R@5`),
    col(`${prefix}R→I R@1`, `${texPrefix}R$\\to$I R@1`),
    col(`${prefix}R→I R@5`, `${texPrefix}R$\\to$I R@5`),
  ];
}

function retrievalCells(r: Omit<ModelSummary['retrieval'], 'global'> | undefined): string[] {
  return [r?.image_to_report_r1, r?.image_to_report_r5, r?.report_to_image_r1, r?.report_to_image_r5].map(rate3);
}

function modelTable(summary: ScoreSummary): TableContent {
  const withGlobal = summary.models.some((m) => m.retrieval.global !== undefined);
  const columns = [
    col('Model', 'Model', 'l'),
    col('Aggregator', 'Aggregator', 'l'),
    col('Hit rule', 'Hit rule', 'l'),
    col('n', '$n$'),
    col('Rate', 'Rate'),
    col('Wilson 95%', 'Wilson 95\\%'),
    col('Bootstrap 95%', 'Bootstrap 95\\%'),
    col('Chance', 'Chance'),
    col('Lift', 'Lift'),
    col('Top-k', 'Top-$k$'),
    col('Mass in box', 'Mass in box'),
    col('CNR', 'CNR'),
    col('Lat. swap', 'Lat.\\ swap'),
    ...retrievalColumns('', ''),
    ...(withGlobal ? retrievalColumns('Global ', 'Global ') : []),
  ];
  const rows = summary.models.map((m) => [
    m.id,
    m.aggregator,
    m.hit_rule,
    String(m.grounding.n),
    rate3(m.grounding.rate),
    interval(m.grounding.wilson95),
    interval(m.grounding.bootstrap95),
    rate3(m.grounding.chance),
    fixed(m.grounding.lift, 2),
    rate3(m.top_k_rate),
    rate3(m.mean_mass_in_boxes),
    fixed(m.mean_cnr, 2),
    rate3(m.laterality_swap_rate),
    ...retrievalCells(m.retrieval),
    ...(withGlobal ? retrievalCells(m.retrieval.global) : []),
  ]);
  return {
    id: 'Table 1',
    title: 'Grounding and retrieval per model',
    note:
      `Rate: share of scored sentences (with a reference box, not negated) whose best cell hits a box under the model's hit rule. ` +
      `Wilson 95% treats sentences as independent; bootstrap 95% resamples studies (seed ${summary.seed}). ` +
      `Lift = rate / chance. Lat. swap: share of misses whose best cell lies in the mirror-image zone. ` +
      `Retrieval: recall at 1 and 5, image to report (I→R) and report to image (R→I)` +
      (withGlobal ? ', from the local score and from the global (mean-pooled) score.' : ', from the local score.'),
    columns,
    rows,
    empty: 'No models were scored.',
  };
}

function groupTable(
  summary: ScoreSummary,
  id: string,
  title: string,
  label: string,
  pick: (m: ModelSummary) => Readonly<Record<string, RateSummary>>,
  order: (keys: Iterable<string>) => string[],
): TableContent {
  const keys = order(new Set(summary.models.flatMap((m) => Object.keys(pick(m)))));
  const rows: string[][] = [];
  for (const k of keys) {
    for (const m of summary.models) {
      const r = pick(m)[k];
      if (!r) continue;
      rows.push([k, m.id, String(r.n), rate3(r.rate), interval(r.wilson95), rate3(r.chance), fixed(r.lift, 2)]);
    }
  }
  return {
    id,
    title,
    note: "Rate under each model's hit rule with its Wilson 95% interval; chance is the mean chance level of the group's sentences; lift = rate / chance.",
    columns: [col(label, label, 'l'), col('Model', 'Model', 'l'), col('n', '$n$'), col('Rate', 'Rate'), col('Wilson 95%', 'Wilson 95\\%'), col('Chance', 'Chance'), col('Lift', 'Lift')],
    rows,
    empty: `No scored sentences carry a ${label.toLowerCase()}.`,
  };
}

function comparisonTable(summary: ScoreSummary): TableContent {
  return {
    id: 'Table 4',
    title: 'Paired comparisons of models',
    note: `Diff = rate(A) - rate(B) over sentences both models scored; bootstrap 95% resamples studies (seed ${summary.seed}); McNemar p is exact (two-sided) on the discordant pairs.`,
    columns: [
      col('A', 'A', 'l'), col('B', 'B', 'l'), col('Pairs', 'Pairs'), col('Diff (A-B)', 'Diff (A$-$B)'), col('Bootstrap 95%', 'Bootstrap 95\\%'),
      col('McNemar p', 'McNemar $p$'), col('A hit, B miss', 'A hit, B miss'), col('B hit, A miss', 'B hit, A miss'),
    ],
    rows: summary.comparisons.map((c) => [
      c.a, c.b, String(c.n_pairs), signed3(c.diff), interval(c.bootstrap95), formatP(c.mcnemar_p), String(c.b_only_a), String(c.c_only_b),
    ]),
    empty: 'No paired comparisons: fewer than two models were scored.',
  };
}

/** Tables 1-4 of a score run: per model, by zone, by finding, paired comparisons. */
export function buildTables(summary: ScoreSummary): TableContent[] {
  return [
    modelTable(summary),
    groupTable(summary, 'Table 2', 'Grounding by zone', 'Zone', (m) => m.by_zone, orderZoneKeys),
    groupTable(summary, 'Table 3', 'Grounding by finding', 'Finding', (m) => m.by_finding, orderKeys),
    comparisonTable(summary),
  ];
}

/** One line naming the run: set, studies, seed, skipped studies. */
export function runLine(summary: ScoreSummary): string {
  const skipped = summary.skipped.length;
  return `Set: ${summary.set}; studies: ${summary.n_studies}; seed: ${summary.seed}; skipped studies: ${skipped}.`;
}
