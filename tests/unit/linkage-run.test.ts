import { describe, expect, it } from 'vitest';
import { circleCircleIntersect, distance, vec2, type Vec2 } from '../../src/core/geometry';
import {
  STEPHENSON_III_DEFAULT,
  closureResidualMm,
  compile,
  fourBar,
  run,
  runWithRates,
  setReferencePose,
  sliderCrank,
  stephensonI,
  stephensonII,
  stephensonIII,
  sweep,
  wattI,
  wattII,
  type Linkage,
  type Plan,
} from '../../src/core/linkage';
import type { PlanInternal } from '../../src/core/linkage/plan';
import { runSized } from '../../src/core/linkage/run';

function compiled(linkage: Linkage): Plan {
  const result = compile(linkage);
  if (!result.ok) throw new Error(`compile failed: ${JSON.stringify(result.issues)}`);
  return result.plan;
}

function at(plan: Plan, pose: Float64Array, id: string): Vec2 {
  const s = plan.slotIndex.get(id);
  if (s === undefined) throw new Error(`no slot ${id}`);
  return { x: pose[2 * s], y: pose[2 * s + 1] };
}

function poseAt(plan: Plan, poses: Float64Array, k: number): Float64Array {
  const stride = 2 * plan.slotCount;
  return poses.subarray(k * stride, (k + 1) * stride);
}

/** Every family, a slider on a moving body, an oscillating guide (a slider block of one joint) and a length-driven rocker. */
function allLinkages(): [string, Linkage][] {
  return [
    ['fourBar', fourBar()],
    ['sliderCrank', sliderCrank()],
    ['wattI', wattI()],
    ['wattII', wattII()],
    ['stephensonI', stephensonI()],
    ['stephensonII', stephensonII()],
    ['stephensonIII', stephensonIII()],
    ['slotted crank', slottedCrank()],
    ['oscillating guide', oscillatingGuide()],
    ['shock-driven rocker', shockRocker()],
  ];
}

/** A joint J sliding in a slot along the crank, held by a link to B0: a circle–line dyad on a moving body. */
function slottedCrank(): Linkage {
  return {
    joints: [
      { id: 'A0', x: 0, y: 0, ground: true },
      { id: 'B0', x: 60, y: -20, ground: true },
      { id: 'A', x: 30, y: 10 },
      { id: 'J', x: 60, y: 20 },
    ],
    bodies: [
      { id: 'crank', joints: ['A0', 'A'] },
      { id: 'link', joints: ['B0', 'J'] },
    ],
    sliders: [{ joint: 'J', body: 'crank', angle: Math.atan2(20, 60) }],
    points: [{ id: 'P', body: 'link', x: 70, y: 0 }],
    driver: { kind: 'rotation', body: 'crank', pivot: 'A0', tip: 'A' },
  };
}

/** Crank pin A slides along a guide pivoted at C0 (the guide carries a second joint G): one Newton unknown. */
function oscillatingGuide(): Linkage {
  return {
    joints: [
      { id: 'A0', x: 0, y: 0, ground: true },
      { id: 'C0', x: 100, y: 0, ground: true },
      { id: 'A', x: 24, y: 32 },
      { id: 'G', x: 100 - 38, y: 16 },
    ],
    bodies: [
      { id: 'crank', joints: ['A0', 'A'] },
      { id: 'guide', joints: ['C0', 'G'] },
    ],
    sliders: [{ joint: 'A', body: 'guide', angle: Math.atan2(32, 24 - 100) }],
    points: [{ id: 'P', body: 'guide', x: 40, y: 40 }],
    driver: { kind: 'rotation', body: 'crank', pivot: 'A0', tip: 'A' },
  };
}

/** A rocker moved by a shock absorber between the frame and its tip: a length driver in a dyad. */
function shockRocker(): Linkage {
  return {
    joints: [
      { id: 'R0', x: 0, y: 0, ground: true },
      { id: 'S0', x: 90, y: -10, ground: true },
      { id: 'S', x: 30, y: 40 },
    ],
    bodies: [{ id: 'rocker', joints: ['R0', 'S'] }],
    points: [{ id: 'P', body: 'rocker', x: -40, y: 30 }],
    driver: { kind: 'length', from: 'S0', to: 'S' },
  };
}

