/**
 * A sweep runs a plan over a range of driver values on the reference pose's assembly
 * branch, and reports where the linkage locks, where a dyad reaches a dead centre, and
 * whether a rotation driver turns fully.
 *
 * Newton blocks are tracked by predictor–corrector continuation from the reference pose
 * (Allgower and Georg, 1990): each step starts from the last pose moved on by its exact
 * rates, and is refused, then halved, when the solution lies on the other side of a fold
 * (det J of a block has not the reference pose's sign) or moved further than the rates
 * allow. Where halving cannot go on, the branch ends there: a lock, with a dead centre.
 * Dyads are placed on their reference side at every value; a window where a dyad cannot
 * assemble that falls between two samples is found from the dyad's own assembly
 * condition (its signed sine, dyadSine.ts), not by finer sampling.
 */
import { OP_NEWTON, OP_STRIDE, type Plan, type PlanInternal } from './plan';
import { blockOperations, isDyadOp, placesBeforeOnBranch, refinesDyadMinimum, signedDyadSine } from './dyadSine';
import { GOLDEN_PROBE_AT, GOLDEN_PROBE_VALUE, goldenSectionMinimum, type DriverProbe } from './goldenSection';
import { blockJacobianSign } from './newton';
import { poseRatesInto, runBatch, runSized, runWithRates } from './run';
import {
  DEAD_CENTRE_SIN_TOL,
  FULL_TURN_TOL_RAD,
  MOTION_CLOSURE_REL_TOL,
  SWEEP_CORRECTION_FLOOR_REL,
  SWEEP_CORRECTION_MAX_SHARE,
  SWEEP_MAX_STEP_RAD,
  SWEEP_MAX_STEP_REL,
  SWEEP_MAX_SUBSTEPS,
  SWEEP_REFINE_MAX_STEPS,
  SWEEP_REFINE_REL_TOL,
  SWEEP_REJOIN_REL_TOL,
} from './tolerances';

export interface SweepRange {
  /** Driver values (rad or mm), both ends included. */
  readonly from: number;
  readonly to: number;
  /** Number of samples, ≥ 1. */
  readonly steps: number;
}

/**
 * `limit`: the motion cannot go on past it (an edge of a lock). `change point`: a dyad
 * reaches its toggle and the motion goes on (its two branches meet there, as at a
 * four-bar's change point).
 */
export type DeadCentreKind = 'limit' | 'change point';

export interface SweepDeadCentre {
  readonly value: number;
  readonly joint: string;
  readonly kind: DeadCentreKind;
}

export interface SweepResult {
  /** The `steps` driver values. */
  readonly values: Float64Array;
  /** steps × 2 × slotCount: the pose at each value (all NaN where it does not assemble). */
  readonly poses: Float64Array;
  /** Same layout: d(pose)/d(driver). */
  readonly rates: Float64Array;
  /** 1 where it assembles on the reference branch. */
  readonly assembled: Uint8Array;
  /**
   * Driver sub-ranges where it cannot assemble on the reference branch, `from` and `to`
   * in the sweep's direction; edges inside the range are located to
   * SWEEP_REFINE_REL_TOL of a step. A lock narrower than the sample spacing, with
   * assembled samples on both sides, is listed too.
   */
  readonly locks: { readonly from: number; readonly to: number }[];
  /**
   * Dead centres met in the range, in the sweep's order: each edge of a lock inside the
   * range (`limit`, named by the joint whose placement fails there; for a Newton block,
   * its first joint), and each place where a dyad's sine at its joint (2 × triangle area
   * / (rA rB)) reaches DEAD_CENTRE_SIN_TOL and the motion goes on (`change point`).
   */
  readonly deadCentres: SweepDeadCentre[];
  /** A rotation driver turned through 2π without locking, back to its first pose (closesInOneTurn). */
  readonly fullTurn: boolean;
}

