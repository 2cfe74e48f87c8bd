/**
 * `loci fit PROBLEM.json [...]`: searches every family of a problem file in worker
 * threads (src/engine) and writes the ranked candidates as JSON. Progress goes to
 * stderr. With --checkpoint the run is saved as it goes and resumed from the file when
 * it is there; Ctrl-C (SIGINT) or SIGTERM stops after the current round, saves, and
 * still writes results. Where the results and the checkpoint go is checked before the
 * search starts; a save that fails later is reported and the search goes on, and
 * results that cannot be written to --out go to stdout.
 */
import { resolve } from 'node:path';
import { toLinkageFile } from '../core/io/linkageFile';
import { GAIT_CAUTION } from '../core/gait';
import type { CandidateReport, SynthesisProblem } from '../core/synthesis';
import {
  createRun,
  defineRun,
  restoreRunFromStore,
  MAX_CHECKPOINT_EVERY_S,
  MIN_CHECKPOINT_EVERY_S,
  type CheckpointStore,
  type RankedCandidate,
  type Run,
  type RunInput,
  type RunOptions,
  type RunProgress,
} from '../engine';
import { checkFileTarget, checkpointPathsFor, fileCheckpointStore, fsReason, nodeEnvironment, temporaryPathFor, writeFileAtomic } from '../engine/node';
import { numberOption, singleFile, type OptionSpec, type ParsedArgs } from './args';
import { EXIT_FAILURE, EXIT_OK, EXIT_USAGE, startCommand, type CliIo } from './command';
import { formatJson } from './formatJson';
import { readProblemFile } from './problemInput';
import { suspensionCandidateJson } from './suspensionResults';
import { legCandidateJson } from './legResults';

/** Evaluations per family when neither --evals nor --seconds is given. */
export const DEFAULT_EVALUATIONS_PER_FAMILY = 50_000;
export const DEFAULT_TOP = 5;
export const DEFAULT_SEED = 1;
/** Seconds between checkpoint saves with --checkpoint, by default (the range --checkpoint-every takes is the engine's). */
export const DEFAULT_CHECKPOINT_EVERY_S = 10;
/** Progress lines on stderr at most this often, ms. */
const PROGRESS_EVERY_MS = 1000;
export const FIT_RESULT_FORMAT = 'loci-fit-result';
export const FIT_RESULT_VERSION = 1;

