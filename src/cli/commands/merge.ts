import { readFile } from 'node:fs/promises';
import { join } from 'node:path';
import type { CommandIo } from '../io';
import { parseArgs, required, UsageError } from '../parse-args';
import { mergeShards, parseShard } from '../../batch/shard-file';
import { writeRunOutputs } from '../run-outputs';

/** `merge DIR... --out DIR`: joins shard outputs into the files one unsharded run would write. */
export async function runMerge(argv: string[], io: CommandIo): Promise<number> {
  const args = parseArgs(argv, { valued: ['out'] });
  const out = required(args, 'out');
  if (args.positional.length === 0) throw new UsageError('give the shard output folders to merge, e.g. merge out/1 out/2 --out merged');
  const shards = [];
  for (const dir of args.positional) {
    const jsonPath = join(dir, 'shard.json');
    let json: string;
    let blob: Uint8Array;
    try {
      json = await readFile(jsonPath, 'utf8');
      blob = new Uint8Array(await readFile(join(dir, 'shard-embeddings.bin')));
    } catch (err) {
      io.stderr(`tessera merge: ${dir}: no shard files (${(err as Error).message}); make them with 'score ... --shard K/N --out ${dir}'`);
      return 2;
    }
    shards.push(parseShard(json, blob, jsonPath));
  }
  const merged = mergeShards(shards);
  await writeRunOutputs(merged, out, io);
  return 0;
}
