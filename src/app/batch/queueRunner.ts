/**
 * Runs the batch queue in the tab that owns it: one job after another through the
 * engine, each job's checkpoints under its own run id, each job's designs kept in the run
 * history when it ends. Every change of the queue goes through the pure transitions of
 * src/engine/queue.ts and is saved before the next, so a reload between jobs finds the
 * queue where it was, and a reload mid-job goes on from that job's checkpoint.
 */
import {
  type RankedCandidate,
  type Run,
  type RunProgress,
  type RunInput,
  type RunResult,
} from '../../engine';
import { createHostedRun, restoreHostedRunFromStore, type HostingEnvironment } from '../../engine/runHost';
import {
  addJob, beginJob, deleteJob, emptyQueue, endJob, finishQueue, moveJob, nextStep, noteResume, pauseQueue, runningJob, setSkip, startQueue,
  type JobOutcome, type QueueChange,
} from '../../engine/queue';
import type { CandidateReport } from '../../core/synthesis';
import { RUN_LOCK } from '../boot';
import { notifyHistoryChanged } from '../history/historyEvents';
import { buildRunInput, CANDIDATES_SHOWN } from '../run/runInput';
import { snapshotTarget } from '../state/project';
import { indexedDbCheckpointStore, keepRun, dropCheckpointsExcept, type LociDb } from '../storage';
import { loadQueue, QUEUE_RUN_SCOPE, saveQueue } from '../storage/queueStore';
import { isJobProblem, isPathJob, jobProject, jobSettings, type AppJobSpec, type AppQueueEntry, type AppQueueState, type JobProblem, type WorkspaceJobSpec } from './jobs';
import { bestPerFamily, bestPerLayout } from './summary';
import { workspaceJobRun, workspaceRunInput, workspaceRunKeep, workspaceStartIssues } from './workspaceJobs';
import { holdSearchLock } from './ownership';

/** Progress reaches the view at most this often, ms. */
const PROGRESS_EVERY_MS = 500;

/** How far the running job has got. */
export interface LiveJob {
  readonly id: string;
  /** waiting-lock: held back until a workspace search ends; starting: workers starting. */
  readonly phase: 'waiting-lock' | 'starting' | 'running' | 'pausing' | 'paused' | 'stopping';
  readonly evaluations: number;
  readonly elapsedMs: number;
  /** The round of its last checkpoint, or null before the first. */
  readonly checkpointRound: number | null;
}

export interface QueueView {
  /** checking: reading the queue and asking for it; self: this tab runs it; other: another tab does. */
  readonly owner: 'checking' | 'self' | 'other';
  readonly state: AppQueueState;
  readonly live: LiveJob | null;
  /** Notes per job id, for the user (a restart after a reload with no checkpoint, a failure's detail). */
  readonly notes: Readonly<Record<string, string>>;
  /** The last thing that went wrong with the queue itself, or null. */
  readonly problem: string | null;
}

export interface QueueRunnerDeps {
  readonly db: LociDb;
  readonly env: HostingEnvironment;
  readonly newRunId: () => string;
  /** Told once when the queue has run to its end in this tab. */
  readonly onQueueDone: (state: AppQueueState) => void;
}

function reportsOf(candidates: readonly RankedCandidate[]): CandidateReport[] {
  return candidates.flatMap((c) => (c.detail.kind === 'synthesis' ? [c.detail.candidate] : []));
}

/** The engine's run input of a job, through the builder its workspace's own search uses. */
function runInputOf(spec: AppJobSpec, workers: number): { ok: true; input: RunInput } | { ok: false; reason: string } {
  if (isPathJob(spec)) return buildRunInput(jobProject(spec), workers);
  const w = spec as WorkspaceJobSpec;
  const refused = workspaceStartIssues(w, workers);
  return refused.length > 0 ? { ok: false, reason: refused.join('; ') } : { ok: true, input: workspaceRunInput(w, workers) };
}

function message(error: unknown): string {
  return error instanceof Error ? error.message : String(error);
}

interface ActiveRun {
  readonly id: string;
  readonly run: Run;
  /** Set when the user skipped the job while it ran. */
  cut: boolean;
  /** Words for a run restored from a checkpoint, given the round it goes on from (known at its first running report); null once said. */
  resumeNote: ((round: number) => string) | null;
  /** The pause under way (the run stops at its next round and checkpoints), or null. */
  pausing: Promise<void> | null;
}

