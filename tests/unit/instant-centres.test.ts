import { describe, expect, it } from 'vitest';
import {
  IC_FINITE,
  IC_UNASSEMBLED,
  bodyMotion,
  instantCentre,
  instantCentrePath,
  instantCentres,
} from '../../src/core/linkage/analysis';
import { compile } from '../../src/core/linkage/compile';
import type { Linkage } from '../../src/core/linkage/model';
import { runWithRates } from '../../src/core/linkage/run';
import { sweep } from '../../src/core/linkage/sweep';
import {
  COUPLER_BODY,
  GROUND_BODY,
  INPUT_BODY,
  OUTPUT_BODY,
  closedFormFourBar,
  lineIntersection,
  type ClosedFormFourBar,
  type ClosedFormFourBarInput,
  type Vec,
} from '../support/closedFormFourBar';

function solved(k: ClosedFormFourBarInput): ClosedFormFourBar {
  const m = closedFormFourBar(k);
  if (m === null) throw new Error(`test four-bar does not assemble: ${JSON.stringify(k)}`);
  return m;
}

function expectFiniteAt(c: ReturnType<typeof instantCentre>, at: Vec, tolMm: number): void {
  expect(c.kind).toBe('finite');
  if (c.kind !== 'finite') return;
  expect(Math.hypot(c.x - at[0], c.y - at[1])).toBeLessThan(tolMm);
}

// Crank-rocker, double crank, double rocker, triple rocker: (ground, input, coupler, output).
const designs: [number, number, number, number][] = [
  [100, 40, 120, 80],
  [40, 100, 120, 80],
  [100, 120, 40, 80],
  [100, 60, 50, 80],
];

