/**
 * The compiled form of a linkage: a flat list of operations in typed arrays, run by
 * run.ts. Public fields follow notes/linkage-api.md; the rest is the kernel's own and
 * callers must not touch it. One plan per thread: it owns its scratch.
 */
import type { Linkage } from './model';

export interface PlanBody {
  readonly id: string;
  /** Slots of the joints (in the body's order) then of the points the body carries. */
  readonly slots: Int32Array;
}

export interface Plan {
  /** Defensive deep copy of the source linkage. */
  readonly linkage: Linkage;
  readonly jointIds: readonly string[];
  readonly pointIds: readonly string[];
  /** Joints then points; a pose holds 2 × slotCount numbers, slot s at [2s, 2s + 1]. */
  readonly slotCount: number;
  readonly slotIndex: ReadonlyMap<string, number>;
  /** bodies[0] is GROUND. */
  readonly bodies: readonly PlanBody[];
  readonly bodyIndex: ReadonlyMap<string, number>;
  /** Driver value in the reference pose: rad for a rotation driver, mm for a length driver. */
  readonly driverReferenceValue: number;
  /** Scalar unknowns (2 per joint) solved by Newton–Raphson blocks; 0 when dyads place every joint. */
  readonly newtonUnknowns: number;
  /** The reference pose. Do not write; use setReferencePose. */
  readonly reference: Float64Array;
}

// Operations, OP_STRIDE int32 each: [code, a, b, c, d, param offset]. a–d are pose
// offsets (2 × slot) or -1; c is the slot an operation writes. The list opens with the
// OP_SETs of the frame, then a rotation driver's OP_ROTATE; neither appears later.
export const OP_STRIDE = 6;
/** c := (x, y). Params: x, y. */
export const OP_SET = 0;
/** c := a + L (cos v, sin v), v the driver angle. Params: L. */
export const OP_ROTATE = 1;
/** c := a + u (b − a) + v perp(b − a). Params: u, v. */
export const OP_RIGID = 2;
/** c at rA from a and rB from b, on side `branch` of a→b. Params: rA, rB, branch. */
export const OP_DYAD = 3;
/** c at r from a on a ground line through Q along unit D. Params: r, branch, Qx, Qy, Dx, Dy, angle. */
export const OP_CIRCLE_GROUND_LINE = 4;
/**
 * c at r from a on a line of a body known from b (= e) and d (= f): Q = e + u w + v perp(w),
 * D = α w + β perp(w), w = f − e. Params: r, branch, u, v, α, β, angle.
 */
export const OP_CIRCLE_BODY_LINE = 5;
/** Newton–Raphson block number a. */
export const OP_NEWTON = 6;

// Constraint equations, EQ_STRIDE int32 each: [type, s0, s1, s2, param offset], s* pose
// offsets. Newton blocks solve them; closureResidualMm checks them.
export const EQ_STRIDE = 5;
/** |s1 − s0| = L (1 row). Params: L. */
export const EQ_DIST = 0;
/** s2 = s0 + u (s1 − s0) + v perp(s1 − s0) (2 rows). Params: u, v. */
export const EQ_RIGID = 1;
/** s0 on the ground line through Q along unit D (1 row). Params: Qx, Qy, Dx, Dy, angle. */
export const EQ_SLIDER_GROUND = 2;
/** s0 on a line of the body known from s1 (= e), s2 (= f), as OP_CIRCLE_BODY_LINE (1 row). Params: u, v, α, β, angle. */
export const EQ_SLIDER_BODY = 3;
/** s0 = (x, y) (2 rows; closure checks only). Params: x, y. */
export const EQ_FIXED = 4;

export function equationRows(type: number): number {
  return type === EQ_RIGID || type === EQ_FIXED ? 2 : 1;
}

/**
 * Pairs of slots (pose offsets) that are the ends of a link: every pair of joints of one
 * moving body (the pairs a linkage file's reference pose is checked on, validate.ts),
 * flat (i0, j0, i1, j1, …).
 */
export function linkJointPairs(plan: Plan): Int32Array {
  const pairs: number[] = [];
  const jointCount = plan.jointIds.length;
  for (let b = 1; b < plan.bodies.length; b++) {
    const slots = Array.from(plan.bodies[b].slots).filter((s) => s < jointCount);
    for (let i = 0; i < slots.length; i++) for (let j = i + 1; j < slots.length; j++) pairs.push(2 * slots[i], 2 * slots[j]);
  }
  return Int32Array.from(pairs);
}

/** The kernel's view of a plan: the public fields plus its arrays and scratch. */
export interface PlanInternal extends Plan {
  driverReferenceValue: number;
  readonly driverIsLength: boolean;
  /** Pose offsets of the driver's joints: pivot and tip, or from and to. */
  readonly driverSlots: Int32Array;
  /** The driver value of the run in progress (see run.ts). */
  readonly driverValue: Float64Array;
  readonly opCount: number;
  /**
   * Operations run before the dispatch loop: the leading OP_SETs (setCount of them) and,
   * for a rotation driver, the OP_ROTATE after them. run.ts does them straight.
   */
  readonly setCount: number;
  readonly ops: Int32Array;
  readonly params: Float64Array;
  /** d(param)/d(driver value): 1 for lengths set by a length driver, else 0. */
  readonly paramRates: Float64Array;
  /** Params overwritten with the driver value by a length driver. */
  readonly driverParams: Int32Array;

  readonly blockCount: number;
  readonly blockUnknownStart: Int32Array;
  readonly blockUnknownCount: Int32Array;
  /** Pose offsets of the joints each block solves. */
  readonly blockUnknowns: Int32Array;
  readonly blockEqStart: Int32Array;
  readonly blockEqCount: Int32Array;
  readonly blockEqs: Int32Array;
  /** Per block, slotCount entries: the Jacobian column of a slot's x, or -1 when the slot is known. */
  readonly blockColumns: Int32Array;

  readonly checkCount: number;
  readonly checks: Int32Array;

  // Newton scratch, sized for the largest block.
  readonly jacobian: Float64Array;
  readonly residual: Float64Array;
  readonly step: Float64Array;
  readonly saved: Float64Array;

  /** Largest of the reference link lengths and coordinates (mm); scales the tolerances. */
  lengthScaleMm: number;
  /** Newton stops below this residual (mm). */
  newtonTolMm: number;
  /** False when the reference pose set last has a zero-length link or a non-finite number. */
  referenceValid: boolean;
  /** Operation index at which the last run failed, -1 after a success. */
  failedOp: number;
  /**
   * The operations as generated straight-line code (specialise.ts), or null where code
   * generation is unavailable and run.ts interprets them. Same results either way.
   */
  kernel: Kernel | null;
}

/**
 * Runs a plan on `pose` at the driver value in its driverValue[0]: -1 on success, else
 * the index of the operation that failed (run.ts then fills NaN from there on). `batch`
 * runs it at many driver values in one call (see BatchKernel), or is null where the
 * plan is too long for one function (run.ts then calls the kernel per value).
 */
export interface Kernel {
  (pose: Float64Array): number;
  batch: BatchKernel | null;
}

/**
 * run.ts's runBatch in one call, for at least one value: for each driver value in
 * `values`, in order, what run would do to `pose`, then the (x, y) of each pose offset in
 * `slots` into `out` (NaN where that value fails), value after value. Returns the number
 * of values that failed, negated when the last one did (failedOp then names where; else
 * runBatch sets it to -1).
 */
export type BatchKernel = (pose: Float64Array, values: Float64Array, slots: Int32Array, out: Float64Array) => number;