/**
 * Samples further apart than this many of the sweep's unit steps (SWEEP_MAX_STEP_RAD,
 * or SWEEP_MAX_STEP_REL of the length scale: 40° for a rotation driver) do not resolve
 * a dyad's sine well enough to judge a minimum by its neighbours: every minimum is
 * refined (there are few samples, so few minima).
 */
const SWEEP_REFINE_SCREEN_MAX_UNIT_STEPS = 8;

/**
 * Work done by a sweep, counted in plan operations run, for callers that measure it
 * (bench, tests): a count does not depend on the machine's speed.
 */
export interface SweepWork {
  /** Plan operations run by the tracking: each tracked solve runs the whole plan. */
  trackOps: number;
  /** Sampled minima of dyads' signed sines between assembled samples. */
  minima: number;
  /** Of those, the ones refined by golden-section search. */
  refined: number;
  /** Plan operations run by golden-section probes: each runs the plan up to its dyad. */
  probeOps: number;
  /** Plan operations run by bisections of a lock window's edges: each step runs the whole plan. */
  edgeOps: number;
}

/** The joint an operation places (for a Newton block its first joint), or -1. */
function opJoint(p: PlanInternal, op: number): number {
  if (!(op >= 0)) return -1;
  const o = op * OP_STRIDE;
  if (p.ops[o] === OP_NEWTON) return p.blockUnknowns[p.blockUnknownStart[p.ops[o + 1]]] >> 1;
  return p.ops[o + 3] >> 1;
}

/** A tracked state: the last pose accepted on the reference branch, its rates and driver value. */
interface Track {
  value: number;
  readonly pose: Float64Array;
  readonly rates: Float64Array;
  /** The operation that refused the last refused step (-1: none). */
  refusedOp: number;
}

/** What every tracked step of one sweep shares: the plan, the reference branch and scratch. */
interface Tracker {
  readonly p: PlanInternal;
  readonly stride: number;
  /** Sign of det J of each block in the reference pose. */
  readonly referenceSigns: Int8Array;
  /** Operation index of each block. */
  readonly blockOps: Int32Array;
  readonly maxStep: number;
  readonly minStep: number;
  readonly correctionFloorMm: number;
  readonly pose: Float64Array;
  readonly rates: Float64Array;
  readonly predicted: Float64Array;
  readonly work: SweepWork | undefined;
}

function newTrack(stride: number): Track {
  return { value: NaN, pose: new Float64Array(stride), rates: new Float64Array(stride), refusedOp: -1 };
}

function copyTrack(to: Track, from: Track): void {
  to.value = from.value;
  to.pose.set(from.pose);
  to.rates.set(from.rates);
  to.refusedOp = from.refusedOp;
}

/**
 * Solves at v from `start` (moved on by `startRates` × (v − startValue) when given) into
 * the tracker's pose and rates. Returns -1 when the solution is on the reference branch
 * and, with rates, within the correction a continuous motion allows; else the index of
 * the operation that failed or refused.
 */
function trySolve(t: Tracker, start: Float64Array, startRates: Float64Array | null, startValue: number, v: number): number {
  const { p, stride, pose, predicted } = t;
  const dv = v - startValue;
  let motion = 0;
  for (let i = 0; i < stride; i += 2) {
    let x = start[i];
    let y = start[i + 1];
    if (startRates !== null) {
      const rx = startRates[i] * dv;
      const ry = startRates[i + 1] * dv;
      if (Number.isFinite(rx) && Number.isFinite(ry)) {
        x += rx;
        y += ry;
        motion = Math.max(motion, Math.hypot(rx, ry));
      }
    }
    predicted[i] = x;
    predicted[i + 1] = y;
  }
  pose.set(predicted);
  if (t.work !== undefined) t.work.trackOps += p.opCount;
  if (!runWithRates(p, v, pose, t.rates)) return p.failedOp;
  const allowed = SWEEP_CORRECTION_MAX_SHARE * motion + t.correctionFloorMm;
  for (let b = 0; b < p.blockCount; b++) {
    if (blockJacobianSign(p, b, pose) !== t.referenceSigns[b]) return t.blockOps[b];
    if (startRates === null) continue;
    for (let k = 0, first = p.blockUnknownStart[b]; k < p.blockUnknownCount[b]; k++) {
      const s = p.blockUnknowns[first + k];
      if (!(Math.hypot(pose[s] - predicted[s], pose[s + 1] - predicted[s + 1]) <= allowed)) return t.blockOps[b];
    }
  }
  return -1;
}