describe('instant centres of a four-bar', () => {
  it("the coupler's centre relative to ground is where the two crank lines cross (theorem)", () => {
    let checked = 0;
    for (const [ground, input, coupler, output] of designs) {
      for (let i = 0; i < 24; i++) {
        for (const branch of [1, -1] as const) {
          const m = closedFormFourBar({ ground, input, coupler, output, theta2: (i * 2 * Math.PI) / 24 + 0.1, branch, origin: [30, -20], groundAngle: 0.4 });
          if (m === null) continue;
          const at = lineIntersection(m.A0, [m.A[0] - m.A0[0], m.A[1] - m.A0[1]], m.B0, [m.B[0] - m.B0[0], m.B[1] - m.B0[1]], 1e-3);
          if (at === null || Math.hypot(at[0], at[1]) > 1e5) continue; // nearly parallel cranks: see the parallelogram case
          expectFiniteAt(instantCentre(m.plan, COUPLER_BODY, GROUND_BODY, m.pose, m.rates), at, 1e-9 * Math.max(1, Math.hypot(...at)));
          checked++;
        }
      }
    }
    expect(checked).toBeGreaterThan(100);
  });

  it('a ground-pivoted link turns about its pivot, and two bodies on a pin about that pin (theorem)', () => {
    const m = solved({ ground: 100, input: 40, coupler: 120, output: 80, theta2: 1.1, branch: 1, origin: [-250, 400], groundAngle: -0.7 });
    expectFiniteAt(instantCentre(m.plan, 'input', 'ground', m.pose, m.rates), m.A0, 1e-9);
    expectFiniteAt(instantCentre(m.plan, 'output', 'ground', m.pose, m.rates), m.B0, 1e-9);
    expectFiniteAt(instantCentre(m.plan, 'input', 'coupler', m.pose, m.rates), m.A, 1e-9);
    expectFiniteAt(instantCentre(m.plan, 'coupler', 'output', m.pose, m.rates), m.B, 1e-9);
    // the centre of A relative to B is the centre of B relative to A
    expect(instantCentre(m.plan, GROUND_BODY, OUTPUT_BODY, m.pose, m.rates)).toEqual(
      instantCentre(m.plan, OUTPUT_BODY, GROUND_BODY, m.pose, m.rates),
    );
  });

  it('input along the ground line: coupler and output move as one for an instant, and their centre is still their pin', () => {
    // Fixture from a Kennedy property-test failure: at θ2 = 0 both crank lines pass
    // through B0, so the coupler turns about B0 exactly as the output does (theorem).
    const m = solved({ ground: 10, input: 46.4, coupler: 11.6, output: 27.3, theta2: 2 * Math.PI, branch: 1, groundAngle: Math.PI });
    expectFiniteAt(instantCentre(m.plan, COUPLER_BODY, OUTPUT_BODY, m.pose, m.rates), m.B, 1e-12);
    expectFiniteAt(instantCentre(m.plan, COUPLER_BODY, GROUND_BODY, m.pose, m.rates), m.B0, 1e-9);
    const c = bodyMotion(m.plan, COUPLER_BODY, m.pose, m.rates);
    const o = bodyMotion(m.plan, OUTPUT_BODY, m.pose, m.rates);
    expect(Math.abs(c.omega - o.omega)).toBeLessThan(1e-12);
  });

  it("a parallelogram's coupler translates: its centre is at infinity along the cranks (theorem)", () => {
    for (const theta2 of [0.3, 1.2, 2.5, 4.0]) {
      // of the two assemblies, the parallelogram is the one with B − A = B0 − A0
      const m = [1, -1].map((branch) => solved({ ground: 100, input: 40, coupler: 100, output: 40, theta2, branch: branch as 1 | -1, groundAngle: 0.2 }))
        .find((x) => Math.hypot(x.B[0] - x.A[0] - (x.B0[0] - x.A0[0]), x.B[1] - x.A[1] - (x.B0[1] - x.A0[1])) < 1e-9);
      expect(m).toBeDefined();
      if (m === undefined) continue;
      const c = instantCentre(m.plan, COUPLER_BODY, GROUND_BODY, m.pose, m.rates);
      expect(c.kind).toBe('infinite');
      if (c.kind !== 'infinite') continue;
      expect(Math.hypot(c.dx, c.dy)).toBeCloseTo(1, 12);
      const crank = [(m.A[0] - m.A0[0]) / 40, (m.A[1] - m.A0[1]) / 40];
      expect(Math.abs(c.dx * crank[1] - c.dy * crank[0])).toBeLessThan(1e-12);
    }
  });

  it('the crossed assembly of the same lengths (antiparallelogram) has a finite coupler centre at the crossing of the cranks (theorem)', () => {
    const m = [1, -1].map((branch) => solved({ ground: 100, input: 40, coupler: 100, output: 40, theta2: 1.2, branch: branch as 1 | -1 }))
      .find((x) => Math.hypot(x.B[0] - x.A[0] - 100, x.B[1] - x.A[1]) > 1);
    if (m === undefined) throw new Error('no crossed assembly');
    const at = lineIntersection(m.A0, [m.A[0] - m.A0[0], m.A[1] - m.A0[1]], m.B0, [m.B[0] - m.B0[0], m.B[1] - m.B0[1]]);
    if (at === null) throw new Error('cranks parallel');
    expectFiniteAt(instantCentre(m.plan, COUPLER_BODY, GROUND_BODY, m.pose, m.rates), at, 1e-9);
  });

  it('a near-parallelogram keeps a finite, far centre until it is within the named tolerance of a translation', () => {
    const near = (eps: number) =>
      [1, -1].map((branch) => solved({ ground: 100, input: 40, coupler: 100 * (1 + eps), output: 40, theta2: 1.2, branch: branch as 1 | -1 }))
        .find((x) => Math.abs(x.B[1] - x.A[1]) < 1);
    const far = near(1e-6);
    if (far === undefined) throw new Error('no open assembly');
    const at = lineIntersection(far.A0, [far.A[0] - far.A0[0], far.A[1] - far.A0[1]], far.B0, [far.B[0] - far.B0[0], far.B[1] - far.B0[1]], 0);
    if (at === null) throw new Error('cranks parallel');
    const c = instantCentre(far.plan, COUPLER_BODY, GROUND_BODY, far.pose, far.rates);
    expect(c.kind).toBe('finite');
    if (c.kind === 'finite') expect(Math.hypot(c.x - at[0], c.y - at[1]) / Math.hypot(...at)).toBeLessThan(1e-6);
    const almost = near(1e-13);
    if (almost === undefined) throw new Error('no open assembly');
    expect(instantCentre(almost.plan, COUPLER_BODY, GROUND_BODY, almost.pose, almost.rates).kind).toBe('infinite');
  });

  it('moves with the linkage when the whole linkage is moved and turned (invariance)', () => {
    const base = { ground: 100, input: 40, coupler: 120, output: 80, theta2: 0.8, branch: 1 as const };
    const m0 = solved(base);
    const m1 = solved({ ...base, origin: [1000, -3000], groundAngle: 2.1 });
    const c0 = instantCentre(m0.plan, COUPLER_BODY, GROUND_BODY, m0.pose, m0.rates);
    const c1 = instantCentre(m1.plan, COUPLER_BODY, GROUND_BODY, m1.pose, m1.rates);
    if (c0.kind !== 'finite' || c1.kind !== 'finite') throw new Error('expected finite centres');
    const moved: Vec = [1000 + c0.x * Math.cos(2.1) - c0.y * Math.sin(2.1), -3000 + c0.x * Math.sin(2.1) + c0.y * Math.cos(2.1)];
    expect(Math.hypot(c1.x - moved[0], c1.y - moved[1])).toBeLessThan(1e-8);
  });

  it('bodyMotion gives the velocity field v(X) = v0 + ω × X of each body', () => {
    const m = solved({ ground: 100, input: 40, coupler: 120, output: 80, theta2: 2.0, branch: -1, origin: [12, 34] });
    const input = bodyMotion(m.plan, INPUT_BODY, m.pose, m.rates);
    expect(input.omega).toBeCloseTo(1, 12); // the input turns one radian per radian of driver
    // v(A0) = 0 for the pivoted input
    expect(input.vx0 - input.omega * m.A0[1]).toBeCloseTo(0, 10);
    expect(input.vy0 + input.omega * m.A0[0]).toBeCloseTo(0, 10);
    // the coupler's field reproduces the hand-differentiated velocity of its point P
    const c = bodyMotion(m.plan, 'coupler', m.pose, m.rates);
    expect(c.vx0 - c.omega * m.P[1]).toBeCloseTo(m.rates[8], 10);
    expect(c.vy0 + c.omega * m.P[0]).toBeCloseTo(m.rates[9], 10);
    expect(bodyMotion(m.plan, GROUND_BODY, m.pose, m.rates)).toEqual({ omega: 0, vx0: 0, vy0: 0 });
  });

  it('lists all n(n − 1)/2 centres of n bodies (Kennedy; theorem)', () => {
    const m = solved({ ground: 100, input: 40, coupler: 120, output: 80, theta2: 0.5, branch: 1 });
    const all = instantCentres(m.plan, m.pose, m.rates);
    expect(all).toHaveLength(6);
    expect(all.every((e) => e.centre.kind === 'finite')).toBe(true);
  });

  it('follows a sweep, marking the steps that did not assemble', () => {
    const thetas = [0.2, 0.9, 1.6, 2.3];
    const stride = 10;
    const poses = new Float64Array(thetas.length * stride).fill(Number.NaN);
    const rates = new Float64Array(thetas.length * stride).fill(Number.NaN);
    const assembled = new Uint8Array(thetas.length);
    let plan: ClosedFormFourBar['plan'] | null = null;
    thetas.forEach((theta2, k) => {
      if (k === 2) return; // pretend this step locked
      const m = solved({ ground: 100, input: 40, coupler: 120, output: 80, theta2, branch: 1 });
      plan = m.plan;
      poses.set(m.pose, k * stride);
      rates.set(m.rates, k * stride);
      assembled[k] = 1;
    });
    if (plan === null) throw new Error('no plan');
    const path = instantCentrePath(plan, 'coupler', 'ground', { values: Float64Array.from(thetas), poses, rates, assembled });
    expect(Array.from(path.kind)).toEqual([IC_FINITE, IC_FINITE, IC_UNASSEMBLED, IC_FINITE]);
    expect(Number.isNaN(path.x[2])).toBe(true);
    const m3 = solved({ ground: 100, input: 40, coupler: 120, output: 80, theta2: thetas[3], branch: 1 });
    const c3 = instantCentre(m3.plan, 'coupler', 'ground', m3.pose, m3.rates);
    if (c3.kind !== 'finite') throw new Error('expected a finite centre');
    expect(path.x[3]).toBe(c3.x);
    expect(path.y[3]).toBe(c3.y);
  });

  it('says what was wrong with a bad body or pose', () => {
    const m = solved({ ground: 100, input: 40, coupler: 120, output: 80, theta2: 0.5, branch: 1 });
    expect(() => instantCentre(m.plan, 'rocker', 'ground', m.pose, m.rates)).toThrow(/no body "rocker"; expected one of ground, input, coupler, output/);
    expect(() => instantCentre(m.plan, 7, 0, m.pose, m.rates)).toThrow(/body index 7/);
    expect(() => bodyMotion(m.plan, 1, m.pose.subarray(0, 6), m.rates)).toThrow(/pose has 6/);
  });
});

