/**
 * `loci batch QUEUE.json`: runs a queue of fit jobs one after another, unattended, each
 * as `loci fit` would with a results file and a checkpoint of its own in the output
 * folder. A status file there says which jobs are done, so running the same queue again
 * continues it: done jobs are passed over, a job cut short resumes from its checkpoint,
 * and a job whose definition or problem changed starts afresh with its old files kept
 * under another name. Every job's problem file is checked before anything runs.
 */
import { mkdir, rename, stat } from 'node:fs/promises';
import { basename, dirname, extname, isAbsolute, join, resolve } from 'node:path';
import { parseBatchQueue, type BatchJob } from '../core/io/batchQueue';
import { parseJsonText } from '../core/io/jsonText';
import { parseSynthesisProblemFile } from '../core/io/problem';
import { fnv1a64Hex, MAX_CHECKPOINT_EVERY_S, MIN_CHECKPOINT_EVERY_S } from '../engine';
import { checkpointPathsFor, fsReason, writeFileAtomic } from '../engine/node';
import { numberOption, singleFile, type OptionSpec } from './args';
import { BATCH_STATUS_FILE, emptyStatus, readBatchStatus, withJob, type BatchStatus, type JobStatus } from './batchStatus';
import { EXIT_FAILURE, EXIT_OK, EXIT_USAGE, startCommand, type CliIo } from './command';
import { run as fit } from './fit';
import { formatJson } from './formatJson';
import { readProblemFile } from './problemInput';

export const usage = `usage: loci batch QUEUE.json [--out-dir DIR] [--workers N] [--checkpoint-every S]

Runs the jobs of a queue file (format "loci-batch") one after another, each as
\`loci fit\` runs a problem file, and writes into the output folder, per job NAME:
NAME.problem.json (the problem it ran, with its families), NAME.json (the results, as
\`loci fit --out\` writes them) and NAME.checkpoint (its run, saved as it goes), and
${BATCH_STATUS_FILE} (each job's state). At the end it prints a summary of every job.

Running the same queue again continues it: jobs done are passed over, a job that was
cut short (Ctrl-C, a kill, a power cut) resumes from its checkpoint, and a job whose
entry or problem file changed runs afresh; its earlier files are kept, renamed
NAME.superseded-<fingerprint>.*. Reorder, add or remove jobs by editing the queue
file; "skip": true keeps a job in the queue without running it.

A queue file:
  { "format": "loci-batch", "version": 1, "name": "Tuesday night",
    "jobs": [ { "name": "pusher-4bar", "problem": "pusher.json", "families": ["fourbar-lengths"],
                "seed": 1, "seconds": 3600 },
              { "name": "pusher-watt", "problem": "pusher.json", "families": ["watt1"],
                "seed": 2, "evaluations": 2000000, "islands": 2, "top": 10 } ] }
  problem     a problem file, relative to the queue file's folder
  families    the problem's families (a suspension problem's layouts) to search; all when absent
  seed        whole number ≥ 0 (default 1)
  evaluations | seconds
              the job's budget, as --evals or --seconds of \`loci fit\`
  islands, top
              as --islands and --top of \`loci fit\`

  --out-dir DIR    the output folder (default: QUEUE.results beside the queue file);
                   made if missing.
  --workers N      worker threads for every job (default: the cores of this machine).
  --checkpoint-every S
                   seconds between checkpoint saves (default as \`loci fit\`).
  --help, -h       this text.

Ctrl-C or SIGTERM stops the job running after its current round; it is saved and its
results so far written, and the queue stops there. Run the queue again to go on.

Exit codes:
  0  every job not skipped is done, or the queue was stopped by Ctrl-C or SIGTERM.
  1  one or more jobs failed (the others still ran; see the summary).
  2  bad input, and nothing was run: the queue file, a job's problem file or
     families, the flags, or an output folder that cannot be made.
`;

const OPTIONS: readonly OptionSpec[] = [
  { name: 'out-dir', kind: 'value' },
  { name: 'workers', kind: 'value' },
  { name: 'checkpoint-every', kind: 'value' },
  { name: 'help', kind: 'flag' },
];

/** A job ready to run: its problem file's JSON with the job's families, and its fingerprint. */
interface PreparedJob {
  readonly job: BatchJob;
  readonly problemJson: unknown;
  readonly fingerprint: string;
}

