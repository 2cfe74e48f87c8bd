/**
 * Running a plan: run places every joint and point for one driver value into a pose;
 * runWithRates also gives exact d(pose)/d(driver) by implicit differentiation of each
 * operation's constraints. Neither allocates; the inner loop is one switch over the
 * Int32Array opcodes with the plan's arrays held in locals.
 */
import { circleCircleIntersectInto as circleCircleImport, circleLineIntersectInto as circleLineImport } from '../geometry/intersect';
import { polarInto as polarImport } from '../geometry/trig';
import { blockRates as blockRatesImport, solveBlock as solveBlockImport } from './newton';
import type {
  OP_CIRCLE_BODY_LINE,
  OP_CIRCLE_GROUND_LINE,
  OP_DYAD,
  OP_NEWTON,
  OP_RIGID,
  OP_ROTATE,
  OP_SET,
  OP_STRIDE,
  Plan,
  PlanInternal,
} from './plan';

// The inner loop sees only literals and module-local functions. Dev-time module
// transforms such as tsx's turn every imported binding into a getter call (measured: a
// call per opcode comparison, and no inlining); bundlers and native modules do not, and
// there these locals cost nothing. Each literal is checked against its named
// constant in plan.ts by `satisfies`, so plan.ts stays the one definition.
const circleCircleIntersectInto = circleCircleImport;
const circleLineIntersectInto = circleLineImport;
const polarInto = polarImport;
const solveBlock = solveBlockImport;
const blockRates = blockRatesImport;
const STRIDE = 6 satisfies typeof OP_STRIDE;

export { closureResidualMm } from './closure';

// Callers test the length themselves and call this only on a mismatch: a call that never
// runs costs the JIT none of its inlining budget, which run's callers need for the kernel.
function poseLengthError(p: PlanInternal, pose: Float64Array, name: string): RangeError {
  return new RangeError(`${name}: array has ${pose.length} numbers; expected ${2 * p.slotCount} (2 × ${p.slotCount} slots)`);
}

/** Marks run failed at operation index `op`: that operation's outputs and all later ones become NaN. */
export function failFrom(p: PlanInternal, op: number, pose: Float64Array): false {
  p.failedOp = op;
  const ops = p.ops;
  for (let o = op * STRIDE, end = p.opCount * STRIDE; o < end; o += STRIDE) {
    if (ops[o] === (6 satisfies typeof OP_NEWTON)) {
      const b = ops[o + 1];
      for (let k = 0; k < p.blockUnknownCount[b]; k++) {
        const s = p.blockUnknowns[p.blockUnknownStart[b] + k];
        pose[s] = NaN;
        pose[s + 1] = NaN;
      }
    } else {
      pose[ops[o + 3]] = NaN;
      pose[ops[o + 3] + 1] = NaN;
    }
  }
  return false;
}

/**
 * Solves the linkage at driverValue (rad for a rotation driver, mm for a length
 * driver). pose in: a nearby pose, the start of any Newton block (the reference pose is
 * fine); out: the solved pose. False when the linkage cannot assemble there (pose then
 * holds NaN from the first joint that could not be placed on).
 */
export function run(plan: Plan, driverValue: number, pose: Float64Array): boolean {
  const p = plan as PlanInternal;
  if (pose.length !== 2 * p.slotCount) throw poseLengthError(p, pose, 'run: pose');
  return runSized(p, driverValue, pose);
}

/**
 * run for a caller that made its pose for this plan (2 × slotCount numbers) and keeps
 * it: the same solve without the check of the pose's length, which costs a tenth of a
 * four-bar's solve. For the hot loops of the core (the curve of a pose family, the
 * sweep); everything else calls run.
 */
export function runSized(plan: Plan, driverValue: number, pose: Float64Array): boolean {
  const p = plan as PlanInternal;
  // Small enough to inline into a caller's loop, and the plan's kernel into it; the
  // value crosses into the kernel through a Float64Array, since a double passed to a
  // call that is not inlined is boxed: an allocation per run.
  p.driverValue[0] = driverValue;
  const kernel = p.kernel;
  const failed = kernel === null ? interpret(p, pose, p.opCount) : kernel(pose);
  if (failed >= 0) return failFrom(p, failed, pose);
  p.failedOp = -1;
  return true;
}

