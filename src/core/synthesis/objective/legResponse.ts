/**
 * The response of a leg problem: for one design, its violations (the family encoding's,
 * with the crank turning fully; with a foot trajectory, the path response's match of it)
 * and the gait figures the search scores, from the foot sampled at `steps` crank angles
 * over one turn with its exact rate. The figures are those of gaitFigures, taken on the
 * samples: stance ends and extremes are not located between samples here (the report
 * gives gaitFigures' own). Everything is allocated when the response is built;
 * responding allocates nothing.
 */
import { fourBar } from '../../linkage';
import { validateLeg, type Leg } from '../../gait';
import {
  CURVE_DX as CURVE_DX_BINDING,
  CURVE_DY as CURVE_DY_BINDING,
  CURVE_OUT_LENGTH,
  CURVE_T as CURVE_T_BINDING,
  CURVE_X as CURVE_X_BINDING,
  CURVE_Y as CURVE_Y_BINDING,
} from '../curve';
import { EXTENT_COS, EXTENT_LENGTH, EXTENT_MAX_X, EXTENT_MAX_Y, EXTENT_MIN_X, EXTENT_MIN_Y, V_BOUNDS, V_SLOTS, targetFrame } from '../encoding';
import type { LegProblem } from '../legProblem';
import type { PoseFamilyId } from '../poseFamilies';
import { boxViolationInto, createPathDesignSpace, type PathDesignSpace } from './designSpace';
import { createPathResponse, type PathResponse } from './pathResponse';
import { sumViolations } from './score';

// Imported constants as locals: a module transform may turn each read of an imported binding into a getter call (pathResponse.ts).
const CURVE_X = CURVE_X_BINDING;
const CURVE_Y = CURVE_Y_BINDING;
const CURVE_DX = CURVE_DX_BINDING;
const CURVE_DY = CURVE_DY_BINDING;
const CURVE_T = CURVE_T_BINDING;
const TAU = 2 * Math.PI;
const DEG_PER_RAD = 180 / Math.PI;

/** Violation slots after the encoding's (encoding.ts V_*). The foot's lowest point is not within the stance tolerance of the ground line: it never stands, or it digs in. */
export const L_GROUND = V_SLOTS;
/** In stance the foot moves forward relative to the body on average: the leg walks the other way. */
export const L_DIRECTION = V_SLOTS + 1;
/** A scored figure is not a number. */
export const L_UNDEFINED = V_SLOTS + 2;
export const L_SLOTS = V_SLOTS + 3;
/**
 * Samples of the size sweep over the turn: 5° apart, a chord short of an arc of radius r
 * by r(1 − cos 2.5°) ≈ 0.001 r; the report's size is gaitFigures' exact one.
 */
export const SIZE_STEPS = 72;
/** The least violation of a leg that walks the wrong way (its mean stance speed exactly 0 still counts). */
export const WRONG_WAY_VIOLATION = 1e-3;

/** Layout of the sampled gait figures (mm, mm per rad of crank, degrees, shares). */
export const G_STRIDE = 0;
export const G_STEP_HEIGHT = 1;
export const G_LOWEST = 2;
export const G_DUTY = 3;
export const G_FLAT_PP = 4;
export const G_FLAT_RMS = 5;
export const G_SPEED_MEAN = 6;
export const G_SPEED_VARIATION = 7;
/** The least of min(μ, 180° − μ) over the four-bar loops at the samples of the longest stance (90 without stance). */
export const G_WORST_TRANSMISSION_DEG = 8;
export const G_WIDTH = 9;
export const G_HEIGHT = 10;
/** RMS distance of the trajectory's points from the foot's path (mm; 0 without a trajectory). */
export const G_TRAJECTORY_RMS = 11;
/** Samples in the longest stance (0: none). */
export const G_STANCE_SAMPLES = 12;
export const G_COUNT = 13;

export interface LegResponse {
  readonly space: PathDesignSpace;
  readonly leg: Leg;
  /** Violation slots of the design responded to last (L_SLOTS). */
  readonly parts: Float64Array;
  readonly figures: Float64Array;
  /** Responds to design x: fills parts and figures; returns the violation. */
  respond(x: Float64Array): number;
}

