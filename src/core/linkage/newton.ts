/**
 * Newton–Raphson blocks: joints no dyad can place (a Stephenson III driven from its
 * dyad side) solved together on their distance, rigid-body and slider equations,
 * started from the incoming pose; a triad among them by its one-unknown reduction. Also the implicit differentiation of those equations
 * for exact rates. Everything works in the plan's preallocated scratch.
 */
import type { EQ_DIST, EQ_RIGID, EQ_SLIDER_BODY, EQ_SLIDER_GROUND, EQ_STRIDE, Plan, PlanInternal } from './plan';
import { determinantSignInPlace as determinantSignInPlaceImport, pivotRow as pivotRowImport } from './determinantSign';
import * as tolerances from './tolerances';
import {
  solveTriad as solveTriadImport,
  triadJacobianSign as triadJacobianSignImport,
  triadLayout,
  triadRates as triadRatesImport,
  type TRIAD_NO_START,
  type TRIAD_SOLVED,
} from './triad';

// Imports bound to locals, literals checked against plan.ts and triad.ts by `satisfies`,
// and tolerances read once: see the note in run.ts on dev-time module transforms.
const STRIDE = 5 satisfies typeof EQ_STRIDE;
const DIST = 0 satisfies typeof EQ_DIST;
const RIGID = 1 satisfies typeof EQ_RIGID;
const SLIDER_GROUND = 2 satisfies typeof EQ_SLIDER_GROUND;
const SLIDER_BODY = 3 satisfies typeof EQ_SLIDER_BODY;
const solveTriad = solveTriadImport;
const triadRates = triadRatesImport;
const triadJacobianSign = triadJacobianSignImport;
const determinantSignInPlace = determinantSignInPlaceImport;
const pivotRow = pivotRowImport;
const NO_START = -1 satisfies typeof TRIAD_NO_START;
const SOLVED = 1 satisfies typeof TRIAD_SOLVED;
const NEWTON_MAX_ITERATIONS = tolerances.NEWTON_MAX_ITERATIONS;
const NEWTON_MAX_HALVINGS = tolerances.NEWTON_MAX_HALVINGS;
const NEWTON_ROUNDING_FLOOR_FACTOR = tolerances.NEWTON_ROUNDING_FLOOR_FACTOR;
const SINGULAR_PIVOT_REL_TOL = tolerances.SINGULAR_PIVOT_REL_TOL;

/** Adds a gradient entry of `row` for slot offset `s`: to the Jacobian when s is unknown, else to the rates right-hand side. */
function accumulate(
  columns: Int32Array, columnBase: number, n: number, jac: Float64Array | null,
  rates: Float64Array | null, rhs: Float64Array, row: number, s: number, gx: number, gy: number,
): void {
  const col = columns[columnBase + (s >> 1)];
  if (col >= 0) {
    if (jac !== null) {
      const k = row * n + col;
      jac[k] += gx;
      jac[k + 1] += gy;
    }
  } else if (rates !== null) {
    rhs[row] -= gx * rates[s] + gy * rates[s + 1];
  }
}

/**
 * Evaluates `count` equations from eqs[start] at pose into res (rows in order) and
 * returns the largest |residual| (mm; NaN when any is NaN). With jac (n × n, zeroed
 * by the caller) also their derivatives by the unknowns of `columns`; with rates also
 * rhs := −(derivative by known slots · their rates + derivative by lengths · their rates).
 */