describe('run: Freudenstein’s equation holds at solved four-bar poses', () => {
  // Freudenstein, "Approximate synthesis of four-bar linkages", Trans. ASME 77, 1955 (form
  // from memory, tests/reference/data/README.md): input a = |A0A|, coupler b = |AB|,
  // output c = |B0B|, ground d = |A0B0|, K1 = d/a, K2 = d/c, K3 = (a² − b² + c² + d²)/(2ac):
  //   K1 cos θ4 − K2 cos θ2 + K3 = cos(θ2 − θ4).
  // Sign convention: the ground runs from the crank pivot A0 to the rocker pivot B0, and θ2
  // (crank A0→A) and θ4 (rocker B0→B) are measured counter-clockwise from that direction.
  const cases: [string, Record<'A0' | 'B0' | 'A' | 'B', Vec2>][] = [
    ['crank-rocker, ground along +x', { A0: vec2(0, 0), B0: vec2(100, 0), A: vec2(24, 32), B: vec2(120, 77) }],
    ['crank-rocker, crossed branch', { A0: vec2(0, 0), B0: vec2(100, 0), A: vec2(24, 32), B: vec2(120, -77) }],
    ['double crank, tilted ground', { A0: vec2(10, 5), B0: vec2(40, 45), A: vec2(80, 40), B: vec2(130, 60) }],
    ['triple rocker (non-Grashof)', { A0: vec2(-50, 20), B0: vec2(50, 20), A: vec2(-40, 80), B: vec2(30, 95) }],
  ];
  /** The residual of Freudenstein's equation at a solved pose of the four-bar `at0`. */
  function freudensteinResidual(at0: Record<'A0' | 'B0' | 'A' | 'B', Vec2>, plan: Plan, pose: Float64Array): number {
    const a = distance(at0.A0, at0.A);
    const b = distance(at0.A, at0.B);
    const c = distance(at0.B0, at0.B);
    const d = distance(at0.A0, at0.B0);
    const groundAngle = Math.atan2(at0.B0.y - at0.A0.y, at0.B0.x - at0.A0.x);
    const K3 = (a * a - b * b + c * c + d * d) / (2 * a * c);
    const A = at(plan, pose, 'A');
    const B = at(plan, pose, 'B');
    const theta2 = Math.atan2(A.y - at0.A0.y, A.x - at0.A0.x) - groundAngle;
    const theta4 = Math.atan2(B.y - at0.B0.y, B.x - at0.B0.x) - groundAngle;
    return (d / a) * Math.cos(theta4) - (d / c) * Math.cos(theta2) + K3 - Math.cos(theta2 - theta4);
  }
  it.each(cases)('%s', (_name, at0) => {
    const plan = compiled(fourBar({ ...at0, P: vec2(0, 0) }));
    const s = sweep(plan, { from: 0, to: 2 * Math.PI, steps: 241 });
    let checked = 0;
    for (let k = 0; k < s.values.length; k++) {
      if (s.assembled[k] === 0) continue;
      expect(Math.abs(freudensteinResidual(at0, plan, poseAt(plan, s.poses, k)))).toBeLessThan(1e-12);
      checked++;
    }
    expect(checked).toBeGreaterThan(40);
  });
  it.each(cases)('%s, through runSized (the hot loops\' entry, which skips the check of the pose\'s length)', (_name, at0) => {
    const plan = compiled(fourBar({ ...at0, P: vec2(0, 0) }));
    const pose = Float64Array.from(plan.reference);
    let checked = 0;
    for (let k = 0; k < 241; k++) {
      if (!runSized(plan, plan.driverReferenceValue + (2 * Math.PI * k) / 240, pose)) continue;
      expect(Math.abs(freudensteinResidual(at0, plan, pose))).toBeLessThan(1e-12);
      checked++;
    }
    expect(checked).toBeGreaterThan(40);
  });
});

