/**
 * What a candidate reports is what its exported linkage does: its figures (transmission
 * range, size, Grashof class, locks) equal those `loci analyze` (analyzeLinkage) gives of
 * its linkage over the same motion, in every family, and the linkage is drawn in a pose
 * on its fitted motion (at target point 1), so its output point sits on the path.
 */
import { describe, expect, it } from 'vitest';
import * as families from '../../../src/core/linkage/families';
import { compile, run, type Linkage } from '../../../src/core/linkage';
import { analyzeLinkage, type LinkageReport } from '../../../src/core/linkage/report';
import {
  FAMILY_IDS,
  FOUR_BAR_OUT_LENGTH,
  createObjective,
  createProblem,
  fourBarCouplerPointInto,
  type CandidateReport,
  type FamilyId,
} from '../../../src/core/synthesis';

const BUILDERS: Readonly<Record<Exclude<FamilyId, 'fourbar-lengths'>, () => Linkage>> = {
  fourbar: () => families.fourBar(),
  'slider-crank': () => families.sliderCrank(),
  'watt-i': () => families.wattI(),
  'watt-ii': () => families.wattII(),
  'stephenson-i': () => families.stephensonI(),
  'stephenson-ii': () => families.stephensonII(),
  'stephenson-iii': () => families.stephensonIII(),
};

// A Grashof crank-rocker of our own (as in objective.test.ts): r1 5, r2 1.5, r3 4, r4 3.5,
// coupler point (2, 1.2), ground angle 0.3, crank pivot (1, −0.5); scaled to mm by 20.
const DESIGN = [100, 30, 80, 70, 40, 24, 0.3, 20, -10];
/** Driver values (rotation from the reference pose, or θ2) of the target: part of a turn, away from 0. */
const TURNS = [1.0, 1.3, 1.6, 1.9, 2.2];

interface Case {
  readonly family: FamilyId;
  readonly points: number[][];
  readonly x: Float64Array;
  readonly bounds?: Record<string, [number, number]>;
}

function caseOf(family: FamilyId): Case {
  if (family === 'fourbar-lengths') {
    const p = Float64Array.from(DESIGN);
    const out = new Float64Array(FOUR_BAR_OUT_LENGTH);
    const points = TURNS.map((t) => {
      fourBarCouplerPointInto(p, 0, t, 1, 0, out);
      return [out[0], out[1]];
    });
    return { family, points, x: Float64Array.from(DESIGN) };
  }
  const linkage = BUILDERS[family]();
  const compiled = compile(linkage);
  if (!compiled.ok) throw new Error(JSON.stringify(compiled.issues));
  const plan = compiled.plan;
  const pose = Float64Array.from(plan.reference);
  const p = 2 * (plan.slotIndex.get('P') ?? -1);
  const points = TURNS.map((t) => {
    expect(run(plan, plan.driverReferenceValue + t, pose)).toBe(true);
    return [pose[p], pose[p + 1]];
  });
  const ids = [...plan.jointIds, ...plan.pointIds];
  const bounds = Object.fromEntries(ids.flatMap((id) => [[`${id}.x`, [-600, 600]], [`${id}.y`, [-600, 600]]])) as Record<string, [number, number]>;
  return { family, points, x: Float64Array.from(plan.reference), bounds };
}

function describeCase(c: Case, timing: 'prescribed' | 'unprescribed'): CandidateReport {
  const made = createProblem({
    name: c.family,
    target: { points: c.points, closed: false },
    timing: timing === 'prescribed' ? { mode: 'prescribed', driverValues: TURNS } : { mode: 'unprescribed', wrap: false },
    placement: 'fixed',
    families: [c.family],
    ...(c.bounds === undefined ? {} : { bounds: { [c.family]: c.bounds } }),
  });
  if (!made.ok) throw new Error(JSON.stringify(made.issues));
  return createObjective(made.problem, c.family).describe(c.x);
}

/** The figures read off a linkage report, here in the test (not through the code under test). */
function reportFigures(report: LinkageReport) {
  const mus = report.fourBarLoops.flatMap((l) => (l.transmissionAngleDeg === null ? [] : [l.transmissionAngleDeg]));
  const xy = [...report.joints, ...report.points].flatMap((j) => j.path.filter((q): q is readonly [number, number] => q !== null));
  const xs = xy.map((q) => q[0]);
  const ys = xy.map((q) => q[1]);
  const driven = report.fourBarLoops.find((l) => l.grounded && l.inputDriven);
  return {
    transmission: mus.length === 0 ? undefined : { min: Math.min(...mus.map((m) => m.min)), max: Math.max(...mus.map((m) => m.max)) },
    size: { widthMm: Math.max(...xs) - Math.min(...xs), heightMm: Math.max(...ys) - Math.min(...ys) },
    grashof: driven?.grashof,
    barker: driven?.barker?.name,
    locks: report.defects.locks.length,
  };
}