export class QueueRunner {
  private readonly deps: QueueRunnerDeps;
  private view: QueueView = { owner: 'checking', state: emptyQueue<JobProblem>(), live: null, notes: {}, problem: null };
  private readonly listeners = new Set<() => void>();
  private active: ActiveRun | null = null;
  /** A job is being set up (restored or created) and not yet active. */
  private preparing = false;
  private saving: Promise<void> = Promise.resolve();
  private lastLiveMs = -Infinity;
  private readonly channel: BroadcastChannel | null = typeof BroadcastChannel === 'undefined' ? null : new BroadcastChannel('loci-batch-queue');
  /** Aborts a wait for the search lock (the queue paused, or a job skipped, while it waited). */
  private lockWait: AbortController | null = null;
  /** The job skipped while its run was being set up: it stops as soon as it exists. */
  private cutWanted: string | null = null;

  constructor(deps: QueueRunnerDeps) {
    this.deps = deps;
    // A tab that only watches the queue reads it again whenever the owner saves it.
    this.channel?.addEventListener('message', () => {
      if (this.view.owner !== 'self') void this.reload();
    });
  }

  snapshot = (): QueueView => this.view;

  subscribe = (listener: () => void): (() => void) => {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  };

  private set(patch: Partial<QueueView>): void {
    this.view = { ...this.view, ...patch };
    for (const listener of this.listeners) listener();
  }

  private note(id: string, text: string | null): void {
    const notes = { ...this.view.notes };
    if (text === null) delete notes[id];
    else notes[id] = text;
    this.set({ notes });
  }

  /** Reads the stored queue (a watching tab, or a tab about to own it). */
  async reload(): Promise<boolean> {
    try {
      const read = await loadQueue<JobProblem>(this.deps.db, isJobProblem);
      if (!read.ok) {
        this.set({ problem: `The stored queue could not be read, and is left as it is: ${read.reason}` });
        return false;
      }
      this.set({ state: read.state, problem: null });
      return true;
    } catch (error) {
      this.set({ problem: `The queue could not be read: ${message(error)}` });
      return false;
    }
  }

  /** Ownership changed (src/app/batch/ownership.ts). */
  async setOwned(owned: boolean): Promise<void> {
    if (!owned) {
      this.set({ owner: 'other' });
      await this.reload();
      return;
    }
    if (!(await this.reload())) {
      this.set({ owner: 'self' });
      return;
    }
    this.set({ owner: 'self' });
    this.advance();
  }

  /** Applies a transition and saves it; false (with the reason shown) when it is refused. */
  private apply(change: QueueChange<JobProblem>): boolean {
    if (!change.ok) {
      this.set({ problem: change.reason.charAt(0).toUpperCase() + change.reason.slice(1) + '.' });
      return false;
    }
    this.set({ state: change.state, problem: null });
    const state = change.state;
    this.saving = this.saving.then(
      () => saveQueue(this.deps.db, state).then(() => this.channel?.postMessage('saved')),
    ).catch((error: unknown) => this.set({ problem: `The queue could not be saved (it runs on, but a reload would lose this change): ${message(error)}` }));
    return true;
  }

  private owns(): boolean {
    return this.view.owner === 'self';
  }

  add(id: string, spec: AppJobSpec): boolean {
    return this.owns() && this.apply(addJob(this.view.state, id, spec));
  }

  remove(id: string): void {
    if (this.owns() && this.apply(deleteJob(this.view.state, id))) this.advance();
  }

  move(id: string, by: -1 | 1): void {
    if (this.owns()) this.apply(moveJob(this.view.state, id, by));
  }

  setSkip(id: string, skip: boolean): void {
    if (this.owns() && this.apply(setSkip(this.view.state, id, skip))) this.advance();
  }

  /** Skips the running job: its run stops at its next round, its designs so far are kept, and the queue goes on. */
  cutRunning(): void {
    const running = runningJob(this.view.state);
    if (!this.owns() || running === null) return;
    const active = this.active;
    if (active !== null && active.id === running.id) {
      active.cut = true;
      this.setLive({ phase: 'stopping' });
      active.run.cancel();
      return;
    }
    if (this.lockWait !== null) {
      // Not started: it waited for a workspace search. Ends with nothing found.
      this.lockWait.abort();
      return;
    }
    if (this.preparing) {
      this.cutWanted = running.id;
      return;
    }
    // Paused across a reload: read its checkpoint back to keep what it found, then end it.
    void this.runJob(running, true, true);
  }

  start(): void {
    if (!this.owns()) return;
    if (!this.apply(startQueue(this.view.state))) return;
    const active = this.active;
    if (active === null) {
      this.advance();
      return;
    }
    // A pause still under way ends first; the run then goes on.
    void (active.pausing ?? Promise.resolve()).then(() => {
      if (this.active !== active || this.view.state.mode !== 'running' || active.run.status() !== 'paused') return;
      active.run.resume();
      this.setLive({ phase: 'running' });
    });
  }

  async pause(): Promise<void> {
    if (!this.owns() || !this.apply(pauseQueue(this.view.state))) return;
    this.lockWait?.abort();
    const active = this.active;
    if (active !== null) await this.pauseRun(active);
  }