/** The problem JSON with only the job's families (or layouts); the families are checked against the problem's own. */
function withFamilies(json: unknown, kind: 'path' | 'suspension' | 'leg', all: readonly string[], job: BatchJob): { ok: true; json: unknown } | { ok: false; message: string } {
  if (job.families === undefined) return { ok: true, json };
  const unknown = job.families.filter((f) => !all.includes(f));
  if (unknown.length > 0) {
    const noun = kind === 'suspension' ? 'layouts' : 'families';
    return { ok: false, message: `${unknown.map((f) => JSON.stringify(f)).join(', ')} ${unknown.length === 1 ? 'is' : 'are'} not among the problem's ${noun} (${all.join(', ')})` };
  }
  const field = kind === 'suspension' ? 'layouts' : 'families';
  return { ok: true, json: { ...(json as Record<string, unknown>), [field]: [...job.families] } };
}

async function prepareJobs(queueFile: string, jobs: readonly BatchJob[], io: CliIo): Promise<{ ok: true; jobs: PreparedJob[] } | { ok: false; lines: string[] }> {
  const lines: string[] = [];
  const prepared: PreparedJob[] = [];
  for (const [i, job] of jobs.entries()) {
    const where = `${queueFile}: jobs[${i}] (${job.name})`;
    const path = isAbsolute(job.problem) ? job.problem : join(dirname(queueFile), job.problem);
    const read = await readProblemFile(path, io);
    if (!read.ok) {
      lines.push(...read.lines.map((line) => `${where}: ${line}`));
      continue;
    }
    const all = read.problem.kind === 'suspension' ? read.problem.layouts : read.problem.families;
    const narrowed = withFamilies(read.json, read.problem.kind, all, job);
    if (!narrowed.ok) {
      lines.push(`${where}: families: ${narrowed.message}`);
      continue;
    }
    const reread = parseSynthesisProblemFile(narrowed.json);
    if (!reread.ok) {
      lines.push(...reread.issues.map((issue) => `${where}: with its families, ${issue.path}: ${issue.message}`));
      continue;
    }
    // What the job runs: its own settings and the problem as run (a changed file is a new job).
    const { skip: _skip, ...settings } = job;
    const fingerprint = fnv1a64Hex(JSON.stringify({ settings, problem: narrowed.json }));
    prepared.push({ job, problemJson: narrowed.json, fingerprint });
  }
  return lines.length > 0 ? { ok: false, lines } : { ok: true, jobs: prepared };
}

async function exists(path: string): Promise<boolean> {
  try {
    await stat(path);
    return true;
  } catch {
    return false;
  }
}

interface Paths {
  readonly problem: string;
  readonly result: string;
  readonly checkpoint: string;
}

function pathsOf(outDir: string, name: string): Paths {
  return { problem: join(outDir, `${name}.problem.json`), result: join(outDir, `${name}.json`), checkpoint: join(outDir, `${name}.checkpoint`) };
}

/** Moves a changed job's earlier files aside, so nothing it found is lost. */
async function setAside(paths: Paths, oldFingerprint: string): Promise<string[]> {
  const moved: string[] = [];
  const tag = `superseded-${oldFingerprint.slice(0, 8)}`;
  const files = [paths.problem, paths.result, ...checkpointPathsFor(paths.checkpoint)];
  for (const file of files) {
    if (!(await exists(file))) continue;
    const ext = extname(file);
    const to = file.endsWith('.problem.json')
      ? file.replace(/\.problem\.json$/, `.${tag}.problem.json`)
      : ext === '.json' ? `${file.slice(0, -ext.length)}.${tag}.json` : `${file}.${tag}`;
    await rename(file, to);
    moved.push(basename(to));
  }
  return moved;
}

/** What a finished job's results file says of it, for the status and the summary. */
async function outcomeOf(resultPath: string, io: CliIo): Promise<Pick<JobStatus, 'stopReason' | 'best' | 'evaluations'>> {
  const read = await io.readTextFile(resultPath);
  if (!read.ok) return { stopReason: null, best: null, evaluations: null };
  try {
    const r = JSON.parse(read.text) as {
      stopReason?: unknown;
      evaluations?: unknown;
      problem?: { unit?: unknown };
      candidates?: { family?: unknown; value?: unknown; feasible?: unknown }[];
    };
    const first = Array.isArray(r.candidates) ? r.candidates[0] : undefined;
    const best = first !== undefined && typeof first.family === 'string' && typeof first.value === 'number' && typeof first.feasible === 'boolean'
      ? { family: first.family, value: first.value, feasible: first.feasible, unit: typeof r.problem?.unit === 'string' ? r.problem.unit : '' }
      : null;
    return {
      stopReason: typeof r.stopReason === 'string' ? r.stopReason : null,
      best,
      evaluations: typeof r.evaluations === 'number' ? r.evaluations : null,
    };
  } catch {
    return { stopReason: null, best: null, evaluations: null };
  }
}

