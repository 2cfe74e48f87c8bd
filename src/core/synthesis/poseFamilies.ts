/**
 * Pose-based encodings of every family in linkage/families.ts: the variables are the
 * reference-pose positions of the joints and of the output point P (mm), in the plan's
 * slot order. The family is compiled once; each evaluation sets the new reference pose
 * (same topology) and runs the plan per driver value. A Newton block starts between the
 * poses it has solved for the design on each side of the new value (SOLVED_BINS: the
 * curve's samples keep the branch they swept), else from the previous pose moved on to
 * the new value (by its rates, or the secant through the two before:
 * PREDICT_MAX_STEP_RAD); a value solved already is not solved again, and past the first
 * turn, where the motion closes in one turn, the poses a turn back serve as they are.
 * Driver values are the crank's rotation from its reference-pose angle. The assembly branch of every dyad is
 * the one of the reference pose; a Newton block's is the part of the reference pose's
 * assembly its driver reaches turning either way from it (sweepReachable: det J of the
 * block keeps its sign, and nothing past the first lock each way is solved), the motion
 * the analysis of an exported linkage follows. A slider's direction stays that of the
 * family's default.
 *
 * Locks: the search samples a motion every MOTION_CHECK_STEP_RAD, a family with a Newton
 * block on its bins' values instead (every SOLVED_BIN_RAD, where the curve's samples have
 * mostly solved it already); for a design otherwise
 * feasible `verify` finds the locks between samples (for the four-bar in closed form:
 * Grashof's criterion for its full turn, the crank's limit angles for a motion; a margin
 * search in lockSearch.ts for the rest, then each dyad's signed sine as the analysis reads
 * it, over each run of spans that follow on from each other at once, sampled on the bins'
 * values where the curve keeps its poses). A report
 * draws the design in its pose at the driver value asked for (the objective asks for
 * target point 1's), so an exported linkage sits on its fitted motion.
 */
import {
  compile,
  linkJointPairs,
  run as runBinding,
  runWithRates as runWithRatesBinding,
  setReferencePose,
  type Linkage,
  type Plan,
} from '../linkage';
import { blockJacobianSign as blockJacobianSignBinding, newtonUnknownSlots } from '../linkage/newton';
import { blockOperations, isDyadOp, placesBeforeOnBranch, signedDyadSine } from '../linkage/dyadSine';
import { GOLDEN_PROBE_AT as GOLDEN_PROBE_AT_BINDING, GOLDEN_PROBE_VALUE as GOLDEN_PROBE_VALUE_BINDING } from '../linkage/goldenSection';
import { OP_STRIDE, type PlanInternal } from '../linkage/plan';
import {
  COINCIDENT_JOINT_TOL_MM as COINCIDENT_JOINT_TOL_MM_BINDING,
  MOTION_CLOSURE_REL_TOL,
  SWEEP_CORRECTION_FLOOR_REL as SWEEP_CORRECTION_FLOOR_REL_BINDING,
  SWEEP_CORRECTION_MAX_SHARE as SWEEP_CORRECTION_MAX_SHARE_BINDING,
} from '../linkage/tolerances';
import { poseRatesInto as poseRatesIntoBinding, runSized as runSizedBinding } from '../linkage/run';
import { classifyFourBar, fourBarLoops, transmissionAngleRad, type FourBarLoop } from '../linkage/analysis';
import {
  CURVE_DX as CURVE_DX_BINDING,
  CURVE_DY as CURVE_DY_BINDING,
  CURVE_MARGIN as CURVE_MARGIN_BINDING,
  CURVE_OUT_LENGTH,
  CURVE_T as CURVE_T_BINDING,
  CURVE_X as CURVE_X_BINDING,
  CURVE_Y as CURVE_Y_BINDING,
  type CurveEvaluator,
} from './curve';
import {
  V_BRANCH as V_BRANCH_BINDING,
  V_CRANK as V_CRANK_BINDING,
  V_KEEP_OUT as V_KEEP_OUT_BINDING,
  V_LINK_LENGTH as V_LINK_LENGTH_BINDING,
  V_TRANSMISSION as V_TRANSMISSION_BINDING,
  EXTENT_COS as EXTENT_COS_BINDING,
  addToExtent,
  lengthViolation,
  resetExtent,
  transmissionCosLimit,
  type EncodingReport,
  type MechanismEncoding,
  type TargetFrame,
} from './encoding';
import { POSE_FAMILY_BUILDERS, poseVariableNames } from './familyVariables';
import { crankViolationInto, inputTurnsFully } from './grashofTurn';
import { LOCK_ARC_HALF_FAR, LOCK_ARC_HALF_NEAR, LOCK_ARC_LENGTH, LockSearch, fourBarLockArcs, fourBarLockCount, type MarginCurve } from './lockSearch';
import type { Constraints, FamilyId } from './problem';

// Imported constants and kernel entries as locals: a module transform (tsx, vitest) may
// turn each read of an imported binding into a getter call, which the hot loops below
// cannot afford.
const CURVE_DX = CURVE_DX_BINDING;
const GOLDEN_PROBE_AT = GOLDEN_PROBE_AT_BINDING;
const GOLDEN_PROBE_VALUE = GOLDEN_PROBE_VALUE_BINDING;
const CURVE_DY = CURVE_DY_BINDING;
const CURVE_MARGIN = CURVE_MARGIN_BINDING;
const CURVE_T = CURVE_T_BINDING;
const CURVE_X = CURVE_X_BINDING;
const CURVE_Y = CURVE_Y_BINDING;
const V_BRANCH = V_BRANCH_BINDING;
const V_CRANK = V_CRANK_BINDING;
const V_KEEP_OUT = V_KEEP_OUT_BINDING;
const V_LINK_LENGTH = V_LINK_LENGTH_BINDING;
const V_TRANSMISSION = V_TRANSMISSION_BINDING;
const EXTENT_COS = EXTENT_COS_BINDING;
const run = runBinding;
const blockJacobianSign = blockJacobianSignBinding;
const COINCIDENT_JOINT_TOL_MM = COINCIDENT_JOINT_TOL_MM_BINDING;
const SWEEP_CORRECTION_FLOOR_REL = SWEEP_CORRECTION_FLOOR_REL_BINDING;
const SWEEP_CORRECTION_MAX_SHARE = SWEEP_CORRECTION_MAX_SHARE_BINDING;
const runWithRates = runWithRatesBinding;
const runSized = runSizedBinding;
const poseRatesInto = poseRatesIntoBinding;

const TAU = 2 * Math.PI;
/** One turn from the reference pose, as the sweeps take a span (from, to). */
const FULL_TURN = Float64Array.of(0, TAU);
/** Driver step of the lock and transmission checks along a motion: 72 per turn. */
export const MOTION_CHECK_STEP_RAD = TAU / 72;
/** Most samples of one lock search (a span of ten turns at MOTION_CHECK_STEP_RAD). */
const LOCK_SEARCH_MAX_STEPS = 720;
/** Violation added per lock the exact search finds: the share of a turn of one sample step. */
const LOCK_SHARE = MOTION_CHECK_STEP_RAD / TAU;

export type PoseFamilyId = Exclude<FamilyId, 'fourbar-lengths'>;

// Every pose family has a builder: the ids of FamilyId and the builders' keys agree.
const BUILDERS: Readonly<Record<PoseFamilyId, () => Linkage>> = POSE_FAMILY_BUILDERS;

/**
 * A solve starts from the last pose solved moved on to its driver value, when that pose
 * is at most this far away (rad): by its exact rates when the last solve had them
 * (tangent predictor), else along the secant through the last two poses solved. A Newton
 * block then starts within the square of the step of its solution, and converges in a
 * step or two. Further away a straight-line prediction is no better than the pose itself.
 */
const PREDICT_MAX_STEP_RAD = 4 * MOTION_CHECK_STEP_RAD;

/** Secants through poses solved closer than this (rad) are rounding: no prediction from them. */
const SECANT_MIN_SPAN_RAD = 1e-6;

/**
 * No prediction where some joint moves faster than this many crank lengths per radian
 * (where the assembly margin is below 1 / (1 + this)): near a lock's edge the motion
 * turns like a square root, a straight line overshoots it, and the last pose itself is
 * the safer start, on the side of the fold that assembles.
 */
const PREDICT_MAX_SPEED = 8;

/** Layout of PlanCurve's `asked`. */
const ASKED_T = 0;
const ASKED_U = 1;
/**
 * A Newton block's poses solved since the design was loaded, one per bin of this width
 * (rad) of driver values in [0, 2π), the bin nearest each (the curve's 180 samples fill
 * one each): a later solve between them starts from the line through the nearest on
 * each side, within about the square of the bin of its solution and on the branch the
 * samples swept, not from the last pose solved, which may be a quarter of a turn away.
 */
const SOLVED_BINS = 180;
const SOLVED_BIN_RAD = TAU / SOLVED_BINS;
/**
 * Beside each bin's pose, the last pose solved between the bins' values nearest it (at
 * index SOLVED_BINS + bin): the fit's driver values, which the target's points, the
 * motion's ends and the lock search ask for again. Kept apart so that a solve between
 * values does not take the place of a bin's pose at its own value (the sweep's), which
 * the motion check and the lock search's grid ask for again too.
 */
