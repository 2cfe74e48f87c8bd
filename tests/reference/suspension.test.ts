/**
 * Rear-suspension metrics checked by second routes written here: the layouts solved by
 * hand (suspension-closed-form.ts), leverage ratios from instant-centre lever arms and
 * virtual work, anti-squat and anti-rise from a virtual-power balance of the forces on
 * the wheel and its body with the load-transfer formula, chain growth from integrating
 * the chain-length rate, and handbook facts.
 */
import { describe, expect, it } from 'vitest';
import { compile, run, type Linkage, type Plan } from '../../src/core/linkage';
import { IC_INFINITE } from '../../src/core/linkage/analysis';
import {
  AXLE_POINT,
  DEMO_LAYOUTS,
  DEMO_TRAIL_BIKE,
  fourBarSeatStayAxle,
  linkageDrivenSinglePivot,
  pitchRadiusMm,
  shortLinkFourBar,
  singlePivot,
  springForceN,
  stephensonSixBar,
  suspensionCurves,
  validateBicycle,
  wattSixBar,
  type Bicycle,
  type SpringSpec,
  type SuspensionReport,
  type ValidBicycle,
} from '../../src/core/suspension';
import { pitchRadius, solveAt, upperRun, velocity, type Motion, type RockerFourBar, type V } from './suspension-closed-form';

const REL = 1e-6;
const P = (p: { x: number; y: number }): V => [p.x, p.y];
const bike: ValidBicycle = (() => {
  const v = validateBicycle(DEMO_TRAIL_BIKE);
  if (!v.ok) throw new Error('demo bicycle invalid');
  return v.bicycle;
})();

function report(linkage: Linkage, bicycle: Bicycle = DEMO_TRAIL_BIKE, options = {}): SuspensionReport {
  const r = suspensionCurves(linkage, bicycle, options);
  if (!r.ok) throw new Error(r.reason);
  return r.report;
}

function expectRel(actual: number, expected: number, rel = REL): void {
  expect(Math.abs(actual - expected)).toBeLessThanOrEqual(rel * Math.max(1, Math.abs(expected)));
}

// The hand-solved form of each demo layout, and which of its bodies carries the axle.
const L = DEMO_LAYOUTS;
const handSolved: { name: string; linkage: Linkage; k: RockerFourBar; axleOn: 'rocker' | 'coupler' | 'link' }[] = [
  {
    name: 'single pivot',
    linkage: singlePivot(L.singlePivot),
    k: { R0: P(L.singlePivot.mainPivot), D0: P(L.singlePivot.shockEye), E0: P(L.singlePivot.shockEye), F: P(L.singlePivot.shockFrameEye) },
    axleOn: 'rocker',
  },
  {
    name: 'linkage-driven single pivot',
    linkage: linkageDrivenSinglePivot(L.linkageDrivenSinglePivot),
    k: {
      R0: P(L.linkageDrivenSinglePivot.rockerPivot),
      D0: P(L.linkageDrivenSinglePivot.rockerLinkPin),
      E0: P(L.linkageDrivenSinglePivot.shockEye),
      F: P(L.linkageDrivenSinglePivot.shockFrameEye),
      M: P(L.linkageDrivenSinglePivot.mainPivot),
      C0: P(L.linkageDrivenSinglePivot.armLinkPin),
    },
    axleOn: 'link',
  },
  {
    name: 'four-bar, axle on the seat stay',
    linkage: fourBarSeatStayAxle(L.fourBarSeatStayAxle),
    k: {
      R0: P(L.fourBarSeatStayAxle.rockerPivot),
      D0: P(L.fourBarSeatStayAxle.rockerStayPin),
      E0: P(L.fourBarSeatStayAxle.shockEye),
      F: P(L.fourBarSeatStayAxle.shockFrameEye),
      M: P(L.fourBarSeatStayAxle.mainPivot),
      C0: P(L.fourBarSeatStayAxle.stayPivot),
    },
    axleOn: 'coupler',
  },
  {
    name: 'short-link four-bar',
    linkage: shortLinkFourBar(L.shortLinkFourBar),
    k: {
      R0: P(L.shortLinkFourBar.upperPivot),
      D0: P(L.shortLinkFourBar.upperLinkPin),
      E0: P(L.shortLinkFourBar.shockEye),
      F: P(L.shortLinkFourBar.shockFrameEye),
      M: P(L.shortLinkFourBar.lowerPivot),
      C0: P(L.shortLinkFourBar.lowerLinkPin),
    },
    axleOn: 'coupler',
  },
];

