/**
 * Dimensions of a plan from its reference pose: link lengths, body-local coordinates,
 * slider lines and dyad branch signs. A design is its reference pose, so the same code
 * serves compile and setReferencePose (new dimensions, same topology).
 */
import {
  EQ_DIST,
  EQ_FIXED,
  EQ_RIGID,
  EQ_SLIDER_BODY,
  EQ_SLIDER_GROUND,
  EQ_STRIDE,
  OP_CIRCLE_BODY_LINE,
  OP_CIRCLE_GROUND_LINE,
  OP_DYAD,
  OP_RIGID,
  OP_ROTATE,
  OP_SET,
  OP_STRIDE,
  type Plan,
  type PlanInternal,
} from './plan';
import { COINCIDENT_JOINT_TOL_MM, NEWTON_RESIDUAL_REL_TOL } from './tolerances';

/** Sign of the side of the line from a to b on which c lies (+1 on the left, and at 0). */
function sideOf(ref: Float64Array, a: number, b: number, c: number): number {
  const cr = (ref[b] - ref[a]) * (ref[c + 1] - ref[a + 1]) - (ref[b + 1] - ref[a + 1]) * (ref[c] - ref[a]);
  return cr < 0 ? -1 : 1;
}

function dist(ref: Float64Array, a: number, b: number): number {
  return Math.hypot(ref[b] - ref[a], ref[b + 1] - ref[a + 1]);
}

/** (u, v) of point c in the frame of base a→b: c = a + u (b − a) + v perp(b − a). */
function localInto(ref: Float64Array, a: number, b: number, cx: number, cy: number, params: Float64Array, q: number): void {
  const wx = ref[b] - ref[a];
  const wy = ref[b + 1] - ref[a + 1];
  const inv = 1 / (wx * wx + wy * wy);
  const qx = cx - ref[a];
  const qy = cy - ref[a + 1];
  params[q] = (qx * wx + qy * wy) * inv;
  params[q + 1] = (wx * qy - wy * qx) * inv;
}

/** (α, β) of the unit direction at `angle` in the frame of base a→b. */
function directionInto(ref: Float64Array, a: number, b: number, angle: number, params: Float64Array, q: number): void {
  const wx = ref[b] - ref[a];
  const wy = ref[b + 1] - ref[a + 1];
  const inv = 1 / (wx * wx + wy * wy);
  const dx = Math.cos(angle);
  const dy = Math.sin(angle);
  params[q] = (dx * wx + dy * wy) * inv;
  params[q + 1] = (wx * dy - wy * dx) * inv;
}

/**
 * Branch of a circle–line placement: +1 when the joint lies further along the line's
 * direction than the foot of the perpendicular from the circle's centre.
 */
function lineBranch(ref: Float64Array, centre: number, joint: number, dx: number, dy: number): number {
  const along = (ref[joint] - ref[centre]) * dx + (ref[joint + 1] - ref[centre + 1]) * dy;
  return along < 0 ? -1 : 1;
}

/** Sets the params of equations [start, start + count) from the reference pose; false if a length is degenerate. */
export function refreshEquations(eqs: Int32Array, start: number, count: number, params: Float64Array, ref: Float64Array): boolean {
  let ok = true;
  for (let e = start * EQ_STRIDE, end = (start + count) * EQ_STRIDE; e < end; e += EQ_STRIDE) {
    const s0 = eqs[e + 1];
    const s1 = eqs[e + 2];
    const s2 = eqs[e + 3];
    const q = eqs[e + 4];
    switch (eqs[e]) {
      case EQ_DIST:
        params[q] = dist(ref, s0, s1);
        if (!(params[q] >= COINCIDENT_JOINT_TOL_MM)) ok = false;
        break;
      case EQ_RIGID:
        localInto(ref, s0, s1, ref[s2], ref[s2 + 1], params, q);
        break;
      case EQ_SLIDER_GROUND:
        params[q] = ref[s0];
        params[q + 1] = ref[s0 + 1];
        params[q + 2] = Math.cos(params[q + 4]);
        params[q + 3] = Math.sin(params[q + 4]);
        break;
      case EQ_SLIDER_BODY:
        localInto(ref, s1, s2, ref[s0], ref[s0 + 1], params, q);
        directionInto(ref, s1, s2, params[q + 4], params, q + 2);
        break;
      case EQ_FIXED:
        params[q] = ref[s0];
        params[q + 1] = ref[s0 + 1];
        break;
    }
  }
  return ok;
}

