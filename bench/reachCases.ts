/**
 * The reach set: path problems whose targets are sampled from known linkages, so the
 * optimum of each is zero. Every case carries its generating design (`design`, in its
 * objective's variable order) and everything the target was made from (the link lengths
 * or reference-pose positions, the driver values, and with a free placement the
 * similarity applied to the curve), so anyone can rebuild and check it: the generating
 * design evaluates to RMS ≈ 0 under the case's own problem
 * (tests/unit/reachCases.test.ts).
 *
 * The set spans families (the literature four-bar, the pose four-bar, the slider-crank,
 * and the Watt I, Watt II and Stephenson I six-bars), the three timing modes (prescribed:
 * driver values given; free: one driver variable per point; unprescribed: matched in
 * order), open arcs and closed loops, and fixed and free placements. Every case is
 * measured in RMS (mm); a search has reached the optimum when its best feasible RMS is
 * at most REACH_SHARE of the target's size (the larger side of its bounding box).
 *
 * Driver values: for `fourbar-lengths` the crank angle θ2 from the ground line (rad); for
 * the pose families the crank's rotation from its reference-pose angle (rad), as the
 * problem's timing takes them. Pose-family curves are followed from the reference pose
 * in steps of at most FOLLOW_STEP_RAD, so each point is on the reference pose's branch,
 * the branch the objective tracks.
 */
import {
  compile,
  fourBar,
  run,
  sliderCrank,
  stephensonI,
  wattI,
  wattII,
  type FourBarPositions,
  type Linkage,
  type SliderCrankPositions,
  type StephensonIPositions,
  type WattIIPositions,
  type WattIPositions,
} from '../src/core/linkage';
import { FOUR_BAR_OUT_LENGTH, fourBarCouplerPointInto } from '../src/core/synthesis/fourBarClosedForm';
import { poseVariableNames } from '../src/core/synthesis/familyVariables';
import type { FamilyId, ProblemInput } from '../src/core/synthesis';

/** Reached: best feasible RMS at most this share of the target's size. */
export const REACH_SHARE = 1e-4;
/** Largest driver step when a pose-family curve is followed from its reference pose, rad (2°). */
const FOLLOW_STEP_RAD = Math.PI / 90;
const TAU = 2 * Math.PI;
/**
 * Curve samples of an unprescribed match: over four times the most target points of a case,
 * so each point has samples of its own to match; the default (180) would nearly double the
 * cost of an evaluation and buy nothing here, since the match is refined on the curve.
 */
const MATCH_SAMPLES = 96;

export type TimingMode = 'prescribed' | 'free' | 'unprescribed';
export type PathShape = 'open' | 'closed';

/** A similarity p ↦ scale · R(rotationRad) p + (tx, ty), applied to the curve of a free-placement case. */
export interface Similarity {
  readonly scale: number;
  readonly rotationRad: number;
  readonly tx: number;
  readonly ty: number;
}

/** The literature four-bar: r1 ground, r2 crank, r3 coupler, r4 rocker, (rcx, rcy) the point on the coupler, θ0, (x0, y0) the crank pivot; mm and rad. */
export interface FourBarLengths {
  readonly r1: number;
  readonly r2: number;
  readonly r3: number;
  readonly r4: number;
  readonly rcx: number;
  readonly rcy: number;
  readonly theta0: number;
  readonly x0: number;
  readonly y0: number;
}

/** What a case's target is sampled from. */
export type Generator =
  | { readonly family: 'fourbar-lengths'; readonly lengths: FourBarLengths }
  | { readonly family: 'fourbar'; readonly pose: FourBarPositions }
  | { readonly family: 'slider-crank'; readonly pose: SliderCrankPositions }
  | { readonly family: 'watt-i'; readonly pose: WattIPositions }
  | { readonly family: 'watt-ii'; readonly pose: WattIIPositions }
  | { readonly family: 'stephenson-i'; readonly pose: StephensonIPositions };

/** How one case is made: the generating linkage, where along its motion the points are, the timing mode and the placement. */
export interface CaseSpec {
  readonly id: string;
  readonly generator: Generator;
  readonly timing: TimingMode;
  readonly shape: PathShape;
  /** Driver values of the target points (rad, as the family's timing takes them). */
  readonly driverValues: readonly number[];
  /** Free placement: the similarity applied to the sampled curve (the search must find it). Fixed placement: absent. */
  readonly similarity?: Similarity;
}

