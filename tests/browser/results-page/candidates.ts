/**
 * What the results test page shows: a target on the straight part of the Chebyshev–Hoeken
 * four-bar's coupler path and the reports `describe` gives for known linkages of several
 * families: the Hoeken linkage itself in both four-bar encodings (an exact fit), a
 * variant with its coupler point moved, and the default linkages of the families. Every
 * figure is computed by src/core (synthesis `describe`), none typed in; the node side of
 * the test builds the same list to check what the page shows.
 */
import {
  FOUR_BAR_DEFAULT,
  SLIDER_CRANK_DEFAULT,
  STEPHENSON_III_DEFAULT,
  WATT_I_DEFAULT,
  compile,
  fourBar,
  run,
  type FourBarPositions,
} from '../../../src/core/linkage';
import { compareCandidates, createObjective, createProblem, objectiveVariableNames, type CandidateReport, type FamilyId, type Problem } from '../../../src/core/synthesis';

/** One unit of the classical proportions, mm. */
export const HOEKEN_UNIT_MM = 20;
const S = HOEKEN_UNIT_MM;

/**
 * Chebyshev–Hoeken proportions (tests/reference/data/README.md, from memory): crank 1, ground 2,
 * rocker 2.5, coupler 2.5 from crank pin to rocker joint, tracing point at 5 from the crank
 * pin; drawn at crank angle 0, where the tracing point is at (−2, 4).
 */
export const HOEKEN: FourBarPositions = {
  A0: { x: 0, y: 0 },
  B0: { x: -2 * S, y: 0 },
  A: { x: S, y: 0 },
  B: { x: -0.5 * S, y: 2 * S },
  P: { x: -2 * S, y: 4 * S },
};

/** Crank angles (deg) of the target points: the straight part of the path, either side of 0. */
const TARGET_CRANK_DEG = [-50, -40, -30, -20, -10, 0, 10, 20, 30, 40, 50];

export interface ResultsFixture {
  readonly problem: Problem;
  readonly target: { readonly points: readonly (readonly [number, number])[]; readonly closed: boolean };
  /** Ranked best first, by the synthesis ranking. */
  readonly candidates: readonly CandidateReport[];
}

function hoekenTarget(): [number, number][] {
  const compiled = compile(fourBar(HOEKEN));
  if (!compiled.ok) throw new Error('the Hoeken four-bar does not compile');
  const plan = compiled.plan;
  const slot = plan.slotIndex.get('P');
  if (slot === undefined) throw new Error('the Hoeken four-bar has no point P');
  const pose = Float64Array.from(plan.reference);
  return TARGET_CRANK_DEG.map((deg) => {
    if (!run(plan, (deg * Math.PI) / 180, pose)) throw new Error(`the Hoeken four-bar does not assemble at ${deg}°`);
    return [pose[2 * slot], pose[2 * slot + 1]];
  });
}

/** A design vector of a pose-based family from named positions (`A0.x`, `A0.y`, …). */
function poseVector(problem: Problem, family: FamilyId, at: object): Float64Array {
  const positions = at as Record<string, { x: number; y: number } | number>;
  return Float64Array.from(objectiveVariableNames(problem, family).map((name) => {
    const [joint, axis] = name.split('.');
    const p = positions[joint];
    if (typeof p !== 'object' || (axis !== 'x' && axis !== 'y')) throw new Error(`no position for variable ${name}`);
    return p[axis];
  }));
}

export function resultsFixture(): ResultsFixture {
  const points = hoekenTarget();
  const families: FamilyId[] = ['fourbar-lengths', 'fourbar', 'slider-crank', 'watt-i', 'stephenson-iii'];
  const created = createProblem({
    name: 'Straight line from the Chebyshev–Hoeken four-bar',
    target: { points, closed: false },
    timing: { mode: 'unprescribed' },
    placement: 'fixed',
    families,
    constraints: { branch: 'either' },
  });
  if (!created.ok) throw new Error(`test problem: ${created.issues.map((i) => `${i.path}: ${i.message}`).join('; ')}`);
  const problem = created.problem;
  const describe = (family: FamilyId, x: Float64Array) => createObjective(problem, family).describe(x);
  const candidates = [
    // The literature encoding: ground, crank, coupler, rocker, coupler point (rcx, rcy), ground angle, crank pivot.
    describe('fourbar-lengths', Float64Array.from([2 * S, S, 2.5 * S, 2.5 * S, 5 * S, 0, Math.PI, 0, 0])),
    describe('fourbar', poseVector(problem, 'fourbar', HOEKEN)),
    describe('fourbar', poseVector(problem, 'fourbar', { ...HOEKEN, P: { x: -2.2 * S, y: 4.1 * S } })),
    describe('fourbar', poseVector(problem, 'fourbar', { ...HOEKEN, B: { x: -0.3 * S, y: 2.2 * S }, P: { x: -1.8 * S, y: 4.3 * S } })),
    describe('fourbar', poseVector(problem, 'fourbar', FOUR_BAR_DEFAULT)),
    describe('slider-crank', poseVector(problem, 'slider-crank', SLIDER_CRANK_DEFAULT)),
    describe('watt-i', poseVector(problem, 'watt-i', WATT_I_DEFAULT)),
    describe('stephenson-iii', poseVector(problem, 'stephenson-iii', STEPHENSON_III_DEFAULT)),
  ].sort(compareCandidates);
  return { problem, target: { points, closed: false }, candidates };
}
