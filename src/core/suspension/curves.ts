/**
 * The per-step kernel of the suspension metrics: every curve at every step of a sweep
 * of the shock, from the solved pose and its exact rates d(pose)/d(shock length). No
 * allocation per step; the result arrays are allocated once per sweep.
 */
import { runWithRates, type Plan, type SweepResult } from '../linkage';
import { instantCentrePath } from '../linkage/analysis';
import { antiSquatHeightMm, brakeCentreInto, heightThroughMm } from './antiLines';
import type { ValidBicycle } from './bicycle';
import { RUN_NX, RUN_NY, RUN_OFFSET_MM, RUN_SCRATCH_LENGTH, upperRunInto, wrappedRunLengthMm } from './chain';
import { springForceN, springRateNPerMm, wheelRateNPerMm } from './spring';

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
  /** Full extension: axle, wrapped run length per cog, direction of the axle body. */
  readonly axleX0: number;
  readonly axleY0: number;
  readonly wrapped0: Float64Array;
  readonly bodyDx0: number;
  readonly bodyDy0: number;
  /** Scratch: chain run, brake centre, and a pose and rates for the slope of LR. */
  readonly runScratch: Float64Array;
  readonly centreScratch: Float64Array;
  readonly poseScratch: Float64Array;
  readonly rateScratch: Float64Array;
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
  const pose = ctx.poseScratch;
  for (let i = 0; i < pose.length; i++) pose[i] = poses[at + i];
  if (!runWithRates(ctx.plan, s, pose, ctx.rateScratch)) return Number.NaN;
  return -ctx.rateScratch[ctx.axleAt + 1];
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

/** Fills every curve from an assembled sweep of the shock (lengths in sw.values). */
export function fillCurves(ctx: CurveContext, sw: SweepResult, out: SuspensionCurves): void {
  fillCurveSteps(ctx, sw, sw.values.length, out);
  const ic = instantCentrePath(ctx.plan, ctx.axleBody, 0, sw);
  out.icPath.kind.set(ic.kind);
  out.icPath.xMm.set(ic.x);
  out.icPath.yMm.set(ic.y);
}

/**
 * Every curve but the instant-centre path at the first `count` steps of a sweep (poses
 * and rates as a sweep stores them), allocating nothing: the kernel a search runs per
 * design. Without a spring in ctx.bicycle (or in `out`) the spring and wheel-rate
 * curves are skipped.
 */
export function fillCurveSteps(ctx: CurveContext, sw: Pick<SweepResult, 'values' | 'poses' | 'rates'>, count: number, out: SuspensionCurves): void {
  const { bicycle, plan } = ctx;
  const stride = 2 * plan.slotCount;
  const poses = sw.poses;
  const rates = sw.rates;
  const cogs = ctx.cogRadiusMm;
  const ring = ctx.ringRadiusMm;
  const R = bicycle.wheelRadiusMm;
  const frontX = bicycle.frontContactXMm;
  const toPct = 100 / bicycle.comHeightMm;
  const runOut = ctx.runScratch;
  const centre = ctx.centreScratch;
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
    if (out.antiRiseFloatingPct !== null) {
      const omegaB = omegaOf(poses, rates, at, ctx.brakeAt, ctx.brakeRefAt);
      brakeCentreInto(ax, ay, vax, vay, omegaB, centre);
      out.antiRiseFloatingPct[k] = heightThroughMm(cx, cy, centre[0], centre[1], centre[2], frontX) * toPct;
    }

    const bdx = poses[at + ctx.axleRefAt] - ax;
    const bdy = poses[at + ctx.axleRefAt + 1] - ay;
    const turnRad = Math.atan2(ctx.bodyDx0 * bdy - ctx.bodyDy0 * bdx, ctx.bodyDx0 * bdx + ctx.bodyDy0 * bdy);
    for (let c = 0; c < cogs.length; c++) {
      const r = cogs[c];
      if (!upperRunInto(ax, ay, r, 0, 0, ring, runOut)) {
        out.antiSquatPct[c][k] = Number.NaN;
        out.chainGrowthMm[c][k] = Number.NaN;
        out.chainGrowthTurningCogMm[c][k] = Number.NaN;
        out.kickbackDeg[c][k] = Number.NaN;
        continue;
      }
      out.antiSquatPct[c][k] = antiSquatHeightMm(runOut[RUN_NX], runOut[RUN_NY], runOut[RUN_OFFSET_MM], ax, ay, ix, iy, iw, cx, cy, frontX) * toPct;
      const growth = wrappedRunLengthMm(runOut, r, ring) - ctx.wrapped0[c];
      out.chainGrowthMm[c][k] = growth;
      // The cog's mark turns with the body: a turn δθ (CCW) lengthens the wrap on the cog by r·δθ.
      out.chainGrowthTurningCogMm[c][k] = growth + r * turnRad;
      out.kickbackDeg[c][k] = (growth / ring) * RAD_TO_DEG;
    }
  }
}

/** The wrapped upper-run length per cog with the axle at (ax, ay), into `out`; false when a cog overlaps the chainring. */
export function wrappedRunsInto(ax: number, ay: number, cogRadiusMm: Float64Array, ringRadiusMm: number, out: Float64Array): boolean {
  const runOut = new Float64Array(RUN_SCRATCH_LENGTH);
  for (let c = 0; c < cogRadiusMm.length; c++) {
    if (!upperRunInto(ax, ay, cogRadiusMm[c], 0, 0, ringRadiusMm, runOut)) return false;
    out[c] = wrappedRunLengthMm(runOut, cogRadiusMm[c], ringRadiusMm);
  }
  return true;
}