export function evaluateEquations(
  eqs: Int32Array, start: number, count: number, params: Float64Array, paramRates: Float64Array,
  pose: Float64Array, columns: Int32Array, columnBase: number, n: number,
  res: Float64Array, jac: Float64Array | null, rates: Float64Array | null, rhs: Float64Array,
): number {
  let worst = 0;
  let row = 0;
  for (let e = start * STRIDE, end = (start + count) * STRIDE; e < end; e += STRIDE) {
    const type = eqs[e];
    const s0 = eqs[e + 1];
    const s1 = eqs[e + 2];
    const s2 = eqs[e + 3];
    const q = eqs[e + 4];
    if (rates !== null) {
      rhs[row] = 0;
      if (type === RIGID) rhs[row + 1] = 0;
    }
    if (type === DIST) {
      const length = params[q];
      const dx = pose[s0] - pose[s1];
      const dy = pose[s0 + 1] - pose[s1 + 1];
      const d2 = dx * dx + dy * dy;
      // (|d|² − L²) / 2L: smooth, and ≈ |d| − L in mm near a solution.
      res[row] = (d2 - length * length) / (2 * length);
      const gx = dx / length;
      const gy = dy / length;
      accumulate(columns, columnBase, n, jac, rates, rhs, row, s0, gx, gy);
      accumulate(columns, columnBase, n, jac, rates, rhs, row, s1, -gx, -gy);
      if (rates !== null) rhs[row] += ((d2 + length * length) / (2 * length * length)) * paramRates[q];
    } else if (type === RIGID) {
      const u = params[q];
      const v = params[q + 1];
      const wx = pose[s1] - pose[s0];
      const wy = pose[s1 + 1] - pose[s0 + 1];
      res[row] = pose[s2] - pose[s0] - u * wx + v * wy;
      res[row + 1] = pose[s2 + 1] - pose[s0 + 1] - u * wy - v * wx;
      accumulate(columns, columnBase, n, jac, rates, rhs, row, s2, 1, 0);
      accumulate(columns, columnBase, n, jac, rates, rhs, row + 1, s2, 0, 1);
      accumulate(columns, columnBase, n, jac, rates, rhs, row, s1, -u, v);
      accumulate(columns, columnBase, n, jac, rates, rhs, row + 1, s1, -v, -u);
      accumulate(columns, columnBase, n, jac, rates, rhs, row, s0, u - 1, -v);
      accumulate(columns, columnBase, n, jac, rates, rhs, row + 1, s0, v, u - 1);
      worst = Math.max(worst, Math.abs(res[row]));
      row += 1;
    } else if (type === SLIDER_GROUND) {
      const dx = params[q + 2];
      const dy = params[q + 3];
      res[row] = dx * (pose[s0 + 1] - params[q + 1]) - dy * (pose[s0] - params[q]);
      accumulate(columns, columnBase, n, jac, rates, rhs, row, s0, -dy, dx);
    } else if (type === SLIDER_BODY) {
      const u = params[q];
      const v = params[q + 1];
      const alpha = params[q + 2];
      const beta = params[q + 3];
      const ex = pose[s1];
      const ey = pose[s1 + 1];
      const wx = pose[s2] - ex;
      const wy = pose[s2 + 1] - ey;
      const dx = alpha * wx - beta * wy;
      const dy = alpha * wy + beta * wx;
      const rx = pose[s0] - (ex + u * wx - v * wy);
      const ry = pose[s0 + 1] - (ey + u * wy + v * wx);
      res[row] = dx * ry - dy * rx;
      // f = D × r: by r, (−Dy, Dx); by D, (ry, −rx); D and Q turn with w = f − e.
      const grx = -dy;
      const gry = dx;
      const gwx = alpha * ry - beta * rx - (u * grx + v * gry);
      const gwy = alpha * -rx - beta * ry - (u * gry - v * grx);
      accumulate(columns, columnBase, n, jac, rates, rhs, row, s0, grx, gry);
      accumulate(columns, columnBase, n, jac, rates, rhs, row, s2, gwx, gwy);
      accumulate(columns, columnBase, n, jac, rates, rhs, row, s1, -grx - gwx, -gry - gwy);
    }
    // Math.max keeps a NaN, so a NaN residual reads as "not converged".
    worst = Math.max(worst, Math.abs(res[row]));
    row += 1;
  }
  return worst;
}

/**
 * Solves a x = b in place by Gaussian elimination with partial pivoting (a is n × n,
 * row-major, destroyed; b becomes x). False when a pivot falls below pivotRelTol × the
 * largest entry of a, or a is not finite.
 */