  private async pauseRun(active: ActiveRun): Promise<void> {
    this.setLive({ phase: 'pausing' });
    const pausing = active.run.pause();
    active.pausing = pausing;
    await pausing;
    if (active.pausing === pausing) active.pausing = null;
    if (this.active === active && !active.cut && this.view.state.mode === 'paused') this.setLive({ phase: 'paused' });
  }

  private setLive(patch: Partial<LiveJob>): void {
    if (this.view.live === null) return;
    this.set({ live: { ...this.view.live, ...patch } });
  }

  /** Runs what the queue's state asks for next, when this tab owns it and no job is under way. */
  private advance(): void {
    if (!this.owns() || this.active !== null || this.preparing) return;
    const step = nextStep(this.view.state);
    if (step.kind === 'hold') return;
    if (step.kind === 'finish') {
      if (this.apply(finishQueue(this.view.state))) void this.saving.then(() => this.deps.onQueueDone(this.view.state));
      return;
    }
    if (step.kind === 'begin') {
      const runId = `${QUEUE_RUN_SCOPE}-${this.deps.newRunId()}`;
      if (!this.apply(beginJob(this.view.state, step.job.id, runId))) return;
      const begun = runningJob(this.view.state);
      if (begun !== null) void this.runJob(begun, false, false);
      return;
    }
    void this.runJob(step.job, true, false);
  }

  /**
   * Runs one job to its end: created afresh, or restored from its newest readable
   * checkpoint (`resume`); `cutNow` restores a paused job only to end it with its designs.
   */
  private async runJob(entry: AppQueueEntry, resume: boolean, cutNow: boolean): Promise<void> {
    const runId = entry.runId;
    if (runId === null) return;
    this.preparing = true;
    this.set({ live: { id: entry.id, phase: 'waiting-lock', evaluations: 0, elapsedMs: 0, checkpointRound: null } });
    let release = () => {};
    const released = new Promise<void>((resolve) => {
      release = resolve;
    });
    const wait = new AbortController();
    this.lockWait = wait;
    try {
      await holdSearchLock(RUN_LOCK, released, wait.signal);
    } catch {
      this.lockWait = null;
      this.preparing = false;
      // Paused while waiting: the job stays the queue's job. Skipped while waiting: it ends with nothing.
      if (this.view.state.mode === 'paused') this.set({ live: null });
      else this.end(entry, 'cut', { ended: 'cancelled', reason: null, evaluations: 0, elapsedMs: 0, restarts: 0, best: [], kept: false });
      return;
    }
    this.lockWait = null;
    try {
      let made: Awaited<ReturnType<QueueRunner['makeRun']>>;
      try {
        made = await this.makeRun(entry, runId, resume);
      } catch (error) {
        // Storage failed under the job (IndexedDB closed, quota): it ends as failed and the queue goes on.
        made = null;
        this.end(entry, 'failed', { ended: 'failed', reason: message(error), evaluations: 0, elapsedMs: 0, restarts: 0, best: [], kept: false });
      }
      this.preparing = false;
      if (made === null) return;
      const cut = cutNow || this.cutWanted === entry.id;
      this.cutWanted = null;
      const active: ActiveRun = { id: entry.id, run: made.run, cut, resumeNote: made.resumeNote, pausing: null };
      this.active = active;
      this.set({ live: { id: entry.id, phase: 'starting', evaluations: 0, elapsedMs: 0, checkpointRound: null } });
      const unsubscribe = made.run.onProgress((p) => this.onProgress(active, p));
      if (cut) made.run.cancel();
      let result: RunResult;
      try {
        const ending = made.run.start();
        // Paused while the job was being set up: it pauses at its first round.
        if (!cut && this.view.state.mode === 'paused') void this.pauseRun(active);
        result = await ending;
      } catch (error) {
        const p = made.run.progress();
        result = { ok: false, reason: message(error), evaluations: p.evaluations, rounds: p.rounds };
      }
      unsubscribe();
      await this.record(entry, active, made.run, result);
    } finally {
      this.preparing = false;
      release();
    }
  }

