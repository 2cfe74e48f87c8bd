/**
 * The target-error stop of a search wrapped in the restart scheme: a target given with the
 * inner search (as a job's optimizer carries it, and as an island wraps it) stops the
 * scheme at that target rather than running on to the budget.
 */
import { describe, expect, it } from 'vitest';
import { reachCases } from '../../../bench/reachCases';
import { DEFAULT_ARCHIVE } from '../../../src/engine/runSpec';
import { Island } from '../../../workers/island';
import { drive, make, rosenbrock } from '../../support/optimize';

const TARGET = 1e-6;

describe('target-error stop through the restart scheme', () => {
  it("takes the inner search's target when the scheme names none, and stops on it", () => {
    // Rosenbrock's minimum is 0 at (1, 1) (Jamil and Yang, 2013), so the target is reachable.
    const opt = make({ kind: 'restart', inner: { kind: 'lshade', targetValue: TARGET }, dim: 2, maxEvaluations: 1_000_000, seed: 3, runEvaluations: 20_000 });
    const result = drive(opt, rosenbrock(2));
    expect(result.stopReason).toBe('target');
    expect(result.value).toBeLessThanOrEqual(TARGET);
    expect(result.evaluations).toBeLessThan(1_000_000);
    expect(opt.exportState().config.targetValue).toBe(TARGET);
  });

  it("the scheme's own target wins over the inner one", () => {
    const opt = make({ kind: 'restart', inner: { kind: 'lshade', targetValue: 1 }, dim: 2, maxEvaluations: 1_000_000, seed: 3, runEvaluations: 20_000, targetValue: TARGET });
    const result = drive(opt, rosenbrock(2));
    expect(result.stopReason).toBe('target');
    expect(result.value).toBeLessThanOrEqual(TARGET);
  });

  it('an island given a job optimizer with a target stops on it, before its budget', () => {
    const c = reachCases(['lengths-p-open-free'])[0];
    const budget = 200_000;
    const made = Island.create({
      islandId: 'reach',
      objective: { kind: 'synthesis', problem: c.problemFile, family: c.family },
      seed: 1,
      stream: 0,
      optimizer: { kind: 'hybrid', targetValue: c.reachRmsMm },
      maxEvaluations: budget,
      archiveCapacity: DEFAULT_ARCHIVE.capacity,
      archiveDistance: DEFAULT_ARCHIVE.distance,
    });
    if (!made.ok) throw new Error(made.reason);
    let progress = made.island.step({ evaluations: budget }, () => 0);
    for (let slice = 0; slice < 100 && progress.stopReason === null; slice++) progress = made.island.step({ evaluations: budget }, () => 0);
    // theorem: the target is sampled from the case's generating design, so RMS 0 exists and the reach error is reachable
    expect(progress.stopReason).toBe('target');
    expect(progress.bestValue as number).toBeLessThanOrEqual(c.reachRmsMm);
    expect(progress.evaluations).toBeLessThan(budget);
  });
});
