/**
 * A six-bar whose driver turns through a whole turn without locking need not come back to
 * its first pose: its second turn is another motion. The search's curve samples the first
 * turn, and a closed target's match runs a whole turn from its first point, into the
 * second turn wherever that point is not at the turn's start; there the samples are not
 * the design's poses. Before, such a design could be ranked feasible on points it does
 * not reach, while its report, which follows the motion itself from the drawn pose, found
 * a lock on the way. Now a span outside the first turn of such a motion counts as a lock.
 *
 * The design is a random one of the Stephenson II pose family on the demo target.
 * Second methods: a plain continuation with the linkage solver alone (`run`, each solve
 * started from the pose before, 0.25° steps halved down to 1/4096 of a step where a solve
 * fails; tests/support/designFixture.ts), as in sweep-closure.test.ts; and the report's
 * analysis of the exported linkage (sweep.ts), as in searchReportAgreement.test.ts.
 */
import { describe, expect, it } from 'vitest';
import { demoPathObjective } from '../../support/demoObjective';
import { continueTo, designPlan, readDesignFixture } from '../../support/designFixture';

const fixture = readDesignFixture('stephenson-ii-opens-after-a-turn');

describe('a motion that does not come back after a turn', () => {
  it('turns through a whole turn without locking and ends in another pose (plain continuation)', () => {
    const plan = designPlan('stephenson-ii', fixture);
    const { pose } = continueTo(plan, 2 * Math.PI);
    expect(pose).not.toBeNull();
    let apart = 0;
    let scaleMm = 0;
    for (let i = 0; i < plan.reference.length; i++) {
      apart = Math.max(apart, Math.abs((pose as Float64Array)[i] - plan.reference[i]));
      scaleMm = Math.max(scaleMm, Math.abs(plan.reference[i]));
    }
    expect(apart).toBeGreaterThan(1e-3 * scaleMm);
  });

  it('on a closed target, its match outside the first turn is charged, as its report charges it', () => {
    const objective = demoPathObjective('stephenson-ii', true);
    const x = Float64Array.from(objective.variableNames.map((name) => fixture.variables[name]));
    const out = new Float64Array(2);
    objective.evaluate(Float64Array.from(x), out);
    expect(out[1]).toBeGreaterThan(0);
    const report = objective.describe(Float64Array.from(x));
    expect(report.feasible).toBe(false);
    // The closed target's motion runs a whole turn from its first point: to the first
    // turn's end or past it, where the design is in another pose than at its start.
    expect(report.driverValues[0]).toBeGreaterThanOrEqual(0);
  });
});
