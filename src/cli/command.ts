/**
 * What every `loci` command shares: the I/O it is given, its exit codes, and the shape
 * of a command module (`usage` and `run`), so main.ts can list and load commands from
 * one table.
 */
import { parseCommandArgs, type OptionSpec, type ParsedArgs } from './args';

/** Exit codes: 0 done, 1 the command failed (a failure it explains, such as a search that failed, or a bug), 2 bad input (file, flags, usage). */
export const EXIT_OK = 0;
export const EXIT_FAILURE = 1;
export const EXIT_USAGE = 2;

export type ReadTextResult = { readonly ok: true; readonly text: string } | { readonly ok: false; readonly message: string };

/** The outside world as a command sees it; Node's is in nodeIo.ts, a test may pass its own. */
export interface CliIo {
  stdout(text: string): void;
  stderr(text: string): void;
  readTextFile(path: string): Promise<ReadTextResult>;
}

/** A command module: `export const usage` and `export function run`. */
export interface CliCommandModule {
  /** The command's help text, starting with its usage line. */
  readonly usage: string;
  /** Runs with the arguments after the command name; resolves to an exit code. */
  run(args: readonly string[], io: CliIo): Promise<number>;
}

/** A command's parsed arguments, and how it reports a usage error (its message, then its help; exit 2). */
export interface CommandStart {
  readonly args: ParsedArgs;
  usageError(message: string): number;
}

/**
 * The start every command shares: parse `argv` against `specs`, answer --help with the
 * help text. Returns the exit code when that already ends the command.
 */
export function startCommand(name: string, usage: string, argv: readonly string[], specs: readonly OptionSpec[], io: CliIo): CommandStart | number {
  const usageError = (message: string): number => {
    io.stderr(`loci ${name}: ${message}\n\n${usage}`);
    return EXIT_USAGE;
  };
  const parsed = parseCommandArgs(argv, specs);
  if (!parsed.ok) return usageError(parsed.message);
  if (parsed.args.options.has('help')) {
    io.stdout(usage);
    return EXIT_OK;
  }
  return { args: parsed.args, usageError };
}