describe('run: exact and near straight lines', () => {
  it('the Peaucellier–Lipkin cell traces a straight line (theorem: inversion maps a circle through the centre to a line)', () => {
    // Crank QC turns C on a circle of radius r through the inversion centre O; arms |OA| =
    // |OB| = L, rhombus side s: |OC| |OP| = L² − s², so P stays on the line x = (L² − s²)/(2r).
    const r = 30;
    const L = 100;
    const s = 70;
    const O = vec2(0, 0);
    const Q = vec2(r, 0);
    const phi = Math.PI / 6;
    const C = vec2(r + r * Math.cos(phi), r * Math.sin(phi));
    const A = circleCircleIntersect(O, L, C, s, 1);
    const B = circleCircleIntersect(O, L, C, s, -1);
    if (A === null || B === null) throw new Error('bad reference');
    // P: the rhombus vertex opposite C, the intersection of the circles about A and B that is not C.
    const P1 = circleCircleIntersect(A, s, B, s, 1);
    const P2 = circleCircleIntersect(A, s, B, s, -1);
    if (P1 === null || P2 === null) throw new Error('bad reference');
    const P = distance(P1, C) > distance(P2, C) ? P1 : P2;
    const cell: Linkage = {
      joints: [
        { id: 'O', ...O, ground: true },
        { id: 'Q', ...Q, ground: true },
        { id: 'C', ...C },
        { id: 'A', ...A },
        { id: 'B', ...B },
        { id: 'P', ...P },
      ],
      bodies: [
        { id: 'crank', joints: ['Q', 'C'] },
        { id: 'armA', joints: ['O', 'A'] },
        { id: 'armB', joints: ['O', 'B'] },
        { id: 'AC', joints: ['A', 'C'] },
        { id: 'CB', joints: ['C', 'B'] },
        { id: 'AP', joints: ['A', 'P'] },
        { id: 'BP', joints: ['B', 'P'] },
      ],
      driver: { kind: 'rotation', body: 'crank', pivot: 'Q', tip: 'C' },
    };
    const plan = compiled(cell);
    expect(plan.bodies.length).toBe(8);
    expect(plan.newtonUnknowns).toBe(0);
    const lineX = (L * L - s * s) / (2 * r);
    // |OC| = 2r cos(φ/2) must exceed L − s: |φ| < 2 acos((L − s)/2r) ≈ 120°; sweep ±110°.
    const range = sweep(plan, { from: (-110 * Math.PI) / 180, to: (110 * Math.PI) / 180, steps: 221 });
    expect(range.assembled.every((f) => f === 1)).toBe(true);
    let worst = 0;
    let spanY = 0;
    for (let k = 0; k < range.values.length; k++) {
      const p = at(plan, poseAt(plan, range.poses, k), 'P');
      worst = Math.max(worst, Math.abs(p.x - lineX) / lineX);
      spanY = Math.max(spanY, Math.abs(p.y));
    }
    expect(worst).toBeLessThan(1e-9);
    expect(spanY).toBeGreaterThan(100);
  });

  it('the Chebyshev–Hoeken four-bar: (−2, 4) at 0, speed 4/3, (−2, 2√6) at 180°, and a straightness bound', () => {
    // Proportions and values from tests/reference/data/README.md (from memory; the
    // values at 0 and 180° are theorems from the proportions): crank 1 about (0, 0),
    // rocker 2.5 about (−2, 0), coupler 2.5 from crank pin to rocker joint, tracing point
    // 5 from the crank pin on the coupler extended.
    const plan = compiled(fourBar({ A0: vec2(0, 0), B0: vec2(-2, 0), A: vec2(1, 0), B: vec2(-0.5, 2), P: vec2(-2, 4) }));
    const pose = Float64Array.from(plan.reference);
    const rates = new Float64Array(pose.length);
    expect(runWithRates(plan, 0, pose, rates)).toBe(true);
    const p0 = at(plan, pose, 'P');
    expect(p0.x).toBeCloseTo(-2, 14);
    expect(p0.y).toBeCloseTo(4, 14);
    const v0 = at(plan, rates, 'P');
    expect(Math.hypot(v0.x, v0.y)).toBeCloseTo(4 / 3, 13);
    expect(v0.y).toBeCloseTo(0, 13);
    expect(run(plan, Math.PI, pose)).toBe(true);
    const p180 = at(plan, pose, 'P');
    expect(p180.x).toBeCloseTo(-2, 13);
    expect(p180.y).toBeCloseTo(2 * Math.sqrt(6), 13);
    // Straightness, computed here (not a published figure): over crank angles −90°…+90°
    // (half a turn) P runs from x = −4 to x = 0 and stays within 0.00976 crank radii of
    // y = 4 (0.24 % of that 4-radius stroke); over ±120° the deviation grows to 0.062.
    const half = sweep(plan, { from: -Math.PI / 2, to: Math.PI / 2, steps: 2001 });
    let deviation = 0;
    for (let k = 0; k < half.values.length; k++) deviation = Math.max(deviation, Math.abs(at(plan, poseAt(plan, half.poses, k), 'P').y - 4));
    expect(deviation).toBeLessThan(0.00976);
    expect(deviation).toBeGreaterThan(0.0097);
    const wide = sweep(plan, { from: (-2 * Math.PI) / 3, to: (2 * Math.PI) / 3, steps: 2001 });
    let wideDeviation = 0;
    for (let k = 0; k < wide.values.length; k++) wideDeviation = Math.max(wideDeviation, Math.abs(at(plan, poseAt(plan, wide.poses, k), 'P').y - 4));
    expect(wideDeviation).toBeGreaterThan(0.06);
  });

  it('the offset slider-crank: x_B = a cos θ + √(b² − (a sin θ − e)²) (theorem: Pythagoras on the rod)', () => {
    const plan = compiled(sliderCrank());
    const a = 50;
    const b = Math.hypot(140, 30);
    const e = 10;
    const s = sweep(plan, { from: 0, to: 2 * Math.PI, steps: 181 });
    expect(s.fullTurn).toBe(true);
    for (let k = 0; k < s.values.length; k++) {
      const theta = s.values[k] + Math.atan2(40, 30) - plan.driverReferenceValue;
      const B = at(plan, poseAt(plan, s.poses, k), 'B');
      expect(B.y).toBeCloseTo(e, 12);
      expect(B.x).toBeCloseTo(a * Math.cos(theta) + Math.sqrt(b * b - (a * Math.sin(theta) - e) ** 2), 11);
    }
  });
});