function accept(t: Tracker, track: Track, v: number): void {
  track.value = v;
  track.pose.set(t.pose);
  track.rates.set(t.rates);
}

/**
 * Moves `track` to `target` by accepted steps, each at most maxStep, halving a refused
 * step and doubling after an accepted one. False when a step below minStep is refused:
 * the branch ends within that of track.value, which is left at the last value accepted
 * (track.refusedOp says which operation refused).
 */
function advance(t: Tracker, track: Track, target: number): boolean {
  const distance = Math.abs(target - track.value);
  const cap = SWEEP_MAX_SUBSTEPS + (t.maxStep < Infinity ? Math.ceil(distance / t.maxStep) : 0);
  let h = Math.min(distance, t.maxStep);
  for (let i = 0; i < cap; i++) {
    const remaining = target - track.value;
    if (!(Math.abs(remaining) > 0)) return remaining === 0;
    const v = h >= Math.abs(remaining) ? target : track.value + Math.sign(remaining) * h;
    const refused = trySolve(t, track.pose, track.rates, track.value, v);
    if (refused < 0) {
      accept(t, track, v);
      if (v === target) return true;
      h = Math.min(2 * h, t.maxStep);
    } else {
      track.refusedOp = refused;
      h *= 0.5;
      if (!(h >= t.minStep)) return false;
    }
  }
  return false;
}

/**
 * Moves `track` back towards `end` (where the branch was last seen from the other side)
 * in steps that halve the distance left, so no step can pass over a lock narrower than
 * itself: false, with track.value at the lock's edge, where the branch ends first; true
 * when it comes within minStep of `end`.
 */
function approach(t: Tracker, track: Track, end: number): boolean {
  for (let i = 0; i < SWEEP_REFINE_MAX_STEPS; i++) {
    const half = 0.5 * (track.value - end);
    if (!(Math.abs(half) >= t.minStep)) return true;
    if (!advance(t, track, end + half)) return false;
  }
  return true;
}

/** Two tracked poses within SWEEP_REJOIN_REL_TOL of the length scale of each other, joint by joint. */
function samePose(t: Tracker, a: Track, b: Track): boolean {
  const tol = SWEEP_REJOIN_REL_TOL * t.p.lengthScaleMm;
  for (let i = 0; i < t.stride; i += 2) {
    if (!(Math.hypot(a.pose[i] - b.pose[i], a.pose[i + 1] - b.pose[i + 1]) <= tol)) return false;
  }
  return true;
}

/**
 * Takes up the reference branch again at v after a lock: from `near` (the last sample
 * solved, when there is one, a start away from the fold where the branch ended), moved
 * on by its rates and not, else from the last accepted pose, else from the reference pose.
 */
function reacquire(t: Tracker, track: Track, v: number, near: Track | null): boolean {
  let refused = near === null ? 0 : trySolve(t, near.pose, near.rates, near.value, v);
  if (refused >= 0 && near !== null) refused = trySolve(t, near.pose, null, near.value, v);
  if (refused >= 0) refused = trySolve(t, track.pose, null, track.value, v);
  if (refused >= 0) refused = trySolve(t, t.p.reference, null, track.value, v);
  if (refused >= 0) {
    track.refusedOp = refused;
    return false;
  }
  accept(t, track, v);
  return true;
}

