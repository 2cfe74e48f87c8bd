/**
 * A sweep runs a plan over a range of driver values, carrying each solved pose (moved
 * on by its rates) into the next step so a Newton block tracks its branch, and reports
 * where the linkage locks, where a dyad passes a dead centre, and whether a rotation
 * driver turns fully.
 */
import {
  OP_CIRCLE_BODY_LINE,
  OP_CIRCLE_GROUND_LINE,
  OP_DYAD,
  OP_NEWTON,
  OP_STRIDE,
  type Plan,
  type PlanInternal,
} from './plan';
import { run, runWithRates } from './run';
import {
  DEAD_CENTRE_CANDIDATE_SIN,
  DEAD_CENTRE_SIN_TOL,
  FULL_TURN_TOL_RAD,
  SWEEP_REFINE_MAX_STEPS,
  SWEEP_REFINE_REL_TOL,
} from './tolerances';

export interface SweepRange {
  /** Driver values (rad or mm), both ends included. */
  readonly from: number;
  readonly to: number;
  /** Number of samples, ≥ 1. */
  readonly steps: number;
}

export interface SweepResult {
  /** The `steps` driver values. */
  readonly values: Float64Array;
  /** steps × 2 × slotCount: the pose at each value (NaN where it does not assemble). */
  readonly poses: Float64Array;
  /** Same layout: d(pose)/d(driver). */
  readonly rates: Float64Array;
  /** 1 where it assembles. */
  readonly assembled: Uint8Array;
  /**
   * Driver sub-ranges where it cannot assemble, `from` and `to` in the sweep's direction;
   * edges inside the range are located to SWEEP_REFINE_REL_TOL of a step.
   */
  readonly locks: { readonly from: number; readonly to: number }[];
  /**
   * Toggle positions of a dyad met in the range: an edge of a lock (named by the joint
   * whose placement fails there; for a Newton block, its first joint), or a dyad's sine
   * at its joint (2 × triangle area / (rA rB), the triangle height normalised) dipping
   * below DEAD_CENTRE_SIN_TOL without locking. In the sweep's order.
   */
  readonly deadCentres: { readonly value: number; readonly joint: string }[];
  /** A rotation driver turned through 2π without locking. */
  readonly fullTurn: boolean;
}

/** The joint an operation places (for a Newton block its first joint), or -1. */
function opJoint(p: PlanInternal, op: number): number {
  const o = op * OP_STRIDE;
  if (p.ops[o] === OP_NEWTON) return p.blockUnknowns[p.blockUnknownStart[p.ops[o + 1]]] >> 1;
  return p.ops[o + 3] >> 1;
}

/**
 * Sine of a dyad's angle at the joint it places, from the pose at poses[at]: for two
 * circles |(J − A) × (J − B)| / (|J − A| |J − B|); for a circle and a line the cosine
 * of the angle between the link and the line. 0 at a dead centre.
 */
function dyadSine(p: PlanInternal, o: number, poses: Float64Array, at: number): number {
  const a = at + p.ops[o + 1];
  const c = at + p.ops[o + 3];
  const ex = poses[c] - poses[a];
  const ey = poses[c + 1] - poses[a + 1];
  const q = p.ops[o + 5];
  if (p.ops[o] === OP_DYAD) {
    const b = at + p.ops[o + 2];
    const fx = poses[c] - poses[b];
    const fy = poses[c + 1] - poses[b + 1];
    return Math.abs(ex * fy - ey * fx) / (Math.hypot(ex, ey) * Math.hypot(fx, fy));
  }
  let dx: number;
  let dy: number;
  if (p.ops[o] === OP_CIRCLE_GROUND_LINE) {
    dx = p.params[q + 4];
    dy = p.params[q + 5];
  } else {
    const e = at + p.ops[o + 2];
    const f = at + p.ops[o + 4];
    const wx = poses[f] - poses[e];
    const wy = poses[f + 1] - poses[e + 1];
    dx = p.params[q + 4] * wx - p.params[q + 5] * wy;
    dy = p.params[q + 4] * wy + p.params[q + 5] * wx;
  }
  return Math.abs(ex * dx + ey * dy) / (Math.hypot(ex, ey) * Math.hypot(dx, dy));
}

function isDyadOp(code: number): boolean {
  return code === OP_DYAD || code === OP_CIRCLE_GROUND_LINE || code === OP_CIRCLE_BODY_LINE;
}

