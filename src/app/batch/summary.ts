/**
 * The morning summary: every job of the queue, what it found (the best design of each
 * family: a path job's RMS error, mm; a rear-suspension or walking-leg job's search
 * score), the time it used, its search and worker restarts and how it ended, on screen and as a CSV
 * file of one shape for every kind. Pure, so the table and the file say the same.
 */
import type { CandidateReport } from '../../core/synthesis';
import type { FamilyBest } from '../../engine/queue';
import { jobKind, type AppQueueEntry } from './jobs';
import { jobCaution } from './workspaceJobs';

/** The best feasible design of each family (of all its designs when none is feasible), best first. */
export function bestPerFamily(candidates: readonly CandidateReport[]): FamilyBest[] {
  const best = new Map<string, { family: string; rmsMm: number; feasible: boolean }>();
  for (const c of candidates) {
    const rms = c.error.rmsMm;
    if (!Number.isFinite(rms)) continue;
    const held = best.get(c.family);
    // Feasibility first, then error (Deb, 2000: the ranking the run gives).
    if (held === undefined || (c.feasible && !held.feasible) || (c.feasible === held.feasible && rms < held.rmsMm)) best.set(c.family, { family: c.family, rmsMm: rms, feasible: c.feasible });
  }
  return [...best.values()].sort((a, b) => Number(b.feasible) - Number(a.feasible) || a.rmsMm - b.rmsMm);
}

/**
 * The best design of each layout (family) of a workspace job by its search score, lower
 * better, feasibility first as the run ranks them (Deb, 2000), best first.
 */
export function bestPerLayout(designs: readonly { readonly family: string; readonly value: number; readonly feasible: boolean }[]): FamilyBest[] {
  const best = new Map<string, { family: string; score: number; feasible: boolean }>();
  for (const d of designs) {
    if (!Number.isFinite(d.value)) continue;
    const held = best.get(d.family);
    if (held === undefined || (d.feasible && !held.feasible) || (d.feasible === held.feasible && d.value < held.score)) best.set(d.family, { family: d.family, score: d.value, feasible: d.feasible });
  }
  return [...best.values()].sort((a, b) => Number(b.feasible) - Number(a.feasible) || a.score - b.score);
}

/** How a job stands, in words for the table and the file. */
export function jobStateWords(entry: AppQueueEntry): string {
  switch (entry.status) {
    case 'waiting':
      return entry.spec.skip ? 'skipped' : 'waiting';
    case 'running':
      return 'running';
    case 'cut':
      return 'skipped while running (designs so far kept)';
    case 'failed':
      return `failed: ${entry.outcome?.reason ?? 'no reason given'}`;
    case 'done': {
      const ended = entry.outcome?.ended;
      return ended === 'budget' ? 'done: budget spent' : ended === 'time' ? 'done: time budget spent' : ended === 'converged' ? 'done: converged' : ended === 'target' ? 'done: target error reached' : `done: ${ended ?? ''}`;
    }
  }
}

export function budgetWords(spec: { readonly evaluations?: number; readonly seconds?: number }): string {
  return spec.evaluations !== undefined ? `${spec.evaluations.toLocaleString('en-GB')} evaluations` : `${(spec.seconds ?? 0).toLocaleString('en-GB')} s`;
}

/** RFC 4180: a field with a comma, quote or line break is quoted, its quotes doubled. */
function csvField(value: string): string {
  return /[",\r\n]/.test(value) ? `"${value.replace(/"/g, '""')}"` : value;
}

/**
 * One shape for every kind: `best_rms_mm` is filled for path jobs, `best_score` (the
 * search's score, lower is better, no unit) for rear-suspension and walking-leg jobs, and
 * `caution` carries the kinematics-only caution of those two kinds.
 */
export const SUMMARY_CSV_HEADER = ['job', 'kind', 'state', 'family', 'best_rms_mm', 'best_score', 'feasible', 'evaluations', 'time_s', 'search_restarts', 'worker_restarts', 'budget_evaluations', 'budget_s', 'seed', 'run_id', 'caution'] as const;

/**
 * One line per job and family (the best design of each family the job searched), one line
 * for a job that found nothing. Numbers are written in full (no rounding) so the file can
 * be checked against the kept runs.
 */
export function summaryCsv(jobs: readonly AppQueueEntry[]): string {
  const lines = [SUMMARY_CSV_HEADER.join(',')];
  for (const entry of jobs) {
    const o = entry.outcome;
    const kind = jobKind(entry.spec.problem);
    const common = (family: string, rms: string, score: string, feasible: string) => [
      entry.spec.name,
      kind,
      jobStateWords(entry),
      family,
      rms,
      score,
      feasible,
      o === null ? '' : String(o.evaluations),
      o === null ? '' : String(o.elapsedMs / 1000),
      o?.searchRestarts === undefined ? '' : String(o.searchRestarts),
      o === null ? '' : String(o.restarts),
      entry.spec.evaluations === undefined ? '' : String(entry.spec.evaluations),
      entry.spec.seconds === undefined ? '' : String(entry.spec.seconds),
      String(entry.spec.seed),
      entry.runId ?? '',
      jobCaution(kind) ?? '',
    ].map(csvField).join(',');
    const best = o?.best ?? [];
    if (best.length === 0) lines.push(common('', '', '', ''));
    for (const b of best) lines.push(common(b.family, 'rmsMm' in b ? String(b.rmsMm) : '', 'score' in b ? String(b.score) : '', b.feasible ? 'yes' : 'no'));
  }
  return `${lines.join('\r\n')}\r\n`;
}
