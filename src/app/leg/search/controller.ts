/**
 * Runs a leg search through the engine: one job per family on the same leg and targets,
 * in the engine's workers (the page evaluates nothing while it runs). Progress
 * (evaluations, elapsed time, the best of each family so far) reaches the page at most a
 * few times a second; Stop ends the run between rounds and keeps what it found. A
 * finished run is handed over whole (`onFinished`), to be kept in the project.
 */
import type { LegProblemInput } from '../../../core/synthesis/legProblem';
import type { PoseFamilyId } from '../../../core/synthesis/poseFamilies';
import { createRun, type EngineEnvironment, type RankedCandidate, type Run, type RunProgress, type RunResult } from '../../../engine';
import { createReducerStore, type ReducerStore } from '../../reducerStore';
import { failureWords } from '../../run/searchController';
import type { LegSearchSettings } from '../readSetup';
import { candidateOf, type LegSearchRun } from './results';
import { RESULTS_PER_FAMILY, TOP_OVERALL, legRunInput, legRunIssues } from './runInput';

/** Progress reaches the page at most this often, ms. */
export const LEG_PROGRESS_EVERY_MS = 250;

export type LegSearchStatus = 'idle' | 'running' | 'stopping' | 'finished' | 'failed';

export interface FamilyBest {
  readonly family: PoseFamilyId;
  readonly value: number;
  readonly violation: number;
}

export interface LegSearchSession {
  readonly status: LegSearchStatus;
  readonly evaluations: number;
  readonly budgetEvaluations: number | null;
  readonly elapsedMs: number;
  readonly bestPerFamily: readonly FamilyBest[];
  readonly message: string | null;
  readonly messageDetail: string | null;
}

export const IDLE_LEG_SESSION: LegSearchSession = { status: 'idle', evaluations: 0, budgetEvaluations: null, elapsedMs: 0, bestPerFamily: [], message: null, messageDetail: null };

export interface LegControllerDeps {
  readonly env: EngineEnvironment;
  /** Wall clock, ms since 1970 (the finished run's time stamp). */
  readonly wallNow: () => number;
  readonly newRunId: () => string;
  /** Told of each finished (or stopped) run with the designs it found. */
  readonly onFinished: (run: LegSearchRun) => void;
}

export class LegSearchController {
  readonly session: ReducerStore<LegSearchSession, Partial<LegSearchSession>>;
  private readonly deps: LegControllerDeps;
  private run: Run | null = null;
  private lastDispatchMs = -Infinity;
  private trailing: ReturnType<typeof setTimeout> | null = null;
  private ended: Promise<void> = Promise.resolve();

  constructor(deps: LegControllerDeps) {
    this.deps = deps;
    this.session = createReducerStore<LegSearchSession, Partial<LegSearchSession>>((s, patch) => ({ ...s, ...patch }), IDLE_LEG_SESSION);
  }

  /** Workers a search runs on here. */
  get workers(): number {
    return this.deps.env.defaultWorkerCount();
  }

  get busy(): boolean {
    return this.run !== null;
  }

  private update(patch: Partial<LegSearchSession>): void {
    // A new message replaces the details of the one before.
    this.session.dispatch(patch.message !== undefined && patch.messageDetail === undefined ? { ...patch, messageDetail: null } : patch);
  }

