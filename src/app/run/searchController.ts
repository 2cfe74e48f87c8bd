/**
 * Runs the project's search through the engine: start, pause, resume, stop, and after a
 * reload, resume from the last checkpoint. The page only follows: the run is
 * orchestrated in the engine worker and evaluated in its search workers. Progress reaches
 * the store at most a few times a second, so React renders stay small while a search runs.
 */
import {
  memoryCheckpointStore,
  type CheckpointStore,
  type RankedCandidate,
  type Run,
  type RunProgress,
  type RunResult,
} from '../../engine';
import { createHostedRun, restoreHostedRunFromStore, type HostingEnvironment } from '../../engine/runHost';
import type { CandidateReport } from '../../core/synthesis';
import { isActive, snapshotTarget, type Project, type RunState, type TargetSnapshot } from '../state/project';
import type { Store } from '../state/store';
import { settingsProblem } from '../state/settings';
import { targetProblem } from '../state/target';
import { dropCheckpointsExcept, indexedDbCheckpointStore, type LociDb } from '../storage';
import { CANDIDATES_SHOWN, buildRunInput, problemFileOf } from './runInput';
import { progressPatch } from './progress';
import { InterimDescriber, newestReadable } from './interimCandidates';
import { failureWords } from './failureWords';
import { askPersistenceOnStart, workerRestartMessage } from '../search/longRun';

/** Progress reaches the store at most this often, ms. */
export const PROGRESS_EVERY_MS = 250;

export interface SearchDeps {
  readonly env: HostingEnvironment;
  /** Null when the browser gives no IndexedDB: the run then keeps its checkpoints in memory only. */
  readonly db: LociDb | null;
  /** Wall clock, ms since 1970 (for "saved 5 s ago"). */
  readonly wallNow: () => number;
  readonly newRunId: () => string;
  /**
   * Holds the one lock a running search takes (so a second tab does not run the same
   * search from the same checkpoints) until `released` settles; false when another tab
   * holds it.
   */
  readonly holdRunLock: (released: Promise<void>) => Promise<boolean>;
}

function reportsOf(candidates: readonly RankedCandidate[]): CandidateReport[] {
  return candidates.flatMap((c) => (c.detail.kind === 'synthesis' ? [c.detail.candidate] : []));
}

export class SearchController {
  private readonly store: Store;
  private readonly deps: SearchDeps;
  private run: Run | null = null;
  /** The run is restored from a checkpoint but not started (it was paused before the reload). */
  private restoredPaused = false;
  private runTarget: TargetSnapshot | null = null;
  private lastDispatchMs = -Infinity;
  private trailing: ReturnType<typeof setTimeout> | null = null;
  private unsubscribe: (() => void) | null = null;
  /** Worker restarts of the run followed, as its first report gave them (a resumed run counts those before). */
  private restartsSeen: number | null = null;

  constructor(store: Store, deps: SearchDeps) {
    this.store = store;
    this.deps = deps;
  }

  private get project(): Project {
    return this.store.getState().project;
  }

  /** A new message replaces the details of the one before. */
  private update(patch: Partial<RunState>): void {
    const full = patch.message !== undefined && patch.messageDetail === undefined ? { ...patch, messageDetail: null } : patch;
    this.store.dispatch({ type: 'run/update', patch: full });
  }

  private describer: InterimDescriber | null = null;

  /** The run's checkpoints: in IndexedDB, or in memory when the browser gives none. */
  private checkpointStore(runId: string): CheckpointStore {
    return this.deps.db === null ? memoryCheckpointStore() : indexedDbCheckpointStore(this.deps.db, runId);
  }

  /** A fresh describer, which keeps the table filled from each checkpoint of the run. */
  private newDescriber(): InterimDescriber {
    this.describer?.close();
    const describer = new InterimDescriber(this.deps.env, CANDIDATES_SHOWN, (candidates) => {
      if (this.describer === describer) this.store.dispatch({ type: 'run/candidates', candidates, target: this.runTarget ?? snapshotTarget(this.project.target) });
    });
    this.describer = describer;
    return describer;
  }

  /** What stops a search from starting now, or null. */
  startProblem(): string | null {
    const project = this.project;
    if (isActive(project.run.status) || project.run.status === 'paused') return 'a search is already running; stop it first';
    return targetProblem(project.target) ?? settingsProblem(project.settings);
  }

