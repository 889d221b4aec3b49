import { resolve } from 'node:path';
import type { CommandIo } from '../io';
import { parseArgs, required, UsageError } from '../parse-args';
import { createNodeFileSource } from '../../dataset/node-file-source';
import { createOrtNodeEngine } from '../../model/adapters/ort-node';
import { createTokenizerFromJson } from '../../model/adapters/hf-tokenizer';
import { inspectModel, formatInspectReport } from '../../model/inspect';

/** `inspect --model DIR`: validates a model folder against the contract and runs a dummy input. */
export async function runInspect(argv: string[], io: CommandIo): Promise<number> {
  const args = parseArgs(argv, { valued: ['model', 'threads'] });
  if (args.positional.length > 0) throw new UsageError(`unexpected argument '${args.positional[0]}'`);
  const dir = required(args, 'model');
  const engine = await createOrtNodeEngine({ threads: 2 });
  const report = await inspectModel(createNodeFileSource(resolve(dir)), engine, { tokenizerFactory: createTokenizerFromJson, now: () => performance.now() });
  io.stdout(formatInspectReport(report));
  return report.ok ? 0 : 2;
}