/**
 * The pose a turn on from `from` is the pose at `from` (MOTION_CLOSURE_REL_TOL): the
 * motion repeats each turn. Where a Newton block's assembly does not close in a turn, the
 * driver's second turn follows another motion, which may lock: turning through one turn
 * is then no proof that the driven link turns fully. False where no sample lies a turn
 * on (FULL_TURN_TOL_RAD), since nothing then shows the motion closes.
 */
function closesInOneTurn(p: PlanInternal, values: Float64Array, poses: Float64Array, from: number, direction: number): boolean {
  const steps = values.length;
  if (steps < 2) return false;
  const spacing = (values[steps - 1] - from) / (steps - 1);
  const k = Math.round((direction * 2 * Math.PI) / spacing);
  if (!(k > 0 && k < steps && Math.abs(values[k] - (from + direction * 2 * Math.PI)) <= FULL_TURN_TOL_RAD)) return false;
  const stride = 2 * p.slotCount;
  const tol = MOTION_CLOSURE_REL_TOL * p.lengthScaleMm;
  for (let i = 0; i < stride; i++) if (!(Math.abs(poses[k * stride + i] - poses[i]) <= tol)) return false;
  return true;
}

/** `work`, when given, has the sweep's work (plan operations run, see SweepWork) added to it. */
export function sweep(plan: Plan, range: SweepRange, work?: SweepWork): SweepResult {
  const p = plan as PlanInternal;
  const { from, to, steps } = range;
  if (!(Number.isFinite(from) && Number.isFinite(to) && Number.isInteger(steps) && steps >= 1)) {
    throw new RangeError(`sweep: range { from: ${from}, to: ${to}, steps: ${steps} }; expected finite ends and an integer steps ≥ 1`);
  }
  const stride = 2 * p.slotCount;
  const values = new Float64Array(steps);
  const poses = new Float64Array(steps * stride).fill(NaN);
  const rates = new Float64Array(steps * stride).fill(NaN);
  const assembled = new Uint8Array(steps);
  const spacing = steps > 1 ? (to - from) / (steps - 1) : 0;
  for (let k = 0; k < steps; k++) values[k] = steps > 1 ? from + spacing * k : from;
  const direction = to >= from ? 1 : -1;

  const unitStep = p.driverIsLength ? SWEEP_MAX_STEP_REL * p.lengthScaleMm : SWEEP_MAX_STEP_RAD;
  const blockOps = blockOperations(p);
  const referenceSigns = new Int8Array(p.blockCount);
  for (let b = 0; b < p.blockCount; b++) referenceSigns[b] = blockJacobianSign(p, b, p.reference);
  const t: Tracker = {
    p,
    stride,
    referenceSigns,
    blockOps,
    maxStep: p.blockCount > 0 ? unitStep : Infinity,
    minStep: SWEEP_REFINE_REL_TOL * (spacing !== 0 ? Math.min(Math.abs(spacing), unitStep) : unitStep),
    correctionFloorMm: SWEEP_CORRECTION_FLOOR_REL * p.lengthScaleMm,
    pose: new Float64Array(stride),
    rates: new Float64Array(stride),
    predicted: new Float64Array(stride),
    work,
  };

  // The reference pose holds at its driver value, and for a rotation driver at any whole
  // turn from it: start from the copy nearest the range.
  let anchor = p.driverReferenceValue;
  if (!p.driverIsLength) {
    const nearest = Math.min(Math.max(anchor, Math.min(from, to)), Math.max(from, to));
    anchor += 2 * Math.PI * Math.round((nearest - anchor) / (2 * Math.PI));
  }
  const start = newTrack(stride);
  start.value = anchor;
  start.pose.set(p.reference);
  if (!runWithRates(p, anchor, start.pose, start.rates)) {
    start.pose.set(p.reference);
    start.rates.fill(NaN);
  }

  // boundaryEdge[b], boundaryOp[b]: where the branch ends between samples b and b + 1.
  const boundaryEdge = new Float64Array(Math.max(steps - 1, 0)).fill(NaN);
  const boundaryOp = new Int32Array(Math.max(steps - 1, 0)).fill(-1);
  const track = newTrack(stride);
  const probe = newTrack(stride);
  const last = newTrack(stride);
  const edgeTrack = newTrack(stride);
  const store = (k: number) => {
    assembled[k] = 1;
    poses.set(track.pose, k * stride);
    rates.set(track.rates, k * stride);
  };
  const locks: { from: number; to: number }[] = [];
  const deadCentres: SweepDeadCentre[] = [];
  const limit = (value: number, op: number) => {
    const joint = opJoint(p, op);
    if (joint >= 0) deadCentres.push({ value, joint: p.jointIds[joint], kind: 'limit' });
  };
  // Two passes out from the anchor: up the index from the first sample at or past it, down from the one before.
  let firstUp = 0;
  while (firstUp < steps && (values[firstUp] - anchor) * direction < 0) firstUp++;
  const whole = p.blockCount === 0 && wholeByBatch(p, t, values, poses, rates, assembled);
  for (const step of whole ? [] : [1, -1]) {
    copyTrack(track, start);
    let alive = true;
    for (let k = step > 0 ? firstUp : firstUp - 1; k >= 0 && k < steps; k += step) {
      const previous = k - step;
      const boundary = step > 0 ? k - 1 : k;
      const hasBoundary = previous >= 0 && previous < steps;
      if (alive) {
        if (advance(t, track, values[k])) {
          store(k);
          continue;
        }
        edgeTrack.value = track.value;
        edgeTrack.pose.set(track.pose);
        const edge = track.value;
        const edgeOp = track.refusedOp;
        // The branch ends between samples. If it is back by this sample, and followed back
        // ends again short of the first end, the lock is narrower than a step; if it comes
        // back to the pose where it ended, the two meet there: a singular point passed.
        if (hasBoundary) {
          last.value = values[previous];
          last.pose.set(poses.subarray(previous * stride, (previous + 1) * stride));
          last.rates.set(rates.subarray(previous * stride, (previous + 1) * stride));
        }
        if (reacquire(t, track, values[k], hasBoundary ? last : null)) {
          copyTrack(probe, track);
          if (!approach(t, probe, edge)) {
            store(k);
            locks.push(step > 0 ? { from: edge, to: probe.value } : { from: probe.value, to: edge });
            limit(edge, edgeOp);
            limit(probe.value, probe.refusedOp);
            continue;
          }
          if (samePose(t, probe, edgeTrack)) {
            store(k);
            const joint = opJoint(p, edgeOp);
            if (joint >= 0) deadCentres.push({ value: edge, joint: p.jointIds[joint], kind: 'change point' });
            continue;
          }
        }
        alive = false;
        if (hasBoundary) {
          boundaryEdge[boundary] = edge;
          boundaryOp[boundary] = edgeOp;
        }
      } else if (reacquire(t, track, values[k], null)) {
        store(k);
        alive = true;
        // Where the lock ends: follow the branch back towards the sample before.
        if (hasBoundary) {
          copyTrack(probe, track);
          if (!approach(t, probe, values[previous])) {
            boundaryEdge[boundary] = probe.value;
            boundaryOp[boundary] = probe.refusedOp;
          }
        }
      }
    }
  }

  for (let k = 0; k < steps; k++) {
    if (assembled[k] === 1) continue;
    let j = k;
    while (j + 1 < steps && assembled[j + 1] === 0) j++;
    let lockFrom = values[k];
    let lockTo = values[j];
    if (k > 0 && Number.isFinite(boundaryEdge[k - 1])) {
      lockFrom = boundaryEdge[k - 1];
      limit(lockFrom, boundaryOp[k - 1]);
    }
    if (j + 1 < steps && Number.isFinite(boundaryEdge[j])) {
      lockTo = boundaryEdge[j];
      limit(lockTo, boundaryOp[j]);
    }
    locks.push({ from: lockFrom, to: lockTo });
    k = j;
  }

  findDyadWindows(p, t, { values, poses, rates, assembled }, locks, deadCentres);
  const order = (a: number, b: number) => (a - b) * direction;
  locks.sort((a, b) => order(a.from, b.from));
  deadCentres.sort((a, b) => order(a.value, b.value));

  const fullTurn = !p.driverIsLength && Math.abs(to - from) >= 2 * Math.PI - FULL_TURN_TOL_RAD &&
    locks.length === 0 && assembled.every((f) => f === 1) && closesInOneTurn(p, values, poses, from, direction);
  return { values, poses, rates, assembled, locks, deadCentres, fullTurn };
}

