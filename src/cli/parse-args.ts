/** Parsed command-line words: repeated options keep every value, flags have value 'true'. */
export interface ParsedArgs {
  readonly positional: string[];
  readonly options: Map<string, string[]>;
}

/** A usage error: the CLI prints its message and exits with code 2. */
export class UsageError extends Error {
  readonly code = 'usage';
}

/**
 * Splits argv into positionals and `--name value` / `--name=value` options. Names in `flags` take no
 * value. Unknown names are a UsageError listing the known ones.
 */
export function parseArgs(argv: readonly string[], spec: { readonly valued: readonly string[]; readonly flags?: readonly string[] }): ParsedArgs {
  const flags = spec.flags ?? [];
  const positional: string[] = [];
  const options = new Map<string, string[]>();
  for (let i = 0; i < argv.length; i++) {
    const word = argv[i];
    if (!word.startsWith('--')) {
      positional.push(word);
      continue;
    }
    const eq = word.indexOf('=');
    const name = word.slice(2, eq === -1 ? undefined : eq);
    let value: string;
    if (flags.includes(name)) {
      if (eq !== -1) throw new UsageError(`--${name} takes no value; got '${word}'`);
      value = 'true';
    } else if (spec.valued.includes(name)) {
      if (eq !== -1) value = word.slice(eq + 1);
      else {
        const next = argv[i + 1];
        if (next === undefined || next.startsWith('--')) throw new UsageError(`--${name} needs a value`);
        value = next;
        i++;
      }
    } else {
      const known = [...spec.valued, ...flags].map((n) => `--${n}`).join(', ');
      throw new UsageError(`unknown option --${name}; this command takes ${known}`);
    }
    const list = options.get(name) ?? [];
    list.push(value);
    options.set(name, list);
  }
  return { positional, options };
}

/** The single value of an option, or undefined; a repeated one is a UsageError. */
export function single(args: ParsedArgs, name: string): string | undefined {
  const v = args.options.get(name);
  if (!v) return undefined;
  if (v.length > 1) throw new UsageError(`--${name} was given ${v.length} times; give it once`);
  return v[0];
}

/** A required single value. */
export function required(args: ParsedArgs, name: string): string {
  const v = single(args, name);
  if (v === undefined) throw new UsageError(`--${name} is required`);
  return v;
}

/** An integer option within [min, max]. */
export function integerOption(args: ParsedArgs, name: string, fallback: number, min: number, max = Number.MAX_SAFE_INTEGER): number {
  const v = single(args, name);
  if (v === undefined) return fallback;
  const n = Number(v);
  if (!Number.isInteger(n) || n < min || n > max) throw new UsageError(`--${name} must be an integer in [${min}, ${max}]; got '${v}'`);
  return n;
}