describe('instant centres through compile, runWithRates and sweep', () => {
  // A crank-rocker (ground 100, input 40) drawn in its reference pose.
  const linkage: Linkage = {
    joints: [
      { id: 'O2', x: 10, y: 20, ground: true },
      { id: 'A', x: 10 + 40 * Math.cos(1), y: 20 + 40 * Math.sin(1) },
      { id: 'B', x: 100, y: 90 },
      { id: 'O4', x: 110, y: 20, ground: true },
    ],
    bodies: [
      { id: 'crank', joints: ['O2', 'A'] },
      { id: 'coupler', joints: ['A', 'B'] },
      { id: 'rocker', joints: ['B', 'O4'] },
    ],
    points: [{ id: 'P', body: 'coupler', x: 60, y: 120 }],
    driver: { kind: 'rotation', body: 'crank', pivot: 'O2', tip: 'A' },
  };
  const compiled = compile(linkage);
  if (!compiled.ok) throw new Error(JSON.stringify(compiled.issues));
  const plan = compiled.plan;
  const at = (pose: Float64Array, id: string): Vec => {
    const s = plan.slotIndex.get(id) ?? -1;
    return [pose[2 * s], pose[2 * s + 1]];
  };

  it("the coupler's centre is where the crank and rocker lines cross, over a full turn (theorem)", () => {
    const pose = Float64Array.from(plan.reference);
    const rates = new Float64Array(pose.length);
    for (let k = 0; k < 72; k++) {
      const theta = (k * 2 * Math.PI) / 72;
      expect(runWithRates(plan, theta, pose, rates)).toBe(true);
      const [O2, A, B, O4] = ['O2', 'A', 'B', 'O4'].map((id) => at(pose, id));
      const cross = lineIntersection(O2, [A[0] - O2[0], A[1] - O2[1]], O4, [B[0] - O4[0], B[1] - O4[1]], 1e-3);
      if (cross === null || Math.hypot(...cross) > 1e5) continue;
      expectFiniteAt(instantCentre(plan, 'coupler', 'ground', pose, rates), cross, 1e-9 * Math.max(1, Math.hypot(...cross)));
      expectFiniteAt(instantCentre(plan, 'crank', 'ground', pose, rates), O2, 1e-12);
    }
  });

  it('instantCentrePath over a sweep agrees with instantCentre at each step', () => {
    const result = sweep(plan, { from: 0, to: 2 * Math.PI, steps: 37 });
    const path = instantCentrePath(plan, 'coupler', 'ground', result);
    const stride = 2 * plan.slotCount;
    for (let k = 0; k < 37; k++) {
      expect(path.kind[k]).toBe(IC_FINITE);
      const c = instantCentre(plan, 'coupler', 'ground', result.poses.slice(k * stride, (k + 1) * stride), result.rates.slice(k * stride, (k + 1) * stride));
      if (c.kind !== 'finite') throw new Error('expected a finite centre');
      expect(path.x[k]).toBe(c.x);
      expect(path.y[k]).toBe(c.y);
    }
  });
});