/**
 * Without Newton blocks, tracking a sample is a run at its value: a dyad keeps its
 * reference side whatever the start, so nothing is predicted or refused and the pose
 * does not depend on the order of the values. All the samples are then run in one batch
 * (runBatch) into `poses`, each sample's rates taken at its pose: true, with every
 * sample stored as the tracking would store it, where all of them assemble. False where
 * one does not (the samples are then left unassembled for the tracking, which also
 * locates the lock's edges).
 */
function wholeByBatch(
  p: PlanInternal, t: Tracker, values: Float64Array, poses: Float64Array, rates: Float64Array, assembled: Uint8Array,
): boolean {
  const { stride, pose } = t;
  const steps = values.length;
  if (t.work !== undefined) t.work.trackOps += steps * p.opCount;
  pose.set(p.reference);
  const slots = new Int32Array(p.slotCount);
  for (let k = 0; k < p.slotCount; k++) slots[k] = 2 * k;
  if (runBatch(p, values, pose, slots, poses) > 0) {
    poses.fill(NaN);
    return false;
  }
  const driverParams = p.driverIsLength ? p.driverParams : new Int32Array(0);
  for (let k = 0; k < steps; k++) {
    // A length driver's lengths as the run at this sample set them.
    for (let j = 0; j < driverParams.length; j++) p.params[driverParams[j]] = values[k];
    for (let i = 0, at = k * stride; i < stride; i++) pose[i] = poses[at + i];
    poseRatesInto(p, pose, t.rates);
    rates.set(t.rates, k * stride);
    assembled[k] = 1;
  }
  return true;
}