const LOCK_DEFECT = /crank cannot turn fully|cannot assemble|branch defect/;

describe("a candidate's figures are those `loci analyze` gives of its linkage over the same motion", () => {
  for (const family of FAMILY_IDS) {
    for (const timing of ['prescribed', 'unprescribed'] as const) {
      it(`${family}, ${timing} timing`, () => {
        const report = describeCase(caseOf(family), timing);
        const compiled = compile(report.linkage);
        expect(compiled.ok).toBe(true);
        if (!compiled.ok) return;
        const { from, to, steps } = report.motion;
        const analysed = analyzeLinkage(compiled.plan, { range: { from, to }, steps });
        expect(analysed.ok).toBe(true);
        if (!analysed.ok) return;
        const expected = reportFigures(analysed.report);
        expect(report.transmissionDeg).toEqual(expected.transmission);
        expect(report.sizeMm).toEqual(expected.size);
        expect(report.grashof?.grashof).toBe(expected.grashof);
        expect(report.grashof?.name).toBe(expected.barker);
        expect(expected.locks > 0).toBe(LOCK_DEFECT.test(report.defects.join()));
        if (report.motion.fullTurn) {
          // `loci analyze file` without a range: a full turn from the reference angle, the
          // first target point's, so the same figures.
          const plain = analyzeLinkage(compiled.plan);
          expect(plain.ok).toBe(true);
          if (!plain.ok) return;
          expect(plain.report.driver.fullTurn).toBe(true);
          const own = reportFigures(plain.report);
          expect(own.transmission === undefined).toBe(expected.transmission === undefined);
          if (own.transmission !== undefined && expected.transmission !== undefined) {
            expect(own.transmission.min).toBeCloseTo(expected.transmission.min, 9);
            expect(own.transmission.max).toBeCloseTo(expected.transmission.max, 9);
          }
          expect(own.size.widthMm).toBeCloseTo(expected.size.widthMm, 9);
          expect(own.size.heightMm).toBeCloseTo(expected.size.heightMm, 9);
        }
      });
    }
  }

  it('fourbar, unprescribed: the transmission range is over the full turn, not at the matched points', () => {
    const report = describeCase(caseOf('fourbar'), 'unprescribed');
    expect(report.motion.fullTurn).toBe(true);
    // theorem (law of cosines in the loop): cos μ = (b² + c² − g² − a² + 2 g a cos θ)/(2 b c)
    // with θ the crank's angle from the ground line, so over a full turn μ runs between its
    // values at θ = 0 and θ = π. Lengths from the default four-bar, measured here.
    const l = families.fourBar();
    const at = (id: string) => l.joints.find((j) => j.id === id) ?? { x: NaN, y: NaN };
    const d = (p: string, q: string) => Math.hypot(at(q).x - at(p).x, at(q).y - at(p).y);
    const [g, a, b, c] = [d('A0', 'B0'), d('A0', 'A'), d('A', 'B'), d('B0', 'B')];
    const mu = (cosTheta: number) => (Math.acos((b * b + c * c - g * g - a * a + 2 * g * a * cosTheta) / (2 * b * c)) * 180) / Math.PI;
    const [lo, hi] = [Math.min(mu(1), mu(-1)), Math.max(mu(1), mu(-1))];
    // 1° steps: the extremes are flat, so within 0.01°.
    expect(Math.abs((report.transmissionDeg?.min ?? NaN) - lo)).toBeLessThan(0.01);
    expect(Math.abs((report.transmissionDeg?.max ?? NaN) - hi)).toBeLessThan(0.01);
  });
});

describe('an exported design is drawn on its fitted motion, at target point 1', () => {
  for (const family of FAMILY_IDS) {
    it(family, () => {
      const c = caseOf(family);
      const report = describeCase(c, 'prescribed');
      expect(report.referencePose).toBe('target point 1');
      const p = report.linkage.points?.find((q) => q.id === 'P');
      // The design traces the target exactly, so its output point in the exported pose is target point 1.
      expect(Math.hypot((p?.x ?? NaN) - c.points[0][0], (p?.y ?? NaN) - c.points[0][1])).toBeLessThan(1e-6);
      // Independent of the report's own points: the exported file, run by the kinematics
      // core at each linkage driver value, reproduces the target.
      const compiled = compile(report.linkage);
      if (!compiled.ok) throw new Error(JSON.stringify(compiled.issues));
      const plan = compiled.plan;
      expect(plan.driverReferenceValue).toBeCloseTo(report.linkageDriverValues[0], 12);
      const pose = Float64Array.from(plan.reference);
      const slot = 2 * (plan.slotIndex.get('P') ?? -1);
      report.linkageDriverValues.forEach((v, i) => {
        expect(run(plan, v, pose)).toBe(true);
        expect(Math.hypot(pose[slot] - c.points[i][0], pose[slot + 1] - c.points[i][1])).toBeLessThan(1e-6);
      });
    });
  }
});
