/**
 * `loci fit PROBLEM.json [...]`: searches every family of a problem file in worker
 * threads (src/engine) and writes the ranked candidates as JSON. Progress goes to
 * stderr. With --checkpoint the run is saved as it goes and resumed from the file when
 * it is there; Ctrl-C stops after the current round, saves, and still writes results.
 */
import { toLinkageFile } from '../core/io/linkageFile';
import type { CandidateReport, Problem } from '../core/synthesis';
import {
  createRun,
  defineRun,
  restoreRunFromStore,
  type CheckpointStore,
  type RankedCandidate,
  type Run,
  type RunInput,
  type RunProgress,
} from '../engine';
import { fileCheckpointStore, nodeEnvironment, writeFileAtomic } from '../engine/node';
import { numberOption, singleFile, type OptionSpec, type ParsedArgs } from './args';
import { EXIT_FAILURE, EXIT_OK, EXIT_USAGE, startCommand, type CliIo } from './command';
import { formatJson } from './formatJson';
import { readProblemFile } from './problemInput';

/** Evaluations per family when neither --evals nor --seconds is given. */
export const DEFAULT_EVALUATIONS_PER_FAMILY = 50_000;
export const DEFAULT_TOP = 5;
export const DEFAULT_SEED = 1;
/** Progress lines on stderr at most this often, ms. */
const PROGRESS_EVERY_MS = 1000;
export const FIT_RESULT_FORMAT = 'loci-fit-result';
export const FIT_RESULT_VERSION = 1;

export const usage = `usage: loci fit PROBLEM.json [--seed N] [--evals N | --seconds S] [--workers N]
                [--islands N] [--top K] [--out FILE] [--checkpoint FILE]

Searches every family of a problem file (format "loci-problem"; see \`loci check\`) and
writes the best distinct candidates, ranked feasible first and then by the problem's
measure, as JSON: each with its family, parameters, linkage file (format
"loci-linkage"), error (sum of squares, RMS, max, per point), Grashof class,
transmission-angle range and defects, and the evaluations used. A progress line goes
to stderr about once a second.

  --seed N         seed of the search, a whole number ≥ 0 (default ${DEFAULT_SEED}).
  --evals N        evaluation budget of the whole search (default ${DEFAULT_EVALUATIONS_PER_FAMILY.toLocaleString('en-GB')} per family).
                   The schedule is then deterministic: the same file, --seed, --evals
                   and --islands give the same result, on any machine and any
                   number of workers.
  --seconds S      a time budget instead: search for S seconds (not deterministic).
  --workers N      worker threads (default: the cores of this machine).
  --islands N      islands per family (default: --workers); they exchange their best
                   individuals every few rounds.
  --top K          candidates to write (default ${DEFAULT_TOP}).
  --out FILE       write the JSON to FILE (atomically) instead of stdout.
  --checkpoint FILE
                   save the run to FILE as it goes (and FILE.prev, the one before);
                   if FILE holds a checkpoint of the same search, continue it.
  --help, -h       this text.

Exit codes: 0 done (also when stopped by Ctrl-C: the results so far are written), 2 bad
input (file, flags, a checkpoint of another search), 1 the search failed.
`;

const OPTIONS: readonly OptionSpec[] = [
  { name: 'seed', kind: 'value' },
  { name: 'evals', kind: 'value' },
  { name: 'seconds', kind: 'value' },
  { name: 'workers', kind: 'value' },
  { name: 'islands', kind: 'value' },
  { name: 'top', kind: 'value' },
  { name: 'out', kind: 'value' },
  { name: 'checkpoint', kind: 'value' },
  { name: 'help', kind: 'flag' },
];

type Read<T> = { readonly ok: true; readonly value: T } | { readonly ok: false; readonly message: string };

function wholeOption(args: ParsedArgs, name: string, min: number, max = Number.MAX_SAFE_INTEGER): Read<number | undefined> {
  const what = `a whole number from ${min.toLocaleString('en-GB')}${max < Number.MAX_SAFE_INTEGER ? ` to ${max.toLocaleString('en-GB')}` : ' up'}`;
  const read = numberOption(args, name, what);
  if (!read.ok) return read;
  if (read.value === undefined) return { ok: true, value: undefined };
  if (!(Number.isInteger(read.value) && read.value >= min && read.value <= max)) {
    return { ok: false, message: `--${name}: expected ${what}, got ${args.options.get(name) as string}` };
  }
  return { ok: true, value: read.value };
}

function stringOption(args: ParsedArgs, name: string): Read<string | undefined> {
  const raw = args.options.get(name);
  if (raw === undefined) return { ok: true, value: undefined };
  if (raw === true || raw === '') return { ok: false, message: `--${name} needs a file name` };
  return { ok: true, value: raw };
}

interface FitSettings {
  readonly file: string;
  readonly seed: number;
  readonly evaluations: number | null;
  readonly seconds: number | null;
  readonly workers: number;
  readonly islands: number;
  readonly top: number;
  readonly out: string | undefined;
  readonly checkpoint: string | undefined;
}