/**
 * Dyad dead centres between samples: a sampled local minimum of a dyad's signed sine
 * between assembled samples that comes near zero for its sampled change
 * (dyadSine.ts) is refined by golden-section search. A minimum within DEAD_CENTRE_SIN_TOL of zero is a
 * change point passed; one below it is a lock window, whose edges are bisected on the
 * assembly condition.
 */
function findDyadWindows(
  p: PlanInternal, t: Tracker,
  samples: Pick<SweepResult, 'values' | 'poses' | 'rates' | 'assembled'>,
  locks: { from: number; to: number }[], deadCentres: SweepDeadCentre[],
): void {
  const work = t.work;
  const { values, poses, rates, assembled } = samples;
  const steps = values.length;
  if (steps < 2) return;
  const stride = t.stride;
  const sine = new Float64Array(steps);
  // goldenSection.ts's probe and answer.
  const probeIo = new Float64Array(2);
  const found = new Float64Array(2);
  const written = prefixSlots(p);
  const unitStep = p.driverIsLength ? SWEEP_MAX_STEP_REL * p.lengthScaleMm : SWEEP_MAX_STEP_RAD;
  const screen = Math.abs(values[1] - values[0]) <= SWEEP_REFINE_SCREEN_MAX_UNIT_STEPS * unitStep;
  for (let o = 0, end = p.opCount * OP_STRIDE; o < end; o += OP_STRIDE) {
    if (!isDyadOp(p.ops[o])) continue;
    for (let k = 0; k < steps; k++) sine[k] = assembled[k] === 1 ? signedDyadSine(p, o, poses, k * stride) : NaN;
    for (let k = 0; k < steps; k++) {
      if (assembled[k] === 0) continue;
      // A neighbour that does not assemble is a lock already reported.
      if ((k > 0 && assembled[k - 1] === 0) || (k + 1 < steps && assembled[k + 1] === 0)) continue;
      const before = k > 0 ? sine[k - 1] : Infinity;
      const after = k + 1 < steps ? sine[k + 1] : Infinity;
      if (!(sine[k] < before && sine[k] <= after)) continue;
      if (work !== undefined) work.minima++;
      if (screen && !refinesDyadMinimum(sine, k, steps - 1, false)) continue;
      if (work !== undefined) work.refined++;
      const lo = values[k > 0 ? k - 1 : k];
      const hi = values[k + 1 < steps ? k + 1 : k];
      const at = k * stride;
      dyadSineMinimum(p, t, written, o, lo, hi, values[k], poses.subarray(at, at + stride), rates.subarray(at, at + stride), probeIo, found);
      const where = found[GOLDEN_PROBE_AT];
      const least = found[GOLDEN_PROBE_VALUE];
      // A minimum at an end of the range is not passed within it.
      if (Math.abs(where - values[0]) <= t.minStep || Math.abs(where - values[steps - 1]) <= t.minStep) continue;
      // A lock the tracking found already (a block's, or one its sub-steps met).
      if (locks.some((l) => (where - l.from) * (where - l.to) <= 0)) continue;
      const joint = p.jointIds[p.ops[o + 3] >> 1];
      if (Math.abs(least) < DEAD_CENTRE_SIN_TOL) {
        deadCentres.push({ value: where, joint, kind: 'change point' });
      } else if (least < 0) {
        // The samples on either side of the window that assemble.
        const left = (values[k] - where) * (hi - lo) < 0 ? k : k - 1;
        const right = left + 1;
        const lockFrom = bisectEdge(p, t, values[left], where, poses.subarray(left * stride, (left + 1) * stride), rates.subarray(left * stride, (left + 1) * stride));
        const lockTo = bisectEdge(p, t, values[right], where, poses.subarray(right * stride, (right + 1) * stride), rates.subarray(right * stride, (right + 1) * stride));
        locks.push({ from: lockFrom.value, to: lockTo.value });
        for (const edge of [lockFrom, lockTo]) {
          const j = opJoint(p, edge.op);
          if (j >= 0) deadCentres.push({ value: edge.value, joint: p.jointIds[j], kind: 'limit' });
        }
      }
    }
  }
}

