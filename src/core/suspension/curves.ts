/**
 * The per-step kernel of the suspension metrics: every curve at every step of a sweep
 * of the shock, from the solved pose and its exact rates d(pose)/d(shock length). It
 * allocates nothing: the curves and the scratch (createCurves, createCurveScratch) are
 * allocated once, by the caller.
 */
import { runWithRates as runWithRatesImport, type Plan, type SweepResult } from '../linkage';
import { IC_SCRATCH_LENGTH, instantCentrePathInto as instantCentrePathIntoImport } from '../linkage/analysis';
import {
  antiSquatHeightMm as antiSquatHeightImport,
  axleLineInto as axleLineIntoImport,
  brakeCentreInto as brakeCentreIntoImport,
  heightThroughMm as heightThroughImport,
} from './antiLines';
import type { ValidBicycle } from './bicycle';
import {
  RUN_COS_TILT,
  RUN_LENGTH_MM,
  RUN_NX,
  RUN_NY,
  RUN_OFFSET_MM,
  RUN_SCRATCH_LENGTH,
  RUN_SIN_TILT,
  upperRunAlongInto as upperRunAlongImport,
  wrappedRunGrowthMm as wrappedRunGrowthImport,
} from './chain';
import {
  springForceN as springForceImport,
  springRateNPerMm as springRateImport,
  wheelRateNPerMm as wheelRateImport,
} from './spring';

// The kernel's loops call module-local functions and read literal slots: dev-time module
// transforms such as tsx's turn every imported binding into a getter call, which also
// keeps V8 from inlining the call (see run.ts). Each literal is checked against its
// named constant in chain.ts by `satisfies`.
const runWithRates = runWithRatesImport;
const instantCentrePathInto = instantCentrePathIntoImport;
const antiSquatHeightMm = antiSquatHeightImport;
const axleLineInto = axleLineIntoImport;
const brakeCentreInto = brakeCentreIntoImport;
const heightThroughMm = heightThroughImport;
const upperRunAlongInto = upperRunAlongImport;
const wrappedRunGrowthMm = wrappedRunGrowthImport;
const springForceN = springForceImport;
const springRateNPerMm = springRateImport;
const wheelRateNPerMm = wheelRateImport;
const NX = 1 satisfies typeof RUN_NX;
const NY = 2 satisfies typeof RUN_NY;
const OFFSET = 3 satisfies typeof RUN_OFFSET_MM;

/**
 * What every cog shares at a step, STEP_WIDTH numbers per step in CurveScratch.shared:
 * the unit vector from the axle to the bottom bracket, their distance and its turn since
 * full extension, the line through the axle and the instant centre (homogeneous), and
 * the axle body's turn.
 */
const STEP_UX = 0;
const STEP_UY = 1;
const STEP_D = 2;
const STEP_LINE_TURN = 3;
const STEP_M = 4;
const STEP_TURN = 7;
const STEP_WIDTH = 8;

/** Numbers per cog in CurveContext.chain0: the run's tangent length, sin and cos of its tilt, and its normal's angle, at full extension. */
const CHAIN0_WIDTH = 4;

/**
 * Step (mm of shock length) of the central difference of the exact leverage ratio that
 * gives dLR/ds for the wheel rate (the kernel gives first derivatives only). Truncation
 * error is h²/6 · LR''' ≈ 1.7e-5 mm² · LR'''; rounding is about ε·LR/h ≈ 2e-14 · LR.
 */
export const LEVERAGE_SLOPE_STEP_MM = 1e-2;

const RAD_TO_DEG = 180 / Math.PI;

export interface InstantCentreCurve {
  /** IC_FINITE (1), IC_INFINITE (2), IC_INDETERMINATE (3) or IC_UNASSEMBLED (0), as in the linkage analysis. */
  readonly kind: Uint8Array;
  /** The centre (finite), or its unit direction (at infinity); NaN otherwise. */
  readonly xMm: Float64Array;
  readonly yMm: Float64Array;
}

