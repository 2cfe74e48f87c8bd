/**
 * Runs a workspace's search through the engine: one job per family (or layout) on the
 * same problem, in the engine's workers (the page evaluates nothing while it runs).
 * Progress (evaluations, elapsed time, the best of each job so far) reaches the page at
 * most a few times a second; Stop ends the run between rounds and keeps what it found. A
 * finished run is handed over whole (`onFinished`), to be kept in the project. The
 * running search (its id, problem and settings) is handed over at its start
 * (`onStarted`) to be kept in the project too, and its checkpoints go to a store under
 * its id, so a search a reload interrupted resumes from its last checkpoint (`resume`).
 * What differs between workspaces (the run input, the start checks, the kept run) is
 * the `SearchKind`.
 */
import {
  memoryCheckpointStore,
  type CheckpointPayload,
  type CheckpointStore,
  type RankedCandidate,
  type Run,
  type RunInput,
  type RunProgress,
  type RunResult,
  type RunStopReason,
} from '../../engine';
import { createHostedRun, restoreHostedRunFromStore, type HostingEnvironment } from '../../engine/runHost';
import { createReducerStore, type ReducerStore } from '../reducerStore';
import { newestReadable } from '../run/interimCandidates';
import { failureWords } from '../run/failureWords';
import type { SearchCheckpoints } from './checkpoints';
import { askPersistenceOnStart, workerRestartMessage } from './longRun';
import type { RankedDesign, RunningSearchOf, SearchRunOf, SearchSettings, SearchStatus } from './types';

export type { RankedDesign, RunningSearchOf, SearchRunOf, SearchSettings, SearchStatus } from './types';

/** Progress reaches the page at most this often, ms. */
export const SEARCH_PROGRESS_EVERY_MS = 250;


/** The best so far of one job (a family or layout: the job's id). */
export interface JobBest {
  readonly job: string;
  readonly value: number;
  readonly violation: number;
}

export interface SearchSession {
  readonly status: SearchStatus;
  readonly evaluations: number;
  readonly budgetEvaluations: number | null;
  readonly elapsedMs: number;
  /** Fresh optimizer runs the islands started after a run converged or stalled, so the search uses its whole budget. */
  readonly searchRestarts: number;
  /** The best of each job so far, in the run's job order (at the end: in rank order). */
  readonly best: readonly JobBest[];
  readonly message: string | null;
  readonly messageDetail: string | null;
  /** The run shown was resumed from its checkpoints after a reload. */
  readonly resumed: boolean;
}

export const IDLE_SESSION: SearchSession = {
  status: 'idle',
  evaluations: 0,
  budgetEvaluations: null,
  elapsedMs: 0,
  searchRestarts: 0,
  best: [],
  message: null,
  messageDetail: null,
  resumed: false,
};

/** What one workspace's search is: its run input, its checks before Start, and the run it keeps. */
export interface SearchKind<P, C extends RankedDesign> {
  /** Designs ranked over all jobs described at the end. */
  readonly topK: number;
  /** Best distinct designs of each job kept. */
  readonly perJob: number;
  /** What would refuse this search, in words; empty when it can start. */
  readonly startIssues: (input: P, settings: SearchSettings, workers: number) => string[];
  readonly runInput: (input: P, settings: SearchSettings, workers: number) => RunInput;
  /** The designs as the project keeps them, from the engine's ranked ones (those of this kind). */
  readonly candidatesOf: (running: RunningSearchOf<P>, ranked: readonly RankedCandidate[]) => C[];
}

export interface SearchControllerDeps<P, C> {
  readonly env: HostingEnvironment;
  /** Wall clock, ms since 1970 (the finished run's time stamp). */
  readonly wallNow: () => number;
  readonly newRunId: () => string;
  /** Told of each finished (or stopped) run with the designs it found. */
  readonly onFinished: (run: SearchRunOf<P, C>) => void;
  /** Where runs keep their checkpoints; absent: in memory only (nothing outlives the page). */
  readonly checkpoints?: SearchCheckpoints;
  /** Told of a search starting (to keep it in the project until it ends). */
  readonly onStarted?: (running: RunningSearchOf<P>) => void;
  /** Told of every end of a run started or resumed, after `onFinished` when there was one. */
  readonly onEnded?: () => void;
}

