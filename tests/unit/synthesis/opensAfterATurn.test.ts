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
 * Second methods: a plain continuation written here with the linkage solver alone (`run`,
 * each solve started from the pose before, 0.25° steps halved down to 1/4096 of a step
 * where a solve fails), as in sweep-closure.test.ts; and the report's analysis of the
 * exported linkage (sweep.ts), as in searchReportAgreement.test.ts.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { demoTargetPoints } from '../../../src/app/demo/transferDemo';
import { compile, setReferencePose } from '../../../src/core/linkage';
import { stephensonII } from '../../../src/core/linkage/families';
import { run } from '../../../src/core/linkage/run';
import { createObjective, createProblem } from '../../../src/core/synthesis';

const STEP_RAD = (0.25 * Math.PI) / 180;
const LEAST_STEP_RAD = STEP_RAD / 4096;

const fixture = JSON.parse(readFileSync(new URL('../../fixtures/designs/stephenson-ii-opens-after-a-turn.json', import.meta.url), 'utf8')) as {
  readonly variables: Readonly<Record<string, number>>;
};

/** The pose a plain continuation reaches a whole turn on from the reference pose (null where it locks first), and the reference pose. */
function aTurnOn(): { readonly start: Float64Array; readonly end: Float64Array | null; readonly scaleMm: number } {
  const compiled = compile(stephensonII());
  if (!compiled.ok) throw new Error('the family does not compile');
  const plan = compiled.plan;
  const reference = new Float64Array(2 * plan.slotCount);
  for (const [id, slot] of plan.slotIndex) {
    reference[2 * slot] = fixture.variables[`${id}.x`];
    reference[2 * slot + 1] = fixture.variables[`${id}.y`];
  }
  setReferencePose(plan, reference);
  const pose = Float64Array.from(plan.reference);
  const trial = new Float64Array(pose.length);
  let t = 0;
  let h = STEP_RAD;
  while (t < 2 * Math.PI) {
    trial.set(pose);
    const next = Math.min(2 * Math.PI, t + h);
    if (run(plan, plan.driverReferenceValue + next, trial)) {
      pose.set(trial);
      t = next;
      h = STEP_RAD;
    } else if (h / 2 >= LEAST_STEP_RAD) {
      h /= 2;
    } else {
      return { start: Float64Array.from(plan.reference), end: null, scaleMm: 1 };
    }
  }
  let scaleMm = 0;
  for (let i = 0; i < pose.length; i++) scaleMm = Math.max(scaleMm, Math.abs(plan.reference[i]));
  return { start: Float64Array.from(plan.reference), end: pose, scaleMm };
}

describe('a motion that does not come back after a turn', () => {
  it('turns through a whole turn without locking and ends in another pose (plain continuation)', () => {
    const { start, end, scaleMm } = aTurnOn();
    expect(end).not.toBeNull();
    let apart = 0;
    for (let i = 0; i < start.length; i++) apart = Math.max(apart, Math.abs((end as Float64Array)[i] - start[i]));
    expect(apart).toBeGreaterThan(1e-3 * scaleMm);
  });

  it('on a closed target, its match outside the first turn is charged, as its report charges it', () => {
    const made = createProblem({
      name: 'opens after a turn',
      target: { points: demoTargetPoints().map((p) => [p.x, p.y]), closed: true },
      timing: { mode: 'unprescribed', samples: 180 },
      placement: 'free',
      families: ['stephenson-ii'],
      measure: 'rms',
    });
    if (!made.ok) throw new Error(JSON.stringify(made.issues));
    const objective = createObjective(made.problem, 'stephenson-ii');
    const x = Float64Array.from(objective.variableNames.map((name) => fixture.variables[name]));
    const out = new Float64Array(2);
    objective.evaluate(Float64Array.from(x), out);
    expect(out[1]).toBeGreaterThan(0);
    const report = objective.describe(Float64Array.from(x));
    expect(report.feasible).toBe(false);
    // The closed target's motion, a whole turn from its first point, leaves the first turn.
    expect(report.driverValues[0]).toBeGreaterThan(0);
  });
});