/** Axle position and its body's motion by hand at shock length s. */
function byHand(h: (typeof handSolved)[number], s: number): { A: V; m: Motion } {
  const solved = solveAt(h.k, s);
  if (solved === null) throw new Error(`${h.name} does not assemble at ${s} mm by hand`);
  const A0 = P(DEMO_TRAIL_BIKE.rearAxleMm);
  const A = h.axleOn === 'rocker' ? solved.rocker(A0) : h.axleOn === 'coupler' ? solved.coupler(A0) : solved.link(A0);
  const m = h.axleOn === 'rocker' ? solved.rockerMotion : h.axleOn === 'coupler' ? solved.couplerMotion : solved.linkMotion;
  return { A, m };
}

/**
 * Anti-squat by a virtual-power balance: drive force 1 N at the contact patch, chain
 * tension R/r_cog along the upper run at the cog's tangent point (the wheel's moment
 * balance about the axle), the vertical ground force N that leaves the shock force
 * unchanged (zero virtual power of these forces with the wheel moving with its body),
 * over the load transfer h/L per newton of drive force.
 */
function antiSquatByPower(A: V, m: Motion, cogTeeth: number): number {
  const rc = pitchRadius(cogTeeth, bike.chainPitchMm);
  const rr = pitchRadius(bike.chainringTeeth, bike.chainPitchMm);
  const C: V = [A[0], A[1] - bike.wheelRadiusMm];
  const runLine = upperRun(A, rc, [0, 0], rr);
  const tension = bike.wheelRadiusMm / rc;
  const vC = velocity(m, C);
  const vT = velocity(m, runLine.tCog);
  const N = -(vC[0] + tension * (runLine.dir[0] * vT[0] + runLine.dir[1] * vT[1])) / vC[1];
  const wheelbase = bike.frontContactXMm - C[0];
  return (100 * N * wheelbase) / bike.comHeightMm;
}

/** Anti-rise by virtual power: braking force 1 N back at the contact patch, the wheel moving with the axle and turning at ω. */
function antiRiseByPower(A: V, vA: V, omega: number): number {
  const C: V = [A[0], A[1] - bike.wheelRadiusMm];
  const vC: V = [vA[0] - omega * (C[1] - A[1]), vA[1] + omega * (C[0] - A[0])];
  // −1·vC.x + N·vC.y = 0, against the load transfer −h/L
  const N = vC[0] / vC[1];
  const wheelbase = bike.frontContactXMm - C[0];
  return (100 * N) / (-bike.comHeightMm / wheelbase);
}

describe('ISO 606 pitch circle', () => {
  it('gives r = p / (2 sin(180°/z)) for known teeth counts', () => {
    // Source: ISO 606 pitch circle, d = p / sin(180°/z); 12.7 mm pitch, 32 teeth: d = 129.57 mm (computed here)
    expect(pitchRadiusMm(32, 12.7)).toBeCloseTo(64.785, 3);
    // from memory: ANSI No. 40 (1/2 in) sprocket tables list pitch diameters 5.101 in (32 T) and 1.618 in (10 T)
    expect((2 * pitchRadiusMm(32, 12.7)) / 25.4).toBeCloseTo(5.101, 3);
    expect((2 * pitchRadiusMm(10, 12.7)) / 25.4).toBeCloseTo(1.618, 3);
    for (const z of [9, 10, 11, 12, 18, 32, 51, 80]) expectRel(pitchRadiusMm(z, 12.7), pitchRadius(z, 12.7), 1e-14);
  });

  it('tends to the circle of circumference z·p for many teeth (theorem)', () => {
    const z = 2000;
    expectRel(pitchRadiusMm(z, 12.7), (z * 12.7) / (2 * Math.PI), 1e-6);
  });
});