export interface ReachCase {
  readonly id: string;
  readonly family: FamilyId;
  readonly timing: TimingMode;
  readonly shape: PathShape;
  readonly placement: 'fixed' | 'free';
  /** The problem as plain data (createProblem's input). */
  readonly problem: ProblemInput;
  /** The problem file the engine and the command line read. */
  readonly problemFile: Record<string, unknown>;
  /** The generating design in the objective's variable order (free timing: its driver values last). */
  readonly design: readonly number[];
  readonly designNames: readonly string[];
  /** The larger side of the target's bounding box, mm. */
  readonly sizeMm: number;
  /** The RMS (mm) at or below which a search has reached the optimum: REACH_SHARE × size. */
  readonly reachRmsMm: number;
  readonly spec: CaseSpec;
}

// ---------------------------------------------------------------------------------------
// Driver-value patterns.

/** n values over a whole turn from `start`, unevenly spaced (an even spacing is a special case a search could exploit). */
function loop(n: number, start: number): number[] {
  return Array.from({ length: n }, (_, i) => start + (TAU * (i + 0.25 * Math.sin(1.7 * i + 0.4))) / n);
}

/** n values from `start` over `span` rad, unevenly spaced. */
export function arc(n: number, start: number, span: number): number[] {
  return Array.from({ length: n }, (_, i) => start + (span * (i + 0.2 * Math.sin(2.3 * i))) / (n - 1 + 0.2 * Math.sin(2.3 * (n - 1))));
}

/** Values reduced into [0, 2π), the default box of a free driver variable. */
function inTurn(values: readonly number[]): number[] {
  return values.map((v) => ((v % TAU) + TAU) % TAU);
}

// ---------------------------------------------------------------------------------------
// The generating linkages (mm). Each four-bar is a Grashof crank-rocker and each six-bar's
// crank turns fully, so closed loops are whole turns of the crank. No pose-family design
// has a joint where its family's default pose (src/core/linkage/families.ts) has it.

const LENGTHS_A: FourBarLengths = { r1: 100, r2: 35, r3: 110, r4: 90, rcx: 55, rcy: 40, theta0: 0.3, x0: 20, y0: -10 };
const LENGTHS_B: FourBarLengths = { r1: 80, r2: 25, r3: 70, r4: 60, rcx: -20, rcy: 50, theta0: 5.9, x0: 0, y0: 30 };
/** Ground-link units (r1 = 1, θ0 = x0 = y0 = 0): the free-placement encoding's own frame. */
const LENGTHS_UNIT: FourBarLengths = { r1: 1, r2: 0.4, r3: 1.2, r4: 0.9, rcx: 0.5, rcy: 0.6, theta0: 0, x0: 0, y0: 0 };

const FOUR_BAR_A: FourBarPositions = { A0: { x: -10, y: 15 }, B0: { x: 85, y: -5 }, A: { x: -5, y: 45 }, B: { x: 95, y: 75 }, P: { x: 60, y: 115 } };
const FOUR_BAR_B: FourBarPositions = { A0: { x: 10, y: 5 }, B0: { x: 95, y: -15 }, A: { x: -15, y: 25 }, B: { x: 70, y: 80 }, P: { x: 20, y: 95 } };
const SLIDER_A: SliderCrankPositions = { A0: { x: 10, y: -5 }, A: { x: -20, y: 20 }, B: { x: 120, y: 25 }, P: { x: 70, y: 75 }, slideAngleRad: 0 };
const SLIDER_B: SliderCrankPositions = { A0: { x: 0, y: 0 }, A: { x: 35, y: -10 }, B: { x: 140, y: 15 }, P: { x: 60, y: 70 }, slideAngleRad: 0 };
const WATT_I: WattIPositions = {
  A0: { x: -10, y: 15 },
  B0: { x: 85, y: -5 },
  A: { x: -5, y: 45 },
  B: { x: 95, y: 75 },
  C: { x: -35, y: 30 },
  D: { x: 70, y: 125 },
  E: { x: 10, y: 150 },
  P: { x: 45, y: 160 },
};
const WATT_II: WattIIPositions = {
  A0: { x: 5, y: -5 },
  B0: { x: 95, y: 5 },
  C0: { x: 175, y: 70 },
  A: { x: 25, y: 30 },
  B: { x: 115, y: 80 },
  C: { x: 155, y: 45 },
  D: { x: 165, y: 125 },
  P: { x: 115, y: 145 },
};
const STEPHENSON_I: StephensonIPositions = {
  A0: { x: 5, y: -10 },
  B0: { x: 95, y: 10 },
  A: { x: 30, y: 20 },
  B: { x: 125, y: 85 },
  C: { x: -15, y: 15 },
  D: { x: 150, y: 40 },
  E: { x: 70, y: -50 },
  P: { x: 20, y: -75 },
};

