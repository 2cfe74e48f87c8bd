/**
 * A small argument parser for `loci` commands. Unlike node:util's parseArgs it takes the
 * token after a value option as its value even when it starts with a dash, so
 * `--from -90` works.
 */

export interface OptionSpec {
  /** The long name without dashes: `from` for `--from`. */
  readonly name: string;
  /** A value option takes the next token (or `--name=value`); a flag takes none. */
  readonly kind: 'value' | 'flag';
}

export interface ParsedArgs {
  readonly positionals: readonly string[];
  /** Values of the options given; a flag given is `true`. */
  readonly options: ReadonlyMap<string, string | true>;
}

export type ParseArgsResult = { readonly ok: true; readonly args: ParsedArgs } | { readonly ok: false; readonly message: string };

/** The one file a command takes (`noun`: "linkage file", "problem file"), or what was given instead. */
export function singleFile(args: ParsedArgs, noun: string): { readonly ok: true; readonly file: string } | { readonly ok: false; readonly message: string } {
  const { positionals } = args;
  if (positionals.length === 0) return { ok: false, message: `no ${noun} given` };
  if (positionals.length > 1) return { ok: false, message: `one ${noun} expected, got ${positionals.length}: ${positionals.join(' ')}` };
  return { ok: true, file: positionals[0] };
}

/** Parses `args` against `specs`; `-h` is `--help`, and `--` ends the options. */
export function parseCommandArgs(args: readonly string[], specs: readonly OptionSpec[]): ParseArgsResult {
  const byName = new Map(specs.map((s) => [s.name, s]));
  const positionals: string[] = [];
  const options = new Map<string, string | true>();
  for (let i = 0; i < args.length; i++) {
    const token = args[i];
    if (token === '--') {
      positionals.push(...args.slice(i + 1));
      break;
    }
    if (!token.startsWith('-') || token === '-') {
      positionals.push(token);
      continue;
    }
    const body = token === '-h' ? 'help' : token.replace(/^--?/, '');
    const eq = body.indexOf('=');
    const name = eq < 0 ? body : body.slice(0, eq);
    const spec = byName.get(name);
    if (!spec) {
      const known = specs.map((s) => `--${s.name}`).join(', ');
      return { ok: false, message: `unknown option ${token}; expected one of ${known}` };
    }
    if (options.has(name)) return { ok: false, message: `--${name} is given twice; give it once` };
    if (spec.kind === 'flag') {
      if (eq >= 0) return { ok: false, message: `--${name} takes no value` };
      options.set(name, true);
      continue;
    }
    if (eq >= 0) {
      options.set(name, body.slice(eq + 1));
    } else if (i + 1 < args.length) {
      options.set(name, args[++i]);
    } else {
      return { ok: false, message: `--${name} needs a value` };
    }
  }
  return { ok: true, args: { positionals, options } };
}

/** Reads a number option: `undefined` when absent, a message when it is not a finite number. */
export function numberOption(
  args: ParsedArgs,
  name: string,
  what: string,
): { readonly ok: true; readonly value: number | undefined } | { readonly ok: false; readonly message: string } {
  const raw = args.options.get(name);
  if (raw === undefined) return { ok: true, value: undefined };
  const value = typeof raw === 'string' && raw.trim() !== '' ? Number(raw) : NaN;
  if (!Number.isFinite(value)) {
    return { ok: false, message: `--${name}: expected ${what}, got ${JSON.stringify(raw === true ? '' : raw)}` };
  }
  return { ok: true, value };
}
