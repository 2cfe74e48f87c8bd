/**
 * Designs of the Stephenson pose families kept as fixtures (tests/fixtures/designs: the
 * reference-pose joint positions by variable name), the family's plan set to one, and a
 * plain continuation of its motion written with the linkage solver alone: a second
 * method beside the search's curve and the analysis's sweep.
 */
import { readFileSync } from 'node:fs';
import { compile, setReferencePose, type Linkage, type Plan } from '../../src/core/linkage';
import { stephensonII, stephensonIII } from '../../src/core/linkage/families';
import { run } from '../../src/core/linkage/run';

export interface DesignFixture {
  readonly variables: Readonly<Record<string, number>>;
}

export function readDesignFixture(name: string): DesignFixture {
  return JSON.parse(readFileSync(new URL(`../fixtures/designs/${name}.json`, import.meta.url), 'utf8')) as DesignFixture;
}

const BUILDERS: Readonly<Record<'stephenson-ii' | 'stephenson-iii', () => Linkage>> = {
  'stephenson-ii': () => stephensonII(),
  'stephenson-iii': () => stephensonIII(),
};

/** The family's plan in the design's reference pose. */
export function designPlan(family: keyof typeof BUILDERS, fixture: DesignFixture): Plan {
  const compiled = compile(BUILDERS[family]());
  if (!compiled.ok) throw new Error(`${family} does not compile`);
  const plan = compiled.plan;
  const reference = new Float64Array(2 * plan.slotCount);
  for (const [id, slot] of plan.slotIndex) {
    reference[2 * slot] = fixture.variables[`${id}.x`];
    reference[2 * slot + 1] = fixture.variables[`${id}.y`];
  }
  setReferencePose(plan, reference);
  return plan;
}

const STEP_RAD = (0.25 * Math.PI) / 180;
const LEAST_STEP_RAD = STEP_RAD / 4096;

/**
 * The motion turning from the reference pose to `to` (rad from it; below 0 turning
 * backward): each solve started from the pose before, 0.25° steps halved down to 1/4096
 * of a step where a solve fails. Where it locks first, `lockRad` (the last value solved)
 * and no pose; else the pose at `to`.
 */
export function continueTo(plan: Plan, to: number): { readonly lockRad: number; readonly pose: Float64Array | null } {
  const direction = to < 0 ? -1 : 1;
  const pose = Float64Array.from(plan.reference);
  const trial = new Float64Array(pose.length);
  let t = 0;
  let h = STEP_RAD;
  while (direction * (to - t) > 0) {
    trial.set(pose);
    const next = direction > 0 ? Math.min(to, t + h) : Math.max(to, t - h);
    if (run(plan, plan.driverReferenceValue + next, trial)) {
      pose.set(trial);
      t = next;
      h = STEP_RAD;
    } else if (h / 2 >= LEAST_STEP_RAD) {
      h /= 2;
    } else {
      return { lockRad: t, pose: null };
    }
  }
  return { lockRad: direction * Infinity, pose };
}