function fitArgs(job: BatchJob, paths: Paths, workers: number | undefined, everyS: number | undefined): string[] {
  const args = [paths.problem, '--seed', String(job.seed), '--out', paths.result, '--checkpoint', paths.checkpoint];
  if (job.evaluations !== undefined) args.push('--evals', String(job.evaluations));
  if (job.seconds !== undefined) args.push('--seconds', String(job.seconds));
  if (job.islands !== undefined) args.push('--islands', String(job.islands));
  if (job.top !== undefined) args.push('--top', String(job.top));
  if (workers !== undefined) args.push('--workers', String(workers));
  if (everyS !== undefined) args.push('--checkpoint-every', String(everyS));
  return args;
}

function summaryLine(name: string, s: JobStatus | undefined, width: number): string {
  const state = s?.state ?? 'not run';
  const best = s?.best === undefined || s.best === null ? '' : `best ${s.best.value.toPrecision(4)} ${s.best.unit}${s.best.feasible ? '' : ' (infeasible)'} (${s.best.family})`;
  const evals = s?.evaluations === undefined || s.evaluations === null ? '' : `${Math.round(s.evaluations).toLocaleString('en-GB')} evaluations`;
  const why = s?.state === 'failed' && s.message !== null ? s.message : s?.stopReason ?? '';
  return `  ${name.padEnd(width)}  ${state.padEnd(11)}  ${[best, evals, why].filter((t) => t !== '').join(', ')}`;
}

