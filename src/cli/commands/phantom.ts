import { createNodeFileSink } from '../../dataset/node-file-source';
import { MAX_PHANTOM_SIZE, PHANTOM_FORMATS, type PhantomFormat } from '../../phantom/phantom-set-options';
import { MIN_PHANTOM_SIZE } from '../../phantom/generate-phantom-study';
import { writePhantomSet } from '../../phantom/write-phantom-set';
import { progressPrinter, type CommandIo } from '../io';
import { integerOption, parseArgs, required, single, UsageError } from '../parse-args';

/**
 * `phantom --n N --seed S --out DIR [--size PX] [--format png|dcm|mixed] [--bit-depth 8|16] [--masks]`:
 * writes a synthetic sample set with reports, labels, reference boxes and lung templates.
 */
export async function runPhantom(argv: string[], io: CommandIo): Promise<number> {
  let options;
  try {
    const args = parseArgs(argv, { valued: ['n', 'seed', 'out', 'size', 'format', 'bit-depth'], flags: ['masks'] });
    if (args.positional.length > 0) throw new UsageError(`unexpected argument '${args.positional[0]}'; phantom takes only --options`);
    const out = required(args, 'out');
    const n = integerOption(args, 'n', Number.NaN, 1);
    if (Number.isNaN(n)) throw new UsageError('--n is required (the number of studies, at least 1)');
    const seed = integerOption(args, 'seed', 1, 0);
    const size = integerOption(args, 'size', 512, MIN_PHANTOM_SIZE, MAX_PHANTOM_SIZE);
    const format = single(args, 'format') ?? 'png';
    if (!PHANTOM_FORMATS.includes(format as PhantomFormat)) throw new UsageError(`--format must be one of ${PHANTOM_FORMATS.join(', ')}; got '${format}'`);
    const bitDepth = integerOption(args, 'bit-depth', 8, 8, 16);
    if (bitDepth !== 8 && bitDepth !== 16) throw new UsageError(`--bit-depth must be 8 or 16; got '${bitDepth}'`);
    options = { out, n, seed, size, format: format as PhantomFormat, bitDepth: bitDepth as 8 | 16, masks: single(args, 'masks') === 'true' };
  } catch (err) {
    if (err instanceof UsageError) {
      io.stderr(`tessera phantom: ${err.message}`);
      return 2;
    }
    throw err;
  }
  const progress = progressPrinter(io);
  const { out, ...set } = options;
  const result = await writePhantomSet({ ...set, onProgress: (done, total) => progress('phantom', done, total) }, createNodeFileSink(out));
  io.stdout(`wrote ${result.studies} synthetic studies with ${result.boxes} reference boxes to ${out}`);
  return 0;
}