export function solveLinearInPlace(a: Float64Array, n: number, b: Float64Array, pivotRelTol: number): boolean {
  let largest = 0;
  for (let i = 0; i < n * n; i++) largest = Math.max(largest, Math.abs(a[i]));
  if (!(largest > 0 && largest < Infinity)) return false;
  const tol = pivotRelTol * largest;
  for (let k = 0; k < n; k++) {
    const p = pivotRow(a, n, k);
    if (!(Math.abs(a[p * n + k]) > tol)) return false;
    if (p !== k) {
      for (let j = k; j < n; j++) {
        const t = a[k * n + j];
        a[k * n + j] = a[p * n + j];
        a[p * n + j] = t;
      }
      const t = b[k];
      b[k] = b[p];
      b[p] = t;
    }
    const inv = 1 / a[k * n + k];
    for (let i = k + 1; i < n; i++) {
      const f = a[i * n + k] * inv;
      if (f !== 0) {
        for (let j = k + 1; j < n; j++) a[i * n + j] -= f * a[k * n + j];
        b[i] -= f * b[k];
      }
    }
  }
  for (let k = n - 1; k >= 0; k--) {
    let sum = b[k];
    for (let j = k + 1; j < n; j++) sum -= a[k * n + j] * b[j];
    b[k] = sum / a[k * n + k];
  }
  return true;
}

function blockResidual(p: PlanInternal, block: number, pose: Float64Array, withJacobian: boolean, rates: Float64Array | null): number {
  const n = 2 * p.blockUnknownCount[block];
  const jac = withJacobian ? p.jacobian : null;
  if (jac !== null) jac.fill(0, 0, n * n);
  return evaluateEquations(
    p.blockEqs, p.blockEqStart[block], p.blockEqCount[block], p.params, p.paramRates, pose,
    p.blockColumns, block * p.slotCount, n, p.residual, jac, rates, p.step,
  );
}

/**
 * Solves block `block` in place in pose, starting from the pose's current values of its
 * joints (the reference pose where they are not finite). A triad (triad.ts: the
 * floating ternary link of a Stephenson II or III) is solved as one unknown; any other
 * block, or a triad none of whose dyads assembles at the start, by damped Newton on the
 * block's equations. False when it does not converge, the Jacobian is singular, or a
 * number turns non-finite.
 */
export function solveBlock(p: PlanInternal, block: number, pose: Float64Array): boolean {
  const first = p.blockUnknownStart[block];
  const joints = p.blockUnknownCount[block];
  const unknowns = p.blockUnknowns;
  for (let k = 0; k < joints; k++) {
    const s = unknowns[first + k];
    if (!(Number.isFinite(pose[s]) && Number.isFinite(pose[s + 1]))) {
      pose[s] = p.reference[s];
      pose[s + 1] = p.reference[s + 1];
    }
  }
  const triad = triadsOf(p)[block];
  if (triad !== null) {
    const outcome = solveTriad(p, triad, pose);
    if (outcome !== NO_START) return outcome === SOLVED;
  }
  return dampedNewton(p, block, pose);
}

/** Pose offsets of every joint a Newton block of `plan` solves (x at each; y follows), in block order. */
export function newtonUnknownSlots(plan: Plan): Int32Array {
  const p = plan as PlanInternal;
  let count = 0;
  for (let b = 0; b < p.blockCount; b++) count += p.blockUnknownCount[b];
  const slots = new Int32Array(count);
  for (let b = 0, k = 0; b < p.blockCount; b++) {
    for (let j = 0; j < p.blockUnknownCount[b]; j++) slots[k++] = p.blockUnknowns[p.blockUnknownStart[b] + j];
  }
  return slots;
}

/** Each plan's blocks that are triads (triad.ts), found on first use: the topology of a plan does not change. */
const TRIADS = new WeakMap<PlanInternal, readonly (Int32Array | null)[]>();
/** The plan last asked about and its triads: a search solves one plan many times in a row, and this spares the map's lookup. */
let lastPlan: PlanInternal | null = null;
let lastTriads: readonly (Int32Array | null)[] = [];

function triadsOf(p: PlanInternal): readonly (Int32Array | null)[] {
  if (p === lastPlan) return lastTriads;
  let found = TRIADS.get(p);
  if (found === undefined) {
    found = Array.from({ length: p.blockCount }, (_, b) => triadLayout(p, b));
    TRIADS.set(p, found);
  }
  lastPlan = p;
  lastTriads = found;
  return found;
}