describe('run: the Newton block and the dyad plan agree', () => {
  it('Stephenson III solved from its input (Newton) equals the same pose solved from a rocker (dyads) and by circle–circle placement', () => {
    const linkage = stephensonIII();
    const newtonPlan = compiled(linkage);
    const dyadPlan = compiled({ ...linkage, driver: { kind: 'rotation', body: 'rockerA', pivot: 'A0', tip: 'A' } });
    expect(newtonPlan.newtonUnknowns).toBe(6);
    expect(dyadPlan.newtonUnknowns).toBe(0);
    const ref = (id: string) => at(newtonPlan, newtonPlan.reference, id);
    const side = (p: Vec2, q: Vec2, r: Vec2) => Math.sign((q.x - p.x) * (r.y - p.y) - (q.y - p.y) * (r.x - p.x));
    const coupler = distance(ref('A'), ref('B'));
    const rockerB = distance(ref('B0'), ref('B'));
    // The dyad plan places B from A and B0, D from C and C0, each on its reference side.
    const sideB = side(ref('A'), ref('B0'), ref('B'));
    const sideD = side(ref('C'), ref('C0'), ref('D'));
    const s = sweep(newtonPlan, { from: newtonPlan.driverReferenceValue, to: newtonPlan.driverReferenceValue + 2 * Math.PI, steps: 181 });
    expect(s.fullTurn).toBe(true);
    const pose = Float64Array.from(dyadPlan.reference);
    let compared = 0;
    for (let k = 0; k < s.values.length; k++) {
      const solved = poseAt(newtonPlan, s.poses, k);
      const p = (id: string) => at(newtonPlan, solved, id);
      // Where input and connector have passed their line, the rocker-driven linkage is on
      // its other branch of D (the input is a crank; from the rocker side it toggles).
      if (side(p('C'), p('C0'), p('D')) !== sideD) continue;
      expect(run(dyadPlan, Math.atan2(p('A').y - p('A0').y, p('A').x - p('A0').x), pose)).toBe(true);
      for (let i = 0; i < pose.length; i++) expect(Math.abs(pose[i] - solved[i])).toBeLessThan(1e-9);
      const B = circleCircleIntersect(p('A'), coupler, p('B0'), rockerB, sideB as 1 | -1);
      expect(B).not.toBeNull();
      if (B !== null) expect(distance(B, p('B'))).toBeLessThan(1e-9);
      compared++;
    }
    expect(compared).toBeGreaterThan(40);
  });

  it('a Newton sweep tracks its branch round a full turn and comes back to its start pose', () => {
    for (const linkage of [stephensonII(), stephensonIII()]) {
      const plan = compiled(linkage);
      const v0 = plan.driverReferenceValue;
      const s = sweep(plan, { from: v0, to: v0 + 2 * Math.PI, steps: 361 });
      expect(s.fullTurn).toBe(true);
      const first = poseAt(plan, s.poses, 0);
      const last = poseAt(plan, s.poses, 360);
      for (let i = 0; i < first.length; i++) {
        expect(Math.abs(last[i] - first[i])).toBeLessThan(1e-9);
        expect(Math.abs(first[i] - plan.reference[i])).toBeLessThan(1e-9);
      }
    }
  });
});

