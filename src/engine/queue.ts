/**
 * A batch queue as a layer above a run: the order of its jobs, each job's state, what
 * runs next, and who owns the queue. Pure: every change is a function from one state to
 * the next (or a reason it is refused), so the page's store, the IndexedDB record and
 * the tests all see the same transitions. A job's shape is the queue file's
 * (src/core/io/batchQueue.ts); only its problem differs, a path on the command line and
 * the problem itself in the app.
 */
import type { BatchJob } from '../core/io/batchQueue';

export const QUEUE_RECORD_FORMAT = 'loci-queue-state';
export const QUEUE_RECORD_VERSION = 1;

/** A queue file's job with its problem carried as `P` (the command line's is a path). */
export type QueuedJobSpec<P> = Omit<BatchJob, 'problem'> & { readonly problem: P };

/**
 * waiting: not run yet (or `spec.skip`: left in the queue, not run); running: the job
 * the queue is on (also while the queue is paused); done: ended on its budget, target
 * or convergence; failed: the engine could not run it; cut: skipped while it ran, its
 * designs so far kept.
 */
export type QueueJobStatus = 'waiting' | 'running' | 'done' | 'failed' | 'cut';

/**
 * The best design of one family (layout) a job found: a path job's by its RMS error, mm;
 * a rear-suspension or walking-leg job's by its search score (lower is better, no unit).
 */
export type FamilyBest =
  | { readonly family: string; readonly rmsMm: number; readonly feasible: boolean }
  | { readonly family: string; readonly score: number; readonly feasible: boolean };

/** The figure a family's best is ranked by (RMS error or score). */
export function bestFigure(b: FamilyBest): number {
  return 'rmsMm' in b ? b.rmsMm : b.score;
}

/** What a job that ended leaves for the summary. */
export interface JobOutcome {
  /** The engine's stop reason, or 'failed'. */
  readonly ended: string;
  /** Why it failed, in the engine's words; null when it did not. */
  readonly reason: string | null;
  readonly evaluations: number;
  /** Active search time, ms (paused time and reloads excluded). */
  readonly elapsedMs: number;
  /** Worker restarts after a lost worker. */
  readonly restarts: number;
  /** Fresh optimizer runs the job's restart schemes started (after a run converged or stalled); absent in outcomes kept before it was counted. */
  readonly searchRestarts?: number;
  /** Best of each family, best first; empty when the job found nothing. */
  readonly best: readonly FamilyBest[];
  /** Whether the job's designs were kept in the run history under its run id. */
  readonly kept: boolean;
  /**
   * A workspace job's finished run as that workspace keeps its runs (absent for path jobs,
   * whose designs go to the run history): the app reads it with the workspace's schema.
   */
  readonly designs?: unknown;
}

export interface QueueEntry<P> {
  /** Stable key of the entry (names may be reused after a delete). */
  readonly id: string;
  readonly spec: QueuedJobSpec<P>;
  readonly status: QueueJobStatus;
  /** The run id its checkpoints and kept results are filed under, once it has started. */
  readonly runId: string | null;
  /** Times the job went on from a checkpoint (after a reload or a pause). */
  readonly resumes: number;
  readonly outcome: JobOutcome | null;
}

/** idle: not started (or stopped); running: jobs run one after another; paused: held on the user's word; done: nothing left to run. */
export type QueueMode = 'idle' | 'running' | 'paused' | 'done';

export interface QueueState<P> {
  readonly format: typeof QUEUE_RECORD_FORMAT;
  readonly version: typeof QUEUE_RECORD_VERSION;
  readonly mode: QueueMode;
  readonly jobs: readonly QueueEntry<P>[];
}

export type QueueChange<P> = { readonly ok: true; readonly state: QueueState<P> } | { readonly ok: false; readonly reason: string };

export function emptyQueue<P>(): QueueState<P> {
  return { format: QUEUE_RECORD_FORMAT, version: QUEUE_RECORD_VERSION, mode: 'idle', jobs: [] };
}

function refuse<P>(reason: string): QueueChange<P> {
  return { ok: false, reason };
}

function withJobs<P>(state: QueueState<P>, jobs: readonly QueueEntry<P>[], mode: QueueMode = state.mode): QueueChange<P> {
  return { ok: true, state: { ...state, mode, jobs } };
}

function find<P>(state: QueueState<P>, id: string): number {
  return state.jobs.findIndex((j) => j.id === id);
}

export function runningJob<P>(state: QueueState<P>): QueueEntry<P> | null {
  return state.jobs.find((j) => j.status === 'running') ?? null;
}

/** The job to run next: the first waiting job not marked skip. */
export function nextJob<P>(state: QueueState<P>): QueueEntry<P> | null {
  return state.jobs.find((j) => j.status === 'waiting' && !j.spec.skip) ?? null;
}