export interface SuspensionCurves {
  readonly steps: number;
  readonly shockLengthMm: Float64Array;
  /** Shock shortening from full extension. */
  readonly shockTravelMm: Float64Array;
  /** Vertical wheel travel: axle y − axle y at full extension. */
  readonly travelMm: Float64Array;
  readonly axleXMm: Float64Array;
  readonly axleYMm: Float64Array;
  /** Rearward axle movement since full extension (positive: the axle moved back, away from the bottom bracket). */
  readonly rearwardMm: Float64Array;
  /** d(vertical wheel travel) / d(shock shortening), exact. */
  readonly leverageRatio: Float64Array;
  /** Null without a spring. */
  readonly springForceN: Float64Array | null;
  readonly wheelRateNPerMm: Float64Array | null;
  /** The cogs, in the bicycle's order; the per-cog curves follow it. */
  readonly cogTeeth: readonly number[];
  readonly antiSquatPct: readonly Float64Array[];
  /** Upper-run growth with neither sprocket turning relative to the front frame. */
  readonly chainGrowthMm: readonly Float64Array[];
  /** Upper-run growth with the cog turning with the axle-carrying body (chainring held). */
  readonly chainGrowthTurningCogMm: readonly Float64Array[];
  /** Crank rotation the frame-held chain growth forces: growth / chainring pitch radius; positive turns the cranks backwards. */
  readonly kickbackDeg: readonly Float64Array[];
  /** Brake caliper on the axle-carrying body. */
  readonly antiRisePct: Float64Array;
  /** Brake caliper on `floatingBrakeBody`; null when none is named. */
  readonly antiRiseFloatingPct: Float64Array | null;
  /** Instant centre of the axle-carrying body relative to the front frame. */
  readonly icPath: InstantCentreCurve;
}

/** What the kernel needs about the plan and the bicycle, resolved once. */
export interface CurveContext {
  readonly plan: Plan;
  readonly bicycle: ValidBicycle;
  readonly eyeToEyeMm: number;
  readonly axleBody: number;
  /** Pose offsets of the axle point and of the axle body's joint farthest from it. */
  readonly axleAt: number;
  readonly axleRefAt: number;
  /** The brake body's two farthest slots, or −1. */
  readonly brakeBody: number;
  readonly brakeAt: number;
  readonly brakeRefAt: number;
  readonly cogRadiusMm: Float64Array;
  readonly ringRadiusMm: number;
  /**
   * Full extension: axle; the chain per cog (chainAtFullExtensionInto: tangent length,
   * sin and cos of the tilt, the normal's angle; NaN where the cog overlaps the
   * chainring); direction of the axle body.
   */
  readonly axleX0: number;
  readonly axleY0: number;
  readonly chain0: Float64Array;
  readonly bodyDx0: number;
  readonly bodyDy0: number;
  readonly scratch: CurveScratch;
}

/** The kernel's working arrays, for sweeps of up to `steps` steps of one plan. */
export interface CurveScratch {
  readonly steps: number;
  /** A chain run (upperRunInto), a brake centre, an instant centre. */
  readonly run: Float64Array;
  readonly centre: Float64Array;
  readonly ic: Float64Array;
  /** A pose and its rates, for the slope of the leverage ratio. */
  readonly pose: Float64Array;
  readonly rates: Float64Array;
  /** What the cogs share at each step. */
  readonly shared: Float64Array;
}

export function createCurveScratch(plan: Plan, steps: number): CurveScratch {
  return {
    steps,
    run: new Float64Array(RUN_SCRATCH_LENGTH),
    centre: new Float64Array(3),
    ic: new Float64Array(IC_SCRATCH_LENGTH),
    pose: new Float64Array(2 * plan.slotCount),
    rates: new Float64Array(2 * plan.slotCount),
    shared: new Float64Array(STEP_WIDTH * steps),
  };
}