describe('leverage ratio: exact rates vs instant-centre lever arms', () => {
  for (const h of handSolved) {
    it(`${h.name}: axle path and LR agree with the layout solved by hand`, () => {
      const r = report(h.linkage);
      const c = r.curves;
      for (let k = 0; k < c.steps; k++) {
        const s = c.shockLengthMm[k];
        const { A, m } = byHand(h, s);
        // theorem: position by the law of cosines and circle intersection
        expect(Math.hypot(c.axleXMm[k] - A[0], c.axleYMm[k] - A[1])).toBeLessThan(1e-9 * 1000);
        // Virtual work, F_s ds' = F_w dy: LR = dy/ds' = ω (I_x − A_x) per mm of shock shortening,
        // the wheel force's lever arm about the body's instant centre times ω (theorem)
        const vA = velocity(m, A);
        expectRel(c.leverageRatio[k], -vA[1]);
      }
    });
  }

  it('single pivot: LR is the lever-arm ratio |A_x − P_x| / (distance from the pivot to the shock line) (theorem)', () => {
    const r = report(handSolved[0].linkage);
    const c = r.curves;
    const pivot = P(L.singlePivot.mainPivot);
    const F = P(L.singlePivot.shockFrameEye);
    for (let k = 0; k < c.steps; k += 10) {
      const solved = solveAt(handSolved[0].k, c.shockLengthMm[k]);
      if (solved === null) throw new Error('no assembly');
      const E = solved.rocker(P(L.singlePivot.shockEye));
      const line: V = [F[0] - E[0], F[1] - E[1]];
      const arm = Math.abs((pivot[0] - E[0]) * line[1] - (pivot[1] - E[1]) * line[0]) / Math.hypot(...line);
      expectRel(c.leverageRatio[k], Math.abs(c.axleXMm[k] - pivot[0]) / arm);
    }
  });

  const sixBars: [string, Linkage][] = [
    ['Watt six-bar', wattSixBar(L.wattSixBar)],
    ['Stephenson six-bar (a Newton block)', stephensonSixBar(L.stephensonSixBar)],
  ];
  for (const [name, linkage] of sixBars) {
    it(`${name}: LR agrees with a Richardson-extrapolated difference of solved positions (theorem)`, () => {
      const r = report(linkage);
      const plan = compiledPlan(linkage);
      for (let k = 1; k < r.curves.steps - 1; k += 6) {
        const s = r.curves.shockLengthMm[k];
        const dy = richardson((x) => axleAt(plan, x)[1], s, 0.5);
        expectRel(r.curves.leverageRatio[k], -dy);
      }
    });
  }
});

function compiledPlan(linkage: Linkage): Plan {
  const c = compile(linkage);
  if (!c.ok) throw new Error('does not compile');
  return c.plan;
}

function slotPoint(plan: Plan, s: number, id: string): V {
  const pose = Float64Array.from(plan.reference);
  if (!run(plan, s, pose)) throw new Error(`no assembly at ${s}`);
  const i = plan.slotIndex.get(id) as number;
  return [pose[2 * i], pose[2 * i + 1]];
}

function axleAt(plan: Plan, s: number): V {
  return slotPoint(plan, s, AXLE_POINT);
}

/** d f / dx by central differences at h and h/2, Richardson-extrapolated (error O(h⁴)). */
function richardson(f: (x: number) => number, x: number, h: number): number {
  const d1 = (f(x + h) - f(x - h)) / (2 * h);
  const d2 = (f(x + h / 2) - f(x - h / 2)) / h;
  return (4 * d2 - d1) / 3;
}

