/**
 * The reach set (bench/reachCases.ts): every case's target is sampled from its generating
 * design, so that design scores zero under the case's own problem; the literature
 * four-bar's targets agree with a four-bar solved by hand (tests/support); and the set
 * spans what the reach bench claims to measure.
 */
import { describe, expect, it } from 'vitest';
import { REACH_SPECS, WELL_POSED_REDUNDANCY, reachCases, redundancy, type ReachCase } from '../../bench/reachCases';
import {
  compile,
  fourBar,
  sliderCrank,
  stephensonI,
  wattI,
  wattII,
  type Linkage,
} from '../../src/core/linkage';
import { createObjective, createProblem, type Objective } from '../../src/core/synthesis';
import { closedFormFourBar } from '../support/closedFormFourBar';

/** RMS (as a share of the target's size) a generating design may show: rounding of the kinematics and of the timing solve. */
const GENERATING_RMS_SHARE = 1e-9;
/** Agreement of two independent computations of a target point, mm. */
const SAME_POINT_MM = 1e-9;

function objectiveOf(c: ReachCase): Objective {
  const made = createProblem(c.problem);
  if (!made.ok) throw new Error(`${c.id}: ${JSON.stringify(made.issues)}`);
  return createObjective(made.problem, c.family);
}

const CASES = reachCases();

/**
 * Least distance (mm) of some joint or point of a generating design from where the
 * family's default pose has it: the defaults are what demos and the search's first
 * guesses are built around, so a target made from them measures a search that may
 * start at its answer (common practice: a benchmark's optimum away from the search's
 * own starting points).
 */
const OFF_DEFAULT_MM = 5;

/** The default pose of each pose family (src/core/linkage/families.ts), built from the families' own defaults. */
const DEFAULT_LINKAGES: Record<string, () => Linkage> = {
  fourbar: () => fourBar(),
  'slider-crank': () => sliderCrank(),
  'watt-i': () => wattI(),
  'watt-ii': () => wattII(),
  'stephenson-i': () => stephensonI(),
};

describe('the reach set', () => {
  for (const c of CASES) {
    it(`${c.id}: its generating design reaches RMS ≈ 0 under its own problem, and a moved design does not`, () => {
      const objective = objectiveOf(c);
      expect(objective.variableNames).toEqual(c.designNames);
      const out = new Float64Array(2);
      objective.evaluate(Float64Array.from(c.design), out);
      // theorem: the target is sampled from this design
      expect(out[1]).toBe(0);
      expect(out[0]).toBeLessThan(GENERATING_RMS_SHARE * c.sizeMm);
      // A mechanism variable moved by 1 % of the size: the error grows past the reach error, so the check can fail.
      const moved = Float64Array.from(c.design);
      const j = c.designNames.findIndex((name) => name !== 'r1' && !name.startsWith('theta0'));
      moved[j] += c.family === 'fourbar-lengths' && c.placement === 'free' ? 0.01 : 0.01 * c.sizeMm;
      objective.evaluate(moved, out);
      expect(out[0]).toBeGreaterThan(c.reachRmsMm);
    });
  }

  it('no pose-family generating design is its family\'s default pose: fewer than half its joints are where the default has them', () => {
    let checked = 0;
    for (const c of CASES) {
      const build = DEFAULT_LINKAGES[c.family];
      if (build === undefined) continue;
      const compiled = compile(build());
      if (!compiled.ok) throw new Error(`${c.family}: the default does not compile`);
      const reference = compiled.plan.reference;
      // The pose variables are the reference pose's slots (then, with free timing, the
      // driver values). Most joints moved, not one: a six-bar sharing its four-bar with the
      // default sits half on it.
      let coinciding = 0;
      let slots = 0;
      for (let k = 0; k + 1 < reference.length && k + 1 < c.design.length; k += 2) {
        if (Math.hypot(c.design[k] - reference[k], c.design[k + 1] - reference[k + 1]) <= OFF_DEFAULT_MM) coinciding++;
        slots++;
      }
      expect(slots, c.id).toBeGreaterThan(0);
      expect(coinciding, c.id).toBeLessThan(slots / 2);
      checked++;
    }
    expect(checked).toBeGreaterThan(0);
  });

  it('the literature four-bar targets are the points of a four-bar solved by hand', () => {
    let checked = 0;
    for (const c of CASES) {
      const g = c.spec.generator;
      if (g.family !== 'fourbar-lengths') continue;
      const l = g.lengths;
      const s = c.spec.similarity ?? { scale: 1, rotationRad: 0, tx: 0, ty: 0 };
      c.spec.driverValues.forEach((theta2, i) => {
        const solved = closedFormFourBar({
          ground: l.r1,
          input: l.r2,
          coupler: l.r3,
          output: l.r4,
          theta2,
          branch: 1,
          origin: [l.x0, l.y0],
          groundAngle: l.theta0,
          couplerPoint: [l.rcx, l.rcy],
        });
        if (solved === null) throw new Error(`${c.id}: the four-bar does not assemble at θ2 = ${theta2}`);
        const [px, py] = solved.P;
        const a = s.scale * Math.cos(s.rotationRad);
        const b = s.scale * Math.sin(s.rotationRad);
        const [tx, ty] = c.problem.target.points[i];
        // theorem: the coupler point by circle–circle intersection, placed by the case's similarity
        expect(Math.hypot(a * px - b * py + s.tx - tx, b * px + a * py + s.ty - ty)).toBeLessThan(SAME_POINT_MM * Math.max(1, s.scale));
        checked++;
      });
    }
    expect(checked).toBeGreaterThan(0);
  });

  it('spans families, timing modes, open and closed paths and placements, each case well posed', () => {
    expect(CASES.length).toBeGreaterThanOrEqual(20);
    const families = new Set(CASES.map((c) => c.family));
    expect(families.has('fourbar-lengths') && families.has('fourbar')).toBe(true);
    expect(families.has('slider-crank')).toBe(true);
    expect([...families].filter((f) => f.startsWith('watt') || f.startsWith('stephenson')).length).toBeGreaterThanOrEqual(2);
    expect(new Set(CASES.map((c) => c.timing))).toEqual(new Set(['prescribed', 'free', 'unprescribed']));
    expect(new Set(CASES.map((c) => c.shape))).toEqual(new Set(['open', 'closed']));
    expect(new Set(CASES.map((c) => c.placement))).toEqual(new Set(['fixed', 'free']));
    expect(new Set(CASES.map((c) => c.id)).size).toBe(CASES.length);
    // common practice: more equations (two per point) than unknowns, by a margin
    for (const spec of REACH_SPECS) expect(redundancy(spec), spec.id).toBeGreaterThanOrEqual(WELL_POSED_REDUNDANCY);
  });
});
