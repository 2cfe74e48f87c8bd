import { describe, expect, it } from 'vitest';
import {
  FOUR_BAR_OUT_LENGTH,
  createObjective,
  createProblem,
  fourBarCouplerPointInto,
  fourBarJointsInto,
  type ProblemInput,
} from '../../../src/core/synthesis';
import { compile, closureResidualMm, run } from '../../../src/core/linkage';

// A Grashof crank-rocker of our own invention: r1 ground 5, r2 crank 1.5, r3 coupler 4,
// r4 rocker 3.5 (s + l = 6.5 < p + q = 7.5), coupler point (2, 1.2), ground angle 0.3,
// crank pivot (1, −0.5).
const DESIGN = [5, 1.5, 4, 3.5, 2, 1.2, 0.3, 1, -0.5];
const ANGLES = [0.2, 0.9, 1.7, 2.4, 3.3, 4.1, 5.0, 5.8];

function pathOf(design: number[], angles: number[], sign = 1): number[][] {
  const p = Float64Array.from(design);
  const out = new Float64Array(FOUR_BAR_OUT_LENGTH);
  return angles.map((t) => {
    fourBarCouplerPointInto(p, 0, t, sign, 0, out);
    return [out[0], out[1]];
  });
}

function problemOf(input: Partial<ProblemInput> & Pick<ProblemInput, 'timing'>, points: number[][], closed = false) {
  const made = createProblem({
    name: 'test',
    target: { points, closed },
    placement: 'fixed',
    families: ['fourbar-lengths'],
    constraints: { fullTurnCrank: true },
    ...input,
  });
  if (!made.ok) throw new Error(JSON.stringify(made.issues));
  return made.problem;
}

const out = new Float64Array(2);

