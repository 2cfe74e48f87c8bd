/**
 * A walking-leg problem: a crank-driven leg of any pose family, its foot the family's
 * output point P, fitted to gait targets (each optional and weighted) and, optionally,
 * to a foot trajectory. Made and checked here once, field by field; the objective trusts
 * what passes. The families' encodings need a path problem (their default boxes are
 * scaled by a target, their constraints are the path problem's): one is built here,
 * from the foot trajectory, or without one from the stride and step height placed on
 * the ground line, with the crank required to turn fully and the keep-out circles.
 */
import { fourBar, MAX_COORDINATE_MM } from '../linkage';
import { validateLeg, type GroundLineSpec, type LegSpec, type XyMm } from '../gait';
import type { PoseFamilyId } from './poseFamilies';
import { createProblem, type BoundsOverrides, type KeepOutCircle, type Problem, type ProblemIssue } from './problem';

/** The families a leg may be: every pose family (the closed-form four-bar has no crank direction of its own). */
export const LEG_FAMILY_IDS: readonly PoseFamilyId[] = ['fourbar', 'slider-crank', 'watt-i', 'watt-ii', 'stephenson-i', 'stephenson-ii', 'stephenson-iii'];
/** The foot: the output point every pose family carries. */
export const LEG_FOOT_ID = 'P';
/** Samples of the foot over one crank turn in the search: default, and the range. */
export const DEFAULT_LEG_STEPS = 180;
export const LEG_STEPS_RANGE = [36, 3600] as const;
/** Largest weight of a term; weights are relative, so this loses nothing. */
export const MAX_LEG_WEIGHT = 1e6;
/** Default tolerances (the deviation that counts as 1): a duty factor of 0.05, a speed variation of 0.05, 5°; mm terms take the stance tolerance. */
export const DEFAULT_DUTY_TOLERANCE = 0.05;
export const DEFAULT_SPEED_VARIATION_TOLERANCE = 0.05;
export const DEFAULT_TRANSMISSION_TOLERANCE_DEG = 5;

/** A resolved term: its target figure, weight and tolerance (in the figure's unit). */
export interface LegTerm {
  readonly value: number;
  readonly weight: number;
  readonly tolerance: number;
}

export interface LegTargets {
  /** The closed foot trajectory wanted (mm), in the order the foot traces it; the term is the RMS distance of its points from the foot's path. */
  readonly footPath?: { readonly points: readonly XyMm[]; readonly weight: number; readonly tolerance: number };
  readonly strideMm?: LegTerm;
  readonly stepHeightMm?: LegTerm;
  readonly minDutyFactor?: LegTerm;
  readonly maxFlatnessMm?: LegTerm;
  readonly maxSpeedVariation?: LegTerm;
  readonly minTransmissionDegInStance?: LegTerm;
  readonly sizeBoxMm?: { readonly widthMm: number; readonly heightMm: number; readonly weight: number; readonly tolerance: number };
}

export interface LegProblem {
  readonly kind: 'leg';
  readonly name: string;
  readonly families: readonly PoseFamilyId[];
  /** The leg as gaitFigures takes it (foot P; no foot trajectory: that is a target). */
  readonly leg: LegSpec;
  readonly steps: number;
  readonly targets: LegTargets;
  /** Ground pivots stay outside these circles (mm). */
  readonly keepOut: readonly LegKeepOut[];
  readonly bounds: BoundsOverrides;
  /** The path problem the families' encodings are built from (fixed placement, full-turn crank, keep-out circles). */
  readonly path: Problem;
}

export type LegKeepOut = KeepOutCircle & { readonly name?: string };