export const usage = `usage: loci fit PROBLEM.json [--seed N] [--evals N | --seconds S] [--workers N]
                [--islands N] [--top K] [--out FILE] [--checkpoint FILE
                [--checkpoint-every S]]

Searches every family of a problem file (format "loci-problem"; see \`loci check\`) and
writes the best distinct candidates, ranked feasible first and then by the problem's
measure, as JSON: each with its family, parameters, linkage file (format
"loci-linkage", drawn in its pose at target point 1, so its output point sits on the
fitted path), error (sum of squares, RMS, max, per point), the motion its figures are
taken over (a full turn from target point 1 when the driver turns fully, else target
point 1 to the last), and over that motion its Grashof class, transmission-angle range
and size, as \`loci analyze --from --to --steps\` gives them of the linkage file; its
defects, and the evaluations used. A progress line goes to stderr about once a second.

A suspension problem ("kind": "suspension") searches its layouts in place of families
and writes, for each candidate, its pivots, terms, figures at sag and its linkage at
full extension, with the best of each layout beside the top K. Loci computes
kinematics only: a frame must be checked by a qualified engineer, physically tested
and meet the ISO 4210 series before anyone rides it.

A leg problem ("kind": "leg") searches its families for a walking leg (the foot is
each family's point P, the crank turning fully) and writes, for each candidate, its
terms, the figures the search scored, its gait figures and its leg file (format
"loci-leg": \`loci analyze\` of it prints the same gait figures), with the best of each
family beside the top K. Loci computes kinematics only: a walking machine that carries
people or loads must be checked by a qualified engineer and physically tested.

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
                   if FILE holds a checkpoint of the same search, continue it (from
                   FILE.prev if FILE is damaged or missing; stderr says which).
  --checkpoint-every S
                   seconds between saves with --checkpoint, from ${MIN_CHECKPOINT_EVERY_S} to ${MAX_CHECKPOINT_EVERY_S.toLocaleString('en-GB')}
                   (default ${DEFAULT_CHECKPOINT_EVERY_S}). A save also happens at the end, and on
                   Ctrl-C (SIGINT) or SIGTERM.
  --help, -h       this text.

Ctrl-C or SIGTERM stops the search after the current round; the run is saved and the
results so far are written. A second one stops at once, losing what was searched since
the last save. --out and --checkpoint are checked before the search starts; a save that
fails later is reported on stderr and the search goes on.

Exit codes:
  0  done, or stopped by Ctrl-C or SIGTERM; the results are written.
  1  the search failed (workers kept failing, or the objective threw: then the best
     results of the rounds before are still written), or --out could not be written
     at the end (the results then go to stdout).
  2  bad input, and nothing was searched: the problem file, the flags, an --out or
     --checkpoint path that cannot be written (a folder, a missing or read-only folder,
     a name too long), or a checkpoint of another search or that cannot be read.
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
  { name: 'checkpoint-every', kind: 'value' },
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
  readonly checkpointEveryS: number;
  /** A suspension problem's table shows every layout's best beside the top K. */
  readonly bestOfEachJob: boolean;
}

function readSettings(args: ParsedArgs, defaultWorkers: number): Read<Omit<FitSettings, 'evaluations' | 'bestOfEachJob'> & { evaluations: number | undefined }> {
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
  const every = numberOption(args, 'checkpoint-every', `a number of seconds from ${MIN_CHECKPOINT_EVERY_S} to ${MAX_CHECKPOINT_EVERY_S}`);
  if (!every.ok) return every;
  if (every.value !== undefined && !(every.value >= MIN_CHECKPOINT_EVERY_S && every.value <= MAX_CHECKPOINT_EVERY_S)) {
    return { ok: false, message: `--checkpoint-every: expected a number of seconds from ${MIN_CHECKPOINT_EVERY_S} to ${MAX_CHECKPOINT_EVERY_S}, got ${every.value}` };
  }
  if (every.value !== undefined && checkpoint.value === undefined) return { ok: false, message: '--checkpoint-every needs --checkpoint FILE' };
  const same = (a: string, b: string | undefined) => b !== undefined && resolve(a) === resolve(b);
  if (out.value !== undefined && same(out.value, checkpoint.value)) return { ok: false, message: '--out and --checkpoint name the same file; give two files' };
  if (same(one.file, out.value) || same(one.file, checkpoint.value)) {
    return { ok: false, message: `${one.file} is the problem file; give --out and --checkpoint other files` };
  }
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
      checkpointEveryS: every.value ?? DEFAULT_CHECKPOINT_EVERY_S,
    },
  };
}

/** The families of a path problem, or the layouts of a suspension problem: one job each. */
function familiesOf(problem: SynthesisProblem): readonly string[] {
  return problem.kind === 'suspension' ? problem.layouts : problem.families;
}

/** The engine run of a problem: one job per family, `islands` islands each, the hybrid optimizer. */
function runInput(problemFile: unknown, problem: SynthesisProblem, s: FitSettings): RunInput {
  return {
    jobs: (problem.kind === 'suspension' ? problem.layouts : problem.families).map((family) => ({
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

function unitOf(problem: SynthesisProblem): string {
  if (problem.kind !== 'path') return '(weighted, normalised)';
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

/** The motion a candidate's figures are taken over, in degrees as `loci analyze` prints driver values. */
function motionJson(report: CandidateReport) {
  const deg = 180 / Math.PI;
  const m = report.motion;
  return { fromDeg: m.from * deg, toDeg: m.to * deg, steps: m.steps, fullTurn: m.fullTurn };
}

function candidateJson(c: RankedCandidate, problem: SynthesisProblem) {
  if (c.detail.kind === 'suspension') return suspensionCandidateJson(c.rank, problem.name, c.detail.candidate);
  if (c.detail.kind === 'leg') return legCandidateJson(c.rank, problem.name, c.detail.candidate);
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
    // Taken over `motion` by the analysis `loci analyze` runs, so the two agree.
    motion: motionJson(report),
    transmissionDeg: report.transmissionDeg ?? null,
    sizeMm: report.sizeMm ?? null,
    // The linkage file is drawn in this pose: its output point sits on the fitted path there.
    referencePose: report.referencePose,
    // Problem frame (the timing variables) and the linkage file's own driver frame.
    driverValues: report.driverValues,
    linkageDriverValues: report.linkageDriverValues,
    ...(report.placement === undefined ? {} : { placement: report.placement }),
    x: report.x,
    linkage: toLinkageFile(report.linkage, `${problem.name}: ${report.family} #${c.rank}${report.referencePose === 'target point 1' ? ', pose at target point 1' : ''}`),
  };
}