/** The message of a run resumed from its checkpoints: where it goes on from, and any damaged checkpoint passed over. */
export function resumedMessage(progress: Pick<RunProgress, 'evaluations' | 'elapsedMs'>, skipped: readonly string[]): string {
  const from = `Resumed after a reload: the search goes on from its last checkpoint (${progress.evaluations.toLocaleString('en-GB')} evaluations, ${(progress.elapsedMs / 1000).toFixed(1)} s).`;
  if (skipped.length === 0) return from;
  // The engine's reasons carry checksums; the first clause says enough ("checkpoint is corrupt").
  const why = [...new Set(skipped.map((reason) => reason.split(':')[0]))].join('; ');
  const n = skipped.length;
  return `${from} The newest ${n === 1 ? 'checkpoint was' : `${n} checkpoints were`} damaged (${why}) and skipped: the work after the one it went on from is searched again.`;
}

/** The best of each job's archive in a checkpoint (each archive is kept best first). */
export function bestPerJobOf(payload: Pick<CheckpointPayload, 'archive'>): JobBest[] {
  return payload.archive.flatMap((job) => (job.entries.length === 0 ? [] : [{ job: job.jobId, value: job.entries[0].value, violation: job.entries[0].violation }]));
}

/** The first (best) design of each job among ranked candidates. */
function bestPerJobOfCandidates(candidates: readonly RankedDesign[]): JobBest[] {
  const seen = new Set<string>();
  return candidates.flatMap((c) => {
    if (seen.has(c.family)) return [];
    seen.add(c.family);
    return [{ job: c.family, value: c.value, violation: c.violation }];
  });
}

export class SearchController<P, C extends RankedDesign> {
  readonly session: ReducerStore<SearchSession, Partial<SearchSession>>;
  private readonly kind: SearchKind<P, C>;
  private readonly deps: SearchControllerDeps<P, C>;
  private run: Run | null = null;
  /** A resume is reading its checkpoints back (no run yet). */
  private resuming = false;
  /** Stop was asked for while a resume read its checkpoints. */
  private stopRequested = false;
  private ended: Promise<void> = Promise.resolve();
  private unsubscribe: (() => void) | null = null;
  private lastDispatchMs = -Infinity;
  private trailing: ReturnType<typeof setTimeout> | null = null;
  /** Worker restarts of the run followed, as its first report gave them (a resumed run counts those before). */
  private restartsSeen: number | null = null;

  constructor(kind: SearchKind<P, C>, deps: SearchControllerDeps<P, C>) {
    this.kind = kind;
    this.deps = deps;
    this.session = createReducerStore<SearchSession, Partial<SearchSession>>((s, patch) => ({ ...s, ...patch }), IDLE_SESSION);
  }

  private update(patch: Partial<SearchSession>): void {
    // A new message replaces the details of the one before.
    this.session.dispatch(patch.message !== undefined && patch.messageDetail === undefined ? { ...patch, messageDetail: null } : patch);
  }

  /** Workers a search runs on here. */
  get workers(): number {
    return this.deps.env.defaultWorkerCount();
  }

  get busy(): boolean {
    return this.run !== null || this.resuming;
  }