/** Adds a job at the end. A queue that was done takes new work: it goes back to idle until started. */
export function addJob<P>(state: QueueState<P>, id: string, spec: QueuedJobSpec<P>): QueueChange<P> {
  if (find(state, id) >= 0) return refuse(`a job with id ${id} is in the queue already`);
  const entry: QueueEntry<P> = { id, spec, status: 'waiting', runId: null, resumes: 0, outcome: null };
  return withJobs(state, [...state.jobs, entry], state.mode === 'done' ? 'idle' : state.mode);
}

/** Deletes a job; the running job must be skipped first (its run has to stop and be kept). */
export function deleteJob<P>(state: QueueState<P>, id: string): QueueChange<P> {
  const i = find(state, id);
  if (i < 0) return refuse('that job is no longer in the queue');
  if (state.jobs[i].status === 'running') return refuse(`"${state.jobs[i].spec.name}" is running; skip it first, then delete it`);
  return withJobs(state, state.jobs.filter((_, k) => k !== i));
}

/** Moves a job one place up (-1) or down (+1). Only the order of jobs not yet run matters, but any job may move. */
export function moveJob<P>(state: QueueState<P>, id: string, by: -1 | 1): QueueChange<P> {
  const i = find(state, id);
  if (i < 0) return refuse('that job is no longer in the queue');
  const j = i + by;
  if (j < 0 || j >= state.jobs.length) return refuse(`"${state.jobs[i].spec.name}" is ${by < 0 ? 'first' : 'last'} already`);
  const jobs = [...state.jobs];
  [jobs[i], jobs[j]] = [jobs[j], jobs[i]];
  return withJobs(state, jobs);
}

/**
 * Marks a waiting job to be passed over (or to run again). The running job is not
 * skipped here: its run must stop first, and then `endJob` records it as cut.
 */
export function setSkip<P>(state: QueueState<P>, id: string, skip: boolean): QueueChange<P> {
  const i = find(state, id);
  if (i < 0) return refuse('that job is no longer in the queue');
  const entry = state.jobs[i];
  if (entry.status !== 'waiting') return refuse(`"${entry.spec.name}" has ${entry.status === 'running' ? 'started; skipping it stops its run' : 'run already'}`);
  return withJobs(state, state.jobs.map((j, k) => (k === i ? { ...j, spec: { ...j.spec, skip } } : j)));
}

/** Starts (or resumes) the queue. */
export function startQueue<P>(state: QueueState<P>): QueueChange<P> {
  if (state.mode === 'running') return refuse('the queue is running already');
  if (runningJob(state) === null && nextJob(state) === null) return refuse('no job is waiting to run (add one, or clear a job\'s skip mark)');
  return withJobs(state, state.jobs, 'running');
}

/** Holds the queue: the running job pauses at its next round and stays the queue's job. */
export function pauseQueue<P>(state: QueueState<P>): QueueChange<P> {
  if (state.mode !== 'running') return refuse('the queue is not running');
  return withJobs(state, state.jobs, 'paused');
}

/** The next job starts under `runId`. */
export function beginJob<P>(state: QueueState<P>, id: string, runId: string): QueueChange<P> {
  if (state.mode !== 'running') return refuse('the queue is not running');
  const running = runningJob(state);
  if (running !== null) return refuse(`"${running.spec.name}" is running already`);
  const i = find(state, id);
  if (i < 0) return refuse('that job is no longer in the queue');
  const entry = state.jobs[i];
  if (entry.status !== 'waiting' || entry.spec.skip) return refuse(`"${entry.spec.name}" is not waiting to run`);
  return withJobs(state, state.jobs.map((j, k) => (k === i ? { ...j, status: 'running' as const, runId } : j)));
}

/** The running job went on from a checkpoint. */
export function noteResume<P>(state: QueueState<P>, id: string): QueueChange<P> {
  const i = find(state, id);
  if (i < 0 || state.jobs[i].status !== 'running') return refuse('that job is not running');
  return withJobs(state, state.jobs.map((j, k) => (k === i ? { ...j, resumes: j.resumes + 1 } : j)));
}

/** The running job ended: done, failed, or cut (skipped while it ran). */
export function endJob<P>(state: QueueState<P>, id: string, status: 'done' | 'failed' | 'cut', outcome: JobOutcome): QueueChange<P> {
  const i = find(state, id);
  if (i < 0 || state.jobs[i].status !== 'running') return refuse('that job is not running');
  return withJobs(state, state.jobs.map((j, k) => (k === i ? { ...j, status, outcome } : j)));
}

/** What the tab that owns the queue does when it opens it (a first start or a reload). */
export type QueueStep<P> =
  | { readonly kind: 'hold' }
  | { readonly kind: 'resume'; readonly job: QueueEntry<P> }
  | { readonly kind: 'begin'; readonly job: QueueEntry<P> }
  | { readonly kind: 'finish' };

/**
 * The next step of a queue: a paused or idle queue holds; a running queue goes on with
 * the job it was on (from that job's checkpoint), else begins the next, else is done.
 */
export function nextStep<P>(state: QueueState<P>): QueueStep<P> {
  if (state.mode !== 'running') return { kind: 'hold' };
  const running = runningJob(state);
  if (running !== null) return { kind: 'resume', job: running };
  const next = nextJob(state);
  return next === null ? { kind: 'finish' } : { kind: 'begin', job: next };
}