/**
 * run at each driver value of `values` in turn, on one pose: each Newton block starts
 * from the pose the value before left (the first from `pose` as given), as a run of
 * calls to run would. After each value the (x, y) of every pose offset in `slots` is
 * written to `out` (value i's at out[2 × slots.length × i ..]), NaN where the linkage
 * does not assemble at that value. Returns the number of values where it does not; pose
 * and plan.failedOp end as run leaves them at the last value. Bit for bit what run gives,
 * through the generated batch kernel where there is one, else value by value.
 */
export function runBatch(plan: Plan, values: Float64Array, pose: Float64Array, slots: Int32Array, out: Float64Array): number {
  const p = plan as PlanInternal;
  if (pose.length !== 2 * p.slotCount) throw poseLengthError(p, pose, 'runBatch: pose');
  if (out.length !== 2 * slots.length * values.length) {
    throw new RangeError(`runBatch: out has ${out.length} numbers; expected ${2 * slots.length * values.length} (2 × ${slots.length} slots × ${values.length} values)`);
  }
  for (let j = 0; j < slots.length; j++) {
    const s = slots[j];
    if (!(s >= 0 && s < 2 * p.slotCount && s % 2 === 0)) {
      throw new RangeError(`runBatch: slots[${j}] is ${s}; expected a pose offset (an even number in [0, ${2 * p.slotCount}))`);
    }
  }
  const kernel = p.kernel;
  if (kernel !== null && kernel.batch !== null && values.length > 0) {
    const last = kernel.batch(pose, values, slots, out);
    // Negative: the last value failed, and failFrom has named its operation in p.failedOp.
    if (last < 0) return -last;
    p.failedOp = -1;
    return last;
  }
  const count = values.length;
  const ns = slots.length;
  const opCount = p.opCount;
  let failures = 0;
  let w = 0;
  for (let i = 0; i < count; i++) {
    p.driverValue[0] = values[i];
    const failed = kernel === null ? interpret(p, pose, opCount) : kernel(pose);
    if (failed >= 0) {
      failFrom(p, failed, pose);
      failures++;
      for (let j = 0; j < ns; j++, w += 2) {
        out[w] = NaN;
        out[w + 1] = NaN;
      }
      continue;
    }
    p.failedOp = -1;
    for (let j = 0; j < ns; j++, w += 2) {
      const s = slots[j];
      out[w] = pose[s];
      out[w + 1] = pose[s + 1];
    }
  }
  return failures;
}

/**
 * Runs only the operations before `endOp` (0 ≤ endOp ≤ opCount), by the interpreter,
 * which gives the generated kernel's bits: what depends on those operations alone (a
 * dyad's inputs, when endOp is the dyad's index) costs the prefix, not the plan. Returns
 * the index of the operation that failed, or -1. Slots of later operations, and
 * plan.failedOp, are left as they were.
 */
export function runPrefix(plan: Plan, driverValue: number, pose: Float64Array, endOp: number): number {
  const p = plan as PlanInternal;
  if (pose.length !== 2 * p.slotCount) throw poseLengthError(p, pose, 'runPrefix: pose');
  if (!(Number.isInteger(endOp) && endOp >= 0 && endOp <= p.opCount)) {
    throw new RangeError(`runPrefix: endOp ${endOp}; expected an integer in [0, ${p.opCount}]`);
  }
  p.driverValue[0] = driverValue;
  return interpret(p, pose, endOp);
}

/**
 * The operations before `endOp` interpreted, where specialise.ts could not generate a
 * kernel or only a prefix is wanted; returns as a Kernel does.
 */