function readSettings(args: ParsedArgs, defaultWorkers: number): Read<Omit<FitSettings, 'evaluations'> & { evaluations: number | undefined }> {
  const one = singleFile(args, 'problem file');
  if (!one.ok) return one;
  const seed = wholeOption(args, 'seed', 0);
  if (!seed.ok) return seed;
  const evals = wholeOption(args, 'evals', 1);
  if (!evals.ok) return evals;
  const seconds = numberOption(args, 'seconds', 'a number of seconds > 0');
  if (!seconds.ok) return seconds;
  if (seconds.value !== undefined && !(seconds.value > 0)) return { ok: false, message: `--seconds: expected a number of seconds > 0, got ${seconds.value}` };
  if (evals.value !== undefined && seconds.value !== undefined) return { ok: false, message: 'give --evals or --seconds, not both' };
  const workers = wholeOption(args, 'workers', 1, 256);
  if (!workers.ok) return workers;
  const islands = wholeOption(args, 'islands', 1, 256);
  if (!islands.ok) return islands;
  const top = wholeOption(args, 'top', 1, 1000);
  if (!top.ok) return top;
  const out = stringOption(args, 'out');
  if (!out.ok) return out;
  const checkpoint = stringOption(args, 'checkpoint');
  if (!checkpoint.ok) return checkpoint;
  const workerCount = workers.value ?? defaultWorkers;
  return {
    ok: true,
    value: {
      file: one.file,
      seed: seed.value ?? DEFAULT_SEED,
      evaluations: evals.value,
      seconds: seconds.value ?? null,
      workers: workerCount,
      islands: islands.value ?? workerCount,
      top: top.value ?? DEFAULT_TOP,
      out: out.value,
      checkpoint: checkpoint.value,
    },
  };
}

/** The engine run of a problem: one job per family, `islands` islands each, the hybrid optimizer. */
function runInput(problemFile: unknown, problem: Problem, s: FitSettings): RunInput {
  return {
    jobs: problem.families.map((family) => ({
      id: family,
      objective: { kind: 'synthesis', problem: problemFile, family },
      seed: s.seed,
      islands: s.islands,
      optimizer: { kind: 'hybrid' },
    })),
    budget: { evaluations: s.evaluations, seconds: s.seconds },
    deterministic: s.evaluations !== null,
  };
}

function unitOf(problem: Problem): string {
  return problem.measure === 'sum-of-squares' ? 'mm²' : 'mm';
}

function formatCount(n: number): string {
  return Math.round(n).toLocaleString('en-GB');
}

function formatDuration(ms: number): string {
  const s = ms / 1000;
  if (s < 60) return `${Math.ceil(s)} s`;
  if (s < 3600) return `${Math.floor(s / 60)} min ${Math.round(s % 60)} s`;
  return `${Math.floor(s / 3600)} h ${Math.round((s % 3600) / 60)} min`;
}

/** One progress line: evaluations, best error, evaluations per second, time left. */
export function progressLine(p: RunProgress, unit: string): string {
  const evaluations = p.budgetEvaluations === null ? `${formatCount(p.evaluations)} evaluations` : `${formatCount(p.evaluations)}/${formatCount(p.budgetEvaluations)} evaluations`;
  const best = p.best === null ? 'no candidate yet' : `best ${p.best.value.toPrecision(4)} ${unit}${p.best.violation > 0 ? ' (infeasible)' : ''} (${p.best.jobId})`;
  const rate = `${formatCount(p.evaluationsPerSecond)} evals/s`;
  const left = p.remainingMs === null ? '' : p.status === 'finished' ? ', done' : `, about ${formatDuration(p.remainingMs)} left`;
  const restarts = p.restarts > 0 ? `, ${p.restarts} worker restart${p.restarts > 1 ? 's' : ''}` : '';
  return `loci fit: ${evaluations}, ${best}, ${rate}${left}${restarts}`;
}

function candidateJson(c: RankedCandidate, problem: Problem) {
  if (c.detail.kind !== 'synthesis') throw new Error('fit: a synthesis run described a candidate of another kind');
  const report: CandidateReport = c.detail.candidate;
  return {
    rank: c.rank,
    family: report.family,
    parameters: report.variables,
    error: report.error,
    value: report.value,
    feasible: report.feasible,
    violation: report.violation,
    defects: report.defects,
    grashof: report.grashof ?? null,
    transmissionDeg: report.transmissionDeg ?? null,
    // Problem frame (the timing variables) and the linkage file's own driver frame.
    driverValues: report.driverValues,
    linkageDriverValues: report.linkageDriverValues,
    ...(report.placement === undefined ? {} : { placement: report.placement }),
    x: report.x,
    linkage: toLinkageFile(report.linkage, `${problem.name}: ${report.family} #${c.rank}`),
  };
}