describe('anti-squat: geometric construction vs force balance', () => {
  for (const h of handSolved) {
    it(`${h.name}: every cog, every step`, () => {
      const r = report(h.linkage);
      const c = r.curves;
      for (let k = 0; k < c.steps; k += 5) {
        const { A, m } = byHand(h, c.shockLengthMm[k]);
        r.cogTeeth.forEach((z, i) => {
          // Source: load transfer ΔN = m a h / L; virtual power of the forces on the wheel and its body (theorem)
          expectRel(c.antiSquatPct[i][k], antiSquatByPower(A, m, z));
        });
      }
    });
  }

  for (const [name, linkage] of [['Watt six-bar', wattSixBar(L.wattSixBar)], ['Stephenson six-bar', stephensonSixBar(L.stephensonSixBar)]] as const) {
    it(`${name}: the seat stay's motion from differences of solved positions`, () => {
      const r = report(linkage);
      const plan = compiledPlan(linkage);
      for (let k = 2; k < r.curves.steps - 2; k += 9) {
        const s = r.curves.shockLengthMm[k];
        const A = axleAt(plan, s);
        const Q = (x: number) => slotPoint(plan, x, 'rockerStayPin');
        const vA: V = [richardson((x) => axleAt(plan, x)[0], s, 0.5), richardson((x) => axleAt(plan, x)[1], s, 0.5)];
        const q = Q(s);
        const vQ: V = [richardson((x) => Q(x)[0], s, 0.5), richardson((x) => Q(x)[1], s, 0.5)];
        const d: V = [q[0] - A[0], q[1] - A[1]];
        const omega = (d[0] * (vQ[1] - vA[1]) - d[1] * (vQ[0] - vA[0])) / (d[0] * d[0] + d[1] * d[1]);
        const m: Motion = { omega, at: A, v: vA };
        r.cogTeeth.forEach((z, i) => expectRel(r.curves.antiSquatPct[i][k], antiSquatByPower(A, m, z)));
      }
    });
  }

  it('a single pivot on the chain line: the ground force must pass through the pivot, so anti-squat is 100 % exactly when that line reaches the CoM height (theorem)', () => {
    const cog = 21;
    const rc = pitchRadius(cog, 12.7);
    const rr = pitchRadius(32, 12.7);
    const A = P(DEMO_TRAIL_BIKE.rearAxleMm);
    const chain = upperRun(A, rc, [0, 0], rr);
    // The pivot on the chain line, 40 mm ahead of the chainring's tangent point.
    const pivot: V = [chain.tRing[0] + 40 * chain.dir[0], chain.tRing[1] + 40 * chain.dir[1]];
    const eye: V = [pivot[0] - 60, pivot[1] + 180];
    const layout = singlePivot({ mainPivot: { x: pivot[0], y: pivot[1] }, axle: DEMO_TRAIL_BIKE.rearAxleMm, shockEye: { x: eye[0], y: eye[1] }, shockFrameEye: { x: eye[0] + 210, y: eye[1] } });
    const C: V = [A[0], A[1] - 370];
    const front = bike.frontContactXMm;
    const lineHeight = ((pivot[1] - C[1]) / (pivot[0] - C[0])) * (front - C[0]);
    const bikeAt = (comHeightMm: number): Bicycle => ({ ...DEMO_TRAIL_BIKE, cogTeeth: [cog], comHeightMm });
    const at100 = report(layout, bikeAt(lineHeight)).curves.antiSquatPct[0][0];
    expectRel(at100, 100, 1e-9);
    const other = report(layout, bikeAt(lineHeight * 1.1)).curves.antiSquatPct[0][0];
    expectRel(other, 100 / 1.1, 1e-9);
  });

  it('a parallel four-bar (centre at infinity) gives a finite anti-squat, the limit of nearly parallel ones (theorem)', () => {
    const base = { x: 60, y: 35 };
    const link = { x: -70, y: -45 };
    const upper = { x: -5, y: 215 };
    const at = (eps: number) =>
      shortLinkFourBar({
        lowerPivot: base,
        lowerLinkPin: { x: base.x + link.x, y: base.y + link.y },
        upperPivot: upper,
        upperLinkPin: { x: upper.x + link.x * (1 + eps), y: upper.y + link.y },
        shockEye: { x: -35, y: 255 },
        shockFrameEye: { x: -35 + 210 * Math.cos(0.1), y: 255 + 210 * Math.sin(0.1) },
        axle: DEMO_TRAIL_BIKE.rearAxleMm,
      });
    const parallel = report(at(0), DEMO_TRAIL_BIKE, { steps: 5 });
    expect(Array.from(parallel.curves.icPath.kind).every((k) => k === IC_INFINITE)).toBe(true);
    const cogs = parallel.cogTeeth.length;
    for (let i = 0; i < cogs; i++) {
      for (let k = 0; k < 5; k++) expect(Number.isFinite(parallel.curves.antiSquatPct[i][k])).toBe(true);
    }
    // The translating rear triangle by hand: every point moves with the upper link's pin.
    const k: RockerFourBar = {
      R0: P(upper),
      D0: [upper.x + link.x, upper.y + link.y],
      E0: [-35, 255],
      F: [-35 + 210 * Math.cos(0.1), 255 + 210 * Math.sin(0.1)],
      M: P(base),
      C0: [base.x + link.x, base.y + link.y],
    };
    for (let step = 0; step < 5; step++) {
      const solved = solveAt(k, parallel.curves.shockLengthMm[step]);
      if (solved === null) throw new Error('no assembly');
      const A = solved.coupler(P(DEMO_TRAIL_BIKE.rearAxleMm));
      const m: Motion = { omega: 0, at: A, v: velocity(solved.rockerMotion, solved.rocker(k.D0)) };
      parallel.cogTeeth.forEach((z, i) => expectRel(parallel.curves.antiSquatPct[i][step], antiSquatByPower(A, m, z)));
    }
    const gaps = [1e-3, 1e-4, 1e-5].map((eps) => {
      const near = report(at(eps), DEMO_TRAIL_BIKE, { steps: 5 });
      return Math.max(...parallel.curves.antiSquatPct.map((curve, i) => Math.abs(curve[2] - near.curves.antiSquatPct[i][2])));
    });
    // First-order convergence: each tenfold smaller eps brings the nearly parallel value ~ten times closer.
    expect(gaps[1]).toBeLessThan(gaps[0] / 5);
    expect(gaps[2]).toBeLessThan(gaps[1] / 5);
    expect(gaps[2]).toBeLessThan(0.01);
  });
});