export function createCurves(steps: number, cogCount: number, withSpring: boolean, withFloatingBrake: boolean, cogTeeth: readonly number[]): SuspensionCurves {
  const f = () => new Float64Array(steps);
  const perCog = () => Array.from({ length: cogCount }, f);
  return {
    steps,
    shockLengthMm: f(),
    shockTravelMm: f(),
    travelMm: f(),
    axleXMm: f(),
    axleYMm: f(),
    rearwardMm: f(),
    leverageRatio: f(),
    springForceN: withSpring ? f() : null,
    wheelRateNPerMm: withSpring ? f() : null,
    cogTeeth: [...cogTeeth],
    antiSquatPct: perCog(),
    chainGrowthMm: perCog(),
    chainGrowthTurningCogMm: perCog(),
    kickbackDeg: perCog(),
    antiRisePct: f(),
    antiRiseFloatingPct: withFloatingBrake ? f() : null,
    icPath: { kind: new Uint8Array(steps), xMm: f(), yMm: f() },
  };
}

/** ω of a body from two of its slots (pose offsets p, q) in a pose and rates stored from `at`. */
function omegaOf(poses: Float64Array, rates: Float64Array, at: number, p: number, q: number): number {
  const dx = poses[at + q] - poses[at + p];
  const dy = poses[at + q + 1] - poses[at + p + 1];
  const dvx = rates[at + q] - rates[at + p];
  const dvy = rates[at + q + 1] - rates[at + p + 1];
  return (dx * dvy - dy * dvx) / (dx * dx + dy * dy);
}

/** −d(axle y)/d(shock length) at shock length s, the pose started from poses[at..]; NaN when it does not assemble. */
function leverageAt(ctx: CurveContext, s: number, poses: Float64Array, at: number): number {
  const { pose, rates } = ctx.scratch;
  for (let i = 0; i < pose.length; i++) pose[i] = poses[at + i];
  if (!runWithRates(ctx.plan, s, pose, rates)) return Number.NaN;
  return -rates[ctx.axleAt + 1];
}

/**
 * dLR / d(shortening) at shock length s: a central difference of the exact ratio, or a
 * one-sided second-order difference where one side does not assemble (an end of travel).
 */
function leverageSlope(ctx: CurveContext, s: number, lr: number, poses: Float64Array, at: number): number {
  const h = LEVERAGE_SLOPE_STEP_MM;
  const longer = leverageAt(ctx, s + h, poses, at);
  const shorter = leverageAt(ctx, s - h, poses, at);
  // d/d(shortening) = −d/d(length)
  if (Number.isFinite(longer) && Number.isFinite(shorter)) return (shorter - longer) / (2 * h);
  if (Number.isFinite(shorter)) return (-3 * lr + 4 * shorter - leverageAt(ctx, s - 2 * h, poses, at)) / (2 * h);
  return -(-3 * lr + 4 * longer - leverageAt(ctx, s + 2 * h, poses, at)) / (2 * h);
}

/**
 * Fills every curve at the first `count` steps of a sweep whose steps all assemble
 * (poses and rates as a sweep stores them), allocating nothing.
 */
export function fillCurves(ctx: CurveContext, sw: Pick<SweepResult, 'values' | 'poses' | 'rates'>, count: number, out: SuspensionCurves): void {
  fillCurveSteps(ctx, sw, count, out);
  const ic = out.icPath;
  instantCentrePathInto(ctx.plan, ctx.axleBody, 0, sw.poses, sw.rates, count, ic.kind, ic.xMm, ic.yMm, ctx.scratch.ic);
}

/**
 * Every curve but the instant-centre path at the first `count` steps of a sweep (poses
 * and rates as a sweep stores them), allocating nothing: the kernel a search runs per
 * design. Without a spring in ctx.bicycle (or in `out`) the spring and wheel-rate
 * curves are skipped. The figures of one step, then each cog's over all steps.
 */
export function fillCurveSteps(ctx: CurveContext, sw: Pick<SweepResult, 'values' | 'poses' | 'rates'>, count: number, out: SuspensionCurves): void {
  if (!(count <= ctx.scratch.steps)) throw new RangeError(`fillCurveSteps: ${count} steps; the context's scratch holds ${ctx.scratch.steps}`);
  fillStepFigures(ctx, sw, count, out);
  for (let c = 0; c < ctx.cogRadiusMm.length; c++) fillCogFigures(ctx, c, count, out);
}