const TURNED: Similarity = { scale: 0.8, rotationRad: 0.7, tx: 30, ty: -20 };
const UNIT_PLACED: Similarity = { scale: 90, rotationRad: -0.5, tx: 40, ty: 15 };

/**
 * The set. Ids: family, timing (p, f, u), shape (open, closed), placement (fixed, free).
 *
 * Each case has at least WELL_POSED_REDUNDANCY more equations (two per point) than the
 * unknowns its optimum has (the mechanism's dimensions, its placement, and one driver value
 * per point under free or unprescribed timing): with fewer, designs other than the
 * generating one pass within the reach error of every point. Ten points under free
 * timing leave the literature four-bar one equation over (20 against 9 + 10 unknowns),
 * and its searches end on such other designs (the nine-point problem has up to 1442
 * exact four-bars per nine points: Wampler, Morgan and Sommese, 1992; from memory).
 */
export const REACH_SPECS: readonly CaseSpec[] = [
  // The literature four-bar (9 unknowns; free placement: 5 of shape and 4 of the similarity).
  { id: 'lengths-p-open-fixed', generator: { family: 'fourbar-lengths', lengths: LENGTHS_A }, timing: 'prescribed', shape: 'open', driverValues: arc(8, 0.5, 3.5) },
  { id: 'lengths-p-closed-fixed', generator: { family: 'fourbar-lengths', lengths: LENGTHS_B }, timing: 'prescribed', shape: 'closed', driverValues: loop(12, 0.2) },
  { id: 'lengths-f-open-fixed', generator: { family: 'fourbar-lengths', lengths: LENGTHS_A }, timing: 'free', shape: 'open', driverValues: arc(16, 0.4, 4) },
  { id: 'lengths-f-closed-fixed', generator: { family: 'fourbar-lengths', lengths: LENGTHS_B }, timing: 'free', shape: 'closed', driverValues: inTurn(loop(16, 1)) },
  { id: 'lengths-u-closed-fixed', generator: { family: 'fourbar-lengths', lengths: LENGTHS_A }, timing: 'unprescribed', shape: 'closed', driverValues: loop(16, 0.1) },
  { id: 'lengths-p-open-free', generator: { family: 'fourbar-lengths', lengths: LENGTHS_UNIT }, timing: 'prescribed', shape: 'open', driverValues: arc(8, 1, 3), similarity: UNIT_PLACED },
  { id: 'lengths-f-closed-free', generator: { family: 'fourbar-lengths', lengths: LENGTHS_UNIT }, timing: 'free', shape: 'closed', driverValues: inTurn(loop(16, 2)), similarity: UNIT_PLACED },
  { id: 'lengths-u-open-free', generator: { family: 'fourbar-lengths', lengths: LENGTHS_UNIT }, timing: 'unprescribed', shape: 'open', driverValues: arc(16, 0.3, 5.5), similarity: UNIT_PLACED },
  // The pose four-bar (10 unknowns: the four-bar's 9 and its reference crank angle, which free timing absorbs).
  { id: 'fourbar-p-open-fixed', generator: { family: 'fourbar', pose: FOUR_BAR_A }, timing: 'prescribed', shape: 'open', driverValues: arc(8, 0, 3) },
  { id: 'fourbar-p-closed-free', generator: { family: 'fourbar', pose: FOUR_BAR_B }, timing: 'prescribed', shape: 'closed', driverValues: loop(12, 0), similarity: TURNED },
  { id: 'fourbar-f-open-fixed', generator: { family: 'fourbar', pose: FOUR_BAR_B }, timing: 'free', shape: 'open', driverValues: arc(16, 0.2, 4) },
  { id: 'fourbar-u-closed-free', generator: { family: 'fourbar', pose: FOUR_BAR_A }, timing: 'unprescribed', shape: 'closed', driverValues: loop(16, 0), similarity: TURNED },
  // The slider-crank (8 unknowns: crank pivot, crank, rod, offset, coupler point, reference angle).
  { id: 'slider-p-open-fixed', generator: { family: 'slider-crank', pose: SLIDER_A }, timing: 'prescribed', shape: 'open', driverValues: arc(8, 0, 3.5) },
  { id: 'slider-f-closed-fixed', generator: { family: 'slider-crank', pose: SLIDER_B }, timing: 'free', shape: 'closed', driverValues: inTurn(loop(14, 0.3)) },
  { id: 'slider-p-closed-free', generator: { family: 'slider-crank', pose: SLIDER_A }, timing: 'prescribed', shape: 'closed', driverValues: loop(12, 0), similarity: TURNED },
  { id: 'slider-u-open-fixed', generator: { family: 'slider-crank', pose: SLIDER_B }, timing: 'unprescribed', shape: 'open', driverValues: arc(14, 0.5, 3.5) },
  // Six-bars (16 unknowns: eight joints and points).
  { id: 'watt1-p-open-fixed', generator: { family: 'watt-i', pose: WATT_I }, timing: 'prescribed', shape: 'open', driverValues: arc(11, 0, 3) },
  { id: 'watt1-p-closed-free', generator: { family: 'watt-i', pose: WATT_I }, timing: 'prescribed', shape: 'closed', driverValues: loop(12, 0.5), similarity: TURNED },
  { id: 'watt2-p-closed-fixed', generator: { family: 'watt-ii', pose: WATT_II }, timing: 'prescribed', shape: 'closed', driverValues: loop(12, 0) },
  { id: 'steph1-p-open-free', generator: { family: 'stephenson-i', pose: STEPHENSON_I }, timing: 'prescribed', shape: 'open', driverValues: arc(11, 0, 3), similarity: TURNED },
  { id: 'steph1-u-closed-fixed', generator: { family: 'stephenson-i', pose: STEPHENSON_I }, timing: 'unprescribed', shape: 'closed', driverValues: loop(22, 0) },
];