const BETWEEN = SOLVED_BINS;
/** Bins searched on each side for the poses solved around a driver value. */
const SOLVED_REACH_BINS = 3;
/** Most samples of one motion on the bins' driver values (four turns); a longer one is sampled every MOTION_CHECK_STEP_RAD. */
const MOTION_MAX_SAMPLES = 4 * SOLVED_BINS;
/**
 * Past the first turn, the poses a turn back start a solve only where they are within
 * this share of the last step's motion of the last pose moved on: the same motion, one
 * turn on, not another assembly.
 */
const SOLVED_WRAP_AGREE = 0.25;
/**
 * A driver value within this of one solved (rad) is that value: a few rounding units of
 * a value two turns on (4π), where t − 2π and the bin's k·SOLVED_BIN_RAD differ in the
 * last bits. The pose moves by less than the Newton tolerance in it (at the fastest a
 * prediction allows, PREDICT_MAX_SPEED crank lengths per radian, 1e-13 crank lengths).
 */
const SAME_DRIVER_VALUE_RAD = 1e-14;
/** sweepReachable halves a step that fails down to this (rad) before it calls the value unreachable. */
const REACH_MIN_STEP_RAD = SOLVED_BIN_RAD / 1024;
/** A motion closes in one turn where its pose a turn on is its first pose within this share of the crank (tolerances.ts). */
const CLOSURE_REL_TOL = MOTION_CLOSURE_REL_TOL;