describe('anti-rise: construction vs force balance', () => {
  for (const h of handSolved) {
    it(`${h.name}: brake on the axle-carrying body`, () => {
      const r = report(h.linkage);
      const c = r.curves;
      for (let k = 0; k < c.steps; k += 5) {
        const { A, m } = byHand(h, c.shockLengthMm[k]);
        // Source: load transfer ΔN = −m a h / L; virtual power (theorem)
        expectRel(c.antiRisePct[k], antiRiseByPower(A, velocity(m, A), m.omega));
      }
    });
  }

  it('four-bar: a floating brake on the chain stay, the wheel turning with the chain stay', () => {
    const h = handSolved[2];
    const r = report(h.linkage, DEMO_TRAIL_BIKE, { floatingBrakeBody: 'chainStay' });
    const c = r.curves;
    const floating = c.antiRiseFloatingPct as Float64Array;
    for (let k = 0; k < c.steps; k += 5) {
      const solved = solveAt(h.k, c.shockLengthMm[k]);
      if (solved === null) throw new Error('no assembly');
      const { A, m } = byHand(h, c.shockLengthMm[k]);
      expectRel(floating[k], antiRiseByPower(A, velocity(m, A), solved.linkMotion.omega));
    }
  });

  it('a floating brake on a link pivoting at the axle: the line runs through that link’s instant centre (theorem)', () => {
    const at = { ...L.fourBarSeatStayAxle, stayPivot: DEMO_TRAIL_BIKE.rearAxleMm };
    const r = report(fourBarSeatStayAxle(at), DEMO_TRAIL_BIKE, { floatingBrakeBody: 'chainStay', steps: 3 });
    const c = r.curves;
    const main = P(at.mainPivot);
    const C: V = [c.axleXMm[0], c.axleYMm[0] - bike.wheelRadiusMm];
    const height = ((main[1] - C[1]) / (main[0] - C[0])) * (bike.frontContactXMm - C[0]);
    expectRel((c.antiRiseFloatingPct as Float64Array)[0], (100 * height) / bike.comHeightMm, 1e-9);
  });
});