/** Fewest equations over unknowns a case of the set has (see REACH_SPECS). */
export const WELL_POSED_REDUNDANCY = 6;

/**
 * Unknowns of a family's optimum with driver values given: the four-bar's 9 (six
 * dimensions and a placement; free placement: five in ground-link units and a
 * similarity), the pose four-bar's 10 (and its reference crank angle), the slider-crank's
 * 8 (crank pivot, crank, reference angle, rod, offset, coupler point; free placement adds
 * the slide's direction), a six-bar's 16 (its eight joint and point positions).
 */
function mechanismUnknowns(family: FamilyId, placement: 'fixed' | 'free'): number {
  if (family === 'fourbar-lengths') return 9;
  if (family === 'fourbar') return 10;
  if (family === 'slider-crank') return placement === 'free' ? 9 : 8;
  return 16;
}

/**
 * Equations (two per point) less the unknowns of the case's optimum: the mechanism's, and
 * under free or unprescribed timing one driver value per point, which absorbs a pose
 * family's reference crank angle.
 */
export function redundancy(spec: CaseSpec): number {
  const n = spec.driverValues.length;
  const family = spec.generator.family;
  const placement = spec.similarity === undefined ? 'fixed' : 'free';
  const perPoint = spec.timing === 'prescribed' ? 0 : n - (family === 'fourbar-lengths' ? 0 : 1);
  return 2 * n - mechanismUnknowns(family, placement) - perPoint;
}

/** The quick subset (`npm run bench -- reach-quick`): cheap cases of each kind of outcome, seconds of work. */
export const REACH_QUICK_IDS: readonly string[] = ['lengths-p-open-fixed', 'lengths-p-open-free', 'lengths-f-open-fixed', 'slider-p-open-fixed'];

// ---------------------------------------------------------------------------------------
// Sampling.

function place(points: number[][], s: Similarity | undefined): number[][] {
  if (s === undefined) return points;
  const a = s.scale * Math.cos(s.rotationRad);
  const b = s.scale * Math.sin(s.rotationRad);
  return points.map(([x, y]) => [a * x - b * y + s.tx, b * x + a * y + s.ty]);
}

function lengthsVector(l: FourBarLengths): number[] {
  return [l.r1, l.r2, l.r3, l.r4, l.rcx, l.rcy, l.theta0, l.x0, l.y0];
}

/** The literature four-bar's coupler point at each crank angle, open branch (sign +1). */
function sampleLengths(l: FourBarLengths, driverValues: readonly number[]): number[][] {
  const p = Float64Array.from(lengthsVector(l));
  const out = new Float64Array(FOUR_BAR_OUT_LENGTH);
  return driverValues.map((t) => {
    const margin = fourBarCouplerPointInto(p, 0, t, 1, 0, out);
    if (!(margin >= 0)) throw new Error(`reach set: the four-bar ${JSON.stringify(l)} does not assemble at θ2 = ${t} rad`);
    return [out[0], out[1]];
  });
}

function poseLinkage(g: Exclude<Generator, { family: 'fourbar-lengths' }>): Linkage {
  switch (g.family) {
    case 'fourbar':
      return fourBar(g.pose);
    case 'slider-crank':
      return sliderCrank(g.pose);
    case 'watt-i':
      return wattI(g.pose);
    case 'watt-ii':
      return wattII(g.pose);
    case 'stephenson-i':
      return stephensonI(g.pose);
  }
}