  /** Starts a search of `input` (a problem, as its file holds it); resolves when it ends. */
  async start(input: P, settings: SearchSettings): Promise<void> {
    if (this.busy) {
      this.update({ message: 'A search is already running; stop it first.' });
      return;
    }
    const workers = this.deps.env.defaultWorkerCount();
    const issues = this.kind.startIssues(input, settings, workers);
    if (issues.length > 0) {
      this.update({ status: 'failed', message: `Cannot start: ${issues.join('; ')}` });
      return;
    }
    const running: RunningSearchOf<P> = {
      runId: this.deps.newRunId(),
      startedAt: new Date(this.deps.wallNow()).toISOString(),
      problem: JSON.parse(JSON.stringify(input)) as P,
      settings: { seed: settings.seed, budget: { evaluations: settings.budget.evaluations, seconds: settings.budget.seconds } },
    };
    const runInput = this.kind.runInput(running.problem, settings, workers);
    let best: JobBest[] = [];
    const made = createHostedRun(this.deps.env, runInput, {
      workers,
      store: this.storeOf(running.runId),
      topK: this.kind.topK,
      perJob: this.kind.perJob,
      onCheckpoint: (payload) => {
        best = bestPerJobOf(payload);
        this.update({ best });
      },
    });
    if (!made.ok) {
      this.update({ status: 'failed', ...failureWords('start', made.reason) });
      return;
    }
    this.run = made.run;
    this.stopRequested = false;
    const ended = this.nowGoing();
    this.update({ ...IDLE_SESSION, status: 'running', budgetEvaluations: runInput.budget.evaluations ?? null, best });
    if (this.deps.checkpoints !== undefined && !(await this.deps.checkpoints.durable().catch(() => false))) {
      this.update({ message: 'This browser keeps no storage (private window?): a reload loses this search. Stop keeps the designs found so far.' });
    }
    askPersistenceOnStart();
    // Older runs' checkpoints of this scope are of no use now (a run whose resume failed leaves some).
    await this.deps.checkpoints?.dropExcept([running.runId]).catch(() => {});
    this.deps.onStarted?.(running);
    await this.follow(made.run, running, ended);
  }

  /**
   * After a reload (or a closed page): the search `running` was doing goes on from its
   * newest checkpoint that reads back whole, and says so; a damaged newer one is skipped,
   * as the engine does, and the message says that too.
   */
  async resume(running: RunningSearchOf<P>): Promise<void> {
    if (this.busy) return;
    this.resuming = true;
    this.stopRequested = false;
    const ended = this.nowGoing();
    this.update({ ...IDLE_SESSION, status: 'running', budgetEvaluations: running.settings.budget.evaluations, message: 'Resuming the search a reload interrupted…', resumed: true });
    const store = this.storeOf(running.runId);
    let best: JobBest[] = [];
    const restored = await restoreHostedRunFromStore(this.deps.env, store, {
      workers: this.deps.env.defaultWorkerCount(),
      topK: this.kind.topK,
      perJob: this.kind.perJob,
      onCheckpoint: (payload) => {
        best = bestPerJobOf(payload);
        this.update({ best });
      },
    });
    if (restored.ok) this.run = restored.run;
    this.resuming = false;
    if (!restored.ok) {
      this.update({
        status: 'failed',
        message: `The search a reload interrupted could not resume: ${restored.empty ? 'it had saved no checkpoint before the reload' : 'no checkpoint of it could be read back whole'}. The runs kept below are unchanged; start the search again.`,
        messageDetail: restored.reason,
      });
      await this.deps.checkpoints?.dropExcept([]).catch(() => {});
      this.deps.onEnded?.();
      ended();
      return;
    }
    // The best of each job at the checkpoint it goes on from, straight away rather than at the next checkpoint.
    // (A run's own progress counts its islands' evaluations only once they are running again.)
    const from = await newestReadable(store).catch(() => null);
    if (from !== null) best = bestPerJobOf(from);
    const at = { evaluations: from?.evaluations ?? 0, elapsedMs: from?.elapsedMs ?? restored.run.progress().elapsedMs };
    this.update({
      status: this.stopRequested ? 'stopping' : 'running',
      ...at,
      budgetEvaluations: restored.run.progress().budgetEvaluations,
      best,
      message: resumedMessage(at, restored.skipped),
    });
    // Stop pressed (or the workspace closed) while the checkpoints were read: the run ends at once with what they hold.
    if (this.stopRequested) restored.run.cancel();
    await this.follow(restored.run, running, ended);
  }

  /** Marks a run as going until the function it returns is called (`whenIdle` waits for it). */
  private nowGoing(): () => void {
    let ended = () => {};
    this.ended = new Promise<void>((resolve) => {
      ended = resolve;
    });
    return ended;
  }

  /** Resolves once no run is going (at once when none is), after its designs were handed over. */
  whenIdle(): Promise<void> {
    return this.ended;
  }

