import { processIo, type CommandIo } from './io';
import { UsageError } from './parse-args';

const USAGE = `Tessera: checks whether an image-report dual encoder grounds report sentences in the right image regions.
Research tool, not a medical device: not for diagnosis or treatment.

usage: npm run tessera -- VERB [options]
  inspect --model DIR                         validate a model folder and run one dummy input through each encoder
  phantom --n N --seed S --out DIR [--size PX] [--format png|dcm|mixed] [--bit-depth 8|16] [--masks]
                                              write a synthetic sample set with reference boxes
  score --model DIR [--model DIR ...] --set DIR --out DIR
        [--aggregator max|softmax:T|lse:R|topk:K] [--hit centre|overlap|upsampled]
        [--tolerance PX] [--top-k K] [--seed S] [--shard K/N] [--dump-similarity]
        [--cache DIR | --no-cache] [--retrieval-pool N]
                                              score grounding and retrieval over a sample set
  merge DIR... --out DIR                      join shard outputs into the files one run would write`;

type Command = (argv: string[], io: CommandIo) => Promise<number>;

const COMMANDS: Record<string, () => Promise<Command>> = {
  inspect: async () => (await import('./commands/inspect')).runInspect,
  phantom: async () => (await import('./commands/phantom')).runPhantom,
  score: async () => (await import('./commands/score')).runScore,
  merge: async () => (await import('./commands/merge')).runMerge,
};

/** Runs one verb and returns the process exit code. */
export async function main(argv: string[], io: CommandIo = processIo): Promise<number> {
  const [verb, ...rest] = argv;
  if (!verb || verb === '--help' || verb === '-h' || verb === 'help') {
    io.stdout(USAGE);
    return verb ? 0 : 2;
  }
  const load = COMMANDS[verb];
  if (!load) {
    io.stderr(`tessera: unknown verb '${verb}'; use one of ${Object.keys(COMMANDS).join(', ')}`);
    return 2;
  }
  try {
    return await (await load())(rest, io);
  } catch (err) {
    if (err instanceof UsageError) {
      io.stderr(`tessera ${verb}: ${err.message}`);
      return 2;
    }
    const e = err as Error & { code?: string };
    io.stderr(`tessera ${verb}: ${e.message}`);
    return 1;
  }
}

const isEntry = process.argv[1] !== undefined && /main\.[cm]?[jt]s$/.test(process.argv[1]);
if (isEntry) {
  main(process.argv.slice(2)).then(
    (code) => {
      process.exitCode = code;
    },
    (err: unknown) => {
      process.stderr.write(`tessera: ${(err as Error).stack ?? String(err)}\n`);
      process.exitCode = 1;
    },
  );
}