/** The figures that do not depend on the cog, and in ctx.scratch.shared what the cogs share. */
function fillStepFigures(ctx: CurveContext, sw: Pick<SweepResult, 'values' | 'poses' | 'rates'>, count: number, out: SuspensionCurves): void {
  const { bicycle, plan } = ctx;
  const stride = 2 * plan.slotCount;
  const poses = sw.poses;
  const rates = sw.rates;
  const R = bicycle.wheelRadiusMm;
  const frontX = bicycle.frontContactXMm;
  const toPct = 100 / bicycle.comHeightMm;
  const centre = ctx.scratch.centre;
  const shared = ctx.scratch.shared;
  // The line from the axle to the bottom bracket at full extension, which the chain's turn is measured from.
  const d0 = Math.sqrt(ctx.axleX0 * ctx.axleX0 + ctx.axleY0 * ctx.axleY0);
  const ux0 = (0 - ctx.axleX0) / d0;
  const uy0 = (0 - ctx.axleY0) / d0;
  for (let k = 0; k < count; k++) {
    const at = k * stride;
    const s = sw.values[k];
    const ax = poses[at + ctx.axleAt];
    const ay = poses[at + ctx.axleAt + 1];
    const vax = rates[at + ctx.axleAt];
    const vay = rates[at + ctx.axleAt + 1];
    const lr = -vay;
    out.shockLengthMm[k] = s;
    out.shockTravelMm[k] = ctx.eyeToEyeMm - s;
    out.travelMm[k] = ay - ctx.axleY0;
    out.axleXMm[k] = ax;
    out.axleYMm[k] = ay;
    out.rearwardMm[k] = ctx.axleX0 - ax;
    out.leverageRatio[k] = lr;

    if (bicycle.spring !== null && out.springForceN !== null && out.wheelRateNPerMm !== null) {
      const shortening = ctx.eyeToEyeMm - s;
      const force = springForceN(bicycle.spring, shortening);
      out.springForceN[k] = force;
      out.wheelRateNPerMm[k] = wheelRateNPerMm(springRateNPerMm(bicycle.spring, shortening), force, lr, leverageSlope(ctx, s, lr, poses, at));
    }

    // Rear contact patch under the axle; ground level through it.
    const cx = ax;
    const cy = ay - R;
    const omega = omegaOf(poses, rates, at, ctx.axleAt, ctx.axleRefAt);
    // Instant centre of the axle body relative to the front frame, homogeneous.
    brakeCentreInto(ax, ay, vax, vay, omega, centre);
    const ix = centre[0];
    const iy = centre[1];
    const iw = centre[2];
    out.antiRisePct[k] = heightThroughMm(cx, cy, ix, iy, iw, frontX) * toPct;
    const sh = k * STEP_WIDTH;
    axleLineInto(ax, ay, ix, iy, iw, shared, sh + STEP_M);
    if (out.antiRiseFloatingPct !== null) {
      const omegaB = omegaOf(poses, rates, at, ctx.brakeAt, ctx.brakeRefAt);
      brakeCentreInto(ax, ay, vax, vay, omegaB, centre);
      out.antiRiseFloatingPct[k] = heightThroughMm(cx, cy, centre[0], centre[1], centre[2], frontX) * toPct;
    }

    const bdx = poses[at + ctx.axleRefAt] - ax;
    const bdy = poses[at + ctx.axleRefAt + 1] - ay;
    shared[sh + STEP_TURN] = Math.atan2(ctx.bodyDx0 * bdy - ctx.bodyDy0 * bdx, ctx.bodyDx0 * bdx + ctx.bodyDy0 * bdy);
    // The line from the axle (every cog's centre) to the bottom bracket.
    const dx = 0 - ax;
    const dy = 0 - ay;
    // sqrt of the sum, not Math.hypot (several times slower): the same d as chainAtFullExtensionInto's and sweepTrouble's.
    const d = Math.sqrt(dx * dx + dy * dy);
    const ux = dx / d;
    const uy = dy / d;
    shared[sh + STEP_UX] = ux;
    shared[sh + STEP_UY] = uy;
    shared[sh + STEP_D] = d;
    shared[sh + STEP_LINE_TURN] = Math.atan2(ux0 * uy - uy0 * ux, ux0 * ux + uy0 * uy);
  }
}