describe('runWithRates: exact rates agree with central finite differences', () => {
  it.each(allLinkages())('%s', (_name, linkage) => {
    const plan = compiled(linkage);
    const isLength = linkage.driver.kind === 'length';
    const v0 = plan.driverReferenceValue;
    const h = isLength ? 1e-5 : 1e-6;
    const span = isLength ? 10 : Math.PI;
    const s = sweep(plan, { from: v0 - span, to: v0 + span, steps: 61 });
    const pose = new Float64Array(2 * plan.slotCount);
    const rates = new Float64Array(pose.length);
    const plus = new Float64Array(pose.length);
    const minus = new Float64Array(pose.length);
    let checked = 0;
    for (let k = 3; k < 58; k += 2) {
      // Inside an assembling stretch, away from its edges (where the rates blow up).
      if (![-3, -2, -1, 0, 1, 2, 3].every((j) => s.assembled[k + j] === 1)) continue;
      const v = s.values[k];
      pose.set(poseAt(plan, s.poses, k));
      expect(runWithRates(plan, v, pose, rates)).toBe(true);
      plus.set(pose);
      minus.set(pose);
      expect(run(plan, v + h, plus)).toBe(true);
      expect(run(plan, v - h, minus)).toBe(true);
      for (let i = 0; i < pose.length; i++) {
        const fd = (plus[i] - minus[i]) / (2 * h);
        expect(Math.abs(rates[i] - fd)).toBeLessThan(1e-6 * (1 + Math.abs(fd)));
      }
      checked++;
    }
    expect(checked).toBeGreaterThanOrEqual(3);
  });

  it('a length driver moves its joints at the rate the length changes', () => {
    const plan = compiled(shockRocker());
    const pose = Float64Array.from(plan.reference);
    const rates = new Float64Array(pose.length);
    expect(runWithRates(plan, 55, pose, rates)).toBe(true);
    const S = at(plan, pose, 'S');
    const S0 = at(plan, pose, 'S0');
    expect(distance(S, S0)).toBeCloseTo(55, 12);
    const dS = at(plan, rates, 'S');
    // d|S − S0|/dℓ = 1 along the shock.
    expect(((S.x - S0.x) * dS.x + (S.y - S0.y) * dS.y) / 55).toBeCloseTo(1, 12);
  });

  it('rates are NaN and the result false where the linkage does not assemble', () => {
    const plan = compiled(shockRocker());
    const pose = Float64Array.from(plan.reference);
    const rates = new Float64Array(pose.length);
    expect(runWithRates(plan, 500, pose, rates)).toBe(false);
    expect(Array.from(rates).every(Number.isNaN)).toBe(true);
    expect(Number.isNaN(at(plan, pose, 'S').x)).toBe(true);
  });
});