function interpret(p: PlanInternal, pose: Float64Array, endOp: number): number {
  const driverValue = p.driverValue[0];
  const ops = p.ops;
  const prm = p.params;
  if (p.driverIsLength) {
    if (!(driverValue > 0 && driverValue < Infinity && p.referenceValid)) return 0;
    const driverParams = p.driverParams;
    for (let k = 0; k < driverParams.length; k++) prm[driverParams[k]] = driverValue;
  } else if (!(Math.abs(driverValue) < Infinity && p.referenceValid)) {
    return 0;
  }
  // Prologue, without dispatch: the frame's positions, then the rotation driver's tip.
  const end = endOp * STRIDE;
  let o = 0;
  for (const setEnd = Math.min(p.setCount * STRIDE, end); o < setEnd; o += STRIDE) {
    const c = ops[o + 3];
    const q = ops[o + 5];
    pose[c] = prm[q];
    pose[c + 1] = prm[q + 1];
  }
  if (!p.driverIsLength && o < end) {
    const a = ops[o + 1];
    polarInto(pose, ops[o + 3], pose[a], pose[a + 1], prm[ops[o + 5]], driverValue);
    o += STRIDE;
  }
  for (; o < end; o += STRIDE) {
    switch (ops[o]) {
      case 2 satisfies typeof OP_RIGID: {
        const a = ops[o + 1];
        const b = ops[o + 2];
        const c = ops[o + 3];
        const q = ops[o + 5];
        const ax = pose[a];
        const ay = pose[a + 1];
        const wx = pose[b] - ax;
        const wy = pose[b + 1] - ay;
        const u = prm[q];
        const v = prm[q + 1];
        pose[c] = ax + u * wx - v * wy;
        pose[c + 1] = ay + u * wy + v * wx;
        break;
      }
      case 3 satisfies typeof OP_DYAD: {
        const a = ops[o + 1];
        const b = ops[o + 2];
        const q = ops[o + 5];
        if (!circleCircleIntersectInto(pose[a], pose[a + 1], prm[q], pose[b], pose[b + 1], prm[q + 1], prm[q + 2], pose, ops[o + 3])) {
          return o / STRIDE;
        }
        break;
      }
      case 4 satisfies typeof OP_CIRCLE_GROUND_LINE: {
        const a = ops[o + 1];
        const q = ops[o + 5];
        if (!circleLineIntersectInto(pose[a], pose[a + 1], prm[q], prm[q + 2], prm[q + 3], prm[q + 4], prm[q + 5], prm[q + 1], pose, ops[o + 3])) {
          return o / STRIDE;
        }
        break;
      }
      case 5 satisfies typeof OP_CIRCLE_BODY_LINE: {
        const a = ops[o + 1];
        const e = ops[o + 2];
        const f = ops[o + 4];
        const q = ops[o + 5];
        const ex = pose[e];
        const ey = pose[e + 1];
        const wx = pose[f] - ex;
        const wy = pose[f + 1] - ey;
        const u = prm[q + 2];
        const v = prm[q + 3];
        const alpha = prm[q + 4];
        const beta = prm[q + 5];
        if (!circleLineIntersectInto(
          pose[a], pose[a + 1], prm[q],
          ex + u * wx - v * wy, ey + u * wy + v * wx, alpha * wx - beta * wy, alpha * wy + beta * wx,
          prm[q + 1], pose, ops[o + 3],
        )) {
          return o / STRIDE;
        }
        break;
      }
      case 6 satisfies typeof OP_NEWTON:
        if (!solveBlock(p, ops[o + 1], pose)) return o / STRIDE;
        break;
    }
  }
  return -1;
}

/**
 * run, and rates := d(pose)/d(driverValue), exact: each operation's constraints
 * differentiated and solved (a dyad's (J − A)·(J' − A') = rA rA', (J − B)·(J' − B') =
 * rB rB' as a 2 × 2 system; a Newton block by its Jacobian). False, with rates all NaN,
 * when the linkage cannot assemble. At a dead centre the rates are not finite.
 */
export function runWithRates(plan: Plan, driverValue: number, pose: Float64Array, rates: Float64Array): boolean {
  const p = plan as PlanInternal;
  if (rates.length !== 2 * p.slotCount) throw poseLengthError(p, rates, 'runWithRates: rates');
  if (!run(plan, driverValue, pose)) {
    rates.fill(NaN);
    return false;
  }
  poseRatesInto(p, pose, rates);
  return true;
}

/**
 * runWithRates's rates alone, for a pose run (or runBatch) has solved: the plan's params
 * must be those of that solve (for a length driver, its lengths at that driver value).
 */