async function openRun(
  input: RunInput,
  s: FitSettings,
  io: CliIo,
): Promise<{ ok: true; run: Run; resumed: boolean } | { ok: false; message: string; exitCode: number }> {
  const env = nodeEnvironment();
  const defined = defineRun(input);
  if (!defined.ok) return { ok: false, message: `loci fit: ${defined.reason}`, exitCode: EXIT_USAGE };
  let store: CheckpointStore | undefined;
  if (s.checkpoint !== undefined) {
    store = fileCheckpointStore(s.checkpoint);
    const restored = await restoreRunFromStore(env, store, { workers: s.workers, topK: s.top });
    if (restored.ok) {
      if (JSON.stringify(restored.run.spec) !== JSON.stringify(defined.spec)) {
        return {
          ok: false,
          message: `loci fit: ${s.checkpoint} holds a checkpoint of another search (another problem, families, --seed, budget or --islands); remove it or give another --checkpoint file`,
          exitCode: EXIT_USAGE,
        };
      }
      for (const reason of restored.skipped) io.stderr(`loci fit: skipped a checkpoint in ${s.checkpoint}: ${reason}\n`);
      io.stderr(`loci fit: resuming from ${s.checkpoint} at round ${restored.run.progress().rounds}\n`);
      return { ok: true, run: restored.run, resumed: true };
    }
    if (!restored.empty) return { ok: false, message: `loci fit: ${s.checkpoint}: no usable checkpoint: ${restored.reason}`, exitCode: EXIT_USAGE };
  }
  const made = createRun(env, input, { workers: s.workers, topK: s.top, ...(store === undefined ? {} : { store }) });
  if (!made.ok) return { ok: false, message: `loci fit: ${made.reason}`, exitCode: EXIT_USAGE };
  return { ok: true, run: made.run, resumed: false };
}

export async function run(args: readonly string[], io: CliIo): Promise<number> {
  const start = startCommand('fit', usage, args, OPTIONS, io);
  if (typeof start === 'number') return start;
  const { usageError } = start;
  const read = readSettings(start.args, nodeEnvironment().defaultWorkerCount());
  if (!read.ok) return usageError(read.message);
  const problemRead = await readProblemFile(read.value.file, io);
  if (!problemRead.ok) {
    io.stderr(`${problemRead.lines.join('\n')}\n`);
    return EXIT_USAGE;
  }
  const problem = problemRead.problem;
  const islandCount = problem.families.length * read.value.islands;
  const evaluations = read.value.seconds !== null ? null : (read.value.evaluations ?? DEFAULT_EVALUATIONS_PER_FAMILY * problem.families.length);
  if (evaluations !== null && evaluations < islandCount) {
    return usageError(`--evals: ${evaluations} is fewer than one evaluation per island (${problem.families.length} families × ${read.value.islands} islands)`);
  }
  const settings: FitSettings = { ...read.value, evaluations };

  const opened = await openRun(runInput(problemRead.json, problem, settings), settings, io);
  if (!opened.ok) {
    io.stderr(`${opened.message}\n`);
    return opened.exitCode;
  }
  const search = opened.run;
  const unit = unitOf(problem);
  let lastLineMs = -Infinity;
  search.onProgress((p) => {
    const now = performance.now();
    if (p.status === 'running' && p.rounds === 0) return; // starting the workers: nothing to tell yet
    if (p.status !== 'finished' && now - lastLineMs < PROGRESS_EVERY_MS) return;
    lastLineMs = now;
    io.stderr(`${progressLine(p, unit)}\n`);
  });
  let interrupted = false;
  const onInterrupt = () => {
    interrupted = true;
    io.stderr('loci fit: interrupted; stopping after this round (the results so far will be written)\n');
    search.cancel();
  };
  process.once('SIGINT', onInterrupt);
  let result;
  try {
    result = await search.start();
  } finally {
    process.off('SIGINT', onInterrupt);
  }
  if (!result.ok) {
    io.stderr(`loci fit: the search failed: ${result.reason}\n`);
    return EXIT_FAILURE;
  }
  const progress = search.progress();
  const output = {
    format: FIT_RESULT_FORMAT,
    version: FIT_RESULT_VERSION,
    problem: { file: settings.file, name: problem.name, measure: problem.measure, unit },
    search: {
      seed: settings.seed,
      budget: { evaluations: settings.evaluations, seconds: settings.seconds },
      deterministic: settings.evaluations !== null,
      families: problem.families,
      islandsPerFamily: settings.islands,
      workers: Math.min(settings.workers, islandCount),
      optimizer: 'hybrid (L-SHADE, then Nelder–Mead polish)',
      resumed: opened.resumed,
    },
    stopReason: interrupted ? 'interrupted' : result.stopReason,
    evaluations: result.evaluations,
    evaluationsByFamily: Object.fromEntries(result.jobs.map((job) => [job.jobId, job.evaluations])),
    elapsedS: result.elapsedMs / 1000,
    evaluationsPerSecond: progress.evaluationsPerSecond,
    workerRestarts: result.restarts,
    candidates: result.candidates.map((c) => candidateJson(c, problem)),
  };
  const text = `${formatJson(output)}\n`;
  if (settings.out !== undefined) {
    try {
      await writeFileAtomic(settings.out, text);
    } catch (error) {
      io.stderr(`loci fit: cannot write ${settings.out}: ${error instanceof Error ? error.message : String(error)}\n`);
      return EXIT_USAGE;
    }
  } else {
    io.stdout(text);
  }
  return EXIT_OK;
}