/** Why `--out` or `--checkpoint` cannot be written, or null: checked before anything is searched. */
async function checkTargets(s: FitSettings): Promise<string | null> {
  if (s.out !== undefined) {
    const out = await checkFileTarget(s.out, [s.out, temporaryPathFor(s.out)]);
    if (!out.ok) return `--out: ${out.reason}`;
  }
  if (s.checkpoint !== undefined) {
    const checkpoint = await checkFileTarget(s.checkpoint, checkpointPathsFor(s.checkpoint), true);
    if (!checkpoint.ok) return `--checkpoint: ${checkpoint.reason}`;
  }
  return null;
}

type Opened = { ok: true; run: Run; resumed: boolean } | { ok: false; message: string; exitCode: number };

/** The run to start: resumed from the checkpoint file when it holds one of this search, else new. */
async function openRun(input: RunInput, s: FitSettings, io: CliIo, hooks: Pick<RunOptions, 'onSaveError' | 'onCheckpoint'>): Promise<Opened> {
  const env = nodeEnvironment();
  const defined = defineRun(input);
  if (!defined.ok) return { ok: false, message: `loci fit: ${defined.reason}`, exitCode: EXIT_USAGE };
  const options: RunOptions = { workers: s.workers, topK: s.top, checkpointEveryMs: s.checkpointEveryS * 1000, bestOfEachJob: s.bestOfEachJob, ...hooks };
  let store: CheckpointStore | undefined;
  if (s.checkpoint !== undefined) {
    const path = s.checkpoint;
    store = fileCheckpointStore(path);
    let restored;
    try {
      restored = await restoreRunFromStore(env, store, options);
    } catch (error) {
      return { ok: false, message: `loci fit: cannot read the checkpoint ${path}: ${fsReason(error)}`, exitCode: EXIT_USAGE };
    }
    for (const note of restored.notes) io.stderr(`loci fit: ${note}\n`);
    if (restored.ok) {
      if (JSON.stringify(restored.run.spec) !== JSON.stringify(defined.spec)) {
        return {
          ok: false,
          message: `loci fit: ${restored.source} holds a checkpoint of another search (another problem, families, --seed, budget or --islands); remove it or give another --checkpoint file`,
          exitCode: EXIT_USAGE,
        };
      }
      for (const { source, reason } of restored.passedOver) io.stderr(`loci fit: skipped ${source}: ${reason}\n`);
      const why = restored.source === path ? '' : restored.passedOver.some((p) => p.source === path) ? ` (${path} was skipped)` : ` (${path} is missing)`;
      io.stderr(`loci fit: resuming from ${restored.source}${why} at round ${restored.run.progress().rounds}\n`);
      return { ok: true, run: restored.run, resumed: true };
    }
    if (!restored.empty) return { ok: false, message: `loci fit: ${path}: no usable checkpoint: ${restored.reason}`, exitCode: EXIT_USAGE };
  }
  const made = createRun(env, input, { ...options, ...(store === undefined ? {} : { store }) });
  if (!made.ok) return { ok: false, message: `loci fit: ${made.reason}`, exitCode: EXIT_USAGE };
  return { ok: true, run: made.run, resumed: false };
}

