/**
 * What every `loci` command shares: the I/O it is given, its exit codes, and the shape
 * of a command module (`usage` and `run`), so main.ts can list and load commands from
 * one table.
 */

/** Exit codes: 0 done, 1 an unexpected failure (a bug), 2 bad input (file, flags, usage). */
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
