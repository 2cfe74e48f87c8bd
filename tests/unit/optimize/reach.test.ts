/**
 * The default search reaches the optimum, not a neighbourhood of it, on two cheap cases of
 * the reach set (bench/reachCases.ts), whose targets are sampled from known four-bars so
 * the optimum is zero: the island's optimizer as a job gets it by default, stopped at the
 * reach error (REACH_SHARE of the target's size) or the budget.
 */
import { describe, expect, it } from 'vitest';
import { runReachSeed } from '../../../bench/reach';
import { reachCases } from '../../../bench/reachCases';

/** Evaluations each seed may spend: the 2e5 (L-SHADE's schedule is sized by it); a seed that reaches stops early. */
const BUDGET = 200_000;
const SEEDS = [1, 2, 3];

describe('reach of the default search', () => {
  for (const c of reachCases(['lengths-p-open-free', 'lengths-p-open-fixed'])) {
    it(`${c.id}: every seed reaches RMS ≤ ${c.reachRmsMm.toPrecision(2)} mm within ${BUDGET} evaluations`, () => {
      for (const seed of SEEDS) {
        const run = runReachSeed(c, seed, BUDGET);
        // theorem: the target is sampled from the case's generating design, so the optimum is RMS 0
        expect(run.reached, `seed ${seed}: best RMS ${run.bestRmsMm} mm after ${run.evaluations} evaluations`).toBe(true);
        expect(run.bestRmsMm).not.toBeNull();
        expect(run.bestRmsMm as number).toBeLessThanOrEqual(c.reachRmsMm);
        expect(run.evaluations).toBeLessThanOrEqual(BUDGET);
      }
    });
  }
});