class PlanCurve implements CurveEvaluator, MarginCurve {
  readonly secondDerivatives = false;
  readonly plan: Plan;
  readonly pose: Float64Array;
  readonly rates: Float64Array;
  /** The pose solved before the last one, at driver value previousT (NaN: none). */
  private readonly previous: Float64Array;
  private previousT = NaN;
  /** Driver value of the last pose solved (NaN: none since a failure or reset). */
  private lastT = NaN;
  /** The rates in `rates` are the last pose's. */
  private lastHasRates = false;
  /** Only a Newton block starts from the pose it is given; dyads need no prediction. */
  private readonly predicts: boolean;
  /** The curve keeps the poses it solves (a plan with a Newton block: see SOLVED_BINS). */
  get keepsSolved(): boolean {
    return this.predicts;
  }
  /**
   * A pose's rates follow from the pose alone (poseRatesInto): a rotation driver's. A
   * length driver's lengths move with its value, which only a solve sets.
   */
  private readonly ratesFromPose: boolean;
  /** Pose offsets of the joints the Newton blocks solve: the only ones whose start matters. */
  private readonly unknowns: Int32Array;
  private readonly pSlot: number;
  private readonly pivotSlot: number;
  private readonly tipSlot: number;
  /** Length of the driven link in the reference pose, mm: the scale of the margin. */
  private crankMm = 1;
  /** Driver value of each bin's solved pose (NaN: none), and the poses (see SOLVED_BIN_RAD); from BETWEEN on, the same of the values between the bins. */
  private readonly solvedT: Float64Array;
  private readonly solvedPoses: Float64Array;
  /** Each bin's pose's rates, where solvedHasRates is 1 (the pose was solved with them). */
  private readonly solvedRates: Float64Array;
  private readonly solvedHasRates: Uint8Array;
  /** Driver value of each bin's last solve that failed (NaN: none). */
  private readonly failedT: Float64Array;
  /** The bin whose pose `start` last found solved at its value. */
  private knownBin = -1;
  /** The motion closes in one turn (closesInOneTurn): 1 yes, 0 no, -1 not yet asked. */
  private closes = -1;
  /** The lower bin `bracket` found. */
  private bracketLo = -1;
  /** The last solve started from the reference pose (see failed). */
  private fromReference = false;
  /** The Newton blocks' joints interpolated between bins (interpolate). */
  private readonly begin: Float64Array;
  /** Sign of det J of each Newton block in the reference pose: the assembly the design is (see onReferenceBranch). */
  private readonly referenceSigns: Int8Array;
  /**
   * Driver values in [0, 2π) the reference pose cannot reach, turning either way, without
   * passing a lock (sweepReachable): those strictly between gapFrom (the last value
   * reached turning forward) and gapTo (the last turning backward); NaN: none known.
   */
  private gapFrom = NaN;
  private gapTo = NaN;
  /** The last value `reach` solved on its way, and its pose and rates there. */
  private reached = NaN;
  private readonly reachedPose: Float64Array;
  private readonly reachedRates: Float64Array;
  /** A continuation (reach) is under way: a failed solve is its to handle, not recover's. */
  private continuing = false;
  /**
   * In a continuation, the Newton blocks' joints moved on from the last pose by its rates,
   * and the largest such move (mm; NaN: no tangent to check against, see followsTangent).
   */
  private readonly expected: Float64Array;
  private expectedMotion = NaN;
  /**
   * The driver value a solve is asked for (ASKED_T) and its place in the first turn
   * (ASKED_U): start and the helpers it calls read them here, since V8 boxes a number
   * passed to a call it does not inline (an allocation per solve).
   */
  private readonly asked = new Float64Array(2);
  /** The point of sweepReachable's solves, and of atIoAround's calls. */
  private readonly sweepPoint = new Float64Array(CURVE_OUT_LENGTH);
  /** The plan's dyads (dyadSine.ts), as their operations' offsets in plan.ops; and each Newton block's operation index. */
  private readonly dyadOps: Int32Array;
  private readonly blockOps: Int32Array;
  /** The pose of dyadSineAt's solves. */
  private readonly dyadPose: Float64Array;
  constructor(plan: Plan, pivotSlot: number, tipSlot: number) {
    this.plan = plan;
    this.pose = new Float64Array(2 * plan.slotCount);
    this.rates = new Float64Array(2 * plan.slotCount);
    this.previous = new Float64Array(2 * plan.slotCount);
    this.predicts = plan.newtonUnknowns > 0;
    this.ratesFromPose = !(plan as PlanInternal).driverIsLength;
    this.unknowns = newtonUnknownSlots(plan);
    this.solvedT = new Float64Array(this.predicts ? 2 * SOLVED_BINS : 0).fill(NaN);
    this.solvedPoses = new Float64Array(this.predicts ? 2 * SOLVED_BINS * 2 * plan.slotCount : 0);
    this.solvedRates = new Float64Array(this.predicts ? 2 * SOLVED_BINS * 2 * plan.slotCount : 0);
    this.solvedHasRates = new Uint8Array(this.predicts ? 2 * SOLVED_BINS : 0);
    this.failedT = new Float64Array(this.predicts ? SOLVED_BINS : 0).fill(NaN);
    this.begin = new Float64Array(2 * plan.slotCount);
    this.expected = new Float64Array(2 * plan.slotCount);
    this.reachedPose = new Float64Array(2 * plan.slotCount);
    this.reachedRates = new Float64Array(2 * plan.slotCount);
    this.referenceSigns = new Int8Array((plan as PlanInternal).blockCount);
    const p = plan as PlanInternal;
    const dyads: number[] = [];
    for (let o = 0; o < p.opCount * OP_STRIDE; o += OP_STRIDE) if (isDyadOp(p.ops[o])) dyads.push(o);
    this.dyadOps = Int32Array.from(dyads);
    this.blockOps = blockOperations(p);
    this.dyadPose = new Float64Array(2 * plan.slotCount);
    this.pSlot = 2 * (plan.slotIndex.get('P') ?? 0);
    this.pivotSlot = pivotSlot;
    this.tipSlot = tipSlot;
  }
  /** A new design, its reference pose set: the poses solved for the last one are no start for its solves. */
  forgetSolved(): void {
    this.solvedT.fill(NaN);
    this.failedT.fill(NaN);
    this.closes = -1;
    this.gapFrom = NaN;
    this.gapTo = NaN;
    const plan = this.plan as PlanInternal;
    for (let b = 0; b < plan.blockCount; b++) this.referenceSigns[b] = blockJacobianSign(plan, b, plan.reference);
  }
  /**
   * Every Newton block of the pose just solved has the reference pose's sign of det J:
   * a solve that lands on the other side of a fold is another assembly, which the
   * design's driver cannot reach from its reference pose without passing a lock. The
   * analysis of an exported linkage refuses such a solve by the same rule (sweep.ts),
   * so the curve's motion is the one the candidate's report follows.
   */
  private onReferenceBranch(): boolean {
    const plan = this.plan as PlanInternal;
    for (let b = 0; b < plan.blockCount; b++) if (blockJacobianSign(plan, b, this.pose) !== this.referenceSigns[b]) return false;
    return true;
  }
  /**
   * The driver values the design reaches from its reference pose (a new design, after
   * forgetSolved): its bins solved turning forward from 0 until a solve fails, then
   * backward from 2π until one fails; what lies between is another assembly or none, so
   * every later solve there fails (unreachable). Without it a solve after a failure starts
   * from the reference pose however far away, and may land on an assembly the linkage
   * cannot reach: a motion the report (which follows the motion from the reference pose)
   * would not draw. The bins keep the poses, so the curve's samples on them cost no solve.
   */
  sweepReachable(): void {
    if (!this.predicts) return;
    this.continuing = true;
    this.reset();
    let first = SOLVED_BINS;
    for (let j = 0; j < SOLVED_BINS; j++) {
      if (!this.reach(j === 0 ? 0 : (j - 1) * SOLVED_BIN_RAD, j * SOLVED_BIN_RAD)) {
        first = j;
        break;
      }
    }
    if (first < SOLVED_BINS) {
      const forwardEnd = this.reached;
      this.reset();
      // Where the motions forward and backward overlap (the driver reaches some values in
      // two poses), the bins keep the forward one's poses below `first` and the backward
      // one's above it, and the bin above `first` is the gap's far end.
      let backwardEnd = (first + 1) * SOLVED_BIN_RAD;
      // The reference pose a turn on, with its rates: the first step back is then checked
      // against its tangent as every later one is, and cannot land across a lock narrower
      // than itself.
      this.reach(TAU, TAU);
      for (let j = SOLVED_BINS - 1; j > first; j--) {
        if (!this.reach(j === SOLVED_BINS - 1 ? TAU : (j + 1) * SOLVED_BIN_RAD, j * SOLVED_BIN_RAD)) {
          backwardEnd = this.reached;
          break;
        }
      }
      this.gapFrom = forwardEnd;
      this.gapTo = backwardEnd;
    } else {
      // Round the whole turn: whether the motion closes, found by going on to 2π as the
      // sweep went (the poses a turn on taken for none until then), not by a solve from
      // the last pose, which near another assembly may land on the first pose anyway.
      this.closes = 0;
      const closes = this.reach((SOLVED_BINS - 1) * SOLVED_BIN_RAD, TAU) && this.atFirstPose();
      this.closes = closes ? 1 : 0;
    }
    this.continuing = false;
    this.reset();
  }
  /** The Newton blocks' joints are where bin 0 (the reference pose, solved at 0) has them, within CLOSURE_REL_TOL of the crank. */
  private atFirstPose(): boolean {
    const pose = this.pose;
    const poses = this.solvedPoses;
    const tol = CLOSURE_REL_TOL * this.crankMm;
    const unknowns = this.unknowns;
    for (let k = 0; k < unknowns.length; k++) {
      const i = unknowns[k];
      if (!(Math.abs(pose[i] - poses[i]) <= tol && Math.abs(pose[i + 1] - poses[i + 1]) <= tol)) return false;
    }
    return true;
  }
  /**
   * Solves at `to` from `from`, solved last (2π: the reference pose); where that fails,
   * on again from `from` in steps halved down to REACH_MIN_STEP_RAD, as the analysis of
   * a linkage advances near a fold (sweep.ts), so a step that only overshoots a sharp
   * turn of the motion is no lock. True when `to` is solved; else `reached` is the last
   * value solved, within REACH_MIN_STEP_RAD of where the motion ends.
   */
  private reach(from: number, to: number): boolean {
    const point = this.sweepPoint;
    this.reached = from;
    point[CURVE_T] = to;
    this.atIo(1, point);
    if (point[CURVE_MARGIN] >= 0) return true;
    let at = from;
    // First the whole step from the pose at `from` (the try above started where `start` chose).
    let h = to - from;
    const least = Math.min(REACH_MIN_STEP_RAD, Math.abs(h));
    // A failure leaves the reference pose: the next try starts from the pose at `at`, which
    // its bin keeps for `from`; past `from`, the copy taken when it was reached (a value
    // between bins has no bin to keep it in, and a solve there from another start may land
    // on another part of the motion).
    let restore = true;
    let kept = false;
    while (h !== 0 && Math.abs(h) >= least) {
      if (restore && kept) this.restoreReached();
      else if (restore) {
        point[CURVE_T] = at;
        this.atIo(1, point);
      }
      // A step below the rounding of `at` is the last one.
      const next = Math.abs(to - at) <= Math.abs(h) || at + h === at ? to : at + h;
      point[CURVE_T] = next;
      this.atIo(1, point);
      restore = point[CURVE_MARGIN] < 0;
      if (restore) {
        h /= 2;
        continue;
      }
      if (next === to) return true;
      at = next;
      this.reached = at;
      this.keepReached();
      kept = true;
    }
    return false;
  }
  /** Keeps the pose and rates just solved at `reached` for restoreReached. */
  private keepReached(): void {
    this.reachedPose.set(this.pose);
    this.reachedRates.set(this.rates);
  }
  /** The curve back at `reached` with its pose and rates as solved there (keepReached), the history gone. */
  private restoreReached(): void {
    this.pose.set(this.reachedPose);
    this.rates.set(this.reachedRates);
    this.lastT = this.reached;
    this.lastHasRates = true;
    this.previousT = NaN;
  }
  /**
   * A solve at t outside the gap failed, though the sweep reached every value there: near a
   * fold a start between kept poses may lead Newton's method to the fold's other branch,
   * which the sign rule refuses, or land further from its start than the rule on kept
   * poses allows (expectFromBins) where a joint turns fast between two bins. The motion
   * goes on to t from the kept pose nearest t on the side away from the gap, as the sweep
   * went (reach). Outside the first turn only where the motion closes in one turn: t's pose
   * is then the first turn's at t's place in it. True when t is solved; the curve is then
   * at t, with its rates.
   */
  private recover(t: number): boolean {
    if (this.continuing || !this.predicts) return false;
    let u = t;
    if (!(t >= 0 && t < TAU)) {
      if (!(t === t) || !this.closesInOneTurn()) return false;
      u = t - Math.floor(t / TAU) * TAU;
      // Rounding may leave a value just below a whole number of turns at the turn's end.
      if (!(u < TAU)) u = 0;
    }
    const ok = this.recoverInTurn(u);
    if (ok && u !== t) {
      // The pose at u is t's: the history goes on from t.
      this.lastT = t;
      this.previousT = NaN;
    }
    return ok;
  }
  /** recover for t in the first turn. */
  private recoverInTurn(t: number): boolean {
    const times = this.solvedT;
    const upward = !(t >= this.gapTo);
    let from = upward ? 0 : TAU;
    let b = Math.min(SOLVED_BINS - 1, Math.round(t / SOLVED_BIN_RAD));
    if (upward) {
      for (; b >= 0; b--) {
        if (times[b] <= t) {
          from = times[b];
          break;
        }
      }
    } else {
      for (; b < SOLVED_BINS; b++) {
        if (times[b] >= t) {
          from = times[b];
          break;
        }
      }
    }
    this.continuing = true;
    this.reset();
    const ok = this.reach(from, t);
    this.continuing = false;
    return ok;
  }
  /**
   * The sweep reached every bin of the first turn (no gap), and the turn's end does not
   * bring the motion back to its first pose (sweepReachable): it goes on in another pose,
   * or locks just short of the end. Either way its poses outside the first turn are not
   * the first turn's, which the curve's samples and the match take them to be.
   */
  get opensAfterATurn(): boolean {
    return this.predicts && Number.isNaN(this.gapFrom) && this.closes === 0;
  }
  /**
   * The driver can turn on and on: nothing the reference pose cannot reach
   * (sweepReachable), and a turn brings the motion back to the pose it started from (a
   * motion that does not close in one turn may meet a lock in its second, beyond the
   * turn the search's samples and lock search see). Plans without a Newton block place
   * every joint by the driver value alone, so their motion closes in one turn.
   */
  get turnsOn(): boolean {
    if (!this.predicts) return true;
    return Number.isNaN(this.gapFrom) && this.closesInOneTurn();
  }
  /**
   * A value a whole number of turns on has the pose of its place in the first turn: the
   * motion closes in one turn, or the reference pose cannot reach some values (a gap), so
   * the driver never turns through and reaches each value it reaches in one pose.
   */
  get repeatsEachTurn(): boolean {
    if (!this.predicts) return true;
    return !Number.isNaN(this.gapFrom) || this.closesInOneTurn();
  }
  /** t lies where the reference pose cannot reach (sweepReachable); the curve is then left as a failed solve leaves it. */
  private unreachable(t: number): boolean {
    const u = t - Math.floor(t / TAU) * TAU;
    if (!(u > this.gapFrom && u < this.gapTo)) return false;
    // Not a failed solve from the reference pose: failedAt keeps none for it.
    this.fromReference = false;
    this.failed(t);
    return true;
  }
  /** Start the next sweep from the reference pose. */
  reset(): void {
    const ref = this.plan.reference;
    this.pose.set(ref);
    this.lastT = NaN;
    this.previousT = NaN;
    // Math.sqrt, not Math.hypot: hypot allocates its answer in V8.
    const cx = ref[this.tipSlot] - ref[this.pivotSlot];
    const cy = ref[this.tipSlot + 1] - ref[this.pivotSlot + 1];
    this.crankMm = Math.sqrt(cx * cx + cy * cy);
  }
  /** Moves the Newton blocks' joints on to the driver value asked (see PREDICT_MAX_STEP_RAD), keeping the last pose solved in `previous`. */
  private predict(): void {
    const t = this.asked[ASKED_T];
    const pose = this.pose;
    const previous = this.previous;
    const rates = this.rates;
    const unknowns = this.unknowns;
    const dt = t - this.lastT;
    const span = this.lastT - this.previousT;
    const tangent = this.lastHasRates;
    // Per radian: the rates, or the secant's slope.
    const slope = tangent ? 1 : Math.abs(span) >= SECANT_MIN_SPAN_RAD ? 1 / span : 0;
    // A continuation steps as the analysis does: always from the tangent (followsTangent checks where it lands).
    const checked = this.continuing && tangent && dt === dt;
    let fastest = 0;
    if (!checked) {
      for (let k = 0; k < unknowns.length; k++) {
        const i = unknowns[k];
        const sx = Math.abs(tangent ? rates[i] : (pose[i] - previous[i]) * slope);
        const sy = Math.abs(tangent ? rates[i + 1] : (pose[i + 1] - previous[i + 1]) * slope);
        if (!(sx <= fastest)) fastest = sx;
        if (!(sy <= fastest)) fastest = sy;
      }
    }
    const predict = slope !== 0 && (checked || (Math.abs(dt) <= PREDICT_MAX_STEP_RAD && fastest <= PREDICT_MAX_SPEED * this.crankMm));
    if (checked) {
      // What followsTangent checks the step against, as the analysis has it: the move of
      // every joint (the driven link's too), so a block's joint momentarily at rest still
      // has a step of the linkage's size to be compared with.
      const expected = this.expected;
      // The largest square, then its root: the root of the largest is the largest root
      // (a correctly rounded root is monotone), at one root instead of one per joint.
      let largest = 0;
      for (let i = 0; i < pose.length; i += 2) {
        const mx = rates[i] * dt;
        const my = rates[i + 1] * dt;
        expected[i] = pose[i] + mx;
        expected[i + 1] = pose[i + 1] + my;
        // x − x is 0 for a finite x, NaN otherwise: Number.isFinite without the call.
        const square = mx * mx + my * my;
        if (mx - mx === 0 && my - my === 0 && square > largest) largest = square;
      }
      this.expectedMotion = Math.sqrt(largest);
    }
    for (let k = 0; k < 2 * unknowns.length; k++) {
      const i = unknowns[k >> 1] + (k & 1);
      const x = pose[i];
      if (predict) {
        const moved = x + (tangent ? rates[i] : (x - previous[i]) * slope) * dt;
        if (Number.isFinite(moved)) pose[i] = moved;
      }
      previous[i] = x;
    }
    this.previousT = this.lastT;
  }
  /**
   * A continuation's step landed where its tangent points: no joint of a Newton block is
   * further from the last pose moved on by its rates than SWEEP_CORRECTION_MAX_SHARE of
   * that move (plus the floor of rounding). A step across a lock narrower than itself
   * lands on the far side's motion, with the same sign of det J but far from the
   * tangent: the analysis refuses it by this rule (sweep.ts), and so does the sweep here.
   */
  private followsTangent(): boolean {
    const motion = this.expectedMotion;
    if (!(motion === motion)) return true;
    const pose = this.pose;
    const expected = this.expected;
    const unknowns = this.unknowns;
    const allowed = SWEEP_CORRECTION_MAX_SHARE * motion + SWEEP_CORRECTION_FLOOR_REL * (this.plan as PlanInternal).lengthScaleMm;
    for (let k = 0; k < unknowns.length; k++) {
      const i = unknowns[k];
      const dx = pose[i] - expected[i];
      const dy = pose[i + 1] - expected[i + 1];
      if (!(Math.sqrt(dx * dx + dy * dy) <= allowed)) return false;
    }
    return true;
  }
  /** After a solve at t: a failure leaves a sane start for the next Newton block, the reference pose, and no history. */
  private solved(t: number, ok: boolean, withRates: boolean): void {
    if (ok) {
      this.lastT = t;
      this.lastHasRates = withRates;
      if (this.predicts) this.keepSolved(t, withRates);
      return;
    }
    this.failed(t);
  }
  /**
   * A solve at t failed: the reference pose and no history. A failure from the reference
   * pose is kept for failedAt: every later solve at t from there fails the same way.
   */
  private failed(t: number): void {
    this.pose.set(this.plan.reference);
    this.lastT = NaN;
    this.previousT = NaN;
    if (!this.predicts || !this.fromReference) return;
    const u = t - Math.floor(t / TAU) * TAU;
    const bin = Math.round(u / SOLVED_BIN_RAD);
    if (bin >= 0 && bin < SOLVED_BINS) this.failedT[bin] = u;
  }
  /**
   * Keeps the pose just solved at t (and its rates, when solved with them) in the bin
   * nearest t, when t is in [0, 2π); beside it (BETWEEN) where t is not the bin's own
   * value and the bin holds the pose at its own value.
   */
  private keepSolved(t: number, withRates: boolean): void {
    // Past the first turn, where the motion is known to close in one turn, t's pose is
    // the one at its place in the first.
    const u = t >= TAU && this.closes === 1 ? t - Math.floor(t / TAU) * TAU : t;
    let bin = Math.round(u / SOLVED_BIN_RAD);
    // u itself in the turn, not its bin: a value just below 0 rounds to bin 0, and its
    // pose (the motion turning backward from the reference pose) is not the turn's.
    if (!(u >= 0 && bin < SOLVED_BINS)) return;
    const own = bin * SOLVED_BIN_RAD;
    if (u !== own && this.solvedT[bin] === own) bin += BETWEEN;
    this.solvedT[bin] = u;
    const o = bin * this.pose.length;
    this.solvedPoses.set(this.pose, o);
    this.solvedHasRates[bin] = withRates ? 1 : 0;
    if (withRates) this.solvedRates.set(this.rates, o);
  }

