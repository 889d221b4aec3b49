import { describe, expect, it } from 'vitest';
import { roundDecimals, roundSignificant, orderZoneKeys } from './export-format';
import { modelSummary, scoreSummary } from './export-fixtures.test-util';
import { serialiseSummary } from './export-summary-json';
import type { ScoreSummary } from './types';

function reverseKeys<T>(value: T): T {
  if (Array.isArray(value)) return value.map(reverseKeys) as T;
  if (value && typeof value === 'object') {
    return Object.fromEntries(Object.entries(value).reverse().map(([k, v]) => [k, reverseKeys(v)])) as T;
  }
  return value;
}

describe('serialiseSummary', () => {
  it('serialiseSummary(summary) is valid JSON with the contract keys in order and a final newline', () => {
    const text = serialiseSummary(scoreSummary());
    expect(text.endsWith('}\n')).toBe(true);
    const parsed = JSON.parse(text);
    expect(Object.keys(parsed)).toEqual(['schema', 'set', 'n_studies', 'seed', 'models', 'comparisons', 'skipped', 'synthetic_set']);
    expect(parsed.schema).toBe('tessera.summary/1');
    expect(Object.keys(parsed.models[0]).slice(0, 4)).toEqual(['id', 'aggregator', 'hit_rule', 'grounding']);
    expect(Object.keys(parsed.models[0].grounding)).toEqual(['n', 'hits', 'rate', 'wilson95', 'chance', 'lift', 'bootstrap95']);
    expect(Object.keys(parsed.models[0].by_rule)).toEqual(['centre', 'overlap', 'upsampled']);
    expect(Object.keys(parsed.models[0].retrieval).at(-1)).toBe('global');
    expect(Object.keys(parsed.comparisons[0])).toEqual(['a', 'b', 'n_pairs', 'diff', 'bootstrap95', 'mcnemar_p', 'b_only_a', 'c_only_b']);
  });

  it('serialiseSummary gives byte-identical text for the same summary built with keys in another order', () => {
    const a = serialiseSummary(scoreSummary());
    expect(serialiseSummary(scoreSummary())).toBe(a);
    expect(serialiseSummary(reverseKeys(scoreSummary()))).toBe(a);
  });

  it('serialiseSummary writes undefined and NaN as null, rounds to 6 significant digits, keeps counts exact', () => {
    const s = scoreSummary({
      n_studies: 123456789,
      models: [modelSummary('m', 7, { mean_cnr: NaN, top_k_rate: undefined, mean_mass_in_boxes: 0.123456789 })],
    });
    const parsed = JSON.parse(serialiseSummary(s));
    expect(parsed.n_studies).toBe(123456789);
    expect(parsed.models[0].mean_cnr).toBeNull();
    expect(parsed.models[0].top_k_rate).toBeNull();
    expect(parsed.models[0].mean_mass_in_boxes).toBe(0.123457);
    expect(parsed.models[0].by_finding['(unlabelled)'].rate).toBeNull();
    expect(parsed.models[0].by_finding['(unlabelled)'].wilson95).toBeNull();
    expect(parsed.comparisons[0].mcnemar_p).toBe(0.000123457);
  });

  it('serialiseSummary orders zones anatomically and findings by code point', () => {
    const parsed = JSON.parse(serialiseSummary(scoreSummary()));
    expect(Object.keys(parsed.models[0].by_zone)).toEqual(['right-upper', 'left-lower', 'cardiac']);
    expect(Object.keys(parsed.models[0].by_finding)).toEqual(['(unlabelled)', 'effusion_50%', 'nodule']);
  });

  it('serialiseSummary keeps integer-like group keys in the stated order and carries unknown extra fields', () => {
    const base = modelSummary('m', 5);
    const s = { ...scoreSummary({ models: [{ ...base, by_finding: { b: base.by_finding.nodule, '10': base.by_finding.nodule, '9': base.by_finding.nodule } }] }), extra_note: 'x' } as ScoreSummary;
    const text = serialiseSummary(s);
    expect(text.indexOf('"10"')).toBeLessThan(text.indexOf('"9"'));
    expect(text.indexOf('"9"')).toBeLessThan(text.indexOf('"b"'));
    expect(JSON.parse(text).extra_note).toBe('x');
    expect(text.indexOf('"extra_note"')).toBeGreaterThan(text.indexOf('"synthetic_set"'));
  });

  it('serialiseSummary puts intervals on one line', () => {
    expect(serialiseSummary(scoreSummary())).toContain('"wilson95": [0.3, 0.85]');
  });

  it('serialiseSummary of a summary with no models writes empty lists', () => {
    const parsed = JSON.parse(serialiseSummary(scoreSummary({ models: [], comparisons: [], skipped: [] })));
    expect(parsed.models).toEqual([]);
    expect(parsed.comparisons).toEqual([]);
  });
});

describe('export number formatting', () => {
  it('roundSignificant(x) keeps 6 significant digits, integers exact, non-finite as undefined', () => {
    expect(roundSignificant(1 / 3)).toBe(0.333333);
    expect(roundSignificant(123456.789)).toBe(123457);
    expect(roundSignificant(1.23456789e-12)).toBe(1.23457e-12);
    expect(roundSignificant(2 ** 60)).toBe(2 ** 60);
    expect(Object.is(roundSignificant(-0), 0)).toBe(true);
    expect(Object.is(roundSignificant(-1e-30, 2), -1e-30)).toBe(true);
    expect(roundSignificant(NaN)).toBeUndefined();
    expect(roundSignificant(Infinity)).toBeUndefined();
  });

  it('roundDecimals(x) keeps 6 decimal places and prints as the short decimal', () => {
    expect(String(roundDecimals(0.1234567891))).toBe('0.123457');
    expect(Object.is(roundDecimals(-0.0000001), 0)).toBe(true);
    expect(roundDecimals(1e300)).toBe(1e300);
    expect(roundDecimals(NaN)).toBeUndefined();
    for (let k = -1000; k <= 1000; k += 7) expect(String(roundDecimals(k / 1e6 + 1e-9))).toBe(String(k / 1e6));
  });

  it('orderZoneKeys puts lung zones first in anatomical order, then other structures, then unknown keys', () => {
    expect(orderZoneKeys(['zzz', 'other', 'left-upper', 'aaa', 'right-lower', 'cardiac'])).toEqual(['right-lower', 'left-upper', 'cardiac', 'other', 'aaa', 'zzz']);
  });
});