export async function run(args: readonly string[], io: CliIo): Promise<number> {
  const start = startCommand('batch', usage, args, OPTIONS, io);
  if (typeof start === 'number') return start;
  const { usageError } = start;
  const one = singleFile(start.args, 'queue file');
  if (!one.ok) return usageError(one.message);
  const workers = numberOption(start.args, 'workers', 'a whole number from 1 to 256');
  if (!workers.ok) return usageError(workers.message);
  if (workers.value !== undefined && !(Number.isInteger(workers.value) && workers.value >= 1 && workers.value <= 256)) {
    return usageError(`--workers: expected a whole number from 1 to 256, got ${workers.value}`);
  }
  const every = numberOption(start.args, 'checkpoint-every', `a number of seconds from ${MIN_CHECKPOINT_EVERY_S} to ${MAX_CHECKPOINT_EVERY_S}`);
  if (!every.ok) return usageError(every.message);
  if (every.value !== undefined && !(every.value >= MIN_CHECKPOINT_EVERY_S && every.value <= MAX_CHECKPOINT_EVERY_S)) {
    return usageError(`--checkpoint-every: expected a number of seconds from ${MIN_CHECKPOINT_EVERY_S} to ${MAX_CHECKPOINT_EVERY_S}, got ${every.value}`);
  }
  const outDirRaw = start.args.options.get('out-dir');
  if (outDirRaw === true || outDirRaw === '') return usageError('--out-dir needs a folder name');

  const queueFile = one.file;
  const read = await io.readTextFile(queueFile);
  if (!read.ok) {
    io.stderr(`loci batch: ${read.message}\n`);
    return EXIT_USAGE;
  }
  const json = parseJsonText(read.text);
  if (!json.ok) {
    io.stderr(`loci batch: ${queueFile}: ${json.message}\n`);
    return EXIT_USAGE;
  }
  const parsed = parseBatchQueue(json.json);
  if (!parsed.ok) {
    io.stderr(parsed.issues.map((issue) => `loci batch: ${queueFile}: ${issue.path === '' ? '' : `${issue.path}: `}${issue.message}\n`).join(''));
    return EXIT_USAGE;
  }
  const queue = parsed.queue;
  const prepared = await prepareJobs(queueFile, queue.jobs.filter((j) => !j.skip), io);
  if (!prepared.ok) {
    io.stderr(prepared.lines.map((line) => `loci batch: ${line}\n`).join(''));
    return EXIT_USAGE;
  }
  const outDir = typeof outDirRaw === 'string' ? outDirRaw : join(dirname(queueFile), `${basename(queueFile, extname(queueFile))}.results`);
  if (resolve(outDir) === resolve(dirname(queueFile)) || resolve(outDir) === resolve(queueFile)) {
    return usageError('--out-dir: give a folder of its own, not the queue file\'s folder, so the results cannot overwrite a problem file');
  }
  try {
    await mkdir(outDir, { recursive: true });
  } catch (error) {
    io.stderr(`loci batch: cannot make the output folder ${outDir}: ${fsReason(error)}\n`);
    return EXIT_USAGE;
  }

  const statusPath = join(outDir, BATCH_STATUS_FILE);
  let status: BatchStatus = emptyStatus(queue.name);
  const kept = await io.readTextFile(statusPath);
  if (kept.ok) {
    const old = readBatchStatus(kept.text);
    if (old.ok) status = { ...old.status, queue: queue.name };
    else io.stderr(`loci batch: ${statusPath} cannot be used (${old.reason}); every job runs, resuming from its checkpoint where it has one\n`);
  }
  const save = async (next: BatchStatus) => {
    status = next;
    try {
      await writeFileAtomic(statusPath, `${formatJson(status)}\n`);
    } catch (error) {
      io.stderr(`loci batch: could not save ${statusPath}: ${fsReason(error)}; the queue goes on\n`);
    }
  };

  let stopping: NodeJS.Signals | null = null;
  const onSignal = (signal: NodeJS.Signals) => {
    if (stopping !== null) {
      // A second signal: let it end the process, as it would without the queue.
      for (const s of signals) process.off(s, onSignal);
      process.kill(process.pid, signal);
      return;
    }
    stopping = signal;
    io.stderr(`loci batch: ${signal}: the job running stops after its round and is saved; the queue stops after it\n`);
  };
  const signals: NodeJS.Signals[] = ['SIGINT', 'SIGTERM'];
  for (const s of signals) process.on(s, onSignal);

  const byName = new Map(prepared.jobs.map((p) => [p.job.name, p]));
  let failed = 0;
  try {
    for (const job of queue.jobs) {
      if (stopping !== null) break;
      const now = () => new Date().toISOString();
      const before = status.jobs[job.name];
      const p = byName.get(job.name);
      if (p === undefined) {
        await save(withJob(status, job.name, { ...(before ?? blank('')), state: 'skipped', message: 'skipped ("skip": true in the queue)' }));
        io.stderr(`loci batch: ${job.name}: skipped\n`);
        continue;
      }
      const paths = pathsOf(outDir, job.name);
      if (before !== undefined && before.fingerprint === p.fingerprint && before.state === 'done' && (await exists(paths.result))) {
        io.stderr(`loci batch: ${job.name}: already done (${paths.result}); passed over\n`);
        continue;
      }
      if (before !== undefined && before.fingerprint !== p.fingerprint) {
        const moved = await setAside(paths, before.fingerprint);
        if (moved.length > 0) io.stderr(`loci batch: ${job.name}: its entry or problem changed; its earlier files are kept as ${moved.join(', ')}\n`);
      }
      if (before?.state === 'running' && before.fingerprint === p.fingerprint) {
        io.stderr(`loci batch: ${job.name}: was running when the last batch ended; resuming it from its checkpoint\n`);
      }
      await writeFileAtomic(paths.problem, `${formatJson(p.problemJson)}\n`);
      await save(withJob(status, job.name, { ...blank(p.fingerprint), state: 'running', startedAt: now() }));
      io.stderr(`loci batch: ${job.name}: started\n`);
      let lastLine = '';
      const jobIo: CliIo = {
        ...io,
        stderr: (text) => {
          for (const line of text.split('\n')) {
            if (line === '') continue;
            lastLine = line.replace(/^loci fit: /, '');
            io.stderr(`[${job.name}] ${line}\n`);
          }
        },
      };
      const code = await fit(fitArgs(job, paths, workers.value, every.value), jobIo);
      const outcome = await outcomeOf(paths.result, io);
      const interrupted = stopping !== null || outcome.stopReason === 'interrupted';
      const state = code !== EXIT_OK ? 'failed' : interrupted ? 'interrupted' : 'done';
      if (state === 'failed') failed++;
      await save(withJob(status, job.name, {
        fingerprint: p.fingerprint,
        state,
        startedAt: status.jobs[job.name]?.startedAt ?? null,
        endedAt: now(),
        exitCode: code,
        ...outcome,
        message: state === 'failed' ? lastLine : null,
      }));
      io.stderr(`loci batch: ${job.name}: ${state}\n`);
    }
  } finally {
    for (const s of signals) process.off(s, onSignal);
  }

  const width = Math.max(...queue.jobs.map((j) => j.name.length));
  const counts = new Map<string, number>();
  for (const job of queue.jobs) {
    const state = status.jobs[job.name]?.state ?? 'not run';
    counts.set(state, (counts.get(state) ?? 0) + 1);
  }
  const tally = [...counts].map(([state, n]) => `${n} ${state}`).join(', ');
  io.stdout([
    `loci batch: ${queue.name}: ${queue.jobs.length} job${queue.jobs.length === 1 ? '' : 's'}: ${tally}; results in ${outDir}`,
    ...queue.jobs.map((j) => summaryLine(j.name, status.jobs[j.name], width)),
    ...(stopping !== null ? ['Stopped on request; run the same queue again to go on.'] : []),
    '',
  ].join('\n'));
  return failed > 0 ? EXIT_FAILURE : EXIT_OK;
}

function blank(fingerprint: string): JobStatus {
  return { fingerprint, state: 'running', startedAt: null, endedAt: null, exitCode: null, stopReason: null, best: null, evaluations: null, message: null };
}