  private async makeRun(entry: AppQueueEntry, runId: string, resume: boolean): Promise<{ run: Run; resumeNote: ((round: number) => string) | null } | null> {
    const { env, db } = this.deps;
    const spec = entry.spec;
    const path = isPathJob(spec) ? jobSettings(spec) : null;
    const workers = path?.workers ?? env.defaultWorkerCount();
    const store = indexedDbCheckpointStore(db, runId);
    const options = path !== null
      ? { workers, topK: CANDIDATES_SHOWN, perJob: path.resultsPerFamily }
      : { workers, ...workspaceRunKeep(spec.problem.kind === 'suspension' ? 'suspension' : 'leg') };
    if (resume) {
      const restored = await restoreHostedRunFromStore(env, store, options);
      if (restored.ok) {
        this.apply(noteResume(this.view.state, entry.id));
        const n = restored.skipped.length;
        const passed = n > 0 ? ` (passed over ${n} damaged newer checkpoint${n === 1 ? '' : 's'})` : '';
        return { run: restored.run, resumeNote: (round) => `Went on from the checkpoint of round ${round}${passed}.` };
      }
      this.note(entry.id, restored.empty
        ? 'No checkpoint of it had been saved yet (it had run less than a checkpoint interval, or not at all): it started from the beginning.'
        : `Its checkpoints could not be read back (${restored.reason.split(':')[0]}): the job started again from the beginning.`);
    } else {
      // Only one queued job runs at a time: older jobs' checkpoints are of no more use.
      await dropCheckpointsExcept(db, [runId], QUEUE_RUN_SCOPE).catch(() => {});
    }
    const built = runInputOf(spec, workers);
    const made = built.ok ? createHostedRun(env, built.input, { ...options, store }) : built;
    if (!made.ok) {
      this.end(entry, 'failed', { ended: 'failed', reason: made.reason, evaluations: 0, elapsedMs: 0, restarts: 0, best: [], kept: false });
      return null;
    }
    return { run: made.run, resumeNote: null };
  }

  private onProgress(active: ActiveRun, p: RunProgress): void {
    if (this.active !== active) return;
    if (active.resumeNote !== null && p.status === 'running') {
      this.note(active.id, active.resumeNote(p.rounds));
      active.resumeNote = null;
    }
    const now = performance.now();
    const checkpointMoved = p.checkpointRound !== this.view.live?.checkpointRound;
    if (!checkpointMoved && now - this.lastLiveMs < PROGRESS_EVERY_MS) return;
    this.lastLiveMs = now;
    const phase = this.view.live?.phase;
    const next: LiveJob['phase'] =
      phase === 'stopping' || phase === 'pausing' ? phase : p.status === 'paused' ? 'paused' : p.status === 'running' ? 'running' : (phase ?? 'starting');
    this.setLive({ phase: next, evaluations: p.evaluations, elapsedMs: p.elapsedMs, checkpointRound: p.checkpointRound });
  }

  /**
   * Keeps the job's designs (a path job's in the run history, a workspace job's run in its
   * outcome, as its workspace keeps a run), then ends it in the queue and goes on.
   */
  private async record(entry: AppQueueEntry, active: ActiveRun, run: Run, result: RunResult): Promise<void> {
    const spec = entry.spec;
    const p = run.progress();
    const ended = result.ok ? result.stopReason : 'failed';
    const base = {
      ended,
      reason: result.ok ? null : result.reason,
      evaluations: result.evaluations,
      elapsedMs: result.ok ? result.elapsedMs : p.elapsedMs,
      restarts: result.ok ? result.restarts : p.restarts,
      searchRestarts: result.ok ? result.searchRestarts : p.searchRestarts,
    };
    if (!isPathJob(spec)) {
      const ranked = result.candidates ?? [];
      const runId = entry.runId ?? entry.id;
      const now = new Date(Date.now()).toISOString();
      const designs = ranked.length === 0 ? null
        : workspaceJobRun(spec as WorkspaceJobSpec, runId, now, now, ranked, result.evaluations, result.ok ? result.stopReason : 'cancelled');
      this.active = null;
      this.end(entry, active.cut ? 'cut' : result.ok ? 'done' : 'failed', {
        ...base,
        best: designs === null ? [] : bestPerLayout(designs.candidates),
        kept: false,
        ...(designs === null ? {} : { designs }),
      });
      return;
    }
    const candidates = reportsOf(result.candidates ?? []);
    let kept = false;
    if (candidates.length > 0 && entry.runId !== null) {
      try {
        await keepRun(this.deps.db, {
          runId: entry.runId,
          name: spec.name,
          keptAt: Date.now(),
          ended,
          evaluations: result.evaluations,
          settings: jobSettings(spec),
          target: snapshotTarget(spec.problem.target),
          candidates,
        });
        kept = true;
        notifyHistoryChanged();
      } catch (error) {
        this.note(entry.id, `Its designs could not be kept in the run history: ${message(error)}`);
      }
    }
    const outcome: JobOutcome = { ...base, best: bestPerFamily(candidates), kept };
    this.active = null;
    this.end(entry, active.cut ? 'cut' : result.ok ? 'done' : 'failed', outcome);
  }

  private end(entry: AppQueueEntry, status: 'done' | 'failed' | 'cut', outcome: JobOutcome): void {
    this.set({ live: null });
    this.apply(endJob(this.view.state, entry.id, status, outcome));
    // The next job in a task of its own, after the save and the re-render this one causes.
    setTimeout(() => this.advance(), 0);
  }
}