  private storeOf(runId: string): CheckpointStore {
    return this.deps.checkpoints?.store(runId) ?? memoryCheckpointStore();
  }

  private async follow(run: Run, running: RunningSearchOf<P>, ended: () => void): Promise<void> {
    this.restartsSeen = null;
    this.unsubscribe = run.onProgress((progress) => this.onProgress(progress));
    let result: RunResult;
    try {
      result = await run.start();
    } catch (error) {
      const p = run.progress();
      result = { ok: false, reason: error instanceof Error ? error.message : String(error), evaluations: p.evaluations, rounds: p.rounds };
    }
    this.finish(run, running, result);
    await this.deps.checkpoints?.dropExcept([]).catch(() => {});
    ended();
  }

  private onProgress(progress: RunProgress): void {
    if (this.restartsSeen === null) this.restartsSeen = progress.restarts;
    if (progress.restarts > this.restartsSeen) {
      this.restartsSeen = progress.restarts;
      this.update({ message: workerRestartMessage(progress) });
    }
    const now = performance.now();
    if (now - this.lastDispatchMs < SEARCH_PROGRESS_EVERY_MS) {
      // Keep the latest for a trailing update, so the last numbers are never lost.
      if (this.trailing === null) {
        this.trailing = setTimeout(() => {
          this.trailing = null;
          if (this.run !== null) this.onProgress(this.run.progress());
        }, SEARCH_PROGRESS_EVERY_MS);
      }
      return;
    }
    this.lastDispatchMs = now;
    this.update({ evaluations: progress.evaluations, budgetEvaluations: progress.budgetEvaluations, elapsedMs: progress.elapsedMs, searchRestarts: progress.searchRestarts });
  }

  private finish(run: Run, running: RunningSearchOf<P>, result: RunResult): void {
    if (this.run !== run) return;
    this.unsubscribe?.();
    this.unsubscribe = null;
    if (this.trailing !== null) clearTimeout(this.trailing);
    this.trailing = null;
    this.run = null;
    const p = run.progress();
    if (!result.ok) {
      const words = failureWords('stopped', result.reason);
      const kept = result.candidates !== undefined && result.candidates.length > 0;
      this.update({
        status: 'failed',
        evaluations: p.evaluations,
        elapsedMs: p.elapsedMs,
        message: `${words.message.split(':')[0]}: ${kept ? 'the designs found before it stopped are kept below.' : 'no design was found before it stopped; start again.'}`,
        messageDetail: words.messageDetail,
      });
      if (kept) this.deps.onFinished(this.runOf(running, result.candidates ?? [], p.evaluations, 'cancelled'));
      this.deps.onEnded?.();
      return;
    }
    const finished = this.runOf(running, result.candidates, result.evaluations, result.stopReason);
    this.update({
      status: 'finished',
      evaluations: result.evaluations,
      elapsedMs: result.elapsedMs,
      best: bestPerJobOfCandidates(finished.candidates),
      message: result.stopReason === 'cancelled' ? 'Stopped: the designs found so far are kept below.' : null,
    });
    this.deps.onFinished(finished);
    this.deps.onEnded?.();
  }

  private runOf(running: RunningSearchOf<P>, ranked: readonly RankedCandidate[], evaluations: number, stopReason: RunStopReason): SearchRunOf<P, C> {
    const { settings } = running;
    return {
      id: running.runId,
      finishedAt: new Date(this.deps.wallNow()).toISOString(),
      problem: running.problem,
      seed: settings.seed,
      budget: { evaluations: settings.budget.evaluations, seconds: settings.budget.seconds },
      evaluations,
      stopReason,
      candidates: this.kind.candidatesOf(running, ranked),
    };
  }

  /** Ends the run between rounds; the designs found so far are kept. */
  stop(): void {
    if (this.resuming) this.stopRequested = true;
    // Once is enough: a second Stop (or one from a listener of the stopping state) changes nothing.
    if (this.run === null || this.stopRequested) return;
    this.stopRequested = true;
    this.update({ status: 'stopping' });
    this.run.cancel();
  }
}