describe('createObjective, fourbar-lengths', () => {
  it('scores the exact design ~0 with prescribed timing', () => {
    const problem = problemOf({ timing: { mode: 'prescribed', driverValues: ANGLES } }, pathOf(DESIGN, ANGLES));
    const objective = createObjective(problem, 'fourbar-lengths');
    expect(objective.variableNames).toEqual(['r1', 'r2', 'r3', 'r4', 'rcx', 'rcy', 'theta0', 'x0', 'y0']);
    objective.evaluate(Float64Array.from(DESIGN), out);
    expect(out[0]).toBeLessThan(1e-12);
    expect(out[1]).toBe(0);
    // A different design is not ~0: the test can fail.
    const other = Float64Array.from(DESIGN);
    other[4] += 0.01;
    objective.evaluate(other, out);
    expect(out[0]).toBeGreaterThan(1e-6);
  });

  it('scores the exact design ~0 with free timing, and flags an order defect', () => {
    const problem = problemOf({ timing: { mode: 'free', wrap: false } }, pathOf(DESIGN, ANGLES));
    const objective = createObjective(problem, 'fourbar-lengths');
    expect(objective.dim).toBe(9 + ANGLES.length);
    expect(objective.variableNames[9]).toBe('theta2_1');
    const x = Float64Array.from([...DESIGN, ...ANGLES]);
    objective.evaluate(x, out);
    expect(out[0]).toBeLessThan(1e-12);
    expect(out[1]).toBe(0);
    const swapped = Float64Array.from(x);
    [swapped[10], swapped[11]] = [swapped[11], swapped[10]];
    objective.evaluate(swapped, out);
    expect(out[1]).toBeGreaterThan(0);
    expect(objective.describe(swapped).defects.join()).toMatch(/order defect/);
  });

  it('accepts a sequence through 2π only with wrap', () => {
    const shifted = ANGLES.map((t) => (t + 3) % (2 * Math.PI));
    const points = pathOf(DESIGN, shifted);
    const x = Float64Array.from([...DESIGN, ...shifted]);
    const noWrap = createObjective(problemOf({ timing: { mode: 'free', wrap: false } }, points), 'fourbar-lengths');
    const wrap = createObjective(problemOf({ timing: { mode: 'free', wrap: true } }, points), 'fourbar-lengths');
    noWrap.evaluate(x, out);
    expect(out[1]).toBeGreaterThan(0);
    wrap.evaluate(x, out);
    expect(out[1]).toBe(0);
    expect(out[0]).toBeLessThan(1e-12);
  });

  it('refines free timing to the exact values and writes them back', () => {
    const problem = problemOf({ timing: { mode: 'free', wrap: false, refine: true } }, pathOf(DESIGN, ANGLES));
    const objective = createObjective(problem, 'fourbar-lengths');
    const x = Float64Array.from([...DESIGN, ...ANGLES.map((t) => t + 0.05)]);
    objective.evaluate(x, out);
    expect(out[0]).toBeLessThan(1e-20);
    for (let i = 0; i < ANGLES.length; i++) expect(x[9 + i]).toBeCloseTo(ANGLES[i], 9);
  });

  it('finds the timing itself when unprescribed, on a closed path and through 2π', () => {
    const shifted = ANGLES.map((t) => (t + 3) % (2 * Math.PI));
    const problem = problemOf({ timing: { mode: 'unprescribed' } }, pathOf(DESIGN, shifted), true);
    const objective = createObjective(problem, 'fourbar-lengths');
    expect(objective.dim).toBe(9);
    objective.evaluate(Float64Array.from(DESIGN), out);
    expect(out[0]).toBeLessThan(1e-20);
    expect(out[1]).toBe(0);
    const report = objective.describe(Float64Array.from(DESIGN));
    report.driverValues.forEach((t, i) => {
      const d = (((t - shifted[i]) % (2 * Math.PI)) + 3 * Math.PI) % (2 * Math.PI) - Math.PI;
      expect(Math.abs(d)).toBeLessThan(1e-9);
    });
    expect(report.error.maxMm).toBeLessThan(1e-10);
    expect(report.grashof?.name).toBe('crank-rocker');
  });

  it('fits the placement in closed form when free', () => {
    // The same mechanism scaled by 2.5, turned by 0.7 rad and moved: with free placement
    // the ground-normalised design (r1 = 1) fits exactly.
    const s = 2.5;
    const c = Math.cos(0.7);
    const n = Math.sin(0.7);
    const points = pathOf(DESIGN, ANGLES).map(([x, y]) => [s * (c * x - n * y) + 10, s * (n * x + c * y) - 4]);
    const problem = problemOf({ timing: { mode: 'free', wrap: false }, placement: 'free' }, points);
    const objective = createObjective(problem, 'fourbar-lengths');
    expect(objective.variableNames.slice(0, 5)).toEqual(['r2', 'r3', 'r4', 'rcx', 'rcy']);
    const r1 = DESIGN[0];
    const x = Float64Array.from([DESIGN[1] / r1, DESIGN[2] / r1, DESIGN[3] / r1, DESIGN[4] / r1, DESIGN[5] / r1, ...ANGLES]);
    objective.evaluate(x, out);
    expect(out[0]).toBeLessThan(1e-18);
    const report = objective.describe(x);
    expect(report.placement?.scale).toBeCloseTo(s * r1, 9);
  });

  it('finds timing and placement together (unprescribed, free placement) on a closed path', () => {
    const s = 3;
    const points = pathOf(DESIGN, ANGLES).map(([x, y]) => [s * y + 2, -s * x + 1]);
    const problem = problemOf({ timing: { mode: 'unprescribed' }, placement: 'free' }, points, true);
    const objective = createObjective(problem, 'fourbar-lengths');
    const r1 = DESIGN[0];
    const x = Float64Array.from([DESIGN[1] / r1, DESIGN[2] / r1, DESIGN[3] / r1, DESIGN[4] / r1, DESIGN[5] / r1]);
    objective.evaluate(x, out);
    expect(out[0]).toBeLessThan(1e-16);
    const report = objective.describe(x);
    expect(report.placement?.scale).toBeCloseTo(s * r1, 9);
    // The design turned by θ0 = 0.3 (the literature ground angle), then by −90°.
    expect(report.placement?.rotationRad).toBeCloseTo(DESIGN[6] - Math.PI / 2, 9);
  });

  it('ranks a non-Grashof crank infeasible, and a change-point one too', () => {
    const points = pathOf(DESIGN, ANGLES);
    // Lengths 5, 1.5, 3.2, 2.6: s + l = 6.5 > p + q = 5.8, not Grashof.
    const bad = Float64Array.from([5, 1.5, 3.2, 2.6, 2, 1.2, 0.3, 1, -0.5]);
    const strict = createObjective(problemOf({ timing: { mode: 'prescribed', driverValues: ANGLES } }, points), 'fourbar-lengths');
    strict.evaluate(bad, out);
    expect(out[1]).toBeGreaterThan(0);
    expect(strict.describe(bad).defects.join()).toMatch(/crank cannot turn fully/);
    // Lengths 5, 1.5, 3.2, 3.3: s + l = 6.5 = p + q, a change point, which passes a flat pose
    // where its motion may change branch: not a full turn (Grashof's criterion as stated by
    // Chang, Lin and Wu, J. Marine Sci. Technol. 13(4), 2005).
    const changePoint = Float64Array.from([5, 1.5, 3.2, 3.3, 2, 1.2, 0.3, 1, -0.5]);
    strict.evaluate(changePoint, out);
    expect(out[1]).toBeGreaterThan(0);
    expect(strict.describe(changePoint).defects.join()).toMatch(/crank cannot turn fully/);
  });

  it('checks transmission angle, link lengths and keep-out circles', () => {
    // Transmission angle (Balli and Chand, Mech. Mach. Theory 37, 2002; formula from
    // memory): cos μ = (r3² + r4² − r1² − r2² + 2 r1 r2 cos θ2)/(2 r3 r4). For DESIGN over
    // a full turn: μ = acos(4/7) ≈ 55.2° at θ2 = 0 and 120° at θ2 = π, so the worst
    // deviation from 90° leaves 55.2°.
    const points = pathOf(DESIGN, ANGLES);
    const timing = { mode: 'prescribed', driverValues: ANGLES } as const;
    const violationWith = (constraints: object) => {
      const objective = createObjective(problemOf({ timing, constraints: { fullTurnCrank: true, ...constraints } }, points), 'fourbar-lengths');
      objective.evaluate(Float64Array.from(DESIGN), out);
      return { violation: out[1], defects: objective.describe(Float64Array.from(DESIGN)).defects.join() };
    };
    const deg = Math.PI / 180;
    expect(violationWith({ minTransmissionRad: 55 * deg }).violation).toBe(0);
    expect(violationWith({ minTransmissionRad: 56 * deg }).defects).toMatch(/transmission angle/);
    const report = createObjective(problemOf({ timing }, points), 'fourbar-lengths').describe(Float64Array.from(DESIGN));
    // The report takes μ over its motion as `loci analyze` does, at 1° steps from the first
    // target point (θ2 = 0.2 rad): the extremes lie between steps, where μ is flat, so the
    // sampled extreme is within ~0.002° of the exact one.
    expect(report.motion.fullTurn).toBe(true);
    expect(Math.abs((report.transmissionDeg?.min ?? NaN) - Math.acos(4 / 7) / deg)).toBeLessThan(0.005);
    expect(Math.abs((report.transmissionDeg?.max ?? NaN) - 120)).toBeLessThan(0.005);
    expect(violationWith({ linkLengthMm: [1, 10] }).violation).toBe(0);
    expect(violationWith({ linkLengthMm: [2, 10] }).defects).toMatch(/link length/);
    expect(violationWith({ keepOut: [{ x: 100, y: 100, r: 5 }] }).violation).toBe(0);
    // The crank pivot is at (1, −0.5).
    expect(violationWith({ keepOut: [{ x: 1.2, y: -0.5, r: 0.5 }] }).defects).toMatch(/keep-out/);
  });

  it('keeps the better branch with either', () => {
    const points = pathOf(DESIGN, ANGLES, -1);
    const timing = { mode: 'prescribed', driverValues: ANGLES } as const;
    const open = createObjective(problemOf({ timing, constraints: { fullTurnCrank: true, branch: 'open' } }, points), 'fourbar-lengths');
    const either = createObjective(problemOf({ timing, constraints: { fullTurnCrank: true, branch: 'either' } }, points), 'fourbar-lengths');
    open.evaluate(Float64Array.from(DESIGN), out);
    expect(out[0]).toBeGreaterThan(1e-3);
    either.evaluate(Float64Array.from(DESIGN), out);
    expect(out[0]).toBeLessThan(1e-12);
  });

  it('reports all three measures, and minimises the one asked for', () => {
    const points = pathOf(DESIGN, ANGLES);
    points[2] = [points[2][0] + 0.3, points[2][1] - 0.4]; // 0.5 off
    for (const measure of ['sum-of-squares', 'rms', 'max'] as const) {
      const objective = createObjective(problemOf({ timing: { mode: 'prescribed', driverValues: ANGLES }, measure }, points), 'fourbar-lengths');
      objective.evaluate(Float64Array.from(DESIGN), out);
      const report = objective.describe(Float64Array.from(DESIGN));
      expect(report.error.sumSquares).toBeCloseTo(0.25, 12);
      expect(report.error.rmsMm).toBeCloseTo(Math.sqrt(0.25 / ANGLES.length), 12);
      expect(report.error.maxMm).toBeCloseTo(0.5, 12);
      const expected = { 'sum-of-squares': 0.25, rms: Math.sqrt(0.25 / ANGLES.length), max: 0.5 }[measure];
      expect(out[0]).toBeCloseTo(expected, 12);
    }
  });

  it('builds a linkage that the kinematics core accepts and that reproduces the path', () => {
    const points = pathOf(DESIGN, ANGLES);
    const objective = createObjective(problemOf({ timing: { mode: 'prescribed', driverValues: ANGLES } }, points), 'fourbar-lengths');
    const report = objective.describe(Float64Array.from(DESIGN));
    const compiled = compile(report.linkage);
    expect(compiled.ok).toBe(true);
    if (!compiled.ok) return;
    const plan = compiled.plan;
    const pose = Float64Array.from(plan.reference);
    const pSlot = 2 * (plan.slotIndex.get('P') ?? -1);
    ANGLES.forEach((t, i) => {
      // The linkage's driver value is the absolute crank angle: θ0 + θ2.
      expect(run(plan, DESIGN[6] + t, pose)).toBe(true);
      expect(closureResidualMm(plan, pose)).toBeLessThan(1e-9);
      expect(pose[pSlot]).toBeCloseTo(points[i][0], 9);
      expect(pose[pSlot + 1]).toBeCloseTo(points[i][1], 9);
    });
  });
});