/** Tells stderr when saving fails, once per distinct reason, and when it works again. */
function saveReporter(io: CliIo, path: string | undefined) {
  let failures = 0;
  let lastReason: string | null = null;
  return {
    get failures() {
      return failures;
    },
    onSaveError(reason: string) {
      failures++;
      if (reason !== lastReason) io.stderr(`loci fit: could not save the checkpoint to ${path ?? 'its store'}: ${reason}; the search goes on, and its results will still be written\n`);
      lastReason = reason;
    },
    onCheckpoint() {
      if (lastReason !== null) io.stderr(`loci fit: saved the checkpoint to ${path ?? 'its store'} again\n`);
      lastReason = null;
    },
  };
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
  const families = familiesOf(problem);
  const islandCount = families.length * read.value.islands;
  const evaluations = read.value.seconds !== null ? null : (read.value.evaluations ?? DEFAULT_EVALUATIONS_PER_FAMILY * families.length);
  if (evaluations !== null && evaluations < islandCount) {
    return usageError(`--evals: ${evaluations} is fewer than one evaluation per island (${families.length} families × ${read.value.islands} islands)`);
  }
  const settings: FitSettings = { ...read.value, evaluations, bestOfEachJob: problem.kind !== 'path' };
  const unusable = await checkTargets(settings);
  if (unusable !== null) {
    io.stderr(`loci fit: ${unusable}\n`);
    return EXIT_USAGE;
  }

  const saves = saveReporter(io, settings.checkpoint);
  const opened = await openRun(runInput(problemRead.json, problem, settings), settings, io, {
    onSaveError: (reason) => saves.onSaveError(reason),
    onCheckpoint: () => saves.onCheckpoint(),
  });
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
  let stoppedBy: NodeJS.Signals | null = null;
  const onSignal = (signal: NodeJS.Signals) => {
    stoppedBy = signal;
    const saving = settings.checkpoint === undefined ? '' : `, saving to ${settings.checkpoint}`;
    io.stderr(`loci fit: ${signal === 'SIGINT' ? 'interrupted (SIGINT)' : signal}; stopping after this round${saving} and writing the results so far (${signal} again stops at once, unsaved)\n`);
    search.cancel();
  };
  const signals: NodeJS.Signals[] = ['SIGINT', 'SIGTERM'];
  for (const signal of signals) process.once(signal, onSignal);
  let result;
  try {
    result = await search.start();
  } finally {
    for (const signal of signals) process.off(signal, onSignal);
  }
  if (!result.ok && result.candidates === undefined) {
    io.stderr(`loci fit: the search failed: ${result.reason}\n`);
    return EXIT_FAILURE;
  }
  if (!result.ok) {
    io.stderr(
      `loci fit: the search stopped: ${result.reason}. This is a fault in Loci or an input it does not handle; please report it with the problem file. The best candidates of the rounds before are written.\n`,
    );
  }
  const lastSaveError = search.progress().checkpointError;
  if (settings.checkpoint !== undefined && lastSaveError !== undefined) {
    io.stderr(`loci fit: ${settings.checkpoint} is older than these results: the last save failed (${lastSaveError}); ${saves.failures} save${saves.failures === 1 ? '' : 's'} failed in all\n`);
  }
  const progress = search.progress();
  const output = {
    format: FIT_RESULT_FORMAT,
    version: FIT_RESULT_VERSION,
    problem: { file: settings.file, name: problem.name, kind: problem.kind, measure: problem.kind === 'path' ? problem.measure : 'weighted, normalised terms', unit },
    search: {
      seed: settings.seed,
      budget: { evaluations: settings.evaluations, seconds: settings.seconds },
      deterministic: settings.evaluations !== null,
      families,
      islandsPerFamily: settings.islands,
      workers: Math.min(settings.workers, islandCount),
      optimizer: 'hybrid (L-SHADE, then Nelder–Mead polish)',
      resumed: opened.resumed,
    },
    stopReason: !result.ok ? 'objective-error' : stoppedBy !== null ? 'interrupted' : result.stopReason,
    ...(result.ok ? {} : { error: result.reason }),
    evaluations: result.evaluations,
    evaluationsByFamily: result.ok ? Object.fromEntries(result.jobs.map((job) => [job.jobId, job.evaluations])) : null,
    elapsedS: progress.elapsedMs / 1000,
    evaluationsPerSecond: progress.evaluationsPerSecond,
    workerRestarts: progress.restarts,
    candidates: (result.candidates ?? []).map((c) => candidateJson(c, problem)),
    // Each layout's best rank (null: the layout gave no candidate at all).
    ...(problem.kind === 'suspension'
      ? { bestRankOfEachLayout: Object.fromEntries(families.map((f) => [f, (result.candidates ?? []).find((c) => c.jobId === f)?.rank ?? null])) }
      : {}),
    ...(problem.kind === 'leg'
      ? { bestRankOfEachFamily: Object.fromEntries(families.map((f) => [f, (result.candidates ?? []).find((c) => c.jobId === f)?.rank ?? null])), caution: GAIT_CAUTION }
      : {}),
  };
  const text = `${formatJson(output)}\n`;
  const done = result.ok ? EXIT_OK : EXIT_FAILURE;
  if (settings.out === undefined) {
    io.stdout(text);
    return done;
  }
  try {
    await writeFileAtomic(settings.out, text);
  } catch (error) {
    // Checked before the search, so something changed since (a full disk, a removed folder): the results must not be lost.
    io.stderr(`loci fit: cannot write the results to ${settings.out}: ${fsReason(error)}; they follow on standard output instead\n`);
    io.stdout(text);
    return EXIT_FAILURE;
  }
  return done;
}
