import type { CommandIo } from './io';
import type { Shard } from '../batch/shard-file';
import type { HitRule } from '../core/types';
import { buildSummary } from '../batch/summarise';
import { parseAggregator } from '../core/pool-regions';
import { writeScoreOutputs } from '../batch/write-score-outputs';
import { createNodeFileSink } from '../dataset/node-file-source';

/** Summarises a whole (or merged) run and writes every output file of `score` into `outDir`. */
export async function writeRunOutputs(shard: Shard, outDir: string, io: CommandIo): Promise<void> {
  const { settings, run } = shard;
  const summary = buildSummary(run.runs, {
    aggregator: parseAggregator(settings.aggregator),
    hitRule: settings.hitRule as HitRule,
    seed: settings.seed,
    setName: settings.set,
    syntheticSet: shard.syntheticSet,
    nStudies: run.nStudies,
    skipped: [...run.setSkipped, ...run.failures.map((f) => ({ study: f.study, reason: f.reason }))],
  });
  const records = run.runs.flatMap((r) => r.records);
  const dumps = settings.dumpSimilarity ? run.runs.flatMap((r) => r.dumps) : undefined;
  await writeScoreOutputs(summary, records, dumps, createNodeFileSink(outDir));
  for (const m of summary.models) {
    const g = m.grounding;
    const pct = (v: number | undefined): string => (v === undefined ? 'n/a' : `${(100 * v).toFixed(1)}%`);
    const ci = g.wilson95 ? ` [${pct(g.wilson95[0])}, ${pct(g.wilson95[1])}]` : '';
    io.stderr(`${m.id}: ${g.hits}/${g.n} sentences hit (${m.hit_rule}) = ${pct(g.rate)}${ci}; chance ${pct(g.chance)}`);
  }
  io.stderr(`wrote ${outDir}/summary.json, sentences.csv, summary.csv, comparisons.csv, tables.md, tables.tex, figures/${dumps ? ', similarity.jsonl' : ''}`);
}