describe('closureResidualMm', () => {
  it.each(allLinkages())('is ~0 on every solved pose of a sweep: %s', (_name, linkage) => {
    const plan = compiled(linkage);
    const v0 = plan.driverReferenceValue;
    const range = linkage.driver.kind === 'length' ? { from: v0 - 10, to: v0 + 10 } : { from: v0 - Math.PI, to: v0 + Math.PI };
    const s = sweep(plan, { ...range, steps: 181 });
    let solved = 0;
    for (let k = 0; k < s.values.length; k++) {
      if (s.assembled[k] === 0) continue;
      expect(closureResidualMm(plan, poseAt(plan, s.poses, k))).toBeLessThan(1e-10 * plan.slotCount * 100);
      solved++;
    }
    expect(solved).toBeGreaterThan(60);
    expect(closureResidualMm(plan, plan.reference)).toBeLessThan(1e-12);
  });

  it('measures a violation: a point moved 0.1 mm off its body, a slider joint off its line, a NaN', () => {
    const plan = compiled(sliderCrank());
    const pose = Float64Array.from(plan.reference);
    const p = 2 * (plan.slotIndex.get('P') ?? 0);
    pose[p] += 0.1;
    expect(closureResidualMm(plan, pose)).toBeCloseTo(0.1, 12);
    pose.set(plan.reference);
    const b = 2 * (plan.slotIndex.get('B') ?? 0);
    pose[b + 1] += 0.25;
    expect(closureResidualMm(plan, pose)).toBeGreaterThanOrEqual(0.25 - 1e-12);
    pose[0] = NaN;
    expect(closureResidualMm(plan, pose)).toBe(Infinity);
  });
});