  /**
   * True when a solve at t now would fail without trying it: the curve is where a failure
   * leaves it (the reference pose, no history), no pose solved near t (a turn back or
   * not) would start it, and a solve at t from the reference pose failed before. The same
   * solve, from the same start, of the same equations (the driver's every turn, to
   * rounding), fails the same way. The curve is then left as a failed solve leaves it.
   */
  failedAt(t: number): boolean {
    if (!this.predicts || !Number.isNaN(this.lastT) || !this.atReference()) return false;
    const u = t - Math.floor(t / TAU) * TAU;
    const bin = Math.round(u / SOLVED_BIN_RAD);
    if (!(bin < SOLVED_BINS && Math.abs(this.failedT[bin] - u) <= SAME_DRIVER_VALUE_RAD)) return false;
    if (this.bracket(u, bin) >= 0) return false;
    this.failed(t);
    return true;
  }

  /**
   * True when t is solved already (its bin holds it; past the first turn, where the
   * motion closes in one turn, a turn back), its pose then copied into `into` when
   * given; the curve itself does not move.
   */
  solvedPoseAt(t: number, into: Float64Array | null): boolean {
    if (!this.predicts || !(t >= 0)) return false;
    const turns = Math.floor(t / TAU);
    const u = t - turns * TAU;
    const bin = Math.round(u / SOLVED_BIN_RAD);
    if (!(bin < SOLVED_BINS)) return false;
    const times = this.solvedT;
    let kept: number;
    if (turns === 0) kept = times[bin] === t ? bin : times[bin + BETWEEN] === t ? bin + BETWEEN : -1;
    else kept = this.sameAs(u, bin) >= 0 ? bin : this.sameAs(u, bin + BETWEEN);
    if (kept < 0 || (turns !== 0 && !this.closesInOneTurn())) return false;
    if (into !== null) {
      const o = kept * into.length;
      for (let i = 0; i < into.length; i++) into[i] = this.solvedPoses[o + i];
    }
    return true;
  }

  /** `slot` when it holds u (within SAME_DRIVER_VALUE_RAD), else −1. */
  private sameAs(u: number, slot: number): number {
    return Math.abs(this.solvedT[slot] - u) <= SAME_DRIVER_VALUE_RAD ? slot : -1;
  }

  /**
   * The motion solved in the first turn goes on, a turn later, as it went from the start:
   * solved from the last pose kept in the turn to the first one's value a turn on, it
   * lands on that first pose (within CLOSURE_REL_TOL of the crank), so by continuation
   * every value a turn on has the pose a turn back. Found once per design, when first
   * asked (a motion past the first turn comes after the curve's samples).
   */
  private closesInOneTurn(): boolean {
    if (this.closes >= 0) return this.closes === 1;
    const times = this.solvedT;
    let first = 0;
    while (first <= SOLVED_REACH_BINS && !(times[first] >= 0)) first++;
    let last = SOLVED_BINS - 1;
    while (last >= SOLVED_BINS - 1 - SOLVED_REACH_BINS && !(times[last] >= 0)) last--;
    // No poses solved near both ends of the turn yet: not known, asked again later.
    if (first > SOLVED_REACH_BINS || last < SOLVED_BINS - 1 - SOLVED_REACH_BINS) return false;
    this.closes = 0;
    // Solved in the scratch `begin`, so the curve's own pose and history stay as they are.
    const pose = this.begin;
    const stride = pose.length;
    const poses = this.solvedPoses;
    for (let i = 0; i < stride; i++) pose[i] = poses[last * stride + i];
    if (!run(this.plan, this.plan.driverReferenceValue + TAU + times[first], pose)) return false;
    const tol = CLOSURE_REL_TOL * this.crankMm;
    const unknowns = this.unknowns;
    for (let k = 0; k < unknowns.length; k++) {
      const i = unknowns[k];
      const o = first * stride + i;
      if (!(Math.abs(pose[i] - poses[o]) <= tol && Math.abs(pose[i + 1] - poses[o + 1]) <= tol)) return false;
    }
    this.closes = 1;
    return true;
  }

  /** The Newton blocks' joints are where the reference pose has them. */
  private atReference(): boolean {
    const pose = this.pose;
    const ref = this.plan.reference;
    const unknowns = this.unknowns;
    for (let k = 0; k < unknowns.length; k++) {
      const i = unknowns[k];
      if (pose[i] !== ref[i] || pose[i + 1] !== ref[i + 1]) return false;
    }
    return true;
  }