export function poseRatesInto(p: PlanInternal, pose: Float64Array, rates: Float64Array): void {
  const ops = p.ops;
  const prm = p.params;
  const prmRates = p.paramRates;
  for (let o = 0, end = p.opCount * STRIDE; o < end; o += STRIDE) {
    const a = ops[o + 1];
    const b = ops[o + 2];
    const c = ops[o + 3];
    const q = ops[o + 5];
    switch (ops[o]) {
      case 0 satisfies typeof OP_SET:
        rates[c] = 0;
        rates[c + 1] = 0;
        break;
      case 1 satisfies typeof OP_ROTATE:
        rates[c] = rates[a] - (pose[c + 1] - pose[a + 1]);
        rates[c + 1] = rates[a + 1] + (pose[c] - pose[a]);
        break;
      case 2 satisfies typeof OP_RIGID: {
        const wx = rates[b] - rates[a];
        const wy = rates[b + 1] - rates[a + 1];
        rates[c] = rates[a] + prm[q] * wx - prm[q + 1] * wy;
        rates[c + 1] = rates[a + 1] + prm[q] * wy + prm[q + 1] * wx;
        break;
      }
      case 3 satisfies typeof OP_DYAD: {
        const ex = pose[c] - pose[a];
        const ey = pose[c + 1] - pose[a + 1];
        const fx = pose[c] - pose[b];
        const fy = pose[c + 1] - pose[b + 1];
        const r1 = prm[q] * prmRates[q] + ex * rates[a] + ey * rates[a + 1];
        const r2 = prm[q + 1] * prmRates[q + 1] + fx * rates[b] + fy * rates[b + 1];
        const det = ex * fy - ey * fx;
        rates[c] = (r1 * fy - r2 * ey) / det;
        rates[c + 1] = (ex * r2 - fx * r1) / det;
        break;
      }
      case 4 satisfies typeof OP_CIRCLE_GROUND_LINE: {
        const dx = prm[q + 4];
        const dy = prm[q + 5];
        const ex = pose[c] - pose[a];
        const ey = pose[c + 1] - pose[a + 1];
        const t = (prm[q] * prmRates[q] + ex * rates[a] + ey * rates[a + 1]) / (ex * dx + ey * dy);
        rates[c] = t * dx;
        rates[c + 1] = t * dy;
        break;
      }
      case 5 satisfies typeof OP_CIRCLE_BODY_LINE: {
        // Row 1: the slider equation D × (J − Q) = 0 differentiated (as EQ_SLIDER_BODY
        // in newton.ts); row 2: (J − A)·(J' − A') = r r'.
        const e = b;
        const f = ops[o + 4];
        const u = prm[q + 2];
        const v = prm[q + 3];
        const alpha = prm[q + 4];
        const beta = prm[q + 5];
        const wx = pose[f] - pose[e];
        const wy = pose[f + 1] - pose[e + 1];
        const dx = alpha * wx - beta * wy;
        const dy = alpha * wy + beta * wx;
        const rx = pose[c] - (pose[e] + u * wx - v * wy);
        const ry = pose[c + 1] - (pose[e + 1] + u * wy + v * wx);
        const grx = -dy;
        const gry = dx;
        const gwx = alpha * ry - beta * rx - (u * grx + v * gry);
        const gwy = -alpha * rx - beta * ry - (u * gry - v * grx);
        const wrx = rates[f] - rates[e];
        const wry = rates[f + 1] - rates[e + 1];
        const r1 = -(gwx * wrx + gwy * wry - grx * rates[e] - gry * rates[e + 1]);
        const ex = pose[c] - pose[a];
        const ey = pose[c + 1] - pose[a + 1];
        const r2 = prm[q] * prmRates[q] + ex * rates[a] + ey * rates[a + 1];
        const det = grx * ey - gry * ex;
        rates[c] = (r1 * ey - r2 * gry) / det;
        rates[c + 1] = (grx * r2 - ex * r1) / det;
        break;
      }
      case 6 satisfies typeof OP_NEWTON:
        if (!blockRates(p, a, pose, rates)) {
          for (let k = 0; k < p.blockUnknownCount[a]; k++) {
            const s = p.blockUnknowns[p.blockUnknownStart[a] + k];
            rates[s] = NaN;
            rates[s + 1] = NaN;
          }
        }
        break;
    }
  }
}
