import type { FileSink } from '../dataset/types';
import { renderFigures } from './export-figures';
import { sentencesCsv } from './export-sentences-csv';
import { comparisonsCsv, summaryCsv } from './export-summary-csv';
import { serialiseSummary } from './export-summary-json';
import { similarityJsonl } from './export-similarity-jsonl';
import { tablesLatex } from './export-tables-tex';
import { tablesMarkdown } from './export-tables-md';
import type { ScoreSummary, SentenceRecord, SimilarityDump } from './types';

/** One output file that could not be written. */
export interface OutputProblem {
  readonly path: string;
  readonly message: string;
}

/** Writing score outputs failed for one or more files; every failed file is listed. */
export class ScoreOutputError extends Error {
  readonly code = 'output-write';
  readonly problems: readonly OutputProblem[];
  constructor(problems: readonly OutputProblem[], cause: unknown) {
    super(
      `Could not write ${problems.length} score output file(s): ` +
        problems.map((p) => `${p.path}: ${p.message}`).join('; ') +
        '. Fix: check that the output folder is writable and has free space, then run the command again.',
      { cause },
    );
    this.name = 'ScoreOutputError';
    this.problems = problems;
  }
}

/** Paths written by writeScoreOutputs, relative to the output folder, in writing order. */
export const SCORE_OUTPUT_FILES = ['summary.json', 'sentences.csv', 'summary.csv', 'comparisons.csv', 'tables.md', 'tables.tex'] as const;

/**
 * Writes a score run's files through `sink`: summary.json, sentences.csv, summary.csv,
 * comparisons.csv, tables.md, tables.tex, figures/*.png and, when `dumps` is given,
 * similarity.jsonl. Every file is attempted even if one fails; failures are then thrown together
 * as a ScoreOutputError. Resolves to the paths written, in order. Same inputs, same bytes.
 */
export async function writeScoreOutputs(
  summary: ScoreSummary,
  records: readonly SentenceRecord[],
  dumps: Iterable<SimilarityDump> | undefined,
  sink: FileSink,
): Promise<string[]> {
  const files: [string, () => string | Uint8Array][] = [
    ['summary.json', () => serialiseSummary(summary)],
    ['sentences.csv', () => sentencesCsv(records)],
    ['summary.csv', () => summaryCsv(summary)],
    ['comparisons.csv', () => comparisonsCsv(summary)],
    ['tables.md', () => tablesMarkdown(summary)],
    ['tables.tex', () => tablesLatex(summary)],
  ];
  for (const f of renderFigures(summary, records)) files.push([`figures/${f.name}`, () => f.png]);
  if (dumps !== undefined) files.push(['similarity.jsonl', () => similarityJsonl(dumps)]);

  const written: string[] = [];
  const problems: OutputProblem[] = [];
  const causes: unknown[] = [];
  for (const [path, make] of files) {
    try {
      await sink.writeFile(path, make());
      written.push(path);
    } catch (err) {
      problems.push({ path, message: err instanceof Error ? err.message : String(err) });
      causes.push(err);
    }
  }
  if (problems.length > 0) throw new ScoreOutputError(problems, causes.length === 1 ? causes[0] : new AggregateError(causes));
  return written;
}