  /**
   * The bins solved nearest u on each side (see SOLVED_BINS) and on u's side of the gap,
   * into bracketLo and the return value (hi); where there is one above only, both are it;
   * hi −1 when there is none above.
   */
  private bracket(u: number, bin: number): number {
    const times = this.solvedT;
    let lo = -1;
    let hi = -1;
    for (let b = bin < SOLVED_BINS ? bin : SOLVED_BINS - 1, end = bin - SOLVED_REACH_BINS; b >= 0 && b >= end; b--) {
      if (times[b] <= u) {
        lo = b;
        break;
      }
    }
    // No pair across the gap (sweepReachable): its two sides are the two ends of the motion.
    if (lo >= 0 && u >= this.gapTo && !(times[lo] >= this.gapTo)) lo = -1;
    for (let b = bin, end = bin + SOLVED_REACH_BINS; b < SOLVED_BINS && b <= end; b++) {
      if (times[b] >= u) {
        hi = b;
        break;
      }
    }
    if (hi >= 0 && u <= this.gapFrom && !(times[hi] <= this.gapFrom)) hi = -1;
    // Above only (below is the gap, or not solved): that pose alone.
    if (lo < 0) lo = hi;
    this.bracketLo = lo;
    return hi;
  }

  /** `start` found t solved already (knownBin): the pose is its solution; with its rates, the bin's, else worked out from the pose and kept. */
  private knownSolved(t: number, withRates: boolean): void {
    this.lastT = t;
    this.lastHasRates = withRates;
    if (!withRates) return;
    const bin = this.knownBin;
    const rates = this.rates;
    const o = bin * rates.length;
    if (this.solvedHasRates[bin] === 1) {
      for (let i = 0; i < rates.length; i++) rates[i] = this.solvedRates[o + i];
      return;
    }
    poseRatesInto(this.plan as PlanInternal, this.pose, rates);
    for (let i = 0; i < rates.length; i++) this.solvedRates[o + i] = rates[i];
    this.solvedHasRates[bin] = 1;
  }

  /**
   * The start of a Newton block's solve at t, the value asked (asked[ASKED_T]; see
   * SOLVED_BINS): the line through the poses solved nearest t on each side
   * (interpolate), else the last pose moved on (predict). Past the first turn, the poses
   * a whole number of turns back: as they are where the motion closes in one turn
   * (closesInOneTurn), else only where they agree with the last pose moved on
   * (SOLVED_WRAP_AGREE): a motion that closes after two turns has another pose there.
   * True when t itself was solved: the pose is its solution.
   */
  private start(): boolean {
    const t = this.asked[ASKED_T];
    this.expectedMotion = NaN;
    let turns = Math.floor(t / TAU);
    const u = t - turns * TAU;
    this.asked[ASKED_U] = u;
    // A motion that closes in one turn has a turn on the poses a turn back: t is u.
    if (turns !== 0 && this.closesInOneTurn()) turns = 0;
    const bin = Math.round(u / SOLVED_BIN_RAD);
    const times = this.solvedT;
    let hi = this.bracket(u, bin);
    let lo = this.bracketLo;
    // A continuation (reach) goes on from the pose it solved last, moved on by its rates:
    // kept poses on both sides of t may straddle a fold, and a start between them lead
    // Newton's method to the fold's other branch.
    const solvedHere = (lo >= 0 && Math.abs(u - times[lo]) <= SAME_DRIVER_VALUE_RAD) || (hi >= 0 && Math.abs(times[hi] - u) <= SAME_DRIVER_VALUE_RAD);
    if (this.continuing && this.lastT === this.lastT && !solvedHere) hi = -1;
    const pose = this.pose;
    const unknowns = this.unknowns;
    const previous = this.previous;
    this.fromReference = false;
    if (hi < 0 || turns !== 0) {
      this.predict();
      if (hi < 0) {
        this.fromReference = this.atReference();
        return false;
      }
    } else {
      // The sequential predictor's history moves on as predict would leave it.
      for (let k = 0; k < unknowns.length; k++) {
        const i = unknowns[k];
        previous[i] = pose[i];
        previous[i + 1] = pose[i + 1];
      }
      this.previousT = this.lastT;
    }
    // t itself solved already: the pose there is its solution (SAME_DRIVER_VALUE_RAD).
    const same = Math.abs(u - times[lo]) <= SAME_DRIVER_VALUE_RAD ? lo : Math.abs(times[hi] - u) <= SAME_DRIVER_VALUE_RAD ? hi : bin < SOLVED_BINS ? this.sameAs(u, bin + BETWEEN) : -1;
    if (same >= 0) {
      lo = same;
      hi = same;
    }
    const poses = this.solvedPoses;
    const stride = pose.length;
    const oLo = lo * stride;
    if (turns === 0 && same >= 0) {
      for (let i = 0; i < stride; i++) pose[i] = poses[oLo + i];
      this.knownBin = same;
      return true;
    }
    this.interpolate(lo, hi);
    if (turns === 0) this.expectFromBins(lo, hi);
    const begin = this.begin;
    if (turns !== 0) {
      // Past the first turn: only where the start a turn back agrees with the last pose moved on.
      let disagree = 0;
      let moved = 0;
      for (let k = 0; k < unknowns.length; k++) {
        for (let i = unknowns[k], end = i + 2; i < end; i++) {
          const d = Math.abs(begin[i] - pose[i]);
          const m = Math.abs(pose[i] - previous[i]);
          if (!(d <= disagree)) disagree = d;
          if (!(m <= moved)) moved = m;
        }
      }
      if (!(disagree <= SOLVED_WRAP_AGREE * moved)) return false;
      if (same >= 0) {
        // The same solve a turn back: Newton's method from its solution stays there.
        for (let i = 0; i < stride; i++) pose[i] = poses[oLo + i];
        this.knownBin = same;
        return true;
      }
    }
    for (let k = 0; k < unknowns.length; k++) {
      const i = unknowns[k];
      pose[i] = begin[i];
      pose[i + 1] = begin[i + 1];
    }
    return false;
  }

  /**
   * The Newton blocks' joints at u between the poses of bins lo and hi into `begin`, by
   * the cubic through both with their rates where both were solved with rates (Hermite
   * interpolation), else the straight line. The cubic is within about the fourth power
   * of the bin of the solution, so a block converges in one Newton step; the line only
   * within the square. Only where no joint moves faster than PREDICT_MAX_SPEED: near a
   * lock's edge the motion turns like a square root, and a cubic overshoots it.
   */
  private interpolate(lo: number, hi: number): void {
    const u = this.asked[ASKED_U];
    const times = this.solvedT;
    const poses = this.solvedPoses;
    const slopes = this.solvedRates;
    const unknowns = this.unknowns;
    const begin = this.begin;
    const stride = begin.length;
    const oLo = lo * stride;
    const oHi = hi * stride;
    if (hi === lo) {
      for (let k = 0; k < unknowns.length; k++) {
        const i = unknowns[k];
        begin[i] = poses[oLo + i];
        begin[i + 1] = poses[oLo + i + 1];
      }
      return;
    }
    const fastest = PREDICT_MAX_SPEED * this.crankMm;
    const span = times[hi] - times[lo];
    const w = (u - times[lo]) / span;
    if (this.solvedHasRates[lo] === 1 && this.solvedHasRates[hi] === 1 && this.slowerThan(lo, fastest) && this.slowerThan(hi, fastest)) {
      // Hermite's basis: h00 = 2w³ − 3w² + 1 = 1 − h01, h10 = w³ − 2w² + w, h11 = w³ − w².
      const w2 = w * w;
      const w3 = w2 * w;
      const h01 = 3 * w2 - 2 * w3;
      const h10 = (w3 - 2 * w2 + w) * span;
      const h11 = (w3 - w2) * span;
      for (let k = 0; k < unknowns.length; k++) {
        for (let i = unknowns[k], end = i + 2; i < end; i++) {
          const p0 = poses[oLo + i];
          begin[i] = p0 + h01 * (poses[oHi + i] - p0) + h10 * slopes[oLo + i] + h11 * slopes[oHi + i];
        }
      }
      return;
    }
    for (let k = 0; k < unknowns.length; k++) {
      for (let i = unknowns[k], end = i + 2; i < end; i++) {
        const p0 = poses[oLo + i];
        begin[i] = p0 + w * (poses[oHi + i] - p0);
      }
    }
  }

  /**
   * A solve started from kept poses must land near its start, as a continuation's near
   * its tangent (followsTangent): within SWEEP_CORRECTION_MAX_SHARE of the motion between
   * the two poses (of the move by the one pose's rates, where there is one), else it has
   * found another assembly and recover continues from the nearest kept pose instead. A
   * pose the curve keeps is then always one of the motion the sweep followed.
   */
  private expectFromBins(lo: number, hi: number): void {
    const u = this.asked[ASKED_U];
    const poses = this.solvedPoses;
    const expected = this.expected;
    const stride = expected.length;
    const oLo = lo * stride;
    // The largest square, then its root (as in predict).
    let largest = 0;
    if (hi !== lo) {
      const oHi = hi * stride;
      for (let i = 0; i < stride; i += 2) {
        const dx = poses[oHi + i] - poses[oLo + i];
        const dy = poses[oHi + i + 1] - poses[oLo + i + 1];
        largest = Math.max(largest, dx * dx + dy * dy);
      }
      expected.set(this.begin);
    } else {
      if (this.solvedHasRates[lo] !== 1) return;
      const rates = this.solvedRates;
      const du = u - this.solvedT[lo];
      for (let i = 0; i < stride; i += 2) {
        const mx = rates[oLo + i] * du;
        const my = rates[oLo + i + 1] * du;
        expected[i] = poses[oLo + i] + mx;
        expected[i + 1] = poses[oLo + i + 1] + my;
        const square = mx * mx + my * my;
        if (mx - mx === 0 && my - my === 0 && square > largest) largest = square;
      }
    }
    this.expectedMotion = Math.sqrt(largest);
  }