describe('chain growth: tangent-plus-wrap geometry vs integrated chain-length rate', () => {
  for (const h of handSolved.slice(1, 3)) {
    it(`${h.name}: both conventions, two cogs`, () => {
      const steps = 801;
      const r = report(h.linkage, DEMO_TRAIL_BIKE, { steps });
      const c = r.curves;
      const rr = pitchRadius(bike.chainringTeeth, bike.chainPitchMm);
      for (const i of [0, r.cogTeeth.length - 1]) {
        const rc = pitchRadius(r.cogTeeth[i], bike.chainPitchMm);
        // dL/ds = −u·v_A for a cog translating without turning (the chain pulled along the run),
        // plus r_c ω for a cog turning with the body (theorem); Simpson's rule over the stroke.
        const rate = new Float64Array(steps);
        const rateTurning = new Float64Array(steps);
        for (let k = 0; k < steps; k++) {
          const { A, m } = byHand(h, c.shockLengthMm[k]);
          const vA = velocity(m, A);
          const u = upperRun(A, rc, [0, 0], rr).dir;
          rate[k] = -(u[0] * vA[0] + u[1] * vA[1]);
          rateTurning[k] = rate[k] + rc * m.omega;
        }
        const ds = c.shockLengthMm[1] - c.shockLengthMm[0];
        const simpson = (f: Float64Array) => {
          let sum = f[0] + f[steps - 1];
          for (let k = 1; k < steps - 1; k++) sum += (k % 2 === 1 ? 4 : 2) * f[k];
          return (sum * ds) / 3;
        };
        expectRel(c.chainGrowthMm[i][steps - 1], simpson(rate));
        expectRel(c.chainGrowthTurningCogMm[i][steps - 1], simpson(rateTurning));
        // Kickback: growth over the chainring's pitch radius (the convention stated).
        expectRel(c.kickbackDeg[i][steps - 1], (c.chainGrowthMm[i][steps - 1] / rr) * (180 / Math.PI), 1e-12);
      }
    });
  }
});

describe('wheel rate', () => {
  it('equals k_s / LR² where the spring force is zero (Barton and Fieldhouse)', () => {
    // Source: Barton and Fieldhouse, "Automotive Chassis Engineering", Springer, 2018, §3.9
    const r = report(handSolved[2].linkage);
    const c = r.curves;
    expectRel((c.wheelRateNPerMm as Float64Array)[0], 80 / c.leverageRatio[0] ** 2);
  });

  const springs: SpringSpec[] = [
    { kind: 'coil', rateNPerMm: 80, preloadMm: 3 },
    { kind: 'air', pressureKPa: 1400, volumeMm3: 150_000, pistonAreaMm2: 2000, gasLaw: 'adiabatic' },
  ];
  for (const spring of springs) {
    it(`${spring.kind}: the wheel rate is the slope of the wheel force F_s / LR over wheel travel, by differences of solved positions (theorem)`, () => {
      const linkage = handSolved[2].linkage;
      const r = report(linkage, { ...DEMO_TRAIL_BIKE, spring });
      const plan = compiledPlan(linkage);
      const c = r.curves;
      const lr = (s: number) => -richardson((x) => axleAt(plan, x)[1], s, 0.05);
      // Virtual work: F_w dy = F_s ds' (theorem); the spring force itself is checked against the gas laws in the unit tests.
      const wheelForce = (s: number) => springForceN(spring, 210 - s) / lr(s);
      for (let k = 3; k < c.steps - 3; k += 10) {
        const s = c.shockLengthMm[k];
        const dF = richardson(wheelForce, s, 0.5);
        const dy = richardson((x) => axleAt(plan, x)[1], s, 0.5);
        expectRel((c.wheelRateNPerMm as Float64Array)[k], dF / dy);
      }
    });
  }
});

