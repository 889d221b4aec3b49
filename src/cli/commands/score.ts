import { mkdir, writeFile } from 'node:fs/promises';
import { homedir } from 'node:os';
import { basename, join, resolve } from 'node:path';
import type { CommandIo } from '../io';
import { progressPrinter } from '../io';
import { integerOption, parseArgs, required, single, UsageError } from '../parse-args';
import type { HitRule } from '../../core/types';
import { formatAggregator, parseAggregator } from '../../core/pool-regions';
import { openSet } from '../../batch/study-inputs';
import { scoreSet, type StudyEncoder } from '../../batch/score-set';
import { serialiseShard, type RunSettings, type Shard } from '../../batch/shard-file';
import { toStudyEncoder } from '../../batch/study-encoder';
import { createNodeFileSource } from '../../dataset/node-file-source';
import { openModelFolder } from '../../model/model-folder';
import { ModelContractError, formatProblem } from '../../model/contract';
import { createOrtNodeEngine } from '../../model/adapters/ort-node';
import { createTokenizerFromJson } from '../../model/adapters/hf-tokenizer';
import { createDiskImageStore } from '../disk-image-store';
import { writeRunOutputs } from '../run-outputs';

const HIT_RULES: readonly HitRule[] = ['centre', 'overlap', 'upsampled'];

function parseShardOption(text: string | undefined): { index: number; count: number } | undefined {
  if (text === undefined) return undefined;
  const m = /^(\d+)\/(\d+)$/.exec(text);
  const index = m ? Number(m[1]) : NaN;
  const count = m ? Number(m[2]) : NaN;
  if (!m || count < 1 || index < 1 || index > count) throw new UsageError(`--shard must be K/N with 1 <= K <= N, e.g. 2/4; got '${text}'`);
  return { index, count };
}

function defaultCacheDir(): string {
  const base = process.env.XDG_CACHE_HOME || join(homedir(), '.cache');
  return join(base, 'tessera', 'embeddings');
}