  /** No Newton block's joint moves faster than `fastest` (mm per radian) by the rates kept in bin a. */
  private slowerThan(a: number, fastest: number): boolean {
    const rates = this.solvedRates;
    const unknowns = this.unknowns;
    const o = a * this.begin.length;
    for (let k = 0; k < unknowns.length; k++) {
      const i = o + unknowns[k];
      if (!(Math.abs(rates[i]) <= fastest && Math.abs(rates[i + 1]) <= fastest)) return false;
    }
    return true;
  }

  /**
   * The next solve starts from `pose`, solved at t, as from the last pose solved, without
   * its rates: Newton's method from the pose itself (where no kept poses bracket the value).
   */
  startFrom(pose: Float64Array, t: number): void {
    this.pose.set(pose);
    this.lastT = t;
    this.lastHasRates = false;
    this.previousT = NaN;
  }
  /**
   * Assembly margin c / (c + max |d(joint)/dt|), c the crank length: every joint's rate
   * grows without bound as a dyad or a Newton block nears its toggle, so the margin falls
   * to 0 at a lock's edge; −1 where the plan does not assemble.
   */
  marginAt(t: number): number {
    const plan = this.plan;
    if (this.unreachable(t)) return -1;
    this.asked[ASKED_T] = t;
    const known = this.predicts && this.start() && this.ratesFromPose;
    const ok = known || (runWithRates(plan, plan.driverReferenceValue + t, this.pose, this.rates) && (!this.predicts || (this.onReferenceBranch() && this.followsTangent())));
    if (known) this.knownSolved(t, true);
    else this.solved(t, ok, true);
    if (!ok && !this.recover(t)) return -1;
    const rates = this.rates;
    let fastest = 0;
    for (let i = 0; i < rates.length; i++) {
      const r = Math.abs(rates[i]);
      if (!(r <= fastest)) fastest = r;
    }
    const margin = this.crankMm / (this.crankMm + fastest);
    return margin >= 0 ? margin : -1;
  }
  /** The plan's dyads, whose windows the lock search looks for between its samples. */
  get dyadCount(): number {
    return this.dyadOps.length;
  }
  /** Dyad d's signed sine (dyadSine.ts) in each of `count` poses at poses[k · stride …], into out[k]. */
  dyadSinesInto(d: number, poses: Float64Array, stride: number, count: number, out: Float64Array): void {
    const p = this.plan as PlanInternal;
    const o = this.dyadOps[d];
    for (let k = 0; k < count; k++) out[k] = signedDyadSine(p, o, poses, k * stride);
  }
  /**
   * Dyad d's signed sine at the driver value in io (goldenSection.ts's probe layout), the
   * operations before it run from `start` (a Newton block among them starts there), into
   * io: −1 where one of them fails or a block lands on another branch than the reference
   * pose's, as the analysis counts it (sweep.ts). The curve does not move.
   */
  dyadSineAt(d: number, io: Float64Array, start: Float64Array): void {
    const p = this.plan as PlanInternal;
    const o = this.dyadOps[d];
    const endOp = o / OP_STRIDE;
    const pose = this.dyadPose;
    for (let i = 0; i < pose.length; i++) pose[i] = start[i];
    io[GOLDEN_PROBE_VALUE] = -1;
    if (!placesBeforeOnBranch(p, p.driverReferenceValue + io[GOLDEN_PROBE_AT], pose, endOp, this.blockOps, this.referenceSigns)) return;
    const sine = signedDyadSine(p, o, pose, 0);
    if (sine === sine) io[GOLDEN_PROBE_VALUE] = sine;
  }
  /** Where the plan does not assemble: a finite stand-in, the reference point, and margin −1. */
  private standIn(out: Float64Array): void {
    const s = this.pSlot;
    out[CURVE_X] = this.plan.reference[s];
    out[CURVE_Y] = this.plan.reference[s + 1];
    out[CURVE_DX] = 0;
    out[CURVE_DY] = 0;
    out[CURVE_MARGIN] = -1;
  }
  /**
   * atIo with the driver value passed and the margin returned, for the callers below that
   * hold a PlanCurve: small enough to inline, so neither number is boxed (curve.ts).
   */
  pointAt(t: number, order: 0 | 1 | 2, out: Float64Array): number {
    out[CURVE_T] = t;
    this.atIo(order, out);
    return out[CURVE_MARGIN];
  }
  /**
   * The curve's samples (CurveEvaluator.atIoAround). Where they are the bins (count
   * SOLVED_BINS), each bin that holds its own value's pose, with its rates where asked,
   * and that the design reaches is read as a lookup there answers, without the call; the
   * others are called. A lookup moves the curve's history on (its pose and the one before,
   * see start), so the last two reads before a call, and at the end, are made as calls too
   * (answering the same): the curve is then left as the calls in turn leave it.
   */
  atIoAround(order: 0 | 1, count: number, out: Float64Array): void {
    const step = TAU / count;
    const point = this.sweepPoint;
    const stride = this.pose.length;
    const s = this.pSlot;
    // A bin is read where a call there would look it up (atIo; with rates, only where
    // they follow from the pose).
    const binned = this.predicts && count === SOLVED_BINS && !this.continuing && (order === 0 || this.ratesFromPose);
    /** Reads in a row, up to j, not made as calls. */
    let read = 0;
    for (let j = 0; j <= count; j++) {
      const t = j * step;
      if (j < count && binned && this.solvedT[j] === t && (order === 0 || this.solvedHasRates[j] === 1) && !(t > this.gapFrom && t < this.gapTo)) {
        const o = j * CURVE_OUT_LENGTH;
        out[o + CURVE_T] = t;
        out[o + CURVE_X] = this.solvedPoses[j * stride + s];
        out[o + CURVE_Y] = this.solvedPoses[j * stride + s + 1];
        if (order > 0) {
          out[o + CURVE_DX] = this.solvedRates[j * stride + s];
          out[o + CURVE_DY] = this.solvedRates[j * stride + s + 1];
        }
        out[o + CURVE_MARGIN] = 1;
        read++;
        continue;
      }
      for (let k = j - Math.min(read, 2); k < j; k++) {
        point[CURVE_T] = k * step;
        this.atIo(order, point);
      }
      read = 0;
      if (j === count) break;
      point[CURVE_T] = t;
      this.atIo(order, point);
      out.set(point, j * CURVE_OUT_LENGTH);
    }
  }
  atIo(order: 0 | 1 | 2, out: Float64Array): void {
    const t = out[CURVE_T];
    const plan = this.plan;
    const value = plan.driverReferenceValue + t;
    if (this.unreachable(t)) {
      this.standIn(out);
      return;
    }
    // A pose solved at t already is its solution: no need to solve it again for the point.
    this.asked[ASKED_T] = t;
    const known = this.predicts && this.start() && (order === 0 || this.ratesFromPose);
    // this.pose is made for the plan (constructor): runSized skips the check of its length.
    const ok = known || ((order === 0 ? runSized(plan, value, this.pose) : runWithRates(plan, value, this.pose, this.rates)) && (!this.predicts || (this.onReferenceBranch() && this.followsTangent())));
    if (known) this.knownSolved(t, order > 0);
    else this.solved(t, ok, order > 0);
    if (!ok && !this.recover(t)) {
      this.standIn(out);
      return;
    }
    const s = this.pSlot;
    out[CURVE_X] = this.pose[s];
    out[CURVE_Y] = this.pose[s + 1];
    if (order > 0) {
      out[CURVE_DX] = this.rates[s];
      out[CURVE_DY] = this.rates[s + 1];
    }
    out[CURVE_MARGIN] = 1;
  }
}

/**
 * The motion over spans (from, to) spans[2i], spans[2i + 1] reaches a whole turn: the
 * spans of a path's motion (pathResponse.ts) each start or end where the one before ends
 * or starts, so together they cover their least start to their greatest end.
 */
function spansCoverTurn(spans: Float64Array, count: number): boolean {
  let from = Infinity;
  let to = -Infinity;
  for (let i = 0; i < count; i++) {
    if (spans[2 * i] < from) from = spans[2 * i];
    if (spans[2 * i + 1] > to) to = spans[2 * i + 1];
  }
  return to - from >= TAU;
}