describe('six-bars with the shock between two moving bodies and the axle on a third', () => {
  // The shock's other eye drawn at the eye-to-eye length from its eye, at angle a (rad).
  const frameEyeAt = (eye: { x: number; y: number }, a: number) => ({ x: eye.x + 210 * Math.cos(a), y: eye.y + 210 * Math.sin(a) });
  const cases: [string, Linkage][] = [
    [
      'Watt six-bar, shock from the bell crank to the rocker, axle on the seat stay',
      wattSixBar({ ...L.wattSixBar, shockFrameEye: frameEyeAt(L.wattSixBar.shockEye, Math.PI / 2), axleBody: 'seatStay', shock: { eye: 'bellCrank', frameEye: 'rocker' } }),
    ],
    [
      'Stephenson six-bar, shock from the bell crank to the chain stay, axle on the seat stay',
      stephensonSixBar({ ...L.stephensonSixBar, shockFrameEye: frameEyeAt(L.stephensonSixBar.shockEye, (5 * Math.PI) / 4), axleBody: 'seatStay', shock: { eye: 'bellCrank', frameEye: 'chainStay' } }),
    ],
  ];
  for (const [name, linkage] of cases) {
    it(`${name}: the shock's two eyes are joints of moving bodies, and the planner places them`, () => {
      const plan = compiledPlan(linkage);
      const ground = plan.linkage.joints.filter((j) => j.ground === true).map((j) => j.id);
      expect(ground).not.toContain('shockEye');
      expect(ground).not.toContain('shockFrameEye');
      // Source: the driver's definition — at every step of the sweep the two eyes sit at the shock length (theorem)
      const r = report(linkage);
      for (let k = 0; k < r.curves.steps; k += 7) {
        const s = r.curves.shockLengthMm[k];
        const e = slotPoint(plan, s, 'shockEye');
        const f = slotPoint(plan, s, 'shockFrameEye');
        expectRel(Math.hypot(e[0] - f[0], e[1] - f[1]), s);
      }
    });

    it(`${name}: LR, anti-squat and anti-rise agree with the seat stay's motion from differences of solved positions (virtual work)`, () => {
      const r = report(linkage);
      const plan = compiledPlan(linkage);
      for (let k = 2; k < r.curves.steps - 2; k += 9) {
        const s = r.curves.shockLengthMm[k];
        const A = axleAt(plan, s);
        const Q = (x: number) => slotPoint(plan, x, 'rockerStayPin');
        const vA: V = [richardson((x) => axleAt(plan, x)[0], s, 0.5), richardson((x) => axleAt(plan, x)[1], s, 0.5)];
        // Source: virtual work, shock force × shortening = wheel force × rise, so LR = −dy_A/ds (theorem)
        expectRel(r.curves.leverageRatio[k], -vA[1]);
        const q = Q(s);
        const vQ: V = [richardson((x) => Q(x)[0], s, 0.5), richardson((x) => Q(x)[1], s, 0.5)];
        const d: V = [q[0] - A[0], q[1] - A[1]];
        const omega = (d[0] * (vQ[1] - vA[1]) - d[1] * (vQ[0] - vA[0])) / (d[0] * d[0] + d[1] * d[1]);
        const m: Motion = { omega, at: A, v: vA };
        // Source: load transfer ΔN = ±m a h / L; virtual power of the forces on the wheel and its body (theorem)
        r.cogTeeth.forEach((z, i) => expectRel(r.curves.antiSquatPct[i][k], antiSquatByPower(A, m, z)));
        expectRel(r.curves.antiRisePct[k], antiRiseByPower(A, vA, omega));
      }
    });
  }
});
