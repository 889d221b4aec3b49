import { describe, expect, it } from 'vitest';
import { parseCsv } from './csv-parse.test-util';
import { scoreSummary } from './export-fixtures.test-util';
import { COMPARISONS_CSV_COLUMNS, SUMMARY_CSV_COLUMNS, comparisonsCsv, summaryCsv } from './export-summary-csv';

function asObjects(text: string): Record<string, string>[] {
  const [header, ...rows] = parseCsv(text);
  return rows.map((r) => Object.fromEntries(header.map((h, i) => [h, r[i]])));
}

describe('summaryCsv', () => {
  it('summaryCsv(summary) writes overall, zone, finding and rule groups per model in a fixed order', () => {
    const rows = asObjects(summaryCsv(scoreSummary()));
    expect(Object.keys(rows[0])).toEqual([...SUMMARY_CSV_COLUMNS]);
    const groupsA = rows.filter((r) => r.model === 'demo-a').map((r) => r.group);
    expect(groupsA).toEqual([
      'overall', 'zone:right-upper', 'zone:left-lower', 'zone:cardiac',
      'finding:(unlabelled)', 'finding:effusion_50%', 'finding:nodule',
      'rule:centre', 'rule:overlap', 'rule:upsampled',
    ]);
    expect(rows.length).toBe(20);
  });

  it('summaryCsv puts the bootstrap interval on the overall row only and the lift as rate / chance', () => {
    const rows = asObjects(summaryCsv(scoreSummary()));
    const overall = rows[0];
    expect(overall).toMatchObject({ model: 'demo-a', aggregator: 'max', hit_rule: 'centre', n: '10', hits: '7', rate: '0.7', wilson_lo: '0.3', wilson_hi: '0.85', bootstrap_lo: '0.35', bootstrap_hi: '0.8', chance: '0.125', lift: '5.6' });
    const zone = rows.find((r) => r.group === 'zone:left-lower')!;
    expect(zone).toMatchObject({ n: '4', hits: '3', rate: '0.75', bootstrap_lo: '', bootstrap_hi: '', chance: '0.1', lift: '7.5' });
    const empty = rows.find((r) => r.group === 'finding:(unlabelled)')!;
    expect(empty).toMatchObject({ n: '0', rate: '', wilson_lo: '', chance: '', lift: '' });
  });

  it('summaryCsv with no models is the header alone', () => {
    expect(summaryCsv(scoreSummary({ models: [] }))).toBe(SUMMARY_CSV_COLUMNS.join(',') + '\r\n');
  });
});

describe('comparisonsCsv', () => {
  it('comparisonsCsv(summary) writes one row per paired comparison with discordant counts', () => {
    const rows = asObjects(comparisonsCsv(scoreSummary()));
    expect(Object.keys(rows[0])).toEqual([...COMPARISONS_CSV_COLUMNS]);
    expect(rows).toEqual([{ model_a: 'demo-a', model_b: 'demo_b', n_pairs: '10', diff: '0.3', bootstrap_lo: '0', bootstrap_hi: '0.6', mcnemar_p: '0.000123457', a_hit_b_miss: '4', b_hit_a_miss: '1' }]);
  });

  it('comparisonsCsv with no comparisons is the header alone', () => {
    expect(parseCsv(comparisonsCsv(scoreSummary({ comparisons: [] })))).toEqual([[...COMPARISONS_CSV_COLUMNS]]);
  });
});