/** Cog c's anti-squat, chain growth and kickback at every step, from the step figures and what the cogs share. */
function fillCogFigures(ctx: CurveContext, c: number, count: number, out: SuspensionCurves): void {
  const bicycle = ctx.bicycle;
  const r = ctx.cogRadiusMm[c];
  const ring = ctx.ringRadiusMm;
  const len0 = ctx.chain0[CHAIN0_WIDTH * c];
  const sinTilt0 = ctx.chain0[CHAIN0_WIDTH * c + 1];
  const cosTilt0 = ctx.chain0[CHAIN0_WIDTH * c + 2];
  const normal0 = ctx.chain0[CHAIN0_WIDTH * c + 3];
  const R = bicycle.wheelRadiusMm;
  const frontX = bicycle.frontContactXMm;
  const toPct = 100 / bicycle.comHeightMm;
  const runOut = ctx.scratch.run;
  const shared = ctx.scratch.shared;
  const axleX = out.axleXMm;
  const axleY = out.axleYMm;
  const antiSquat = out.antiSquatPct[c];
  const growthMm = out.chainGrowthMm[c];
  const turningMm = out.chainGrowthTurningCogMm[c];
  const kickback = out.kickbackDeg[c];
  for (let k = 0; k < count; k++) {
    const sh = k * STEP_WIDTH;
    const d = shared[sh + STEP_D];
    if (!(d > r + ring)) {
      antiSquat[k] = Number.NaN;
      growthMm[k] = Number.NaN;
      turningMm[k] = Number.NaN;
      kickback[k] = Number.NaN;
      continue;
    }
    const ax = axleX[k];
    const ay = axleY[k];
    upperRunAlongInto(ax, ay, shared[sh + STEP_UX], shared[sh + STEP_UY], d, r, ring, runOut);
    antiSquat[k] = antiSquatHeightMm(
      runOut[NX], runOut[NY], runOut[OFFSET], shared[sh + STEP_M], shared[sh + STEP_M + 1], shared[sh + STEP_M + 2], ax, ay - R, frontX,
    ) * toPct;
    const growth = wrappedRunGrowthMm(runOut, len0, sinTilt0, cosTilt0, normal0, shared[sh + STEP_LINE_TURN], r, ring);
    growthMm[k] = growth;
    // The cog's mark turns with the body: a turn δθ (CCW) lengthens the wrap on the cog by r·δθ.
    turningMm[k] = growth + r * shared[sh + STEP_TURN];
    kickback[k] = (growth / ring) * RAD_TO_DEG;
  }
}

/**
 * The chain at full extension, the axle at (ax, ay), into chain0 (CurveContext.chain0):
 * per cog the upper run's tangent length, tilt and normal's angle, NaN for a cog that
 * overlaps the chainring. False when one does.
 */
export function chainAtFullExtensionInto(ax: number, ay: number, cogRadiusMm: Float64Array, ringRadiusMm: number, chain0: Float64Array, run: Float64Array): boolean {
  const dx = 0 - ax;
  const dy = 0 - ay;
  const d = Math.sqrt(dx * dx + dy * dy);
  let clear = true;
  for (let c = 0; c < cogRadiusMm.length; c++) {
    const at = CHAIN0_WIDTH * c;
    if (!(d > cogRadiusMm[c] + ringRadiusMm)) {
      chain0.fill(Number.NaN, at, at + CHAIN0_WIDTH);
      clear = false;
      continue;
    }
    upperRunAlongInto(ax, ay, dx / d, dy / d, d, cogRadiusMm[c], ringRadiusMm, run);
    chain0[at] = run[0 satisfies typeof RUN_LENGTH_MM];
    chain0[at + 1] = run[4 satisfies typeof RUN_SIN_TILT];
    chain0[at + 2] = run[5 satisfies typeof RUN_COS_TILT];
    chain0[at + 3] = Math.atan2(run[2 satisfies typeof RUN_NY], run[1 satisfies typeof RUN_NX]);
  }
  return clear;
}

/** An array for chainAtFullExtensionInto. */
export function createChain0(cogCount: number): Float64Array {
  return new Float64Array(CHAIN0_WIDTH * cogCount);
}