describe('pose-based fourbar against fourbar-lengths', () => {
  it('gives the same error for the same mechanism', () => {
    const points = pathOf(DESIGN, ANGLES).map(([x, y], i) => [x + 0.01 * Math.sin(3 * i), y + 0.01 * Math.cos(5 * i)]);
    const made = createProblem({
      name: 'same mechanism',
      target: { points, closed: false },
      timing: { mode: 'free', wrap: false },
      placement: 'fixed',
      families: ['fourbar-lengths', 'fourbar'],
    });
    if (!made.ok) throw new Error(JSON.stringify(made.issues));
    const literature = createObjective(made.problem, 'fourbar-lengths');
    const pose = createObjective(made.problem, 'fourbar');
    // The pose family's reference pose: the literature joints at the first angle; its
    // driver values are the crank's turn from there.
    const joints = new Float64Array(8);
    const p = Float64Array.from(DESIGN);
    fourBarJointsInto(p, 0, ANGLES[0], 1, joints);
    const cp = new Float64Array(FOUR_BAR_OUT_LENGTH);
    fourBarCouplerPointInto(p, 0, ANGLES[0], 1, 0, cp);
    const at: Record<string, [number, number]> = {
      A0: [joints[0], joints[1]],
      A: [joints[2], joints[3]],
      B: [joints[4], joints[5]],
      B0: [joints[6], joints[7]],
      P: [cp[0], cp[1]],
    };
    const x = new Float64Array(pose.dim);
    pose.variableNames.forEach((name, j) => {
      const [id, axis] = name.split('.');
      if (axis === undefined) x[j] = ANGLES[Number(id.split('_')[1]) - 1] - ANGLES[0];
      else x[j] = at[id][axis === 'x' ? 0 : 1];
    });
    const a = new Float64Array(2);
    const b = new Float64Array(2);
    literature.evaluate(Float64Array.from([...DESIGN, ...ANGLES]), a);
    pose.evaluate(x, b);
    expect(a[0]).toBeGreaterThan(1e-5);
    expect(Math.abs(a[0] - b[0]) / a[0]).toBeLessThan(1e-9);
    expect(b[1]).toBe(0);
  });
});