/** Sets the params of every operation from the reference pose; false if a length is degenerate. */
function refreshOperations(p: PlanInternal, ref: Float64Array): boolean {
  const ops = p.ops;
  const params = p.params;
  let ok = true;
  for (let o = 0, end = p.opCount * OP_STRIDE; o < end; o += OP_STRIDE) {
    const a = ops[o + 1];
    const b = ops[o + 2];
    const c = ops[o + 3];
    const d = ops[o + 4];
    const q = ops[o + 5];
    switch (ops[o]) {
      case OP_SET:
        params[q] = ref[c];
        params[q + 1] = ref[c + 1];
        break;
      case OP_ROTATE:
        params[q] = dist(ref, a, c);
        if (!(params[q] >= COINCIDENT_JOINT_TOL_MM)) ok = false;
        break;
      case OP_RIGID:
        localInto(ref, a, b, ref[c], ref[c + 1], params, q);
        break;
      case OP_DYAD:
        params[q] = dist(ref, a, c);
        params[q + 1] = dist(ref, b, c);
        params[q + 2] = sideOf(ref, a, b, c);
        if (!(params[q] >= COINCIDENT_JOINT_TOL_MM && params[q + 1] >= COINCIDENT_JOINT_TOL_MM)) ok = false;
        break;
      case OP_CIRCLE_GROUND_LINE: {
        const dx = Math.cos(params[q + 6]);
        const dy = Math.sin(params[q + 6]);
        params[q] = dist(ref, a, c);
        params[q + 1] = lineBranch(ref, a, c, dx, dy);
        params[q + 2] = ref[c];
        params[q + 3] = ref[c + 1];
        params[q + 4] = dx;
        params[q + 5] = dy;
        if (!(params[q] >= COINCIDENT_JOINT_TOL_MM)) ok = false;
        break;
      }
      case OP_CIRCLE_BODY_LINE:
        params[q] = dist(ref, a, c);
        params[q + 1] = lineBranch(ref, a, c, Math.cos(params[q + 6]), Math.sin(params[q + 6]));
        localInto(ref, b, d, ref[c], ref[c + 1], params, q + 2);
        directionInto(ref, b, d, params[q + 6], params, q + 4);
        if (!(params[q] >= COINCIDENT_JOINT_TOL_MM)) ok = false;
        break;
    }
  }
  return ok;
}

/**
 * Gives the plan new dimensions: `pose` (2 × slotCount numbers) becomes its reference
 * pose; lengths, body-local coordinates, slider lines (each keeps its direction and
 * passes through its joint's new position) and dyad branches follow from it. Same
 * topology; allocates nothing. A pose with a zero-length link or a non-finite number
 * is kept but makes every run return false until a good pose is set.
 */
export function setReferencePose(plan: Plan, pose: Float64Array): void {
  const p = plan as PlanInternal;
  if (pose.length !== 2 * p.slotCount) {
    throw new RangeError(`setReferencePose: pose has ${pose.length} numbers; expected ${2 * p.slotCount} (2 × ${p.slotCount} slots)`);
  }
  const ref = p.reference;
  ref.set(pose);
  let scale = 0;
  for (let i = 0; i < ref.length; i++) scale = Math.max(scale, Math.abs(ref[i]));
  let ok = Number.isFinite(scale);
  ok = refreshOperations(p, ref) && ok;
  for (let b = 0; b < p.blockCount; b++) ok = refreshEquations(p.blockEqs, p.blockEqStart[b], p.blockEqCount[b], p.params, ref) && ok;
  ok = refreshEquations(p.checks, 0, p.checkCount, p.params, ref) && ok;
  const params = p.params;
  for (let i = 0; i < params.length; i++) if (!Number.isFinite(params[i])) ok = false;
  // Every link is shorter than 3 × the largest coordinate, and rounding grows with the
  // coordinates: the largest |coordinate| scales the Newton tolerance.
  p.lengthScaleMm = Math.max(scale, COINCIDENT_JOINT_TOL_MM);
  p.newtonTolMm = NEWTON_RESIDUAL_REL_TOL * p.lengthScaleMm;
  p.driverReferenceValue = referenceDriverValue(p, ref);
  p.referenceValid = ok;
}

function referenceDriverValue(p: PlanInternal, ref: Float64Array): number {
  const a = p.driverSlots[0];
  const b = p.driverSlots[1];
  return p.driverIsLength ? dist(ref, a, b) : Math.atan2(ref[b + 1] - ref[a + 1], ref[b] - ref[a]);
}