/** A pose family's output point at each driver value (rotation from the reference pose), followed from the reference pose; also its design vector. */
function samplePose(g: Exclude<Generator, { family: 'fourbar-lengths' }>, driverValues: readonly number[]): { points: number[][]; design: number[]; names: string[] } {
  const compiled = compile(poseLinkage(g));
  if (!compiled.ok) throw new Error(`reach set: the ${g.family} of ${JSON.stringify(g.pose)} does not compile`);
  const plan = compiled.plan;
  const p = 2 * (plan.slotIndex.get('P') ?? -1);
  const points = driverValues.map((target) => {
    const pose = Float64Array.from(plan.reference);
    const steps = Math.max(1, Math.ceil(Math.abs(target) / FOLLOW_STEP_RAD));
    for (let k = 1; k <= steps; k++) {
      if (!run(plan, plan.driverReferenceValue + (target * k) / steps, pose)) {
        throw new Error(`reach set: the ${g.family} of ${JSON.stringify(g.pose)} does not assemble at driver ${(target * k) / steps} rad`);
      }
    }
    return [pose[p], pose[p + 1]];
  });
  return { points, design: Array.from(plan.reference), names: poseVariableNames(plan) };
}

function sizeOf(points: number[][]): number {
  const xs = points.map((q) => q[0]);
  const ys = points.map((q) => q[1]);
  return Math.max(Math.max(...xs) - Math.min(...xs), Math.max(...ys) - Math.min(...ys));
}

/** Builds a case: its target from the generating linkage, its problem and its generating design. */
export function buildCase(spec: CaseSpec): ReachCase {
  const g = spec.generator;
  const placement = spec.similarity === undefined ? 'fixed' : 'free';
  let curve: number[][];
  let design: number[];
  let names: string[];
  if (g.family === 'fourbar-lengths') {
    curve = sampleLengths(g.lengths, spec.driverValues);
    const l = g.lengths;
    design = placement === 'fixed' ? lengthsVector(l) : [l.r2, l.r3, l.r4, l.rcx, l.rcy];
    names = placement === 'fixed' ? ['r1', 'r2', 'r3', 'r4', 'rcx', 'rcy', 'theta0', 'x0', 'y0'] : ['r2', 'r3', 'r4', 'rcx', 'rcy'];
    if (placement === 'free' && !(l.r1 === 1 && l.theta0 === 0 && l.x0 === 0 && l.y0 === 0)) {
      throw new Error(`reach set ${spec.id}: a free-placement four-bar is given in ground-link units (r1 = 1, θ0 = x0 = y0 = 0)`);
    }
  } else {
    const sampled = samplePose(g, spec.driverValues);
    curve = sampled.points;
    design = sampled.design;
    names = sampled.names;
  }
  const points = place(curve, spec.similarity);
  const prefix = g.family === 'fourbar-lengths' ? 'theta2' : 'driver';
  if (spec.timing === 'free') {
    design = [...design, ...spec.driverValues];
    names = [...names, ...spec.driverValues.map((_, i) => `${prefix}_${i + 1}`)];
  }
  const closed = spec.shape === 'closed';
  // Free timing refined, as the app poses it (src/app/run/runInput.ts): each design's driver
  // values refined on its curve, and refitted where the target's match moves a point.
  const timing: ProblemInput['timing'] =
    spec.timing === 'prescribed'
      ? { mode: 'prescribed', driverValues: [...spec.driverValues] }
      : spec.timing === 'free'
        ? { mode: 'free', wrap: closed, refine: true }
        : { mode: 'unprescribed', samples: MATCH_SAMPLES };
  const problem: ProblemInput = {
    kind: 'path',
    name: `reach ${spec.id}`,
    target: { points, closed },
    timing,
    placement,
    families: [g.family],
    measure: 'rms',
  };
  const sizeMm = sizeOf(points);
  return {
    id: spec.id,
    family: g.family,
    timing: spec.timing,
    shape: spec.shape,
    placement,
    problem,
    problemFile: { format: 'loci-problem', version: 1, ...problem },
    design,
    designNames: names,
    sizeMm,
    reachRmsMm: REACH_SHARE * sizeMm,
    spec,
  };
}

export function reachCases(ids?: readonly string[]): ReachCase[] {
  const specs = ids === undefined ? REACH_SPECS : ids.map((id) => {
    const spec = REACH_SPECS.find((s) => s.id === id);
    if (spec === undefined) throw new Error(`reach set: no case "${id}"; known: ${REACH_SPECS.map((s) => s.id).join(', ')}`);
    return spec;
  });
  return specs.map(buildCase);
}