/** A running queue with nothing left to run is done (the step after its last job, or after the last waiting one is skipped or deleted). */
export function finishQueue<P>(state: QueueState<P>): QueueChange<P> {
  if (nextStep(state).kind !== 'finish') return refuse('the queue has work left, or is not running');
  return withJobs(state, state.jobs, 'done');
}

function isObject(v: unknown): v is Record<string, unknown> {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}

const STATUSES: readonly string[] = ['waiting', 'running', 'done', 'failed', 'cut'];
const MODES: readonly string[] = ['idle', 'running', 'paused', 'done'];

function entryProblem(v: unknown, isProblem: (p: unknown) => boolean): string | null {
  if (!isObject(v) || typeof v.id !== 'string' || !STATUSES.includes(v.status as string)) return 'has no id or status';
  if (!(v.runId === null || typeof v.runId === 'string') || typeof v.resumes !== 'number') return 'has no run id or resume count';
  const spec = v.spec;
  if (!isObject(spec) || typeof spec.name !== 'string' || typeof spec.seed !== 'number' || typeof spec.skip !== 'boolean') return 'has no name, seed or skip mark';
  if (typeof spec.evaluations !== 'number' && typeof spec.seconds !== 'number') return 'has no budget';
  if (!isProblem(spec.problem)) return 'has no problem the page can read';
  const o = v.outcome;
  if (o !== null && !(isObject(o) && typeof o.ended === 'string' && typeof o.evaluations === 'number' && typeof o.elapsedMs === 'number' && Array.isArray(o.best))) return 'has an unreadable outcome';
  if ((v.status === 'waiting' || v.status === 'running') !== (o === null)) return 'has an outcome that does not match its status';
  return null;
}

/**
 * A stored queue read back, checked whole: a record of another format, or with a job
 * that cannot be read, is refused with where it went wrong, never half read.
 */
export function readQueueState<P>(value: unknown, isProblem: (p: unknown) => boolean): QueueChange<P> {
  if (!isObject(value) || value.format !== QUEUE_RECORD_FORMAT) return refuse('the stored queue is not a Loci queue record');
  if (value.version !== QUEUE_RECORD_VERSION) return refuse(`the stored queue is version ${String(value.version)}; this page reads version ${QUEUE_RECORD_VERSION}`);
  if (!MODES.includes(value.mode as string) || !Array.isArray(value.jobs)) return refuse('the stored queue has no mode or job list');
  const jobs = value.jobs as unknown[];
  for (const [i, job] of jobs.entries()) {
    const problem = entryProblem(job, isProblem);
    if (problem !== null) return refuse(`job ${i + 1} of the stored queue ${problem}`);
  }
  const state = value as unknown as QueueState<P>;
  if (state.jobs.filter((j) => j.status === 'running').length > 1) return refuse('the stored queue has more than one job running');
  return { ok: true, state };
}

export interface QueueTally {
  /** Jobs the queue runs (not skipped), and those of them that have ended. */
  readonly runnable: number;
  readonly ended: number;
  readonly skipped: number;
}

export function tally<P>(state: QueueState<P>): QueueTally {
  let runnable = 0;
  let ended = 0;
  let skipped = 0;
  for (const j of state.jobs) {
    if (j.status === 'waiting' && j.spec.skip) skipped++;
    else runnable++;
    if (j.status === 'done' || j.status === 'failed' || j.status === 'cut') ended++;
  }
  return { runnable, ended, skipped };
}

/**
 * Fraction of a job's budget spent (0 … 1): evaluations of an evaluation budget, active
 * seconds of a time budget. A job that ended counts whole.
 */
export function jobFraction(spec: { readonly evaluations?: number; readonly seconds?: number }, evaluations: number, elapsedMs: number): number {
  const f = spec.evaluations !== undefined ? evaluations / spec.evaluations : spec.seconds !== undefined ? elapsedMs / (spec.seconds * 1000) : 0;
  return f >= 0 ? Math.min(1, f) : 0;
}

/** A lease on the queue, for browsers without the Web Locks API: the owner renews it before it expires. */
export interface QueueLease {
  readonly owner: string;
  /** Wall time it lapses, ms since 1970. */
  readonly expiresAt: number;
}

/** How long a lease lasts past its last renewal, ms: three renewals may be missed (a throttled timer) before another tab takes over. */
export const LEASE_MS = 20_000;
export const LEASE_RENEW_MS = 5_000;

/** Whether `me` may own the queue at `nowMs` given the stored lease: its own, a lapsed one or none is free to take. */
export function leaseHolder(lease: QueueLease | null, me: string, nowMs: number): 'mine' | 'free' | 'other' {
  if (lease === null) return 'free';
  if (lease.owner === me) return 'mine';
  // A lease from a clock far ahead would never lapse: one further out than a full term is treated as lapsed.
  if (!(lease.expiresAt > nowMs) || lease.expiresAt - nowMs > LEASE_MS) return 'free';
  return 'other';
}
