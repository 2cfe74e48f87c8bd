/**
 * A six-bar candidate is drawn at target point 1 in the pose its motion has there, the
 * motion the driver makes from the design's reference pose, and the search and the
 * report judge that motion alike. Three random designs on the demo target's open path
 * where they did not (the report found a lock on a motion the search had not fitted):
 *
 * - the match's refinement solved driver values just below 0 and kept their poses, of
 *   the motion turning backward, in the bin of the turn's start (stephenson-ii-refined-
 *   just-before-its-start);
 * - the sweep back from a whole turn took its first step without its tangent, and landed
 *   on another assembly with the same sign of det J, one whose motion folds within that
 *   2° step (stephenson-ii-narrow-fold-near-turn-end);
 * - a design that cannot turn through (a gap) matched a whole turn on, which the search
 *   takes as the first turn's values and the report drew in the design's reference pose
 *   (stephenson-iii-gap-matched-past-the-turn).
 *
 * Second method: a plain continuation with the linkage solver alone (tests/support/
 * designFixture.ts) from the reference pose to target point 1's driver value, forward or,
 * where the motion locks first, backward; the exported linkage must be that pose, placed.
 * And the report's analysis of the exported linkage (sweep.ts) must find the motion feasible,
 * as the search does.
 */
import { describe, expect, it } from 'vitest';
import type { FamilyId } from '../../../src/core/synthesis';
import { demoPathObjective } from '../../support/demoObjective';
import { continueTo, designPlan, readDesignFixture } from '../../support/designFixture';

const TAU = 2 * Math.PI;
/** Exported joints within this share of the design's size of the continuation's, placed (the solver's tolerance, placed, is far below). */
const POSE_REL_TOL = 1e-6;

const CASES: readonly [FamilyId & ('stephenson-ii' | 'stephenson-iii'), string][] = [
  ['stephenson-ii', 'stephenson-ii-refined-just-before-its-start'],
  ['stephenson-ii', 'stephenson-ii-narrow-fold-near-turn-end'],
  ['stephenson-iii', 'stephenson-iii-gap-matched-past-the-turn'],
];

describe('a six-bar drawn on its own motion', () => {
  for (const [family, name] of CASES) {
    it(`${name}: drawn at target point 1 where the motion is, and feasible in the search and in its report`, () => {
      const fixture = readDesignFixture(name);
      const objective = demoPathObjective(family, false);
      const x = Float64Array.from(objective.variableNames.map((v) => fixture.variables[v]));
      const out = new Float64Array(2);
      objective.evaluate(Float64Array.from(x), out);
      expect(out[1]).toBe(0);
      const report = objective.describe(Float64Array.from(x));
      expect(report.defects).toEqual([]);
      expect(report.feasible).toBe(true);
      expect(report.referencePose).toBe('target point 1');

      const plan = designPlan(family, fixture);
      const inTurn = report.driverValues[0] - Math.floor(report.driverValues[0] / TAU) * TAU;
      const forward = continueTo(plan, inTurn);
      const reached = forward.pose ?? continueTo(plan, inTurn - TAU).pose;
      expect(reached).not.toBeNull();
      const pose = reached as Float64Array;
      if (report.placement === undefined) throw new Error('a free placement reports its placement');
      const { scale, rotationRad, tx, ty } = report.placement;
      const c = scale * Math.cos(rotationRad);
      const s = scale * Math.sin(rotationRad);
      let sizeMm = 0;
      for (const v of plan.reference) sizeMm = Math.max(sizeMm, scale * Math.abs(v));
      for (const joint of report.linkage.joints) {
        const slot = plan.slotIndex.get(joint.id) as number;
        const px = pose[2 * slot];
        const py = pose[2 * slot + 1];
        expect(Math.hypot(joint.x - (c * px - s * py + tx), joint.y - (s * px + c * py + ty)), joint.id).toBeLessThan(POSE_REL_TOL * sizeMm);
      }
    });
  }
});