/**
 * The pose offsets each operation writes, in plan order: operation i writes
 * slots[start[i] .. start[i + 1]) (a Newton block its unknowns, any other operation its
 * one slot). Operations read only what earlier ones wrote, so a run of the operations
 * before i needs only the slots before start[i].
 */
interface PrefixSlots {
  readonly slots: Int32Array;
  readonly start: Int32Array;
}

function prefixSlots(p: PlanInternal): PrefixSlots {
  const start = new Int32Array(p.opCount + 1);
  for (let i = 0; i < p.opCount; i++) {
    const o = i * OP_STRIDE;
    start[i + 1] = start[i] + (p.ops[o] === OP_NEWTON ? p.blockUnknownCount[p.ops[o + 1]] : 1);
  }
  const slots = new Int32Array(start[p.opCount]);
  for (let i = 0; i < p.opCount; i++) {
    const o = i * OP_STRIDE;
    if (p.ops[o] !== OP_NEWTON) {
      slots[start[i]] = p.ops[o + 3];
      continue;
    }
    const b = p.ops[o + 1];
    for (let k = 0; k < p.blockUnknownCount[b]; k++) slots[start[i] + k] = p.blockUnknowns[p.blockUnknownStart[b] + k];
  }
  return { slots, start };
}

/**
 * Moves a sample's pose on by its rates to v, for the slots given: the start of a run,
 * where Newton blocks begin from it.
 */