export function createPoseFamily(family: PoseFamilyId, constraints: Constraints, frame: TargetFrame): MechanismEncoding {
  const source = BUILDERS[family]();
  const compiled = compile(source);
  if (!compiled.ok) throw new Error(`family ${family} does not compile: ${compiled.issues.map((i) => `${i.where}: ${i.message}`).join('; ')}`);
  const plan = compiled.plan;
  const names = poseVariableNames(plan);
  const L = frame.size;
  const lower = new Float64Array(names.length);
  const upper = new Float64Array(names.length);
  for (let k = 0; k < names.length; k += 2) {
    lower[k] = frame.cx - 3 * L;
    upper[k] = frame.cx + 3 * L;
    lower[k + 1] = frame.cy - 3 * L;
    upper[k + 1] = frame.cy + 3 * L;
  }
  const slotOfJoint = (id: string) => 2 * (plan.slotIndex.get(id) ?? 0);
  const driver = source.driver;
  const curve = new PlanCurve(plan, slotOfJoint(driver.kind === 'rotation' ? driver.pivot : driver.from), slotOfJoint(driver.kind === 'rotation' ? driver.tip : driver.to));
  const groundSlots = Int32Array.from(
    source.joints.filter((j) => j.ground === true).map((j) => 2 * (plan.slotIndex.get(j.id) ?? 0)),
  );
  const links = linkJointPairs(plan);
  /** The least distance between two joints of one body in the loaded design's reference pose (mm, before placement). */
  const closestJoints = new Float64Array(1);
  const loops: FourBarLoop[] = fourBarLoops(plan);
  const driven = loops.find((l) => l.grounded && l.inputDriven);
  // The four-bar's full turn is Grashof's criterion on its one loop, exactly; the other
  // families' needs every loop: a margin search.
  const grashofLoop = family === 'fourbar' ? driven : undefined;
  // The four-bar's locks along a motion: its crank's limit angles, in closed form.
  const lockArcs = new Float64Array(LOCK_ARC_LENGTH);
  const fourBarSlots = family === 'fourbar' ? Int32Array.from(['A0', 'A', 'B', 'B0'].map(slotOfJoint)) : undefined;
  // The slider-crank's crank pivot, crank pin and slider pin, and its slide's direction (cannotTurn).
  const slideSlots = family === 'slider-crank' ? Int32Array.from(['A0', 'A', 'B'].map(slotOfJoint)) : undefined;
  const slideAngle = source.sliders?.[0]?.angle ?? 0;
  const slideCos = Math.cos(slideAngle);
  const slideSin = Math.sin(slideAngle);
  const fullTurn = constraints.fullTurnCrank === true;
  const cosLimit = transmissionCosLimit(constraints.minTransmissionRad);
  const linkLimits = constraints.linkLengthMm;
  const keepOut = constraints.keepOut ?? [];
  const reference = new Float64Array(2 * plan.slotCount);
  const point = new Float64Array(CURVE_OUT_LENGTH);
  const lockSearch = new LockSearch(2 * plan.slotCount, LOCK_SEARCH_MAX_STEPS);
  // A curve that keeps its solved poses has its margins on the bins' values for the price of a lookup.
  const lockGridRad = curve.keepsSolved ? SOLVED_BIN_RAD : 0;
  const solvedPose = new Float64Array(2 * plan.slotCount);
  /** A loop's four sides (loopLengthsInto), and the crank violation of the Grashof loop's. */
  const loopSides = new Float64Array(4);
  const crank = new Float64Array(1);
  /** The transmission defect summed along a sweep (addTransmissionDefect). */
  const transmission = new Float64Array(1);

  /** The four sides of a loop in the reference pose (ground, input, coupler, output for a loop through ground), into `lengths`. */
  function loopLengthsInto(loop: FourBarLoop, lengths: Float64Array): void {
    const ref = plan.reference;
    for (let i = 0; i < 4; i++) {
      const a = loop.joints[(i + 3) % 4];
      const b = loop.joints[i];
      const dx = ref[2 * b] - ref[2 * a];
      const dy = ref[2 * b + 1] - ref[2 * a + 1];
      lengths[i] = Math.sqrt(dx * dx + dy * dy);
    }
  }

  /** Adds the transmission defect of `pose` (each loop's |cos μ| beyond the limit) to transmission[0]; the callers scale the sum by the share of a turn each pose stands for. */
  function addTransmissionDefect(pose: Float64Array): void {
    if (cosLimit >= 1) return;
    for (let q = 0; q < loops.length; q++) {
      const loop = loops[q];
      const c = Math.abs(Math.cos(transmissionAngleRad(loop, pose)));
      if (!(c <= cosLimit)) transmission[0] += Number.isNaN(c) ? 1 : c - cosLimit;
    }
  }

  /**
   * Runs the driver over `span` (from, to) in steps of MOTION_CHECK_STEP_RAD: adds the
   * share of a turn that failed to parts[slot], and the transmission defect along the way
   * to parts[V_TRANSMISSION]. Numbers cross in arrays, not as arguments (curve.ts).
   */
  function sweepFailures(span: Float64Array, parts: Float64Array, slot: number): void {
    const a = span[0];
    const b = span[1];
    const steps = Math.min(LOCK_SEARCH_MAX_STEPS, Math.max(1, Math.ceil((b - a) / MOTION_CHECK_STEP_RAD)));
    const h = (b - a) / steps;
    let failed = 0;
    transmission[0] = 0;
    for (let k = 1; k <= steps; k++) {
      point[CURVE_T] = a + k * h;
      curve.atIo(0, point);
      if (point[CURVE_MARGIN] < 0) failed++;
      else addTransmissionDefect(curve.pose);
    }
    parts[slot] += (failed * h) / TAU;
    parts[V_TRANSMISSION] += (h / TAU) * transmission[0];
  }

  /**
   * sweepFailures for a motion over `span`, on the curve's bins' driver values (every
   * SOLVED_BIN_RAD, finer than MOTION_CHECK_STEP_RAD) between its ends and at its end:
   * where the curve has solved a value already (its samples, of the same bins), its pose
   * or its failure is that value's without a solve.
   */
  function motionFailures(span: Float64Array, parts: Float64Array, slot: number): void {
    const a = span[0];
    const b = span[1];
    const first = Math.floor(a / SOLVED_BIN_RAD) + 1;
    const last = Math.ceil(b / SOLVED_BIN_RAD) - 1;
    const count = last - first + 2;
    // Without a Newton block every solve is a run of dyads, as cheap as a lookup: sampled as before.
    if (!curve.keepsSolved || !(count >= 1 && count <= MOTION_MAX_SAMPLES)) {
      sweepFailures(span, parts, slot);
      return;
    }
    const share = (b - a) / (count * TAU);
    const into = cosLimit < 1 ? solvedPose : null;
    let failed = 0;
    transmission[0] = 0;
    // The last value passed over as solved already: the curve takes it up before a solve, as its start.
    let passed = NaN;
    for (let k = first; k <= last + 1; k++) {
      const t = k <= last ? k * SOLVED_BIN_RAD : b;
      if (curve.solvedPoseAt(t, into)) {
        if (into !== null) addTransmissionDefect(into);
        passed = t;
        continue;
      }
      if (passed === passed) {
        point[CURVE_T] = passed;
        curve.atIo(0, point);
      }
      passed = NaN;
      if (curve.failedAt(t)) {
        failed++;
        continue;
      }
      point[CURVE_T] = t;
      curve.atIo(0, point);
      if (point[CURVE_MARGIN] < 0) failed++;
      else addTransmissionDefect(curve.pose);
    }
    if (passed === passed) {
      point[CURVE_T] = passed;
      curve.atIo(0, point);
    }
    parts[slot] += failed * share;
    parts[V_TRANSMISSION] += share * transmission[0];
  }

  /** Moves the curve from the reference pose to driver value t in steps of MOTION_CHECK_STEP_RAD; false where a step does not assemble. */
  function stepTo(t: number): boolean {
    curve.reset();
    const steps = Math.min(LOCK_SEARCH_MAX_STEPS, Math.max(1, Math.ceil(Math.abs(t) / MOTION_CHECK_STEP_RAD)));
    for (let k = 1; k <= steps; k++) if (curve.pointAt((t * k) / steps, 0, point) < 0) return false;
    return true;
  }

  /**
   * The loaded design certainly cannot turn its driver through a whole turn: the four-bar
   * loop that holds the driven link has a lock arc (closed form), the slider-crank's rod
   * cannot reach its slide at every crank angle, or, with a Newton block, the sweep from
   * the reference pose found values it cannot reach or a motion that does not close after
   * a turn (turnsOn). False says nothing: a six-bar may lock elsewhere.
   */
  function cannotTurn(): boolean {
    if (driven !== undefined) {
      const j = driven.joints;
      fourBarLockArcs(plan.reference, 2 * j[0], 2 * j[1], 2 * j[2], 2 * j[3], lockArcs);
      return lockArcs[LOCK_ARC_HALF_NEAR] >= 0 || lockArcs[LOCK_ARC_HALF_FAR] >= 0;
    }
    if (slideSlots !== undefined) {
      // The crank pin comes as far from the slide as the pivot's offset from it plus the
      // crank: the rod reaches the slide all round only while that is less than its length.
      const ref = plan.reference;
      const a0 = slideSlots[0];
      const a = slideSlots[1];
      const b = slideSlots[2];
      const crank = Math.sqrt((ref[a] - ref[a0]) ** 2 + (ref[a + 1] - ref[a0 + 1]) ** 2);
      const rod = Math.sqrt((ref[b] - ref[a]) ** 2 + (ref[b + 1] - ref[a + 1]) ** 2);
      const offset = Math.abs((ref[a0] - ref[b]) * slideSin - (ref[a0 + 1] - ref[b + 1]) * slideCos);
      return !(crank + offset < rod);
    }
    return !curve.turnsOn;
  }

  /** The locks `verify` looks for: the full turn's, the four-bar's in closed form, or an exact search of each run of spans. */
  function verifyLocks(spans: Float64Array, count: number, parts: Float64Array): void {
    if (fullTurn) {
      // Grashof's criterion in load was exact already.
      if (grashofLoop === undefined) parts[V_CRANK] += LOCK_SHARE * fullTurnLocks();
      return;
    }
    if (fourBarSlots !== undefined) {
      fourBarLockArcs(plan.reference, fourBarSlots[0], fourBarSlots[1], fourBarSlots[2], fourBarSlots[3], lockArcs);
      parts[V_BRANCH] += LOCK_SHARE * fourBarLockCount(lockArcs, spans, count);
      return;
    }
    // Spans that follow on from each other (the motion from point to point) searched as
    // one range: a span's end is no minimum of the margin the motion goes on past.
    curve.reset();
    let i = 0;
    while (i < count) {
      const a = spans[2 * i];
      let b = spans[2 * i + 1];
      i++;
      while (i < count && spans[2 * i] === b && spans[2 * i + 1] >= b) {
        b = spans[2 * i + 1];
        i++;
      }
      parts[V_BRANCH] += LOCK_SHARE * lockSearch.count(curve, a, b, MOTION_CHECK_STEP_RAD, false, lockGridRad);
    }
    curve.reset();
  }

  /** Locks met in a full turn from the reference pose, found exactly. */
  function fullTurnLocks(): number {
    curve.reset();
    const locks = lockSearch.count(curve, 0, TAU, MOTION_CHECK_STEP_RAD, true, lockGridRad);
    curve.reset();
    // A design whose reachable motion has a gap does not turn fully, even where the lock
    // search's grid steps over the gap (one bin wide where the motions forward and backward
    // overlap); nor does one whose motion a turn on is another (see turnsOn).
    return locks === 0 && !curve.turnsOn ? 1 : locks;
  }

  return {
    names,
    lower,
    upper,
    driverName: 'driver',
    branchCount: 1,
    curve,
    // A slide keeps its direction whatever its joints' positions.
    placementTurns: source.sliders === undefined || source.sliders.length === 0,
    placeDesignInto(x: Float64Array, placement: Float64Array, _lower: Float64Array, _upper: Float64Array, into: Float64Array): void {
      const a = placement[0];
      const b = placement[1];
      // Every variable is a joint's or point's (x, y) in the reference pose.
      for (let k = 0; k < names.length; k += 2) {
        const px = x[k];
        const py = x[k + 1];
        into[k] = a * px - b * py + placement[2];
        into[k + 1] = b * px + a * py + placement[3];
      }
    },
    load(x: Float64Array, _branch: number, parts: Float64Array): void {
      for (let k = 0; k < reference.length; k++) reference[k] = x[k];
      setReferencePose(plan, reference);
      let closest = Infinity;
      for (let k = 0; k < links.length; k += 2) {
        const i = links[k];
        const j = links[k + 1];
        const dx = reference[j] - reference[i];
        const dy = reference[j + 1] - reference[i + 1];
        const d = Math.sqrt(dx * dx + dy * dy);
        if (!(d >= closest)) closest = d;
      }
      closestJoints[0] = closest;
      curve.forgetSolved();
      curve.sweepReachable();
      curve.reset();
      if (fullTurn) {
        if (grashofLoop !== undefined) {
          loopLengthsInto(grashofLoop, loopSides);
          crankViolationInto(loopSides, 0, true, crank, 0);
          parts[V_CRANK] += crank[0];
        }
        sweepFailures(FULL_TURN, parts, V_CRANK);
        curve.reset();
      }
    },
    motion(span: Float64Array, parts: Float64Array): void {
      const a = span[0];
      const b = span[1];
      // A full turn was swept in load: it found every lock and every poor transmission angle.
      if (fullTurn || !(b > a)) return;
      // Outside the first turn a motion that does not come back after a turn is another
      // motion than the samples the target was matched on: as good as a lock on the way.
      if (curve.opensAfterATurn && !(a >= 0 && b < TAU)) parts[V_BRANCH] += LOCK_SHARE;
      point[CURVE_T] = a;
      curve.atIo(0, point);
      motionFailures(span, parts, V_BRANCH);
    },
    cannotTurn,
    verify(spans: Float64Array, count: number, parts: Float64Array): void {
      verifyLocks(spans, count, parts);
      // A motion over a whole turn by a design that cannot make one meets a lock, though
      // the samples and the search may step over a narrow one: charged as one, so that
      // cannotTurn never names a design feasible (the objective stops early on it).
      const slot = fullTurn ? V_CRANK : V_BRANCH;
      if (parts[V_CRANK] + parts[V_BRANCH] <= 0 && (fullTurn || spansCoverTurn(spans, count)) && cannotTurn()) parts[slot] += LOCK_SHARE;
    },
    sweepExtent(from: number, to: number, steps: number, placement: Float64Array, out: Float64Array): number {
      resetExtent(out);
      curve.reset();
      const pose = curve.pose;
      let failed = 0;
      for (let k = 0; k <= steps; k++) {
        if (curve.pointAt(from + ((to - from) * k) / steps, 0, point) < 0) {
          failed++;
          continue;
        }
        for (let s = 0; s < pose.length; s += 2) addToExtent(pose[s], pose[s + 1], placement, out);
        for (let q = 0; q < loops.length; q++) {
          const c = Math.abs(Math.cos(transmissionAngleRad(loops[q], pose)));
          if (!(c <= out[EXTENT_COS])) out[EXTENT_COS] = Number.isNaN(c) ? 1 : c;
        }
      }
      curve.reset();
      return failed;
    },
    placed(placement: Float64Array, parts: Float64Array): void {
      const sa = placement[0];
      const sb = placement[1];
      const tx = placement[2];
      const ty = placement[3];
      // Math.sqrt, not Math.hypot: hypot allocates its answer in V8.
      const scale = Math.sqrt(sa * sa + sb * sb);
      const ref = plan.reference;
      // Two joints of one body closer than a linkage file allows (coincident in the
      // design, or a placement whose scale collapsed to nothing, as where every target
      // point is matched to one driver value): no linkage to export or analyse, so the
      // report could not stand behind it. As infeasible as one that cannot be built.
      if (!(scale * closestJoints[0] >= COINCIDENT_JOINT_TOL_MM)) parts[V_LINK_LENGTH] += 1;
      if (linkLimits !== undefined) {
        const [lo, hi] = linkLimits;
        for (let k = 0; k < links.length; k += 2) {
          const i = links[k];
          const j = links[k + 1];
          const dx = ref[j] - ref[i];
          const dy = ref[j + 1] - ref[i + 1];
          parts[V_LINK_LENGTH] += lengthViolation(scale * Math.sqrt(dx * dx + dy * dy), lo, hi);
        }
      }
      for (let g = 0; g < groundSlots.length; g++) {
        const s = groundSlots[g];
        const x = sa * ref[s] - sb * ref[s + 1] + tx;
        const y = sb * ref[s] + sa * ref[s + 1] + ty;
        for (let q = 0; q < keepOut.length; q++) {
          const c = keepOut[q];
          const d = Math.sqrt((x - c.x) * (x - c.x) + (y - c.y) * (y - c.y));
          if (!(d >= c.r)) parts[V_KEEP_OUT] += Number.isNaN(d) ? 1 : (c.r - d) / c.r;
        }
      }
    },
    report(t: number, sa: number, sb: number, tx: number, ty: number): EncodingReport {
      // The pose at t: in the first turn, the curve's own (its bins hold the motion the
      // driver reaches from the reference pose either way, sweepReachable), so the drawn
      // pose is the fitted one; past it, the first turn's where the motion repeats each
      // turn (as the curve's samples take it), else reached in steps from the reference
      // so a Newton block keeps its branch, and where a lock bars the way, the other way round.
      let assembles: boolean;
      // In the first turn inTurn is t itself; rounding may leave a value just below a whole
      // number of turns at 2π, which no bin holds.
      const inTurn = t - Math.floor(t / TAU) * TAU;
      if (inTurn < TAU && (inTurn === t || curve.repeatsEachTurn)) {
        curve.reset();
        assembles = curve.pointAt(inTurn, 0, point) >= 0;
      } else {
        assembles = stepTo(t);
        if (!assembles) assembles = stepTo(t > 0 ? t - TAU : t + TAU);
      }
      const drawnAt = assembles ? t : 0;
      const pose = assembles ? Float64Array.from(curve.pose) : Float64Array.from(plan.reference);
      const place = (s: number) => ({ x: sa * pose[2 * s] - sb * pose[2 * s + 1] + tx, y: sb * pose[2 * s] + sa * pose[2 * s + 1] + ty });
      const rotation = Math.atan2(sb, sa);
      const linkage: Linkage = {
        joints: source.joints.map((j) => ({ ...j, ...place(plan.slotIndex.get(j.id) ?? 0) })),
        bodies: source.bodies.map((b) => ({ id: b.id, joints: [...b.joints] })),
        ...(source.sliders === undefined ? {} : { sliders: source.sliders.map((s) => ({ joint: s.joint, body: s.body, angle: s.angle + rotation })) }),
        ...(source.points === undefined ? {} : { points: source.points.map((p) => ({ ...p, ...place(plan.slotIndex.get(p.id) ?? 0) })) }),
        driver: source.driver,
      };
      const scale = Math.hypot(sa, sb);
      let grashof: EncodingReport['grashof'];
      if (driven !== undefined) {
        try {
          loopLengthsInto(driven, loopSides);
          grashof = classifyFourBar(scale * loopSides[0], scale * loopSides[1], scale * loopSides[2], scale * loopSides[3]);
        } catch {
          grashof = undefined;
        }
      }
      if (grashofLoop !== undefined) loopLengthsInto(grashofLoop, loopSides);
      const turnsFully = grashofLoop !== undefined ? inputTurnsFully(loopSides[0], loopSides[1], loopSides[2], loopSides[3]) : fullTurnLocks() === 0;
      curve.reset();
      return {
        linkage,
        // Pose families count the driver as the rotation from the reference pose.
        drawnAt,
        ...(grashof === undefined ? {} : { grashof }),
        turnsFully,
      };
    },
  };
}
