/**
 * The `loci` command line: a table of commands, each loaded when it is run. A new
 * command is one more line in COMMANDS and a module exporting `usage` and `run`
 * (see command.ts).
 */
import { EXIT_FAILURE, EXIT_OK, EXIT_USAGE, type CliCommandModule, type CliIo } from './command';
import { nodeIo } from './nodeIo';

interface CommandEntry {
  readonly name: string;
  readonly summary: string;
  readonly load: () => Promise<CliCommandModule>;
}

const COMMANDS: readonly CommandEntry[] = [
  { name: 'analyze', summary: 'kinematic analysis of a linkage file, printed as JSON', load: () => import('./analyze') },
  { name: 'batch', summary: 'run a queue of fit jobs one after another; continues where it stopped', load: () => import('./batch') },
  { name: 'check', summary: 'validate a problem file and show what a fit would search', load: () => import('./check') },
  { name: 'fit', summary: 'search linkages for a problem file; writes ranked candidates as JSON', load: () => import('./fit') },
];

function usage(): string {
  const width = Math.max(...COMMANDS.map((c) => c.name.length));
  const lines = COMMANDS.map((c) => `  ${c.name.padEnd(width)}  ${c.summary}`);
  return [
    'usage: loci COMMAND [ARGS]',
    '',
    'Commands:',
    ...lines,
    '',
    'Run `loci COMMAND --help` for the arguments of one command.',
    'Exit codes: 0 done, 2 bad input (file, flags or usage), 1 a failure (see the command\'s --help).',
    '',
  ].join('\n');
}

/** Runs one command line (the arguments after `loci`); resolves to the exit code. */
export async function main(argv: readonly string[], io: CliIo): Promise<number> {
  const [name, ...rest] = argv;
  if (name === '--help' || name === '-h' || name === 'help') {
    io.stdout(usage());
    return EXIT_OK;
  }
  if (name === undefined) {
    io.stderr(`loci: no command given\n\n${usage()}`);
    return EXIT_USAGE;
  }
  const entry = COMMANDS.find((c) => c.name === name);
  if (!entry) {
    io.stderr(`loci: unknown command ${JSON.stringify(name)}; expected one of ${COMMANDS.map((c) => c.name).join(', ')}\n\n${usage()}`);
    return EXIT_USAGE;
  }
  const command = await entry.load();
  return command.run(rest, io);
}

/** The process entry point used by bin/loci.js: sets the exit code, never calls process.exit. */
export async function runCli(): Promise<void> {
  process.stdout.on('error', (error: NodeJS.ErrnoException) => {
    // A closed pipe (`loci analyze … | head`) is the reader's choice, not a failure.
    if (error.code !== 'EPIPE') throw error;
  });
  try {
    process.exitCode = await main(process.argv.slice(2), nodeIo);
  } catch (error) {
    process.stderr.write(`loci: unexpected failure (a bug; please report it):\n${error instanceof Error ? error.stack ?? error.message : String(error)}\n`);
    process.exitCode = EXIT_FAILURE;
  }
}