export function sweep(plan: Plan, range: SweepRange): SweepResult {
  const p = plan as PlanInternal;
  const { from, to, steps } = range;
  if (!(Number.isFinite(from) && Number.isFinite(to) && Number.isInteger(steps) && steps >= 1)) {
    throw new RangeError(`sweep: range { from: ${from}, to: ${to}, steps: ${steps} }; expected finite ends and an integer steps ≥ 1`);
  }
  const stride = 2 * p.slotCount;
  const values = new Float64Array(steps);
  const poses = new Float64Array(steps * stride);
  const rates = new Float64Array(steps * stride);
  const assembled = new Uint8Array(steps);
  const failedOps = new Int32Array(steps).fill(-1);
  const spacing = steps > 1 ? (to - from) / (steps - 1) : 0;
  const pose = new Float64Array(stride);
  const rate = new Float64Array(stride);
  const lastPose = Float64Array.from(p.reference);
  const lastRates = new Float64Array(stride);
  let lastValue = p.driverReferenceValue;
  let haveRates = false;
  const tracking = p.blockCount > 0;

  for (let k = 0; k < steps; k++) {
    const v = steps > 1 ? from + spacing * k : from;
    values[k] = v;
    // Predictor for the Newton blocks: the last solved pose moved on by its rates.
    for (let i = 0; i < stride; i++) {
      const predicted = lastPose[i] + lastRates[i] * (v - lastValue);
      pose[i] = haveRates && Number.isFinite(predicted) ? predicted : lastPose[i];
    }
    let ok = runWithRates(p, v, pose, rate);
    if (!ok && tracking) {
      pose.set(lastPose);
      ok = runWithRates(p, v, pose, rate);
      if (!ok) {
        pose.set(p.reference);
        ok = runWithRates(p, v, pose, rate);
      }
    }
    poses.set(pose, k * stride);
    rates.set(rate, k * stride);
    if (ok) {
      assembled[k] = 1;
      lastPose.set(pose);
      lastRates.set(rate);
      lastValue = v;
      haveRates = true;
    } else {
      failedOps[k] = p.failedOp;
    }
  }

  const scratch = new Float64Array(stride);
  /** Bisects between an assembling and a failing value; returns the edge and the operation that fails past it. */
  const edge = (good: number, bad: number, goodPoseAt: number, badOp: number): { value: number; op: number } => {
    const start = poses.slice(goodPoseAt, goodPoseAt + stride);
    let lo = good;
    let hi = bad;
    let op = badOp;
    const tol = SWEEP_REFINE_REL_TOL * Math.abs(spacing);
    for (let i = 0; i < SWEEP_REFINE_MAX_STEPS && Math.abs(hi - lo) > tol; i++) {
      const mid = 0.5 * (lo + hi);
      scratch.set(start);
      if (run(p, mid, scratch)) {
        lo = mid;
        start.set(scratch);
      } else {
        hi = mid;
        op = p.failedOp;
      }
    }
    return { value: 0.5 * (lo + hi), op };
  };

  const locks: { from: number; to: number }[] = [];
  const deadCentres: { value: number; joint: string }[] = [];
  for (let k = 0; k < steps; k++) {
    if (assembled[k] === 1) continue;
    let j = k;
    while (j + 1 < steps && assembled[j + 1] === 0) j++;
    let lockFrom = values[k];
    let lockTo = values[j];
    if (k > 0) {
      const found = edge(values[k - 1], values[k], (k - 1) * stride, failedOps[k]);
      lockFrom = found.value;
      const joint = opJoint(p, found.op);
      if (joint >= 0) deadCentres.push({ value: found.value, joint: p.jointIds[joint] });
    }
    if (j + 1 < steps) {
      const found = edge(values[j + 1], values[j], (j + 1) * stride, failedOps[j]);
      lockTo = found.value;
      const joint = opJoint(p, found.op);
      if (joint >= 0) deadCentres.push({ value: found.value, joint: p.jointIds[joint] });
    }
    locks.push({ from: lockFrom, to: lockTo });
    k = j;
  }

  // Dead centres passed without locking: a dyad's sine dips to ~0 between samples.
  for (let o = 0, end = p.opCount * OP_STRIDE; o < end; o += OP_STRIDE) {
    if (!isDyadOp(p.ops[o])) continue;
    for (let k = 1; k + 1 < steps; k++) {
      if (assembled[k - 1] === 0 || assembled[k] === 0 || assembled[k + 1] === 0) continue;
      const here = dyadSine(p, o, poses, k * stride);
      if (!(here < DEAD_CENTRE_CANDIDATE_SIN && here < dyadSine(p, o, poses, (k - 1) * stride) && here <= dyadSine(p, o, poses, (k + 1) * stride))) continue;
      const found = refineMinimum(p, o, values[k - 1], values[k + 1], poses.subarray(k * stride, (k + 1) * stride), scratch, Math.abs(spacing));
      if (found.sine < DEAD_CENTRE_SIN_TOL) deadCentres.push({ value: found.value, joint: p.jointIds[p.ops[o + 3] >> 1] });
    }
  }
  deadCentres.sort((a, b) => (to >= from ? a.value - b.value : b.value - a.value));

  const fullTurn = !p.driverIsLength && Math.abs(to - from) >= 2 * Math.PI - FULL_TURN_TOL_RAD && assembled.every((f) => f === 1);
  return { values, poses, rates, assembled, locks, deadCentres, fullTurn };
}

/** Golden-section search for the smallest dyad sine on [lo, hi]; a value that does not assemble counts as sine 0. */
function refineMinimum(
  p: PlanInternal, o: number, lo: number, hi: number, start: Float64Array, scratch: Float64Array, spacing: number,
): { value: number; sine: number } {
  const invPhi = (Math.sqrt(5) - 1) / 2;
  const sineAt = (v: number) => {
    scratch.set(start);
    return run(p, v, scratch) ? dyadSine(p, o, scratch, 0) : 0;
  };
  let a = lo;
  let b = hi;
  let x1 = b - invPhi * (b - a);
  let x2 = a + invPhi * (b - a);
  let f1 = sineAt(x1);
  let f2 = sineAt(x2);
  const tol = SWEEP_REFINE_REL_TOL * spacing;
  for (let i = 0; i < SWEEP_REFINE_MAX_STEPS && Math.abs(b - a) > tol; i++) {
    if (f1 <= f2) {
      b = x2;
      x2 = x1;
      f2 = f1;
      x1 = b - invPhi * (b - a);
      f1 = sineAt(x1);
    } else {
      a = x1;
      x1 = x2;
      f1 = f2;
      x2 = a + invPhi * (b - a);
      f2 = sineAt(x2);
    }
  }
  return f1 <= f2 ? { value: x1, sine: f1 } : { value: x2, sine: f2 };
}
