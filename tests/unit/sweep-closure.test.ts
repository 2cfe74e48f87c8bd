/**
 * A driven link turns fully only where its motion comes back to its first pose a turn on.
 * A six-bar with a Newton block can turn through a whole turn without locking and end in
 * another pose: its second turn is another motion, which may lock. `loci analyze` must
 * not call that a full turn.
 *
 * The fixtures are random designs of Loci's own search space (Stephenson II and III pose
 * families on the demo target, seed 7), exported as linkage files: one that locks in its
 * second turn, one whose motion repeats every second turn, and one that closes in one.
 *
 * Second method: a plain continuation written here with the linkage solver alone (`run`,
 * each solve started from the pose before, 0.25° steps halved down to 1/4096 of a step
 * where a solve fails), not the sweep the analysis uses.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { readLinkageFile } from '../../src/core/io/linkageFile';
import type { Plan } from '../../src/core/linkage/plan';
import { analyzeLinkage } from '../../src/core/linkage/report';
import { run } from '../../src/core/linkage/run';

const TURN = 2 * Math.PI;
const STEP_RAD = (0.25 * Math.PI) / 180;
const LEAST_STEP_RAD = STEP_RAD / 4096;
const DEG = 180 / Math.PI;

function planOf(name: string): Plan {
  const read = readLinkageFile(JSON.parse(readFileSync(new URL(`../fixtures/linkages/${name}.json`, import.meta.url), 'utf8')));
  if (!read.ok) throw new Error(`${name}: ${JSON.stringify(read.issues)}`);
  return read.plan;
}

/** The continuation's poses at the end of each of `turns` turns (null from a lock on) and where it locked (rad from the reference; NaN: never). */
function continuation(plan: Plan, turns: number): { readonly ends: (Float64Array | null)[]; readonly lockRad: number } {
  const reference = plan.driverReferenceValue;
  const pose = Float64Array.from(plan.reference);
  const before = new Float64Array(pose.length);
  const ends: (Float64Array | null)[] = [];
  let t = 0;
  for (let turn = 1; turn <= turns; turn++) {
    const end = turn * TURN;
    while (t < end) {
      let h = Math.min(STEP_RAD, end - t);
      before.set(pose);
      while (!run(plan, reference + t + h, pose)) {
        pose.set(before);
        h /= 2;
        if (h < LEAST_STEP_RAD) {
          while (ends.length < turns) ends.push(null);
          return { ends, lockRad: t };
        }
      }
      t = t + h > end - 1e-12 ? end : t + h;
    }
    ends.push(Float64Array.from(pose));
  }
  return { ends, lockRad: NaN };
}

function largestMove(a: Float64Array, b: Float64Array): number {
  let most = 0;
  for (let i = 0; i < a.length; i++) most = Math.max(most, Math.abs(a[i] - b[i]));
  return most;
}

describe('a full turn is one the motion comes back from', () => {
  it('a Stephenson II six-bar that turns through one turn and locks in its second: an assembly range past a turn, where the continuation locks', () => {
    const plan = planOf('stephenson-ii-locks-in-second-turn');
    const walked = continuation(plan, 2);
    // The continuation: through the first turn, but not back to the first pose, then a lock.
    expect(walked.ends[0]).not.toBeNull();
    expect(largestMove(walked.ends[0] as Float64Array, plan.reference)).toBeGreaterThan(1);
    expect(walked.lockRad).toBeGreaterThan(TURN);
    expect(walked.lockRad).toBeLessThan(2 * TURN);

    const analysed = analyzeLinkage(plan);
    if (!analysed.ok) throw new Error(JSON.stringify(analysed.issues));
    const driver = analysed.report.driver;
    expect(driver.fullTurn).toBe(false);
    expect(driver.rangeRule).toBe('assembly range');
    // The analysis's end of the motion is the continuation's lock (degrees; the
    // continuation's last step is 6e-5°, the analysis stops 1e-7 rad inside its limit).
    expect(Math.abs(driver.to - (plan.driverReferenceValue + walked.lockRad) * DEG)).toBeLessThan(0.01);
  });

  it('a Stephenson III six-bar whose motion repeats every second turn: the analysis asks for the range, and calls nothing a full turn', () => {
    const plan = planOf('stephenson-iii-two-turn-period');
    const walked = continuation(plan, 4);
    expect(walked.lockRad).toBeNaN();
    const [one, two, three, four] = walked.ends as Float64Array[];
    expect(largestMove(one, plan.reference)).toBeGreaterThan(1);
    expect(largestMove(two, plan.reference)).toBeLessThan(1e-6);
    expect(largestMove(three, one)).toBeLessThan(1e-6);
    expect(largestMove(four, plan.reference)).toBeLessThan(1e-6);

    const analysed = analyzeLinkage(plan);
    expect(analysed.ok).toBe(false);
    if (!analysed.ok) expect(analysed.issues).toEqual([{ path: 'driver', message: expect.stringMatching(/does not repeat each turn/) }]);
  });

  it('a Stephenson II six-bar whose motion closes in one turn: a full turn, as before', () => {
    const plan = planOf('stephenson-ii-closes-each-turn');
    const walked = continuation(plan, 1);
    expect(walked.lockRad).toBeNaN();
    expect(largestMove(walked.ends[0] as Float64Array, plan.reference)).toBeLessThan(1e-6);

    const analysed = analyzeLinkage(plan);
    if (!analysed.ok) throw new Error(JSON.stringify(analysed.issues));
    expect(analysed.report.driver.fullTurn).toBe(true);
    expect(analysed.report.driver.rangeRule).toBe('full turn');
  });
});
