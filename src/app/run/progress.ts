/** The engine's progress in the workspace's terms: pure, so it can be tested without a run. */
import type { RunProgress } from '../../engine';
import type { Measure, RunState } from '../state/project';

/**
 * The best error in mm from the value of the measure the search minimises: an RMS or a
 * maximum distance is one already; a sum of squares over n points becomes the RMS,
 * √(Σd² / n) (for unit weights).
 */
export function errorMmOf(value: number, measure: Measure, pointCount: number): number {
  if (!Number.isFinite(value)) return Infinity;
  if (measure === 'sum-of-squares') return pointCount > 0 ? Math.sqrt(Math.max(0, value) / pointCount) : Infinity;
  return value;
}

/** The run-state fields a progress report sets; the checkpoint is noted when its round moves on. */
export function progressPatch(progress: RunProgress, run: RunState, wallNowMs: number): Partial<RunState> {
  const patch: { -readonly [K in keyof RunState]?: RunState[K] } = {
    evaluations: progress.evaluations,
    budgetEvaluations: progress.budgetEvaluations,
    elapsedMs: progress.elapsedMs,
    evaluationsPerSecond: progress.evaluationsPerSecond,
    remainingMs: progress.remainingMs,
    searchRestarts: progress.searchRestarts,
  };
  if (progress.best !== null) {
    patch.bestErrorMm = errorMmOf(progress.best.value, run.measure, run.targetPointCount);
    patch.bestFeasible = !(progress.best.violation > 0);
  }
  const round = progress.checkpointRound;
  // A checkpoint the store refused is no place a reload goes back to: the note keeps the last one saved.
  if (round !== null && progress.checkpointError === undefined && (run.checkpoint === null || run.checkpoint.round !== round)) {
    patch.checkpoint = { round, evaluations: progress.evaluations, savedAtMs: wallNowMs };
  }
  return patch;
}

/** "3 min 20 s", "45 s", "2 h 05 min": a duration for the progress line. */
export function formatDuration(ms: number | null): string {
  if (ms === null || !Number.isFinite(ms)) return '—';
  const s = Math.max(0, Math.round(ms / 1000));
  if (s < 60) return `${s} s`;
  const m = Math.floor(s / 60);
  if (m < 60) return `${m} min ${String(s % 60).padStart(2, '0')} s`;
  const h = Math.floor(m / 60);
  return `${h} h ${String(m % 60).padStart(2, '0')} min`;
}

/** Share of the budget done, 0 … 1, by evaluations or by time, whichever the run has. */
export function fractionDone(run: RunState): number {
  if (run.status === 'finished') return 1;
  if (run.budgetEvaluations !== null && run.budgetEvaluations > 0) return Math.min(1, run.evaluations / run.budgetEvaluations);
  if (run.budgetSeconds !== null && run.budgetSeconds > 0) return Math.min(1, run.elapsedMs / (run.budgetSeconds * 1000));
  return 0;
}
