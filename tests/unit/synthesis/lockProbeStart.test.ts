/**
 * The lock search refines each minimum of the margin from its sample's pose. A Stephenson
 * curve moves the pose it starts a solve from on by the rates of the value it solved
 * last; a probe that replaced that pose with its sample's, the curve not told, was moved
 * on from the wrong value where no kept poses bracket the probe (below the turn's start,
 * here), landed off the motion and was charged as a lock. Two random designs on the demo
 * target's open path whose motions have no lock, which the search called infeasible for
 * that (tests/fixtures/designs/*-probe-started-off-its-sample.json).
 *
 * Second method: a plain continuation with the linkage solver alone (tests/support/
 * designFixture.ts) from the reference pose to both ends of the fitted driver values
 * reaches them, so no lock lies on the motion; and the report's analysis of the exported
 * linkage finds none. The search must now call the designs feasible, as its report does.
 */
import { describe, expect, it } from 'vitest';
import type { FamilyId } from '../../../src/core/synthesis';
import { demoPathObjective } from '../../support/demoObjective';
import { continueTo, designPlan, readDesignFixture } from '../../support/designFixture';

const CASES: readonly [FamilyId & ('stephenson-ii' | 'stephenson-iii'), string][] = [
  ['stephenson-ii', 'stephenson-ii-probe-started-off-its-sample'],
  ['stephenson-iii', 'stephenson-iii-probe-started-off-its-sample'],
];

describe("the lock search's probes start from their sample", () => {
  for (const [family, name] of CASES) {
    it(`${name}: no lock on the motion, and the search finds none`, () => {
      const fixture = readDesignFixture(name);
      const objective = demoPathObjective(family, false);
      const x = Float64Array.from(objective.variableNames.map((v) => fixture.variables[v]));
      const report = objective.describe(Float64Array.from(x));
      const lo = Math.min(...report.driverValues);
      const hi = Math.max(...report.driverValues);
      // The fitted motion starts below the reference pose's value: where the probes went wrong.
      expect(lo).toBeLessThan(0);
      const plan = designPlan(family, fixture);
      expect(continueTo(plan, lo).pose).not.toBeNull();
      expect(continueTo(plan, hi).pose).not.toBeNull();
      expect(report.defects).toEqual([]);

      const out = new Float64Array(2);
      objective.evaluate(Float64Array.from(x), out);
      expect(out[1]).toBe(0);
      expect(report.feasible).toBe(true);
    });
  }
});
