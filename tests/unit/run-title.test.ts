/** The tab title during a search: the state, the share of the budget, the best error. */
import { describe, expect, it } from 'vitest';
import { runTitle } from '../../src/app/run/runTitle';
import { IDLE_RUN, type RunState } from '../../src/app/state/project';

const run = (patch: Partial<RunState>): RunState => ({ ...IDLE_RUN, ...patch });

describe('runTitle', () => {
  it('is the app name when no search has run', () => {
    expect(runTitle(IDLE_RUN)).toBe('Loci');
  });

  it('shows the share of an evaluation budget used, and the best error', () => {
    // 12,345 of 50,000 evaluations is 24.69 %: shown as the whole per cent reached, 24.
    expect(runTitle(run({ status: 'running', evaluations: 12_345, budgetEvaluations: 50_000, bestErrorMm: 0.04213, bestFeasible: true }))).toBe('24 % · 0.042 mm · Loci');
  });

  it('measures a time budget by the time used, and never says 100 % before the end', () => {
    expect(runTitle(run({ status: 'running', budgetEvaluations: null, budgetSeconds: 600, elapsedMs: 150_000 }))).toBe('25 % · Loci');
    expect(runTitle(run({ status: 'running', budgetEvaluations: null, budgetSeconds: 600, elapsedMs: 600_000 }))).toBe('99 % · Loci');
  });

  it('names the other states and marks an infeasible best', () => {
    expect(runTitle(run({ status: 'paused', bestErrorMm: 1.5, bestFeasible: false }))).toBe('Paused · 1.500 mm (infeasible) · Loci');
    expect(runTitle(run({ status: 'finished', bestErrorMm: 0.0312, bestFeasible: true }))).toBe('Done · 0.031 mm · Loci');
    expect(runTitle(run({ status: 'failed' }))).toBe('Stopped · Loci');
  });
});
