import { describe, expect, it } from 'vitest';
import { similarityDump } from './export-fixtures.test-util';
import { similarityJsonl, similarityJsonlLine } from './export-similarity-jsonl';

describe('similarityJsonlLine', () => {
  it('similarityJsonlLine(dump) is one JSON line with the contract keys in order', () => {
    const line = similarityJsonlLine(similarityDump());
    expect(line).not.toContain('\n');
    const parsed = JSON.parse(line);
    expect(Object.keys(parsed)).toEqual(['model', 'study', 'sentence', 'negated', 'grid', 'values', 'cells', 'boxes']);
    expect(Object.keys(parsed.grid)).toEqual(['h', 'w']);
  });

  it('similarityJsonlLine rounds numbers to 6 decimals and writes -0 and NaN as 0 and null', () => {
    const line = similarityJsonlLine(similarityDump({ values: [0.1234567891, -0.5, 1 / 3, -0.0000001] }));
    expect(line).toContain('"values":[0.123457,-0.5,0.333333,0]');
    expect(JSON.parse(similarityJsonlLine(similarityDump({ values: [NaN, 1, 2, Infinity] }))).values).toEqual([null, 1, 2, null]);
    expect(line).toContain('"cells":[[0,0,12.5,12.5],');
    expect(line).toContain('"boxes":[[1,2,3,4]]');
  });

  it('similarityJsonlLine is deterministic for the same dump', () => {
    expect(similarityJsonlLine(similarityDump())).toBe(similarityJsonlLine(similarityDump()));
  });

  it('similarityJsonlLine rejects a value or cell count that does not match the grid', () => {
    expect(() => similarityJsonlLine(similarityDump({ values: [1, 2, 3] }))).toThrow(/'dump.values'.*got 3/);
    expect(() => similarityJsonlLine(similarityDump({ cells: [] }))).toThrow(/'dump.cells'/);
  });

  it('similarityJsonl joins lines with a newline after each, and is empty for no dumps', () => {
    expect(similarityJsonl([])).toBe('');
    const text = similarityJsonl([similarityDump(), similarityDump({ sentence: 1, negated: true })]);
    const lines = text.split('\n');
    expect(lines.length).toBe(3);
    expect(lines[2]).toBe('');
    expect(JSON.parse(lines[1]).negated).toBe(true);
  });
});