  /** Starts a search of `input` (a leg problem, as its file holds it); resolves when it ends. */
  async start(input: LegProblemInput, settings: LegSearchSettings): Promise<void> {
    if (this.busy) {
      this.update({ message: 'A search is already running; stop it first.' });
      return;
    }
    const workers = this.deps.env.defaultWorkerCount();
    const issues = legRunIssues(input, settings, workers);
    if (issues.length > 0) {
      this.update({ status: 'failed', message: `Cannot start: ${issues.map((i) => i.message).join('; ')}` });
      return;
    }
    const problem = JSON.parse(JSON.stringify(input)) as LegProblemInput;
    const runInput = legRunInput(problem, settings, workers);
    const made = createRun(this.deps.env, runInput, {
      workers,
      topK: TOP_OVERALL,
      perJob: RESULTS_PER_FAMILY,
      onCheckpoint: (payload) => {
        // Each job's archive is kept best first.
        this.update({ bestPerFamily: payload.archive.flatMap((job) => (job.entries.length === 0 ? [] : [{ family: job.jobId as PoseFamilyId, value: job.entries[0].value, violation: job.entries[0].violation }])) });
      },
    });
    if (!made.ok) {
      this.update({ status: 'failed', ...failureWords('start', made.reason) });
      return;
    }
    const run = made.run;
    this.run = run;
    let ended = () => {};
    this.ended = new Promise<void>((resolve) => {
      ended = resolve;
    });
    this.update({ ...IDLE_LEG_SESSION, status: 'running', budgetEvaluations: runInput.budget.evaluations ?? null });
    const unsubscribe = run.onProgress((p) => this.onProgress(p));
    let result: RunResult;
    try {
      result = await run.start();
    } catch (error) {
      const p = run.progress();
      result = { ok: false, reason: error instanceof Error ? error.message : String(error), evaluations: p.evaluations, rounds: p.rounds };
    }
    unsubscribe();
    if (this.trailing !== null) clearTimeout(this.trailing);
    this.trailing = null;
    this.run = null;
    this.finish(run, problem, settings, result);
    ended();
  }

  /** Resolves once no run is going (at once when none is), after its designs were handed over. */
  whenIdle(): Promise<void> {
    return this.ended;
  }

  private onProgress(progress: RunProgress): void {
    const now = performance.now();
    if (now - this.lastDispatchMs < LEG_PROGRESS_EVERY_MS) {
      // Keep the latest for a trailing update, so the last numbers are never lost.
      if (this.trailing === null) {
        this.trailing = setTimeout(() => {
          this.trailing = null;
          if (this.run !== null) this.onProgress(this.run.progress());
        }, LEG_PROGRESS_EVERY_MS);
      }
      return;
    }
    this.lastDispatchMs = now;
    this.update({ evaluations: progress.evaluations, budgetEvaluations: progress.budgetEvaluations, elapsedMs: progress.elapsedMs });
  }

  private finish(run: Run, problem: LegProblemInput, settings: LegSearchSettings, result: RunResult): void {
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
      if (kept) this.deps.onFinished(this.runOf(problem, settings, result.candidates ?? [], p.evaluations, 'cancelled'));
      return;
    }
    const finished = this.runOf(problem, settings, result.candidates, result.evaluations, result.stopReason);
    const seen = new Set<PoseFamilyId>();
    this.update({
      status: 'finished',
      evaluations: result.evaluations,
      elapsedMs: result.elapsedMs,
      bestPerFamily: finished.candidates.flatMap((c) => (seen.has(c.family) ? [] : (seen.add(c.family), [{ family: c.family, value: c.value, violation: c.violation }]))),
      message: result.stopReason === 'cancelled' ? 'Stopped: the designs found so far are kept below.' : null,
    });
    this.deps.onFinished(finished);
  }

  private runOf(problem: LegProblemInput, settings: LegSearchSettings, ranked: readonly RankedCandidate[], evaluations: number, stopReason: LegSearchRun['stopReason']): LegSearchRun {
    const withTrajectory = problem.targets.footPath !== undefined;
    return {
      id: this.deps.newRunId(),
      finishedAt: new Date(this.deps.wallNow()).toISOString(),
      problem,
      seed: settings.seed,
      budget: { evaluations: settings.budget.evaluations, seconds: settings.budget.seconds },
      evaluations,
      stopReason,
      candidates: ranked.flatMap((c) => (c.detail.kind === 'leg' ? [candidateOf(c.rank, problem.name, c.detail.candidate, withTrajectory)] : [])),
    };
  }

  /** Ends the run between rounds; the designs found so far are kept. */
  stop(): void {
    // Once is enough: a second Stop (or one from a listener of the stopping state) changes nothing.
    if (this.run === null || this.session.getState().status === 'stopping') return;
    this.update({ status: 'stopping' });
    this.run.cancel();
  }
}
