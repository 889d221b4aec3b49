import type { ModelRun, SetRun } from './score-set';
import type { SentenceRecord, SimilarityDump } from './types';

export const SHARD_SCHEMA = 'tessera.shard/1';

/** Everything that decides a run's numbers; shards merge only when these agree. */
export interface RunSettings {
  readonly set: string;
  readonly models: readonly { readonly id: string; readonly hash: string }[];
  readonly aggregator: string;
  readonly hitRule: string;
  readonly tolerancePx: number;
  readonly topK: number;
  readonly seed: number;
  readonly retrievalPool: number;
  readonly dumpSimilarity: boolean;
}

interface ShardJson {
  readonly schema: typeof SHARD_SCHEMA;
  readonly settings: RunSettings;
  readonly shard: { readonly index: number; readonly count: number };
  readonly nStudies: number;
  readonly positions: readonly number[];
  readonly setSkipped: SetRun['setSkipped'];
  readonly failures: SetRun['failures'];
  readonly scored: SetRun['scored'];
  readonly syntheticSet: boolean;
  readonly runs: readonly {
    readonly model: string;
    readonly dim: number;
    readonly records: readonly SentenceRecord[];
    readonly dumps: readonly SimilarityDump[];
    readonly pool: readonly { readonly position: number; readonly study: string; readonly nCells: number; readonly nSentences: number; readonly offset: number }[];
  }[];
}

export interface Shard {
  readonly settings: RunSettings;
  readonly shard: { readonly index: number; readonly count: number };
  readonly syntheticSet: boolean;
  readonly run: SetRun;
}

/** Shard state as JSON plus one float32 blob with the retrieval-pool embeddings. */
export function serialiseShard(shard: Shard): { json: string; embeddings: Uint8Array } {
  const chunks: Float32Array[] = [];
  let offset = 0;
  const runs = shard.run.runs.map((r) => ({
    model: r.model,
    dim: r.dim,
    records: r.records,
    dumps: r.dumps,
    pool: r.pool.map((p) => {
      const entry = { position: p.position, study: p.study, nCells: p.embeddings.nCells, nSentences: p.embeddings.nSentences, offset };
      chunks.push(p.embeddings.cells, p.embeddings.sentences);
      offset += p.embeddings.cells.length + p.embeddings.sentences.length;
      return entry;
    }),
  }));
  const blob = new Float32Array(offset);
  let at = 0;
  for (const c of chunks) {
    blob.set(c, at);
    at += c.length;
  }
  const json: ShardJson = {
    schema: SHARD_SCHEMA,
    settings: shard.settings,
    shard: shard.shard,
    nStudies: shard.run.nStudies,
    positions: shard.run.positions,
    setSkipped: shard.run.setSkipped,
    failures: shard.run.failures,
    scored: shard.run.scored,
    syntheticSet: shard.syntheticSet,
    runs,
  };
  return { json: JSON.stringify(json), embeddings: new Uint8Array(blob.buffer) };
}

/** Reads a shard written by serialiseShard; `file` names it in errors. */
export function parseShard(jsonText: string, embeddingBytes: Uint8Array, file: string): Shard {
  const j = JSON.parse(jsonText) as ShardJson;
  if (j.schema !== SHARD_SCHEMA) throw new TypeError(`${file}: not a Tessera shard (schema '${String(j.schema)}', expected '${SHARD_SCHEMA}'); run 'score --shard K/N' to make one`);
  const copy = embeddingBytes.slice();
  const blob = new Float32Array(copy.buffer, copy.byteOffset, copy.byteLength / 4);
  const runs: ModelRun[] = j.runs.map((r) => ({
    model: r.model,
    dim: r.dim,
    records: [...r.records],
    dumps: [...r.dumps],
    pool: r.pool.map((p) => {
      const cellsLen = p.nCells * r.dim;
      const sentLen = p.nSentences * r.dim;
      return {
        position: p.position,
        study: p.study,
        embeddings: {
          cells: blob.subarray(p.offset, p.offset + cellsLen),
          nCells: p.nCells,
          sentences: blob.subarray(p.offset + cellsLen, p.offset + cellsLen + sentLen),
          nSentences: p.nSentences,
        },
      };
    }),
  }));
  return {
    settings: j.settings,
    shard: j.shard,
    syntheticSet: j.syntheticSet,
    run: { runs, setSkipped: j.setSkipped, failures: [...j.failures], positions: [...j.positions], scored: [...j.scored], nStudies: j.nStudies, encodings: { computed: 0, fromStore: 0 } },
  };
}

/**
 * Joins shards into the run one unsharded invocation would have made: records, dumps and pool in
 * study order. Throws a RangeError naming what disagrees or which studies no shard covered.
 */
export function mergeShards(shards: readonly Shard[]): Shard {
  if (shards.length === 0) throw new RangeError("'shards' must hold at least one shard; got none");
  const first = shards[0];
  const settingsText = JSON.stringify(first.settings);
  for (const s of shards) {
    if (JSON.stringify(s.settings) !== settingsText) throw new RangeError(`shard ${s.shard.index}/${s.shard.count} was made with other settings than shard ${first.shard.index}/${first.shard.count}; re-run it with the same models, set and options`);
    if (s.run.nStudies !== first.run.nStudies) throw new RangeError(`shard ${s.shard.index}/${s.shard.count} saw ${s.run.nStudies} studies, shard ${first.shard.index} saw ${first.run.nStudies}; the set changed between shards`);
  }
  const covered = new Set<number>();
  for (const s of shards) {
    for (const p of s.run.positions) {
      if (covered.has(p)) throw new RangeError(`study position ${p} appears in two shards; give each shard once`);
      covered.add(p);
    }
  }
  const missing = first.run.nStudies - covered.size;
  if (missing > 0) throw new RangeError(`${missing} of ${first.run.nStudies} studies are in no shard; merge every shard 1..${first.shard.count}`);
  const positionOf = new Map<string, number>();
  for (const s of shards) for (const e of s.run.scored) positionOf.set(e.study, e.position);
  const runs: ModelRun[] = first.run.runs.map((r, m) => {
    const all = shards.map((s) => s.run.runs[m]);
    // A stable sort by study position keeps each study's sentences in their order.
    const byPos = <T extends { study: string }>(xs: T[]): T[] => [...xs].sort((a, b) => (positionOf.get(a.study) ?? 0) - (positionOf.get(b.study) ?? 0));
    return {
      model: r.model,
      dim: r.dim,
      records: byPos(all.flatMap((x) => x.records)),
      dumps: byPos(all.flatMap((x) => x.dumps)),
      pool: all.flatMap((x) => x.pool).sort((a, b) => a.position - b.position),
    };
  });
  const failures = shards.flatMap((s) => s.run.failures).sort((a, b) => a.position - b.position);
  return {
    settings: first.settings,
    shard: { index: 1, count: 1 },
    syntheticSet: first.syntheticSet,
    run: {
      runs,
      setSkipped: first.run.setSkipped,
      failures,
      positions: [...covered].sort((a, b) => a - b),
      scored: shards.flatMap((s) => s.run.scored).sort((a, b) => a.position - b.position),
      nStudies: first.run.nStudies,
      encodings: { computed: 0, fromStore: 0 },
    },
  };
}
