import { describe, expect, it } from 'vitest';
import type { FileSink } from '../dataset/types';
import { scoreSummary, sentenceRecords, similarityDump } from './export-fixtures.test-util';
import { ScoreOutputError, writeScoreOutputs } from './write-score-outputs';

function memorySink(fail: (path: string) => boolean = () => false): FileSink & { files: Map<string, Uint8Array | string> } {
  const files = new Map<string, Uint8Array | string>();
  return {
    files,
    async writeFile(path, data) {
      if (fail(path)) throw new Error(`disk full writing ${path}`);
      files.set(path, data);
    },
  };
}

describe('writeScoreOutputs', () => {
  it('writeScoreOutputs(summary, records, undefined, sink) writes the tables, CSVs, summary and four figures', async () => {
    const sink = memorySink();
    const written = await writeScoreOutputs(scoreSummary(), sentenceRecords(), undefined, sink);
    expect(written).toEqual([
      'summary.json', 'sentences.csv', 'summary.csv', 'comparisons.csv', 'tables.md', 'tables.tex',
      'figures/grounding-by-model.png', 'figures/grounding-by-zone.png', 'figures/grounding-by-finding.png', 'figures/best-cell-distance.png',
    ]);
    expect([...sink.files.keys()]).toEqual(written);
    expect(typeof sink.files.get('summary.json')).toBe('string');
    expect(sink.files.get('figures/grounding-by-model.png')).toBeInstanceOf(Uint8Array);
  });

  it('writeScoreOutputs writes similarity.jsonl only when dumps are given', async () => {
    const sink = memorySink();
    await writeScoreOutputs(scoreSummary(), sentenceRecords(), [similarityDump(), similarityDump({ sentence: 1 })], sink);
    const text = sink.files.get('similarity.jsonl') as string;
    expect(text.trimEnd().split('\n').length).toBe(2);
  });

  it('writeScoreOutputs gives the same bytes for the same inputs', async () => {
    const a = memorySink();
    const b = memorySink();
    await writeScoreOutputs(scoreSummary(), sentenceRecords(), [similarityDump()], a);
    await writeScoreOutputs(scoreSummary(), sentenceRecords(), [similarityDump()], b);
    for (const [path, data] of a.files) {
      const other = b.files.get(path)!;
      if (typeof data === 'string') expect(other).toBe(data);
      else expect(Buffer.from(data).equals(Buffer.from(other as Uint8Array))).toBe(true);
    }
  });

  it('writeScoreOutputs attempts every file and reports all failures together', async () => {
    const sink = memorySink((p) => p === 'summary.csv' || p.endsWith('zone.png'));
    const err = await writeScoreOutputs(scoreSummary(), sentenceRecords(), undefined, sink).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(ScoreOutputError);
    const e = err as ScoreOutputError;
    expect(e.code).toBe('output-write');
    expect(e.problems.map((p) => p.path)).toEqual(['summary.csv', 'figures/grounding-by-zone.png']);
    expect(e.message).toContain('Fix:');
    expect(sink.files.has('tables.tex')).toBe(true);
  });
});
