import { describe, expect, it } from 'vitest';
import { compile, run } from '../../../src/core/linkage';
import * as families from '../../../src/core/linkage/families';
import { createObjective, createProblem, type FamilyId } from '../../../src/core/synthesis';

const BUILDERS: [FamilyId, () => ReturnType<typeof families.fourBar>][] = [
  ['fourbar', () => families.fourBar()],
  ['slider-crank', () => families.sliderCrank()],
  ['watt-i', () => families.wattI()],
  ['watt-ii', () => families.wattII()],
  ['stephenson-i', () => families.stephensonI()],
  ['stephenson-ii', () => families.stephensonII()],
  ['stephenson-iii', () => families.stephensonIII()],
];

const OFFSETS = [0, 0.08, 0.16, 0.24, 0.32];

describe('pose-based family encodings', () => {
  for (const [family, build] of BUILDERS) {
    it(`${family}: its own path scores ~0 at its reference pose, and a moved joint does not`, () => {
      const compiled = compile(build());
      expect(compiled.ok).toBe(true);
      if (!compiled.ok) return;
      const plan = compiled.plan;
      const pose = Float64Array.from(plan.reference);
      const p = 2 * (plan.slotIndex.get('P') ?? -1);
      const points = OFFSETS.map((t) => {
        expect(run(plan, plan.driverReferenceValue + t, pose)).toBe(true);
        return [pose[p], pose[p + 1]];
      });
      const made = createProblem({
        name: family,
        target: { points, closed: false },
        timing: { mode: 'prescribed', driverValues: OFFSETS },
        placement: 'fixed',
        families: [family],
        // Boxes wide enough for the default proportions (the defaults scale with the target).
        bounds: { [family]: Object.fromEntries([...plan.jointIds, ...plan.pointIds].flatMap((id) => [[`${id}.x`, [-500, 500]], [`${id}.y`, [-500, 500]]])) },
      });
      if (!made.ok) throw new Error(JSON.stringify(made.issues));
      const objective = createObjective(made.problem, family);
      expect(objective.dim).toBe(2 * plan.slotCount);
      const x = Float64Array.from(plan.reference);
      const out = new Float64Array(2);
      objective.evaluate(x, out);
      expect(out[0]).toBeLessThan(1e-18);
      const report = objective.describe(x);
      expect(report.feasible).toBe(true);
      expect(compile(report.linkage).ok).toBe(true);
      // Move the output point: the error must grow, so the test can fail.
      const moved = Float64Array.from(x);
      moved[objective.variableNames.indexOf('P.x')] += 1;
      objective.evaluate(moved, out);
      expect(out[0]).toBeGreaterThan(1e-3);
    });
  }
});

describe('pose-based timing solves', () => {
  it('fourbar: finds the timing of its own closed path (unprescribed) and turns fully', () => {
    const compiled = compile(families.fourBar());
    if (!compiled.ok) throw new Error('default four-bar does not compile');
    const plan = compiled.plan;
    const pose = Float64Array.from(plan.reference);
    const p = 2 * (plan.slotIndex.get('P') ?? -1);
    const turns = [0.3, 1.1, 2.0, 2.9, 3.7, 4.6, 5.5];
    const points = turns.map((t) => {
      expect(run(plan, plan.driverReferenceValue + t, pose)).toBe(true);
      return [pose[p], pose[p + 1]];
    });
    const made = createProblem({
      name: 'own path',
      target: { points, closed: true },
      timing: { mode: 'unprescribed' },
      placement: 'fixed',
      families: ['fourbar'],
      constraints: { fullTurnCrank: true, minTransmissionRad: (20 * Math.PI) / 180 },
      bounds: { fourbar: Object.fromEntries(['A0', 'B0', 'A', 'B', 'P'].flatMap((id) => [[`${id}.x`, [-300, 300]], [`${id}.y`, [-300, 300]]])) },
    });
    if (!made.ok) throw new Error(JSON.stringify(made.issues));
    const objective = createObjective(made.problem, 'fourbar');
    const report = objective.describe(Float64Array.from(plan.reference));
    expect(report.error.maxMm).toBeLessThan(1e-8);
    expect(report.feasible).toBe(true);
    report.driverValues.forEach((t, i) => expect(t).toBeCloseTo(turns[i], 8));
    expect(report.grashof?.name).toBe('crank-rocker');
  });
});
