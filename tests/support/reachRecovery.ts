/**
 * A reach case's generating design (bench/reachCases.ts), disturbed by a test, brought
 * back by the search's fitBetter: the check the fitBetter tests share.
 */
import { expect } from 'vitest';
import type { ReachCase } from '../../bench/reachCases';
import type { Objective } from '../../src/core/synthesis';

/** RMS (share of the target's size) of a design on its target: rounding of kinematics, fit and timing solve. */
export const ON_TARGET_SHARE = 1e-9;
/** Agreement of a recovered design's variables with the generating design's, as a share of the target's size (and rad). */
export const SAME_DESIGN_SHARE = 1e-6;

/**
 * fitBetter on x, which `objective` has just evaluated into out, takes it back to `c`'s
 * generating design: true, feasible, on the target, every variable j within
 * SAME_DESIGN_SHARE by `distance(j)`; and the report of the design x now holds gives the
 * figures out holds.
 */
export function expectFitBetterRecovers(objective: Objective, c: ReachCase, x: Float64Array, out: Float64Array, distance: (j: number) => number): void {
  expect(objective.fitBetter?.(x, out)).toBe(true);
  expect(out[1]).toBe(0);
  expect(out[0] / c.sizeMm).toBeLessThan(ON_TARGET_SHARE);
  for (let j = 0; j < c.design.length; j++) expect(distance(j), c.designNames[j]).toBeLessThan(SAME_DESIGN_SHARE);
  const report = objective.describe(x);
  expect(report.value).toBe(out[0]);
  expect(report.violation).toBe(out[1]);
}