describe('sweep: locks, dead centres, full turns', () => {
  it('a crank-rocker driven by its rocker locks at the toggles, located at the law-of-cosines limits (theorem)', () => {
    const linkage = fourBar();
    const plan = compiled({ ...linkage, driver: { kind: 'rotation', body: 'rocker', pivot: 'B0', tip: 'B' } });
    const s = sweep(plan, { from: 0, to: 2 * Math.PI, steps: 361 });
    expect(s.fullTurn).toBe(false);
    // The rocker's limits: crank and coupler in line, |B − A0| = coupler ± crank; the angle
    // at B0 from the triangle (rocker, ground, that length), measured from +x.
    const a = 40;
    const b = Math.hypot(96, 45);
    const c = Math.hypot(20, 77);
    const d = 100;
    const limit = (r: number) => Math.PI - Math.acos((c * c + d * d - r * r) / (2 * c * d));
    const edges = [limit(b + a), limit(b - a), 2 * Math.PI - limit(b - a), 2 * Math.PI - limit(b + a)];
    const found = s.locks.flatMap((l) => [l.from, l.to]).filter((v) => v > 1e-9 && v < 2 * Math.PI - 1e-9);
    expect(found.length).toBe(4);
    for (let i = 0; i < 4; i++) expect(found[i]).toBeCloseTo(edges[i], 9);
    expect(s.deadCentres.map((dc) => dc.joint)).toEqual(['A', 'A', 'A', 'A']);
    for (let i = 0; i < 4; i++) expect(s.deadCentres[i].value).toBeCloseTo(edges[i], 9);
    for (let k = 0; k < s.values.length; k++) {
      const inLock = s.locks.some((l) => s.values[k] >= l.from && s.values[k] <= l.to);
      expect(s.assembled[k]).toBe(inLock ? 0 : 1);
    }
  });

  it('a crank-rocker driven by its crank turns fully with no locks and no dead centre of its dyad', () => {
    const s = sweep(compiled(fourBar()), { from: 0, to: 2 * Math.PI, steps: 361 });
    expect(s).toMatchObject({ fullTurn: true, locks: [], deadCentres: [] });
  });

  it('a parallelogram passes its change point at 0 without locking: a dead centre of the dyad at B', () => {
    // Grashof's change point, s + l = p + q (Grashof 1883): crank, coupler, rocker and ground in line at θ = 0.
    const plan = compiled(fourBar({ A0: vec2(0, 0), B0: vec2(100, 0), A: vec2(30, 40), B: vec2(130, 40), P: vec2(80, 60) }));
    const s = sweep(plan, { from: -3, to: 3, steps: 301 });
    expect(s.deadCentres.length).toBe(1);
    expect(s.deadCentres[0].joint).toBe('B');
    expect(s.deadCentres[0].kind).toBe('change point');
    expect(s.locks).toEqual([]);
    expect(Math.abs(s.deadCentres[0].value)).toBeLessThan(1e-6);
  });

  it('a length driver sweeps in mm and reports its lock at the rocker’s reach (|R0S0| ± |R0S|)', () => {
    const plan = compiled(shockRocker());
    const reach = Math.hypot(90, -10) + 50;
    const s = sweep(plan, { from: 60, to: 160, steps: 101 });
    expect(s.fullTurn).toBe(false);
    expect(s.locks.length).toBe(1);
    expect(s.locks[0].from).toBeCloseTo(reach, 8);
    expect(s.locks[0].to).toBe(160);
    expect(s.deadCentres).toEqual([{ value: s.locks[0].from, joint: 'S', kind: 'limit' }]);
  });

  it('refuses a malformed range', () => {
    const plan = compiled(fourBar());
    expect(() => sweep(plan, { from: 0, to: 1, steps: 0 })).toThrow(/expected finite ends and an integer steps ≥ 1/);
    expect(() => sweep(plan, { from: NaN, to: 1, steps: 5 })).toThrow(RangeError);
  });
});

describe('run: guards', () => {
  it('past-hang guard: a Newton linkage that cannot assemble returns false, from any start', () => {
    // Stephenson III with a long input: it cannot assemble for most input angles.
    const plan = compiled(stephensonIII({ ...STEPHENSON_III_DEFAULT, D: vec2(150 + 60, 120 + 50) }));
    const pose = new Float64Array(2 * plan.slotCount);
    let failures = 0;
    for (let i = 0; i < 2000; i++) {
      const angle = (i * 2 * Math.PI) / 2000;
      if (i % 3 === 0) pose.fill(NaN);
      else if (i % 3 === 1) pose.fill(1e6 * (i % 7));
      else pose.set(plan.reference);
      if (!run(plan, angle, pose)) failures++;
    }
    // Every call came back (a solve is at most NEWTON_MAX_ITERATIONS steps; a hang would
    // be this test's timeout), and the starts far from any pose did not assemble.
    expect(failures).toBeGreaterThan(500);
  });

  it('a non-finite driver value, or a negative length, does not assemble', () => {
    const plan = compiled(fourBar());
    const pose = Float64Array.from(plan.reference);
    expect(run(plan, NaN, pose)).toBe(false);
    expect(Array.from(pose).every(Number.isNaN)).toBe(true);
    expect(run(plan, Infinity, pose)).toBe(false);
    expect(run(plan, 1, pose)).toBe(true);
    const shock = compiled(shockRocker());
    expect(run(shock, -5, Float64Array.from(shock.reference))).toBe(false);
  });

  it('starts a Newton block from the reference pose when the incoming pose is not finite', () => {
    const plan = compiled(stephensonIII());
    const pose = new Float64Array(2 * plan.slotCount).fill(NaN);
    expect(run(plan, plan.driverReferenceValue, pose)).toBe(true);
    for (let i = 0; i < pose.length; i++) expect(pose[i]).toBeCloseTo(plan.reference[i], 9);
  });

  it('throws for a pose of the wrong length (a programmer error)', () => {
    const plan = compiled(fourBar());
    expect(() => run(plan, 0, new Float64Array(3))).toThrow(/run: pose: array has 3 numbers; expected 10/);
  });
});