/** Share of u ∈ [0, 1] where |a + (b − a)u| ≤ tol: the stance within one sample step, the height taken as linear. */
function bandShare(a: number, b: number, tol: number): number {
  const d = b - a;
  if (!(Math.abs(d) > 0)) return Math.abs(a) <= tol ? 1 : 0;
  const u1 = (-tol - a) / d;
  const u2 = (tol - a) / d;
  const lo = Math.max(0, Math.min(u1, u2));
  const hi = Math.min(1, Math.max(u1, u2));
  return hi > lo ? hi - lo : 0;
}

export function createLegResponse(problem: LegProblem, family: PoseFamilyId): LegResponse {
  const space = createPathDesignSpace(problem.path, family);
  const { encoding, dim, lower, upper } = space;
  const trajectory: PathResponse | null = problem.targets.footPath === undefined ? null : createPathResponse(problem.path, space);
  const checked = validateLeg(problem.leg, fourBar());
  // createLegProblem made the leg from the same spec.
  if (!checked.ok) throw new Error(`leg response: the problem's leg does not check: ${checked.issues.map((i) => i.message).join('; ')}`);
  const leg = checked.leg;
  const n = problem.steps;
  const dir = leg.crankDirection;
  const tol = leg.stanceToleranceMm;
  const scale = targetFrame(problem.path.target.points).size;
  const curve = encoding.curve;

  const parts = new Float64Array(L_SLOTS);
  const figures = new Float64Array(G_COUNT);
  const buf = new Float64Array(CURVE_OUT_LENGTH);
  const extent = new Float64Array(EXTENT_LENGTH);
  const identity = Float64Array.of(1, 0, 0, 0);
  /** No spans between target points: the full turn is the only motion. */
  const noSpans = new Float64Array(0);
  const height = new Float64Array(n);
  const along = new Float64Array(n);
  const back = new Float64Array(n);
  const inBand = new Uint8Array(n);

  function mechanismViolation(x: Float64Array): void {
    if (trajectory !== null) {
      const best = trajectory.evaluateAll(x);
      for (let s = 0; s < V_SLOTS; s++) parts[s] = trajectory.parts[s];
      figures[G_TRAJECTORY_RMS] = trajectory.evaluation[2 * best];
      return;
    }
    boxViolationInto(x, lower, upper, dim, parts, V_BOUNDS);
    encoding.load(x, 0, parts);
    encoding.placed(identity, parts);
    // Otherwise feasible: the exact lock search over the full turn.
    if (sumViolations(parts, V_SLOTS) <= 0) encoding.verify(noSpans, 0, parts);
  }

  /** Where between sample `out` (outside the band) and sample `inside` the foot crosses the band's edge, along the ground. */
  function crossingAlong(out: number, inside: number): number {
    const hOut = height[out];
    const d = height[inside] - hOut;
    const u = d !== 0 ? ((hOut > 0 ? tol : -tol) - hOut) / d : 1;
    return along[out] + (u >= 0 && u <= 1 ? u : 1) * (along[inside] - along[out]);
  }

  function respond(x: Float64Array): number {
    parts.fill(0);
    figures.fill(0);
    mechanismViolation(x);

    // The leg's size over the turn (the sweep leaves the curve at its reference pose).
    encoding.sweepExtent(Math.min(0, dir * TAU), Math.max(0, dir * TAU), SIZE_STEPS, identity, extent);
    figures[G_WIDTH] = extent[EXTENT_MAX_X] - extent[EXTENT_MIN_X];
    figures[G_HEIGHT] = extent[EXTENT_MAX_Y] - extent[EXTENT_MIN_Y];

    const o = leg.originMm;
    let lowest = Infinity;
    let highest = -Infinity;
    for (let k = 0; k < n; k++) {
      buf[CURVE_T] = (dir * TAU * k) / n;
      curve.atIo(1, buf);
      const px = buf[CURVE_X] - o.x;
      const py = buf[CURVE_Y] - o.y;
      const h = px * leg.up.x + py * leg.up.y;
      height[k] = h;
      along[k] = px * leg.along.x + py * leg.along.y;
      back[k] = -dir * (buf[CURVE_DX] * leg.along.x + buf[CURVE_DY] * leg.along.y);
      inBand[k] = Math.abs(h) <= tol ? 1 : 0;
      if (!(h >= lowest)) lowest = Number.isNaN(h) ? -Infinity : h;
      if (!(h <= highest)) highest = Number.isNaN(h) ? Infinity : h;
    }
    figures[G_LOWEST] = lowest;
    figures[G_STEP_HEIGHT] = highest;
    let duty = 0;
    for (let k = 0; k < n; k++) duty += bandShare(height[k], height[(k + 1) % n], tol);
    figures[G_DUTY] = duty / n;

    // The longest run of samples in the band, cyclically.
    let runStart = 0;
    let runLength = 0;
    let outside = -1;
    for (let k = 0; k < n && outside < 0; k++) if (inBand[k] === 0) outside = k;
    if (outside < 0) {
      runLength = n;
    } else {
      let start = -1;
      for (let j = 1; j <= n; j++) {
        const k = (outside + j) % n;
        if (inBand[k] === 1) {
          if (start < 0) start = outside + j;
        } else if (start >= 0) {
          if (outside + j - start > runLength) {
            runLength = outside + j - start;
            runStart = start % n;
          }
          start = -1;
        }
      }
    }
    figures[G_STANCE_SAMPLES] = runLength;
    figures[G_WORST_TRANSMISSION_DEG] = 90;
    if (runLength > 0) {
      let sMin = Infinity;
      let sMax = -Infinity;
      let hMin = Infinity;
      let hMax = -Infinity;
      let h2 = 0;
      let vMin = Infinity;
      let vMax = -Infinity;
      let vSum = 0;
      for (let j = 0; j < runLength; j++) {
        const k = (runStart + j) % n;
        sMin = Math.min(sMin, along[k]);
        sMax = Math.max(sMax, along[k]);
        hMin = Math.min(hMin, height[k]);
        hMax = Math.max(hMax, height[k]);
        h2 += height[k] * height[k];
        vMin = Math.min(vMin, back[k]);
        vMax = Math.max(vMax, back[k]);
        vSum += back[k];
      }
      if (runLength < n) {
        // The stance's ends between samples, the height and position linear there: the stride to second order in the step.
        const first = runStart;
        const before = (runStart + n - 1) % n;
        const last = (runStart + runLength - 1) % n;
        const after = (last + 1) % n;
        const a = crossingAlong(before, first);
        const b = crossingAlong(after, last);
        sMin = Math.min(sMin, a, b);
        sMax = Math.max(sMax, a, b);
      }
      const mean = vSum / runLength;
      figures[G_STRIDE] = sMax - sMin;
      figures[G_FLAT_PP] = hMax - hMin;
      figures[G_FLAT_RMS] = Math.sqrt(h2 / runLength);
      figures[G_SPEED_MEAN] = mean;
      figures[G_SPEED_VARIATION] = mean > 0 ? (vMax - vMin) / mean : 0;
      if (!(mean > 0)) parts[L_DIRECTION] = WRONG_WAY_VIOLATION + (Number.isNaN(mean) ? 1 : -mean / scale);
      const a = (dir * TAU * runStart) / n;
      const b = (dir * TAU * (runStart + runLength - 1)) / n;
      encoding.sweepExtent(Math.min(a, b), Math.max(a, b), Math.max(1, runLength - 1), identity, extent);
      const c = extent[EXTENT_COS];
      figures[G_WORST_TRANSMISSION_DEG] = Math.acos(c >= 1 ? 1 : c) * DEG_PER_RAD;
    }
    const reach = Math.abs(lowest) - tol;
    if (!(reach <= 0)) parts[L_GROUND] = Number.isNaN(reach) || reach === Infinity ? 1 : reach / scale;
    return sumViolations(parts, L_SLOTS);
  }

  return { space, leg, parts, figures, respond };
}