type Weighted = { readonly weight?: number };
export interface LegProblemInput {
  readonly kind: 'leg';
  readonly name: string;
  readonly families: readonly string[];
  readonly ground: GroundLineSpec;
  readonly stanceToleranceMm: number;
  readonly crankDirection: 1 | -1;
  readonly walkingDirection: 1 | -1;
  readonly steps?: number;
  readonly targets: {
    readonly footPath?: { readonly points: readonly (readonly number[])[]; readonly toleranceMm?: number } & Weighted;
    readonly strideMm?: { readonly value: number; readonly toleranceMm?: number } & Weighted;
    readonly stepHeightMm?: { readonly value: number; readonly toleranceMm?: number } & Weighted;
    readonly minDutyFactor?: { readonly min: number; readonly tolerance?: number } & Weighted;
    readonly maxFlatnessMm?: { readonly max: number; readonly toleranceMm?: number } & Weighted;
    readonly maxSpeedVariation?: { readonly max: number; readonly tolerance?: number } & Weighted;
    readonly minTransmissionDegInStance?: { readonly min: number; readonly toleranceDeg?: number } & Weighted;
    readonly sizeBoxMm?: { readonly widthMm: number; readonly heightMm: number; readonly toleranceMm?: number } & Weighted;
  };
  readonly keepOut?: readonly LegKeepOut[];
  readonly bounds?: BoundsOverrides;
}

export type LegProblemResult = { readonly ok: true; readonly problem: LegProblem } | { readonly ok: false; readonly issues: ProblemIssue[] };

function finite(v: unknown): v is number {
  return typeof v === 'number' && Number.isFinite(v);
}

