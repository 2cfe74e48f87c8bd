/**
 * Runs a suspension search through the engine: one job per layout on the same bicycle
 * and targets, in the engine's workers (the page evaluates nothing while it runs).
 * Progress (evaluations, elapsed time, the best of each layout so far) reaches the page
 * at most a few times a second; Stop ends the run between rounds and keeps what it
 * found. A finished run is handed over whole (`onFinished`), to be kept in the project.
 */
import type { LayoutKind } from '../../../core/suspension';
import type { SuspensionProblemInput } from '../../../core/synthesis';
import { createRun, memoryCheckpointStore, type CheckpointPayload, type EngineEnvironment, type RankedCandidate, type Run, type RunProgress, type RunResult } from '../../../engine';
import { createReducerStore, type ReducerStore } from '../../reducerStore';
import { failureWords } from '../../run/searchController';
import { candidateOf, type SearchCandidate, type SearchRun } from './results';
import { RESULTS_PER_LAYOUT, searchStartIssues, suspensionRunInput, type SearchSettings } from './runInput';

/** Progress reaches the page at most this often, ms. */
export const SEARCH_PROGRESS_EVERY_MS = 250;
/** Designs ranked over all layouts described at the end, beside each layout's own best (RESULTS_PER_LAYOUT). */
const TOP_OVERALL = 10;

export type SearchStatus = 'idle' | 'running' | 'stopping' | 'finished' | 'failed';

export interface LayoutBest {
  readonly layout: LayoutKind;
  readonly value: number;
  readonly violation: number;
}

export interface SearchSession {
  readonly status: SearchStatus;
  readonly evaluations: number;
  readonly budgetEvaluations: number | null;
  readonly elapsedMs: number;
  readonly bestPerLayout: readonly LayoutBest[];
  readonly message: string | null;
  readonly messageDetail: string | null;
}

export const IDLE_SESSION: SearchSession = {
  status: 'idle',
  evaluations: 0,
  budgetEvaluations: null,
  elapsedMs: 0,
  bestPerLayout: [],
  message: null,
  messageDetail: null,
};

export interface SearchControllerDeps {
  readonly env: EngineEnvironment;
  /** Wall clock, ms since 1970 (the finished run's time stamp). */
  readonly wallNow: () => number;
  readonly newRunId: () => string;
  /** Told of each finished (or stopped) run with the designs it found. */
  readonly onFinished: (run: SearchRun) => void;
}

/** The best of each job's archive in a checkpoint (each archive is kept best first). */
export function bestPerLayoutOf(payload: Pick<CheckpointPayload, 'archive'>): LayoutBest[] {
  return payload.archive.flatMap((job) => (job.entries.length === 0 ? [] : [{ layout: job.jobId as LayoutKind, value: job.entries[0].value, violation: job.entries[0].violation }]));
}

function bestPerLayoutOfCandidates(candidates: readonly SearchCandidate[]): LayoutBest[] {
  const seen = new Set<LayoutKind>();
  return candidates.flatMap((c) => {
    if (seen.has(c.family)) return [];
    seen.add(c.family);
    return [{ layout: c.family, value: c.value, violation: c.violation }];
  });
}

export class SuspensionSearchController {
  readonly session: ReducerStore<SearchSession, Partial<SearchSession>>;
  private readonly deps: SearchControllerDeps;
  private run: Run | null = null;
  private unsubscribe: (() => void) | null = null;
  private lastDispatchMs = -Infinity;
  private trailing: ReturnType<typeof setTimeout> | null = null;

  constructor(deps: SearchControllerDeps) {
    this.deps = deps;
    this.session = createReducerStore<SearchSession, Partial<SearchSession>>((s, patch) => ({ ...s, ...patch }), IDLE_SESSION);
  }

  private update(patch: Partial<SearchSession>): void {
    // A new message replaces the details of the one before.
    this.session.dispatch(patch.message !== undefined && patch.messageDetail === undefined ? { ...patch, messageDetail: null } : patch);
  }

  get busy(): boolean {
    return this.run !== null;
  }

  /** Starts a search of `input` (a suspension problem, as its file holds it); resolves when it ends. */
  async start(input: SuspensionProblemInput, settings: SearchSettings): Promise<void> {
    if (this.run !== null) {
      this.update({ message: 'A search is already running; stop it first.' });
      return;
    }
    const workers = this.deps.env.defaultWorkerCount();
    const issues = searchStartIssues(input, settings, workers);
    if (issues.length > 0) {
      this.update({ status: 'failed', message: `Cannot start: ${issues.join('; ')}` });
      return;
    }
    const runInput = suspensionRunInput(input, settings, workers);
    let bestPerLayout: LayoutBest[] = [];
    const made = createRun(this.deps.env, runInput, {
      workers,
      store: memoryCheckpointStore(),
      topK: TOP_OVERALL,
      perJob: RESULTS_PER_LAYOUT,
      onCheckpoint: (payload) => {
        bestPerLayout = bestPerLayoutOf(payload);
        this.update({ bestPerLayout });
      },
    });
    if (!made.ok) {
      this.update({ status: 'failed', ...failureWords('start', made.reason) });
      return;
    }
    const run = made.run;
    this.run = run;
    this.update({ ...IDLE_SESSION, status: 'running', budgetEvaluations: runInput.budget.evaluations ?? null, bestPerLayout });
    this.unsubscribe = run.onProgress((progress) => this.onProgress(progress));
    let result: RunResult;
    try {
      result = await run.start();
    } catch (error) {
      const p = run.progress();
      result = { ok: false, reason: error instanceof Error ? error.message : String(error), evaluations: p.evaluations, rounds: p.rounds };
    }
    this.finish(run, input, settings, result);
  }

  private onProgress(progress: RunProgress): void {
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
    this.update({ evaluations: progress.evaluations, budgetEvaluations: progress.budgetEvaluations, elapsedMs: progress.elapsedMs });
  }

  private finish(run: Run, input: SuspensionProblemInput, settings: SearchSettings, result: RunResult): void {
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
      if (kept) this.deps.onFinished(this.runOf(input, settings, result.candidates ?? [], p.evaluations, 'cancelled'));
      return;
    }
    const finished = this.runOf(input, settings, result.candidates, result.evaluations, result.stopReason);
    this.update({
      status: 'finished',
      evaluations: result.evaluations,
      elapsedMs: result.elapsedMs,
      bestPerLayout: bestPerLayoutOfCandidates(finished.candidates),
      message: result.stopReason === 'cancelled' ? 'Stopped: the designs found so far are kept below.' : null,
    });
    this.deps.onFinished(finished);
  }

  private runOf(input: SuspensionProblemInput, settings: SearchSettings, ranked: readonly RankedCandidate[], evaluations: number, stopReason: SearchRun['stopReason']): SearchRun {
    const candidates = ranked.flatMap((c) => (c.detail.kind === 'suspension' ? [candidateOf(c.rank, c.detail.candidate)] : []));
    return {
      id: this.deps.newRunId(),
      finishedAt: new Date(this.deps.wallNow()).toISOString(),
      problem: JSON.parse(JSON.stringify(input)) as SuspensionProblemInput,
      seed: settings.seed,
      budget: { evaluations: settings.budget.evaluations, seconds: settings.budget.seconds },
      evaluations,
      stopReason,
      candidates,
    };
  }

  /** Ends the run between rounds; the designs found so far are kept. */
  stop(): void {
    if (this.run === null) return;
    this.update({ status: 'stopping' });
    this.run.cancel();
  }
}
