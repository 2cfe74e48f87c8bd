import { describe, expect, it } from 'vitest';
import { compile, fourBar, run, type Plan } from '../../src/core/linkage';
import type { PlanInternal } from '../../src/core/linkage/plan';
import { runBatch } from '../../src/core/linkage/run';

/**
 * A non-Grashof four-bar (ground 100, crank and rocker 53.85, coupler 42.43 mm: the
 * shortest plus the longest link exceed the other two), so its crank cannot turn fully:
 * at π rad the crank pin is 153.85 mm from B0, beyond coupler + rocker (96.28 mm).
 * Source: Grashof's criterion (theorem); the distances are plain arithmetic.
 */
function rockingFourBar(): PlanInternal {
  const compiled = compile(fourBar({ A0: { x: 0, y: 0 }, B0: { x: 100, y: 0 }, A: { x: 50, y: 20 }, B: { x: 80, y: 50 }, P: { x: 70, y: 60 } }));
  if (!compiled.ok) throw new Error('the test four-bar did not compile');
  return compiled.plan as PlanInternal;
}

const REFERENCE_RAD = Math.atan2(20, 50);

/** What runBatch must give, by its definition: run at each value in turn on one pose. Source: common practice (differential testing). */
function byValue(plan: Plan, values: readonly number[], start: Float64Array, slot: number): { failures: number; failedOp: number; out: number[]; pose: Float64Array } {
  const pose = Float64Array.from(start);
  const out: number[] = [];
  let failures = 0;
  for (const v of values) {
    const ok = run(plan, v, pose);
    if (!ok) failures++;
    out.push(ok ? pose[slot] : NaN, ok ? pose[slot + 1] : NaN);
  }
  return { failures, failedOp: (plan as PlanInternal).failedOp, out, pose };
}

const bits = (a: ArrayLike<number>) => Array.from(a, (x) => (Object.is(x, -0) ? '-0' : String(x))).join(',');

describe('the generated batch entry reports the outcome of its last value as run does', () => {
  it.each([
    ['the last value fails', [REFERENCE_RAD, REFERENCE_RAD + 0.05, Math.PI]],
    ['an earlier value fails and the last assembles', [Math.PI, REFERENCE_RAD, REFERENCE_RAD + 0.05]],
    ['the only value fails', [Math.PI]],
    ['every value assembles', [REFERENCE_RAD, REFERENCE_RAD - 0.05, REFERENCE_RAD + 0.1]],
  ] as const)('%s: failures, failedOp, outputs and pose match run value by value', (_case, list) => {
    const plan = rockingFourBar();
    expect(plan.kernel?.batch).toBeTruthy();
    const slot = 2 * (plan.slotIndex.get('P') ?? -1);
    const expected = byValue(plan, list, plan.reference, slot);
    // Only the crank angle π cannot be reached (Grashof, above).
    expect(expected.failures).toBe(list.filter((v) => v === Math.PI).length);
    plan.failedOp = 99; // whatever the batch leaves here must be its own
    const pose = Float64Array.from(plan.reference);
    const out = new Float64Array(2 * list.length);
    expect(runBatch(plan, Float64Array.from(list), pose, Int32Array.of(slot), out)).toBe(expected.failures);
    expect(plan.failedOp).toBe(expected.failedOp);
    expect(bits(out)).toBe(bits(expected.out));
    expect(bits(pose)).toBe(bits(expected.pose));
  });

  it('no values: nothing fails and failedOp is left as it was', () => {
    const plan = rockingFourBar();
    const pose = Float64Array.from(plan.reference);
    expect(run(plan, Math.PI, pose)).toBe(false);
    const before = plan.failedOp;
    expect(before).toBeGreaterThanOrEqual(0);
    expect(runBatch(plan, new Float64Array(0), pose, Int32Array.of(0), new Float64Array(0))).toBe(0);
    expect(plan.failedOp).toBe(before);
  });
});