/** Checks plain leg-problem data and returns the problem, or every issue found. */
export function createLegProblem(input: LegProblemInput): LegProblemResult {
  const issues: ProblemIssue[] = [];
  const legSpec: LegSpec = {
    foot: LEG_FOOT_ID,
    ground: input.ground,
    stanceToleranceMm: input.stanceToleranceMm,
    crankDirection: input.crankDirection,
    walkingDirection: input.walkingDirection,
  };
  // Any pose family carries P on a moving link: the default four-bar stands in for the check of the ground line and directions.
  const checked = validateLeg(legSpec, fourBar());
  if (!checked.ok) for (const i of checked.issues) issues.push({ path: i.path, message: i.message });
  const tol = input.stanceToleranceMm;

  const steps = input.steps ?? DEFAULT_LEG_STEPS;
  if (!(Number.isInteger(steps) && steps >= LEG_STEPS_RANGE[0] && steps <= LEG_STEPS_RANGE[1])) {
    issues.push({ path: 'steps', message: `is ${String(steps)}; expected a whole number of foot samples per crank turn from ${LEG_STEPS_RANGE[0]} to ${LEG_STEPS_RANGE[1]}` });
  }
  const families: PoseFamilyId[] = [];
  if (input.families.length === 0) issues.push({ path: 'families', message: `is empty; expected at least one of ${LEG_FAMILY_IDS.join(', ')}` });
  input.families.forEach((f, i) => {
    const first = input.families.indexOf(f);
    if (!(LEG_FAMILY_IDS as readonly string[]).includes(f)) issues.push({ path: `families[${i}]`, message: `"${f}" is not a leg family; expected one of ${LEG_FAMILY_IDS.join(', ')}` });
    else if (first < i) issues.push({ path: `families[${i}]`, message: `"${f}" is listed twice (also families[${first}]); expected each family once` });
    else families.push(f as PoseFamilyId);
  });

  const t = input.targets;
  const mmTol = finite(tol) && tol > 0 ? tol : 1;
  const weightOf = (path: string, w: number | undefined): number => {
    if (w === undefined) return 1;
    if (!(finite(w) && w >= 0 && w <= MAX_LEG_WEIGHT)) issues.push({ path: `${path}.weight`, message: `is ${String(w)}; expected a weight from 0 to ${MAX_LEG_WEIGHT}` });
    return w;
  };
  const toleranceOf = (path: string, v: number | undefined, fallback: number, unit: string): number => {
    if (v === undefined) return fallback;
    if (!(finite(v) && v > 0 && v <= MAX_COORDINATE_MM)) issues.push({ path, message: `is ${String(v)}; expected a tolerance above 0 (${unit}), the deviation that counts as 1` });
    return v;
  };
  const figure = (path: string, v: number, lo: number, hi: number, what: string): number => {
    if (!(finite(v) && v >= lo && v <= hi)) issues.push({ path, message: `is ${String(v)}; expected ${what}` });
    return v;
  };
  const mm = `a length in mm from 0 to ${MAX_COORDINATE_MM}`;
  const targets: {
    -readonly [K in keyof LegTargets]: LegTargets[K];
  } = {};
  let footPoints: XyMm[] = [];
  if (t.footPath !== undefined) {
    const pts = t.footPath.points;
    footPoints = pts.map((p) => ({ x: p[0], y: p[1] }));
    // validateLeg checks the trajectory's count and coordinates in the user's words.
    const withPath = validateLeg({ ...legSpec, footPath: footPoints }, fourBar());
    if (!withPath.ok) for (const i of withPath.issues) if (i.path.startsWith('footPath')) issues.push({ path: `targets.${i.path.replace('footPath', 'footPath.points')}`, message: i.message });
    pts.forEach((p, i) => {
      if (p.length !== 2) issues.push({ path: `targets.footPath.points[${i}]`, message: `has ${p.length} numbers; expected a pair [x mm, y mm]` });
    });
    targets.footPath = { points: footPoints, weight: weightOf('targets.footPath', t.footPath.weight), tolerance: toleranceOf('targets.footPath.toleranceMm', t.footPath.toleranceMm, mmTol, 'mm') };
  }
  if (t.strideMm !== undefined) {
    targets.strideMm = { value: figure('targets.strideMm.value', t.strideMm.value, 0, MAX_COORDINATE_MM, mm), weight: weightOf('targets.strideMm', t.strideMm.weight), tolerance: toleranceOf('targets.strideMm.toleranceMm', t.strideMm.toleranceMm, mmTol, 'mm') };
  }
  if (t.stepHeightMm !== undefined) {
    targets.stepHeightMm = { value: figure('targets.stepHeightMm.value', t.stepHeightMm.value, 0, MAX_COORDINATE_MM, mm), weight: weightOf('targets.stepHeightMm', t.stepHeightMm.weight), tolerance: toleranceOf('targets.stepHeightMm.toleranceMm', t.stepHeightMm.toleranceMm, mmTol, 'mm') };
  }
  if (t.minDutyFactor !== undefined) {
    targets.minDutyFactor = { value: figure('targets.minDutyFactor.min', t.minDutyFactor.min, 0, 1, 'a share of the turn from 0 to 1'), weight: weightOf('targets.minDutyFactor', t.minDutyFactor.weight), tolerance: toleranceOf('targets.minDutyFactor.tolerance', t.minDutyFactor.tolerance, DEFAULT_DUTY_TOLERANCE, 'a share of the turn') };
  }
  if (t.maxFlatnessMm !== undefined) {
    targets.maxFlatnessMm = { value: figure('targets.maxFlatnessMm.max', t.maxFlatnessMm.max, 0, MAX_COORDINATE_MM, mm), weight: weightOf('targets.maxFlatnessMm', t.maxFlatnessMm.weight), tolerance: toleranceOf('targets.maxFlatnessMm.toleranceMm', t.maxFlatnessMm.toleranceMm, mmTol, 'mm') };
  }
  if (t.maxSpeedVariation !== undefined) {
    targets.maxSpeedVariation = { value: figure('targets.maxSpeedVariation.max', t.maxSpeedVariation.max, 0, 1e6, 'a ratio ≥ 0 ((max − min) / mean)'), weight: weightOf('targets.maxSpeedVariation', t.maxSpeedVariation.weight), tolerance: toleranceOf('targets.maxSpeedVariation.tolerance', t.maxSpeedVariation.tolerance, DEFAULT_SPEED_VARIATION_TOLERANCE, 'a ratio') };
  }
  if (t.minTransmissionDegInStance !== undefined) {
    const m = t.minTransmissionDegInStance;
    targets.minTransmissionDegInStance = { value: figure('targets.minTransmissionDegInStance.min', m.min, 0, 90, 'an angle from 0 to 90 degrees'), weight: weightOf('targets.minTransmissionDegInStance', m.weight), tolerance: toleranceOf('targets.minTransmissionDegInStance.toleranceDeg', m.toleranceDeg, DEFAULT_TRANSMISSION_TOLERANCE_DEG, 'degrees') };
  }
  if (t.sizeBoxMm !== undefined) {
    const s = t.sizeBoxMm;
    const positive = `a length in mm above 0 and at most ${MAX_COORDINATE_MM}`;
    if (!(finite(s.widthMm) && s.widthMm > 0 && s.widthMm <= MAX_COORDINATE_MM)) issues.push({ path: 'targets.sizeBoxMm.widthMm', message: `is ${String(s.widthMm)}; expected ${positive}` });
    if (!(finite(s.heightMm) && s.heightMm > 0 && s.heightMm <= MAX_COORDINATE_MM)) issues.push({ path: 'targets.sizeBoxMm.heightMm', message: `is ${String(s.heightMm)}; expected ${positive}` });
    targets.sizeBoxMm = { widthMm: s.widthMm, heightMm: s.heightMm, weight: weightOf('targets.sizeBoxMm', s.weight), tolerance: toleranceOf('targets.sizeBoxMm.toleranceMm', s.toleranceMm, mmTol, 'mm') };
  }
  if (Object.keys(targets).length === 0) {
    issues.push({ path: 'targets', message: 'has no target; expected at least one of footPath, strideMm, stepHeightMm, minDutyFactor, maxFlatnessMm, maxSpeedVariation, minTransmissionDegInStance, sizeBoxMm' });
  }
  if (t.footPath === undefined && (t.strideMm === undefined || t.stepHeightMm === undefined)) {
    issues.push({ path: 'targets', message: 'has no foot trajectory; expected footPath, or both strideMm and stepHeightMm (they place and size the search\'s default boxes about the ground line)' });
  }
  if (issues.length > 0 || !checked.ok) return { ok: false, issues };

  // The frame of the families' default boxes: the trajectory, or the stride and step height standing on the ground line.
  const leg = checked.leg;
  let frame: XyMm[];
  if (footPoints.length > 0) {
    frame = footPoints;
  } else {
    const half = (targets.strideMm as LegTerm).value / 2;
    const up = (targets.stepHeightMm as LegTerm).value;
    const o = leg.originMm;
    const at = (s: number, h: number) => ({ x: o.x + s * leg.along.x + h * leg.up.x, y: o.y + s * leg.along.y + h * leg.up.y });
    frame = [at(-half, 0), at(half, 0), at(half, up), at(-half, up)];
  }
  // The encodings' curve runs with the driver angle increasing: a clockwise crank meets the trajectory's points in reverse.
  const ordered = input.crankDirection === -1 ? [...frame].reverse() : frame;
  const keepOut: LegKeepOut[] = (input.keepOut ?? []).map((k) => ({ ...(k.name === undefined ? {} : { name: k.name }), x: k.x, y: k.y, r: k.r }));
  const path = createProblem({
    kind: 'path',
    name: input.name,
    target: { points: ordered.map((p) => [p.x, p.y]), closed: true },
    timing: { mode: 'unprescribed', wrap: true, samples: steps },
    placement: 'fixed',
    families,
    ...(input.bounds === undefined ? {} : { bounds: input.bounds }),
    constraints: { fullTurnCrank: true, keepOut: keepOut.map((k) => ({ x: k.x, y: k.y, r: k.r })) },
    measure: 'rms',
  });
  if (!path.ok) {
    // Its fields are the leg problem's, but for the target (the trajectory, or the frame from stride and step height) and the keep-out circles.
    const where = (p: string) => p.replace(/^constraints\.keepOut/, 'keepOut').replace(/^target\.points/, footPoints.length > 0 ? 'targets.footPath.points' : 'targets (the stride and step height frame)');
    return { ok: false, issues: path.issues.map((i) => ({ path: where(i.path), message: i.message })) };
  }
  return {
    ok: true,
    problem: {
      kind: 'leg',
      name: input.name,
      families,
      leg: legSpec.ground.kind === 'level'
        ? { ...legSpec, ground: { kind: 'level', yMm: legSpec.ground.yMm } }
        : { ...legSpec, ground: { kind: 'line', point: { ...legSpec.ground.point }, direction: { ...legSpec.ground.direction } } },
      steps,
      targets,
      keepOut,
      bounds: path.problem.bounds,
      path: path.problem,
    },
  };
}