describe('setReferencePose', () => {
  it('gives the plan new dimensions: runs equal those of a plan compiled from the new positions', () => {
    const plan = compiled(fourBar());
    const next = fourBar({ A0: vec2(5, -3), B0: vec2(90, 10), A: vec2(20, 30), B: vec2(100, 90), P: vec2(60, 120) });
    const fresh = compiled(next);
    setReferencePose(plan, fresh.reference);
    expect(plan.driverReferenceValue).toBeCloseTo(fresh.driverReferenceValue, 15);
    const a = new Float64Array(10);
    const b = new Float64Array(10);
    for (let k = 0; k < 12; k++) {
      const v = (k * Math.PI) / 6;
      expect(run(plan, v, a)).toBe(run(fresh, v, b));
      for (let i = 0; i < 10; i++) expect(a[i]).toBe(b[i]);
    }
  });

  it('a pose with a zero-length link makes runs fail until a good pose is set; a Newton plan follows new dimensions too', () => {
    const plan = compiled(stephensonIII());
    const good = Float64Array.from(plan.reference);
    const bad = Float64Array.from(good);
    const a = 2 * (plan.slotIndex.get('A') ?? 0);
    bad[a] = bad[0];
    bad[a + 1] = bad[1];
    setReferencePose(plan, bad);
    expect(run(plan, 0, Float64Array.from(good))).toBe(false);
    const stretched = Float64Array.from(good);
    for (let i = 0; i < stretched.length; i++) stretched[i] *= 1.5;
    setReferencePose(plan, stretched);
    const pose = Float64Array.from(stretched);
    expect(run(plan, plan.driverReferenceValue + 0.2, pose)).toBe(true);
    expect(closureResidualMm(plan, pose)).toBeLessThan(1e-9);
    expect(() => setReferencePose(plan, new Float64Array(2))).toThrow(RangeError);
  });
});

describe('run: the generated kernel and the interpreter give the same poses', () => {
  function bits(pose: Float64Array): number[] {
    return Array.from(new Uint8Array(pose.buffer, pose.byteOffset, pose.byteLength));
  }

  /** Driver values round a full turn (or ±60 % of the driven length), past the limits of assembly, and non-finite. */
  function driverValues(plan: Plan): number[] {
    const v0 = plan.driverReferenceValue;
    const isLength = plan.linkage.driver.kind === 'length';
    const values: number[] = [];
    for (let k = 0; k <= 96; k++) values.push(isLength ? v0 * (0.4 + (1.2 * k) / 96) : v0 + (2 * Math.PI * k) / 96);
    values.push(NaN, Infinity, isLength ? -v0 : 1e7);
    return values;
  }

  // The interpreter is the path where a Content-Security-Policy forbids code generation;
  // a second plan of the same linkage forced onto it must agree to the last bit.
  it.each(allLinkages())('%s: bit-identical poses, results and failing operation, before and after setReferencePose', (_name, linkage) => {
    const generated = compiled(linkage) as PlanInternal;
    const interpreted = compiled(linkage) as PlanInternal;
    expect(generated.kernel).not.toBeNull();
    interpreted.kernel = null;
    const resized = Float64Array.from(generated.reference, (x, i) => 1.3 * x + (i % 2 === 0 ? 7 : -3));
    for (const reference of [generated.reference.slice(), resized]) {
      setReferencePose(generated, reference);
      setReferencePose(interpreted, reference);
      const a = Float64Array.from(reference);
      const b = Float64Array.from(reference);
      for (const v of driverValues(generated)) {
        expect(run(generated, v, a)).toBe(run(interpreted, v, b));
        expect(generated.failedOp).toBe(interpreted.failedOp);
        expect(bits(a)).toEqual(bits(b));
      }
    }
  });
});