function predictInto(t: Tracker, v: number, at: number, pose: Float64Array, rates: Float64Array, slots: Int32Array, count: number): void {
  for (let j = 0; j < count; j++) {
    const i = slots[j];
    const x = pose[i] + rates[i] * (v - at);
    const y = pose[i + 1] + rates[i + 1] * (v - at);
    t.pose[i] = Number.isFinite(x) ? x : pose[i];
    t.pose[i + 1] = Number.isFinite(y) ? y : pose[i + 1];
  }
}

/**
 * Solves at v into t.pose from a sample's pose moved on by its rates. False when it does
 * not assemble or a block lands on another branch (p.failedOp then names the operation).
 */
function solveNear(p: PlanInternal, t: Tracker, v: number, at: number, pose: Float64Array, rates: Float64Array): boolean {
  for (let i = 0; i < t.stride; i++) {
    const predicted = pose[i] + rates[i] * (v - at);
    t.pose[i] = Number.isFinite(predicted) ? predicted : pose[i];
  }
  if (!runSized(p, v, t.pose)) return false;
  for (let b = 0; b < p.blockCount; b++) {
    if (blockJacobianSign(p, b, t.pose) !== t.referenceSigns[b]) {
      p.failedOp = t.blockOps[b];
      return false;
    }
  }
  return true;
}

/**
 * solveNear for the operations before `endOp` only (their slots in t.pose): true when
 * they all place and every block among them stays on the reference branch. Blocks are
 * numbered in plan order, so this is solveNear's failure before endOp.
 */
function solvePrefixNear(
  p: PlanInternal, t: Tracker, written: PrefixSlots, endOp: number, v: number, at: number, pose: Float64Array, rates: Float64Array,
): boolean {
  predictInto(t, v, at, pose, rates, written.slots, written.start[endOp]);
  return placesBeforeOnBranch(p, v, t.pose, endOp, t.blockOps, t.referenceSigns);
}

/**
 * The least signed sine of dyad `o` on [lo, hi] and where it lies, into `found`
 * (goldenSection.ts layout). The sine depends only on the operations before the dyad,
 * so each probe runs only those.
 */
function dyadSineMinimum(
  p: PlanInternal, t: Tracker, written: PrefixSlots, o: number, lo: number, hi: number, at: number,
  pose: Float64Array, rates: Float64Array, probeIo: Float64Array, found: Float64Array,
): void {
  const work = t.work;
  const endOp = o / OP_STRIDE;
  const sine: DriverProbe = {
    probe(io) {
      if (work !== undefined) work.probeOps += endOp;
      // Where the linkage fails (or leaves the branch) before this dyad, its sine is not defined: count it as a lock.
      io[GOLDEN_PROBE_VALUE] = -1;
      if (!solvePrefixNear(p, t, written, endOp, io[GOLDEN_PROBE_AT], at, pose, rates)) return;
      const s = signedDyadSine(p, o, t.pose, 0);
      if (!Number.isNaN(s)) io[GOLDEN_PROBE_VALUE] = s;
    },
  };
  goldenSectionMinimum(sine, lo, hi, t.minStep, probeIo, found);
}

/** Bisects between `good` (a sample that assembles, pose and rates given) and `bad`; returns the last value that assembles and the operation that fails past it. */
function bisectEdge(
  p: PlanInternal, t: Tracker, good: number, bad: number, pose: Float64Array, rates: Float64Array,
): { value: number; op: number } {
  const work = t.work;
  const at = good;
  let lo = good;
  let hi = bad;
  let op = -1;
  for (let i = 0; i < SWEEP_REFINE_MAX_STEPS && Math.abs(hi - lo) > t.minStep; i++) {
    const mid = 0.5 * (lo + hi);
    if (work !== undefined) work.edgeOps += p.opCount;
    if (solveNear(p, t, mid, at, pose, rates)) {
      lo = mid;
    } else {
      hi = mid;
      op = p.failedOp;
    }
  }
  if (work !== undefined && op < 0) work.edgeOps += p.opCount;
  if (op < 0 && !solveNear(p, t, bad, at, pose, rates)) op = p.failedOp;
  return { value: lo, op };
}