  async start(): Promise<void> {
    const problem = this.startProblem();
    if (problem !== null) {
      this.update({ message: `Cannot start: ${problem}` });
      return;
    }
    const project = this.project;
    const runId = this.deps.newRunId();
    const workers = project.settings.workers ?? this.deps.env.defaultWorkerCount();
    const built = buildRunInput(project, workers);
    if (!built.ok) {
      this.update({ status: 'failed', message: `Cannot start: ${built.reason}` });
      return;
    }
    const describer = this.newDescriber();
    const made = createHostedRun(this.deps.env, built.input, {
      workers,
      store: this.checkpointStore(runId),
      topK: CANDIDATES_SHOWN,
      perJob: project.settings.resultsPerFamily,
      onCheckpoint: (payload) => describer.offer(payload),
    });
    if (!made.ok) {
      this.describer?.close();
      this.describer = null;
      this.update({ status: 'failed', ...failureWords('start', made.reason) });
      return;
    }
    this.runTarget = snapshotTarget(project.target);
    this.update({
      status: 'starting',
      runId,
      evaluations: 0,
      budgetEvaluations: built.input.budget.evaluations ?? null,
      budgetSeconds: built.input.budget.seconds ?? null,
      elapsedMs: 0,
      evaluationsPerSecond: 0,
      remainingMs: null,
      searchRestarts: 0,
      bestErrorMm: null,
      bestFeasible: null,
      checkpoint: null,
      resumedFrom: null,
      stopReason: null,
      message: null,
      targetPointCount: project.target.points.length,
      measure: project.settings.measure,
      withTerms: problemFileOf(project).terms !== undefined,
    });
    this.store.dispatch({ type: 'run/candidates', candidates: [], target: this.runTarget });
    askPersistenceOnStart();
    if (this.deps.db !== null) await dropCheckpointsExcept(this.deps.db, [runId]).catch(() => {});
    await this.drive(made.run, false);
  }

  /** Follows a run to its end: progress into the store, then the ranked candidates. */
  private async drive(run: Run, resumed: boolean): Promise<void> {
    let release = () => {};
    const released = new Promise<void>((resolve) => {
      release = resolve;
    });
    if (!(await this.deps.holdRunLock(released))) {
      this.describer?.close();
      this.describer = null;
      this.run = null;
      this.update(
        resumed
          ? { message: 'This search is running in another Loci tab or window; it goes on there.' }
          : { status: 'idle', message: 'Another search is running: in another Loci tab or window, or a job of the batch queue. Stop it there, or pause the queue, first.' },
      );
      return;
    }
    try {
      await this.follow(run, resumed);
    } finally {
      release();
    }
  }

  private async follow(run: Run, resumed: boolean): Promise<void> {
    this.run = run;
    this.restoredPaused = false;
    this.restartsSeen = null;
    let first = true;
    this.unsubscribe = run.onProgress((progress) => {
      if (resumed && first && progress.status === 'running') {
        first = false;
        this.update({ resumedFrom: { round: progress.rounds, evaluations: progress.evaluations } });
      }
      this.onProgress(progress);
    });
    let result: RunResult;
    try {
      result = await run.start();
    } catch (error) {
      result = { ok: false, reason: error instanceof Error ? error.message : String(error), evaluations: run.progress().evaluations, rounds: run.progress().rounds };
    }
    this.finish(run, result);
  }

  private onProgress(progress: RunProgress): void {
    if (this.restartsSeen === null) this.restartsSeen = progress.restarts;
    if (progress.restarts > this.restartsSeen) {
      this.restartsSeen = progress.restarts;
      this.update({ message: workerRestartMessage(progress) });
    }
    const statusNow = this.project.run.status;
    const status = progress.status === 'running' && statusNow === 'starting' ? 'running' : null;
    // A new checkpoint goes through at once: its evaluation count is exact only at this report.
    const checkpointMoved = progress.checkpointRound !== null && progress.checkpointRound !== this.project.run.checkpoint?.round;
    const statusChanged = status !== null || checkpointMoved || (progress.status === 'paused' && statusNow !== 'paused');
    const now = performance.now();
    if (!statusChanged && now - this.lastDispatchMs < PROGRESS_EVERY_MS) {
      // Keep the latest for a trailing update, so the last numbers are never lost.
      if (this.trailing === null) {
        this.trailing = setTimeout(() => {
          this.trailing = null;
          if (this.run !== null) this.onProgress(this.run.progress());
        }, PROGRESS_EVERY_MS);
      }
      return;
    }
    this.lastDispatchMs = now;
    const patch = progressPatch(progress, this.project.run, this.deps.wallNow());
    const current = this.project.run.status;
    let nextStatus = current;
    if (progress.status === 'paused' && (current === 'pausing' || current === 'running')) nextStatus = 'paused';
    if (progress.status === 'running' && (current === 'starting' || current === 'paused')) nextStatus = 'running';
    this.update({ ...patch, status: nextStatus });
  }

