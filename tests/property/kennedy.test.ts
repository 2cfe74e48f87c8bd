/**
 * Kennedy's theorem (Aronhold–Kennedy; any kinematics text, theorem): the three relative
 * instant centres of any three bodies in plane motion lie on one line, and n bodies have
 * n(n − 1)/2 centres. A centre at infinity is the point at infinity of its direction,
 * so the check is on homogeneous coordinates.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import type { Vec2 } from '../../src/core/geometry';
import { instantCentres, type InstantCentre, type InstantCentreEntry } from '../../src/core/linkage/analysis';
import { compile } from '../../src/core/linkage/compile';
import {
  FOUR_BAR_DEFAULT,
  STEPHENSON_III_DEFAULT,
  STEPHENSON_II_DEFAULT,
  STEPHENSON_I_DEFAULT,
  WATT_II_DEFAULT,
  WATT_I_DEFAULT,
  fourBar,
  stephensonI,
  stephensonII,
  stephensonIII,
  wattI,
  wattII,
} from '../../src/core/linkage/families';
import type { Linkage } from '../../src/core/linkage/model';
import { closureResidualMm, runWithRates } from '../../src/core/linkage/run';
import { closedFormFourBar } from '../support/closedFormFourBar';

/**
 * Collinearity tolerance: |det| of the three unit homogeneous vectors (finite points
 * taken about the linkage's centre in units of its size). Exact arithmetic gives 0;
 * rounding gave at most about 5e-16 over these runs, and 1e-9 leaves room for a centre
 * far away, whose position carries the rounding of a small relative ω.
 */
const COLLINEAR_TOL = 1e-9;

function homogeneous(c: InstantCentre, cx: number, cy: number, size: number): [number, number, number] {
  if (c.kind === 'infinite') return [c.dx, c.dy, 0];
  if (c.kind !== 'finite') throw new Error('indeterminate centre');
  const v: [number, number, number] = [(c.x - cx) / size, (c.y - cy) / size, 1];
  const n = Math.hypot(...v);
  return [v[0] / n, v[1] / n, v[2] / n];
}

/** The largest |det| over every triple of bodies; also checks the count of centres. */
function worstKennedyResidual(entries: InstantCentreEntry[], bodies: number, pose: Float64Array): number {
  expect(entries).toHaveLength((bodies * (bodies - 1)) / 2);
  let minX = Infinity, minY = Infinity, maxX = -Infinity, maxY = -Infinity;
  for (let i = 0; i < pose.length; i += 2) {
    minX = Math.min(minX, pose[i]); maxX = Math.max(maxX, pose[i]);
    minY = Math.min(minY, pose[i + 1]); maxY = Math.max(maxY, pose[i + 1]);
  }
  const cx = 0.5 * (minX + maxX);
  const cy = 0.5 * (minY + maxY);
  const size = Math.hypot(maxX - minX, maxY - minY);
  const centre = (a: number, b: number) => {
    const e = entries.find((x) => x.bodyA === Math.min(a, b) && x.bodyB === Math.max(a, b));
    if (e === undefined) throw new Error(`no centre for ${a}, ${b}`);
    return homogeneous(e.centre, cx, cy, size);
  };
  let worst = 0;
  for (let i = 0; i < bodies; i++) {
    for (let j = i + 1; j < bodies; j++) {
      for (let k = j + 1; k < bodies; k++) {
        const [p, q, r] = [centre(i, j), centre(j, k), centre(i, k)];
        const det = p[0] * (q[1] * r[2] - q[2] * r[1]) - p[1] * (q[0] * r[2] - q[2] * r[0]) + p[2] * (q[0] * r[1] - q[1] * r[0]);
        worst = Math.max(worst, Math.abs(det));
      }
    }
  }
  return worst;
}