/** `score`: grounding and retrieval of one or more models over a sample set. */
export async function runScore(argv: string[], io: CommandIo): Promise<number> {
  const args = parseArgs(argv, {
    valued: ['model', 'set', 'out', 'aggregator', 'hit', 'tolerance', 'top-k', 'seed', 'shard', 'cache', 'retrieval-pool', 'threads'],
    flags: ['dump-similarity', 'no-cache'],
  });
  if (args.positional.length > 0) throw new UsageError(`unexpected argument '${args.positional[0]}'`);
  const modelDirs = args.options.get('model') ?? [];
  if (modelDirs.length === 0) throw new UsageError('--model DIR is required (repeat it to compare models)');
  const setDir = required(args, 'set');
  const out = required(args, 'out');
  let aggregator;
  try {
    aggregator = parseAggregator(single(args, 'aggregator') ?? 'max');
  } catch (err) {
    throw new UsageError(`--aggregator: ${(err as Error).message}`);
  }
  const hitRule = (single(args, 'hit') ?? 'centre') as HitRule;
  if (!HIT_RULES.includes(hitRule)) throw new UsageError(`--hit must be one of ${HIT_RULES.join(', ')}; got '${hitRule}'`);
  const tolerancePx = Number(single(args, 'tolerance') ?? '0');
  if (!Number.isFinite(tolerancePx) || tolerancePx < 0) throw new UsageError(`--tolerance must be a number of pixels >= 0; got '${single(args, 'tolerance')}'`);
  const topK = integerOption(args, 'top-k', 5, 1);
  const seed = integerOption(args, 'seed', 0, 0, 2 ** 31 - 1);
  const retrievalPool = integerOption(args, 'retrieval-pool', 256, 2);
  const threads = integerOption(args, 'threads', 2, 1, 64);
  const shard = parseShardOption(single(args, 'shard'));
  const dumpSimilarity = args.options.has('dump-similarity');
  const noCache = args.options.has('no-cache');
  if (noCache && args.options.has('cache')) throw new UsageError('give --cache DIR or --no-cache, not both');

  const engine = await createOrtNodeEngine({ threads });
  const encoders: StudyEncoder[] = [];
  const ids = new Set<string>();
  let contractFailed = false;
  for (const dir of modelDirs) {
    try {
      const dual = await openModelFolder(createNodeFileSource(resolve(dir)), engine, { threads, tokenizerFactory: createTokenizerFromJson });
      let id = dual.manifest.id;
      if (ids.has(id)) id = `${id}@${basename(resolve(dir))}`;
      ids.add(id);
      encoders.push(toStudyEncoder(dual, id));
    } catch (err) {
      contractFailed = true;
      if (err instanceof ModelContractError) for (const p of err.problems) io.stderr(`tessera score: ${dir}: ${formatProblem(p)}`);
      else io.stderr(`tessera score: ${dir}: ${(err as Error).message}`);
    }
  }
  if (contractFailed) return 2;

  const controller = new AbortController();
  const onSigint = (): void => {
    io.stderr('tessera score: stopping after the current study (Ctrl-C again to quit at once); no outputs will be written');
    controller.abort(new Error('cancelled by the user'));
    process.once('SIGINT', () => process.exit(130));
  };
  process.once('SIGINT', onSigint);
  try {
    const set = await openSet(createNodeFileSource(resolve(setDir)), { signal: controller.signal });
    // Each problem's message already names its file, item and fix.
    for (const p of set.problems) io.stderr(`tessera score: ${p.message}`);
    const progress = progressPrinter(io);
    const label = shard ? `scoring shard ${shard.index}/${shard.count}` : 'scoring';
    const run = await scoreSet(set, encoders, {
      aggregator,
      hitRule,
      tolerancePx,
      topK,
      dumpSimilarity,
      retrievalPool,
      seed,
      shard,
      signal: controller.signal,
      store: noCache ? undefined : createDiskImageStore(single(args, 'cache') ?? defaultCacheDir()),
      onProgress: (p) => progress(label, p.done, p.total),
    });
    for (const f of run.failures) io.stderr(`tessera score: skipped study '${f.study}': ${f.reason}`);
    io.stderr(`image embeddings: ${run.encodings.computed} encoded, ${run.encodings.fromStore} read from the cache`);
    const settings: RunSettings = {
      set: set.manifest.name,
      models: encoders.map((e) => ({ id: e.id, hash: e.hash })),
      aggregator: formatAggregator(aggregator),
      hitRule,
      tolerancePx,
      topK,
      seed,
      retrievalPool,
      dumpSimilarity,
    };
    const result: Shard = { settings, shard: shard ?? { index: 1, count: 1 }, syntheticSet: set.manifest.synthetic, run };
    if (shard) {
      await mkdir(out, { recursive: true });
      const { json, embeddings } = serialiseShard(result);
      await writeFile(join(out, 'shard.json'), json);
      await writeFile(join(out, 'shard-embeddings.bin'), embeddings);
      io.stderr(`wrote shard ${shard.index}/${shard.count} to ${out}; join every shard with 'merge DIR... --out DIR'`);
    } else {
      const pool = run.runs[0]?.pool.length ?? 0;
      io.stderr(`summarising: intervals, paired comparisons and retrieval over ${pool} studies for ${encoders.length} model(s)`);
      await writeRunOutputs(result, out, io);
    }
    const anyScored = run.scored.length > 0;
    if (!anyScored) io.stderr('tessera score: no study could be scored; see the problems above');
    return anyScored ? 0 : 1;
  } catch (err) {
    if (controller.signal.aborted) {
      io.stderr('tessera score: cancelled; nothing was written');
      return 130;
    }
    throw err;
  } finally {
    process.removeListener('SIGINT', onSigint);
  }
}