  /**
   * The final candidates, then, in a task of their own, the end of the run (which unlocks
   * the target and settings): each is a re-render and a save, and together they could
   * hold the main thread too long. A reload between the two finds the run still running
   * and ends it again from its final checkpoint.
   */
  private finish(run: Run, result: RunResult): void {
    if (this.run !== run) return;
    this.describer?.close();
    this.describer = null;
    this.unsubscribe?.();
    this.unsubscribe = null;
    if (this.trailing !== null) clearTimeout(this.trailing);
    this.trailing = null;
    this.run = null;
    if (!result.ok) {
      this.update({ status: 'failed', ...failureWords('stopped', result.reason) });
      return;
    }
    const target = this.runTarget ?? snapshotTarget(this.project.target);
    this.store.dispatch({ type: 'run/candidates', candidates: reportsOf(result.candidates), target });
    setTimeout(() => {
      if (this.run !== null) return;
      this.update({ ...progressPatch(run.progress(), this.project.run, this.deps.wallNow()), status: 'finished', stopReason: result.stopReason, remainingMs: 0 });
    }, 0);
  }

  async pause(): Promise<void> {
    const run = this.run;
    if (run === null || this.project.run.status !== 'running') return;
    this.update({ status: 'pausing' });
    await run.pause();
    if (this.run === run) this.update({ status: 'paused' });
  }

  resume(): void {
    const run = this.run;
    if (run === null || this.project.run.status !== 'paused') return;
    if (this.restoredPaused) {
      this.update({ status: 'starting' });
      void this.drive(run, true);
      return;
    }
    this.update({ status: 'running' });
    run.resume();
  }

  stop(): void {
    const run = this.run;
    if (run === null) {
      // Nothing running in this page (a reload with no checkpoint left): just end the run.
      if (isActive(this.project.run.status) || this.project.run.status === 'paused') this.update({ status: 'finished', stopReason: 'cancelled' });
      return;
    }
    this.update({ status: 'stopping' });
    run.cancel();
    if (this.restoredPaused) void this.drive(run, true);
  }

  /**
   * After a reload: a run that was running (or paused) goes on from its last checkpoint
   * that reads back whole; a damaged newer one is skipped, and the user is told.
   */
  async restoreAfterReload(): Promise<void> {
    const project = this.project;
    const { runId, status } = project.run;
    if (runId === null || !(isActive(status) || status === 'paused')) return;
    if (this.deps.db === null) {
      this.update({ status: 'failed', message: 'The search could not resume: this browser keeps no storage for its checkpoints.' });
      return;
    }
    const store = this.checkpointStore(runId);
    const describer = this.newDescriber();
    const restored = await restoreHostedRunFromStore(this.deps.env, store, {
      workers: project.settings.workers ?? this.deps.env.defaultWorkerCount(),
      topK: CANDIDATES_SHOWN,
      perJob: project.settings.resultsPerFamily,
      onCheckpoint: (payload) => describer.offer(payload),
    });
    if (!restored.ok) {
      this.describer?.close();
      this.describer = null;
      this.update({ status: 'failed', ...failureWords('resume', restored.reason) });
      return;
    }
    // The candidates of the checkpoint it goes on from, straight away rather than at the next checkpoint.
    setTimeout(() => void newestReadable(store).then((payload) => payload !== null && describer.offer(payload)), 0);
    this.runTarget = project.candidatesTarget ?? snapshotTarget(project.target);
    // The engine's reasons carry checksums; the first clause says enough ("checkpoint is corrupt").
    const why = [...new Set(restored.skipped.map((reason) => reason.split(':')[0]))].join('; ');
    const n = restored.skipped.length;
    const skipped = n === 0 ? null : `Skipped ${n} damaged checkpoint${n === 1 ? '' : 's'} (${why}) and went on from the one before.`;
    if (status === 'paused' || status === 'pausing') {
      this.run = restored.run;
      this.restoredPaused = true;
      this.update({ status: 'paused', message: skipped });
      return;
    }
    this.update({ status: 'starting', message: skipped });
    await this.drive(restored.run, true);
  }
}