/**
 * Damped Newton on the block's equations: a step that does not lower the largest
 * residual is halved, at most NEWTON_MAX_HALVINGS times; at most NEWTON_MAX_ITERATIONS
 * iterations.
 */
function dampedNewton(p: PlanInternal, block: number, pose: Float64Array): boolean {
  const first = p.blockUnknownStart[block];
  const joints = p.blockUnknownCount[block];
  const n = 2 * joints;
  const unknowns = p.blockUnknowns;
  const step = p.step;
  const saved = p.saved;
  const tol = p.newtonTolMm;
  let norm = blockResidual(p, block, pose, false, null);
  for (let iteration = 0; iteration < NEWTON_MAX_ITERATIONS; iteration++) {
    if (norm <= tol) return true;
    if (!(norm < Infinity)) return false;
    blockResidual(p, block, pose, true, null);
    const res = p.residual;
    for (let i = 0; i < n; i++) step[i] = -res[i];
    if (!solveLinearInPlace(p.jacobian, n, step, SINGULAR_PIVOT_REL_TOL)) return false;
    for (let k = 0; k < joints; k++) {
      const s = unknowns[first + k];
      saved[2 * k] = pose[s];
      saved[2 * k + 1] = pose[s + 1];
    }
    let lambda = 1;
    let next = Infinity;
    for (let halving = 0; halving <= NEWTON_MAX_HALVINGS; halving++) {
      for (let k = 0; k < joints; k++) {
        const s = unknowns[first + k];
        pose[s] = saved[2 * k] + lambda * step[2 * k];
        pose[s + 1] = saved[2 * k + 1] + lambda * step[2 * k + 1];
      }
      next = blockResidual(p, block, pose, false, null);
      if (next < norm) break;
      lambda *= 0.5;
    }
    // No step along Newton's direction lowers the residual: either rounding (converged)
    // or a fold of the assembly with no solution nearby, which more iterations would not fix.
    if (!(next < norm)) {
      for (let k = 0; k < joints; k++) {
        const s = unknowns[first + k];
        pose[s] = saved[2 * k];
        pose[s + 1] = saved[2 * k + 1];
      }
      return norm <= NEWTON_ROUNDING_FLOOR_FACTOR * tol;
    }
    norm = next;
  }
  return norm <= tol;
}

/** Rates of the block's joints from the rates already known: the block Jacobian solve of the differentiated equations. */
export function blockRates(p: PlanInternal, block: number, pose: Float64Array, rates: Float64Array): boolean {
  const triad = triadsOf(p)[block];
  if (triad !== null && triadRates(p, triad, pose, rates)) return true;
  const first = p.blockUnknownStart[block];
  const joints = p.blockUnknownCount[block];
  const n = 2 * joints;
  blockResidual(p, block, pose, true, rates);
  const rhs = p.step;
  if (!solveLinearInPlace(p.jacobian, n, rhs, SINGULAR_PIVOT_REL_TOL)) return false;
  for (let k = 0; k < joints; k++) {
    const s = p.blockUnknowns[first + k];
    rates[s] = rhs[2 * k];
    rates[s + 1] = rhs[2 * k + 1];
  }
  return true;
}

/**
 * Sign of det(J) of block `block` at pose (+1 or −1), times a factor fixed for the plan
 * (±1; see triadJacobianSign): which assembly branch of the block the pose is on, since
 * det(J) changes sign only where J is singular, at a fold of the assembly where two
 * branches meet. Meant for comparison with the sign at another pose of the same plan
 * (the reference pose's), which the factor does not change. 0 when J is singular (a pivot
 * below SINGULAR_PIVOT_REL_TOL of its largest entry) or not finite. Works in the plan's
 * scratch.
 */
export function blockJacobianSign(p: PlanInternal, block: number, pose: Float64Array): number {
  const triad = triadsOf(p)[block];
  if (triad !== null) return triadJacobianSign(p, triad, pose);
  const n = 2 * p.blockUnknownCount[block];
  blockResidual(p, block, pose, true, null);
  return determinantSignInPlace(p.jacobian, n, SINGULAR_PIVOT_REL_TOL);
}