describe("Kennedy's theorem", () => {
  it('holds for random four-bars in random poses, on both assemblies', () => {
    const length = fc.double({ min: 10, max: 300, noNaN: true });
    fc.assert(
      fc.property(
        length, length, length, length,
        fc.double({ min: 0, max: 2 * Math.PI, noNaN: true }),
        fc.constantFrom(1 as const, -1 as const),
        fc.double({ min: -1000, max: 1000, noNaN: true }),
        fc.double({ min: -Math.PI, max: Math.PI, noNaN: true }),
        (ground, input, coupler, output, theta2, branch, shift, groundAngle) => {
          const m = closedFormFourBar({ ground, input, coupler, output, theta2, branch, origin: [shift, -0.5 * shift], groundAngle });
          fc.pre(m !== null);
          if (m === null) return;
          const entries = instantCentres(m.plan, m.pose, m.rates);
          expect(entries.every((e) => e.centre.kind !== 'indeterminate')).toBe(true);
          expect(worstKennedyResidual(entries, 4, m.pose)).toBeLessThan(COLLINEAR_TOL);
        },
      ),
      { numRuns: 500, seed: 1872 },
    );
  });

  it('holds with a centre at infinity (parallelogram)', () => {
    const m = [1, -1].map((b) => closedFormFourBar({ ground: 100, input: 40, coupler: 100, output: 40, theta2: 1, branch: b as 1 | -1 }))
      .find((x) => x !== null && Math.abs(x.B[1] - x.A[1]) < 1e-9);
    if (m === undefined || m === null) throw new Error('no parallelogram assembly');
    const entries = instantCentres(m.plan, m.pose, m.rates);
    expect(entries.filter((e) => e.centre.kind === 'infinite')).toHaveLength(2); // coupler–ground and input–output
    expect(worstKennedyResidual(entries, 4, m.pose)).toBeLessThan(COLLINEAR_TOL);
  });

  // Random designs of every family: each default reference pose with every position moved
  // by up to ±20 mm, compiled, then solved with rates at a driver value up to ±0.6 rad from
  // the reference. Poses the compiler rejects or that do not assemble are skipped, and so
  // are poses near a dead centre (some slot faster than 1000 linkage sizes per radian),
  // where the rates, and so the centres, are ill-conditioned.
  const families: { name: string; build: (offsets: readonly number[]) => Linkage; positions: number }[] = [
    { name: 'fourBar', build: (o) => fourBar(moved(FOUR_BAR_DEFAULT, o)), positions: Object.keys(FOUR_BAR_DEFAULT).length },
    { name: 'wattI', build: (o) => wattI(moved(WATT_I_DEFAULT, o)), positions: Object.keys(WATT_I_DEFAULT).length },
    { name: 'wattII', build: (o) => wattII(moved(WATT_II_DEFAULT, o)), positions: Object.keys(WATT_II_DEFAULT).length },
    { name: 'stephensonI', build: (o) => stephensonI(moved(STEPHENSON_I_DEFAULT, o)), positions: Object.keys(STEPHENSON_I_DEFAULT).length },
    { name: 'stephensonII', build: (o) => stephensonII(moved(STEPHENSON_II_DEFAULT, o)), positions: Object.keys(STEPHENSON_II_DEFAULT).length },
    { name: 'stephensonIII', build: (o) => stephensonIII(moved(STEPHENSON_III_DEFAULT, o)), positions: Object.keys(STEPHENSON_III_DEFAULT).length },
  ];
  for (const family of families) {
    it(`holds for random ${family.name} designs (${family.name === 'fourBar' ? 4 : 6} bodies, all pairs and triples)`, () => {
      let checked = 0;
      fc.assert(
        fc.property(
          fc.array(fc.double({ min: -20, max: 20, noNaN: true }), { minLength: 2 * family.positions, maxLength: 2 * family.positions }),
          fc.double({ min: -0.6, max: 0.6, noNaN: true }),
          (offsets, turn) => {
            const compiled = compile(family.build(offsets));
            fc.pre(compiled.ok);
            if (!compiled.ok) return;
            const plan = compiled.plan;
            const pose = Float64Array.from(plan.reference);
            const rates = new Float64Array(pose.length);
            fc.pre(runWithRates(plan, plan.driverReferenceValue + turn, pose, rates));
            const size = sizeMm(pose);
            let fastest = 0;
            for (let i = 0; i < rates.length; i += 2) fastest = Math.max(fastest, Math.hypot(rates[i], rates[i + 1]));
            fc.pre(fastest < 1000 * size);
            expect(closureResidualMm(plan, pose)).toBeLessThan(1e-9 * size);
            const entries = instantCentres(plan, pose, rates);
            expect(entries.every((e) => e.centre.kind !== 'indeterminate')).toBe(true);
            expect(worstKennedyResidual(entries, plan.bodies.length, pose)).toBeLessThan(COLLINEAR_TOL);
            checked++;
          },
        ),
        { numRuns: 150, seed: 1886 },
      );
      expect(checked).toBeGreaterThan(50);
    });
  }
});

function moved<T extends { readonly [K in keyof T]: Vec2 }>(base: T, offsets: readonly number[]): T {
  const out = { ...base } as { -readonly [K in keyof T]: Vec2 };
  (Object.keys(base) as (keyof T)[]).forEach((key, i) => {
    out[key] = { x: base[key].x + offsets[2 * i], y: base[key].y + offsets[2 * i + 1] };
  });
  return out as T;
}

function sizeMm(pose: Float64Array): number {
  let minX = Infinity, minY = Infinity, maxX = -Infinity, maxY = -Infinity;
  for (let i = 0; i < pose.length; i += 2) {
    minX = Math.min(minX, pose[i]); maxX = Math.max(maxX, pose[i]);
    minY = Math.min(minY, pose[i + 1]); maxY = Math.max(maxY, pose[i + 1]);
  }
  return Math.hypot(maxX - minX, maxY - minY);
}
