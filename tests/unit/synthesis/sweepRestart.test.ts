/**
 * The search's curve follows a six-bar's motion from its reference pose in steps of its
 * 2° bins, halving a step that fails. After a failed step it starts again from the last
 * value it reached; that value's pose must be the one it reached, not a new solve there:
 * a value between two bins has no bin to keep its pose, and a solve from another start
 * may land on another part of the motion. Near the end of a turn that other part can be
 * the reference pose's own motion turning backward, and the curve then "closed" a motion
 * that locks short of the turn. The design here (a random one of the Stephenson II pose
 * family on the demo target) locks 0.26° short of a full turn; before, a search asked for
 * a crank that turns fully ranked it feasible, while its report found the lock.
 *
 *
 * The same restart, past the first turn: where a solve fails there (a probe of the lock
 * search near a sharp minimum of the assembly margin), the curve goes on to it from its
 * nearest kept pose as within the first turn, on the first turn's poses, where the motion
 * closes in one turn. Before, it did not, and charged a lock the report does not find:
 * the second design, whose closed target's last span runs into the second turn.
 *
 * Second methods: a plain continuation with the linkage solver alone (`run`, each solve
 * started from the pose before, 0.25° steps halved down to 1/4096 of a step where a solve
 * fails; tests/support/designFixture.ts), as in sweep-closure.test.ts; and the report's
 * analysis of the exported linkage (sweep.ts), as in searchReportAgreement.test.ts.
 */
import { describe, expect, it } from 'vitest';
import { demoPathObjective } from '../../support/demoObjective';
import { continueTo, designPlan, readDesignFixture, type DesignFixture } from '../../support/designFixture';

const DEG = Math.PI / 180;

const locksShort = readDesignFixture('stephenson-ii-locks-just-short-of-a-turn');
const recovers = readDesignFixture('stephenson-ii-recovers-in-second-turn');

function objective(fixture: DesignFixture, fullTurnCrank: boolean) {
  const searchObjective = demoPathObjective('stephenson-ii', true, fullTurnCrank ? { fullTurnCrank: true } : undefined);
  const x = Float64Array.from(searchObjective.variableNames.map((name) => fixture.variables[name]));
  return { objective: searchObjective, x };
}

describe('a sweep step after a refused one goes on from the pose it reached', () => {
  it('the design locks turning forward within the last degree of a turn (plain continuation)', () => {
    const lock = continueTo(designPlan('stephenson-ii', locksShort), 2 * Math.PI).lockRad;
    expect(lock).toBeGreaterThan(359 * DEG);
    expect(lock).toBeLessThan(360 * DEG);
  });

  it('a search asked for a crank that turns fully does not rank it feasible, and its report agrees', () => {
    const { objective: o, x } = objective(locksShort, true);
    const out = new Float64Array(2);
    o.evaluate(Float64Array.from(x), out);
    expect(out[1]).toBeGreaterThan(0);
    const report = o.describe(Float64Array.from(x));
    expect(report.feasible).toBe(false);
    expect(report.defects.join('; ')).toMatch(/crank cannot turn fully/);
  });

  it('past the first turn a failed solve is recovered from the first turn\'s poses: no lock the report does not find', () => {
    const { objective: o, x } = objective(recovers, false);
    const report = o.describe(Float64Array.from(x));
    expect(report.feasible).toBe(true);
    const out = new Float64Array(2);
    o.evaluate(Float64Array.from(x), out);
    expect(out[1]).toBe(0);
  });
});
