/**
 * Velocity fields and instant centres of the bodies of a solved pose.
 *
 * Rates are d(pose)/d(driver value), so every velocity here is per unit of driver rate:
 * mm per rad for a rotation driver, mm per mm for a length driver; ω likewise (rad per
 * driver unit). A body's field is v(X) = v0 + ω × X (ω × X = (−ω·Xy, ω·Xx)), found from
 * the two of its slots farthest apart. The relative instant centre of bodies A and B is
 * the point X where v_A(X) = v_B(X) (Aronhold–Kennedy; any kinematics text).
 */
import type { Plan } from '../plan';
import type { SweepResult } from '../sweep';

export interface BodyMotion {
  /** Angular rate, rad per driver unit (CCW positive). */
  readonly omega: number;
  /** Velocity of the body point at the origin, mm per driver unit. */
  readonly vx0: number;
  readonly vy0: number;
}

export type InstantCentre =
  | { readonly kind: 'finite'; readonly x: number; readonly y: number }
  /** Relative translation: the centre lies at infinity in the direction (dx, dy), a unit vector perpendicular to the relative velocity. */
  | { readonly kind: 'infinite'; readonly dx: number; readonly dy: number }
  /** No relative motion at this pose (or no velocity at all, or a body without two distinct solved slots): any point would do. */
  | { readonly kind: 'indeterminate' };

/**
 * A centre counts as at infinity when |Δω|·L ≤ this × |Δv|, with L the size of the
 * linkage in the pose (the diagonal of its bounding box) and Δv the relative velocity
 * at the box centre: the centre would lie more than 1e9 linkage sizes away. Below this,
 * rounding in ω (about 1e-16 of the bodies' own rates) would move a finite centre by
 * more than 1e-7 of its distance.
 */
export const INFINITE_CENTRE_REL_TOL = 1e-9;

/**
 * Relative motion counts as none when |Δv| + |Δω|·L ≤ this × V, with V the greatest
 * slot speed in the pose (mm per driver unit): a pair of bodies that move as one.
 */
export const STILL_MOTION_REL_TOL = 1e-10;

/** Kind codes of `instantCentreInto` and `instantCentrePath`. */
export const IC_UNASSEMBLED = 0;
export const IC_FINITE = 1;
export const IC_INFINITE = 2;
export const IC_INDETERMINATE = 3;

/** Length of the `out` array of `instantCentreInto`: the result in out[0..1], the rest scratch. */
export const IC_SCRATCH_LENGTH = 8;

/** A body by its plan index or its id. */
export type BodyRef = number | string;

/** The velocity field of a body; NaN fields when it has no two distinct solved slots in the pose. */
export function bodyMotion(plan: Plan, body: BodyRef, pose: Float64Array, rates: Float64Array): BodyMotion {
  checkPoseAndRates(plan, pose, rates, 'bodyMotion');
  const out = new Float64Array(3);
  if (!motionInto(plan, resolveBody(plan, body, 'bodyMotion'), pose, rates, 0, 0, 0, out, 0)) {
    return { omega: Number.NaN, vx0: Number.NaN, vy0: Number.NaN };
  }
  return { omega: out[0], vx0: out[1], vy0: out[2] };
}

/** The instant centre of `bodyA` relative to `bodyB` (the same point as of B relative to A). */
export function instantCentre(
  plan: Plan,
  bodyA: BodyRef,
  bodyB: BodyRef,
  pose: Float64Array,
  rates: Float64Array,
): InstantCentre {
  checkPoseAndRates(plan, pose, rates, 'instantCentre');
  const a = resolveBody(plan, bodyA, 'instantCentre');
  const b = resolveBody(plan, bodyB, 'instantCentre');
  const out = new Float64Array(IC_SCRATCH_LENGTH);
  return centreFromCode(centreAtPose(plan, a, b, pose, rates, out), out);
}

/**
 * The allocation-free form for hot loops: body indices, no argument checks. Writes the
 * centre (IC_FINITE) or its unit direction (IC_INFINITE) to out[0..1] and returns the kind
 * code; `out` needs IC_SCRATCH_LENGTH numbers.
 */
export function instantCentreInto(
  plan: Plan,
  bodyA: number,
  bodyB: number,
  pose: Float64Array,
  rates: Float64Array,
  out: Float64Array,
): number {
  return centreAtPose(plan, bodyA, bodyB, pose, rates, out);
}

export interface InstantCentreEntry {
  readonly bodyA: number;
  readonly bodyB: number;
  readonly centre: InstantCentre;
}

/** All n(n − 1)/2 relative centres of the plan's n bodies, pairs (a, b) with a < b. */
export function instantCentres(plan: Plan, pose: Float64Array, rates: Float64Array): InstantCentreEntry[] {
  checkPoseAndRates(plan, pose, rates, 'instantCentres');
  const out = new Float64Array(IC_SCRATCH_LENGTH);
  const n = plan.bodies.length;
  const entries: InstantCentreEntry[] = [];
  for (let a = 0; a < n; a++) {
    for (let b = a + 1; b < n; b++) {
      entries.push({ bodyA: a, bodyB: b, centre: centreFromCode(centreAtPose(plan, a, b, pose, rates, out), out) });
    }
  }
  return entries;
}

export interface InstantCentrePath {
  /** Driver values, one per step of the sweep. */
  readonly values: Float64Array;
  /** IC_FINITE, IC_INFINITE, IC_INDETERMINATE, or IC_UNASSEMBLED where the sweep did not assemble. */
  readonly kind: Uint8Array;
  /** The centre (finite) or its unit direction (infinite); NaN otherwise. */
  readonly x: Float64Array;
  readonly y: Float64Array;
}

/** The centre of `bodyA` relative to `bodyB` at every step of a sweep. */
export function instantCentrePath(plan: Plan, bodyA: BodyRef, bodyB: BodyRef, sweep: Pick<SweepResult, 'values' | 'poses' | 'rates' | 'assembled'>): InstantCentrePath {
  return instantCentrePaths(plan, [[bodyA, bodyB]], sweep)[0];
}

/**
 * The centres of several pairs of bodies over one sweep: instantCentrePath for each
 * pair, with the linkage's frame at each step (its bounding box and greatest speed,
 * which every pair shares) found once, not once per pair.
 */
export function instantCentrePaths(
  plan: Plan,
  pairs: readonly (readonly [BodyRef, BodyRef])[],
  sweep: Pick<SweepResult, 'values' | 'poses' | 'rates' | 'assembled'>,
): InstantCentrePath[] {
  const resolved = pairs.map(([bodyA, bodyB]) => [resolveBody(plan, bodyA, 'instantCentrePath'), resolveBody(plan, bodyB, 'instantCentrePath')] as const);
  const steps = sweep.values.length;
  const stride = 2 * plan.slotCount;
  if (sweep.poses.length !== steps * stride || sweep.rates.length !== steps * stride || sweep.assembled.length !== steps) {
    throw new RangeError(
      `instantCentrePath: sweep has ${steps} values, ${sweep.poses.length} pose and ${sweep.rates.length} rate numbers, ` +
        `${sweep.assembled.length} flags; expected ${steps * stride} (${steps} × 2 × ${plan.slotCount} slots) and ${steps}`,
    );
  }
  const frames = new Float64Array(steps * FRAME_LENGTH);
  for (let k = 0; k < steps; k++) {
    if (sweep.assembled[k] === 1) frameInto(plan, sweep.poses, sweep.rates, k * stride, frames, k * FRAME_LENGTH);
  }
  const out = new Float64Array(IC_SCRATCH_LENGTH);
  return resolved.map(([a, b]) => {
    const pin = sharedPin(plan, a, b);
    const kind = new Uint8Array(steps);
    const x = new Float64Array(steps).fill(Number.NaN);
    const y = new Float64Array(steps).fill(Number.NaN);
    for (let k = 0; k < steps; k++) {
      if (sweep.assembled[k] !== 1) continue;
      const code = instantCentreAt(plan, a, b, pin, sweep.poses, sweep.rates, k * stride, frames, k * FRAME_LENGTH, out);
      kind[k] = code;
      if (code === IC_FINITE || code === IC_INFINITE) {
        x[k] = out[0];
        y[k] = out[1];
      }
    }
    return { values: Float64Array.from(sweep.values), kind, x, y };
  });
}

/**
 * instantCentrePath's allocation-free form for hot loops: body indices, no argument
 * checks, the first `count` steps of poses and rates stored as a sweep stores them, each
 * one assembled. Writes each step's kind code and centre (or direction; NaN for the
 * other kinds) into kind, x and y: the numbers instantCentrePath gives. `scratch` needs
 * IC_SCRATCH_LENGTH numbers.
 */
export function instantCentrePathInto(
  plan: Plan,
  bodyA: number,
  bodyB: number,
  poses: Float64Array,
  rates: Float64Array,
  count: number,
  kind: Uint8Array,
  x: Float64Array,
  y: Float64Array,
  scratch: Float64Array,
): void {
  const pin = sharedPin(plan, bodyA, bodyB);
  const stride = 2 * plan.slotCount;
  for (let k = 0; k < count; k++) {
    const offset = k * stride;
    // As centreAtPose: the frame in scratch[4..7], read before the centre overwrites it.
    if (pin < 0) frameInto(plan, poses, rates, offset, scratch, 4);
    const code = instantCentreAt(plan, bodyA, bodyB, pin, poses, rates, offset, scratch, 4, scratch);
    const placed = code === IC_FINITE || code === IC_INFINITE;
    kind[k] = code;
    x[k] = placed ? scratch[0] : Number.NaN;
    y[k] = placed ? scratch[1] : Number.NaN;
  }
}

/** Numbers per pose in a frame: the bounding box's centre (x, y) and diagonal, and the greatest slot speed. */
const FRAME_LENGTH = 4;

/**
 * The frame of the pose and rates stored from `offset` into frames[f..f+3]: the centre
 * of the linkage's bounding box, its diagonal (mm) and the greatest slot speed (mm per
 * driver unit), over the slots solved with finite rates.
 */
function frameInto(plan: Plan, poses: Float64Array, rates: Float64Array, offset: number, frames: Float64Array, f: number): void {
  let minX = Infinity;
  let minY = Infinity;
  let maxX = -Infinity;
  let maxY = -Infinity;
  // Squared speeds, one square root at the end: this runs per slot and per step of a path.
  let speed2 = 0;
  for (let s = 0; s < plan.slotCount; s++) {
    const px = poses[offset + 2 * s];
    const py = poses[offset + 2 * s + 1];
    const vx = rates[offset + 2 * s];
    const vy = rates[offset + 2 * s + 1];
    if (!(Number.isFinite(px) && Number.isFinite(py) && Number.isFinite(vx) && Number.isFinite(vy))) continue;
    if (px < minX) minX = px;
    if (px > maxX) maxX = px;
    if (py < minY) minY = py;
    if (py > maxY) maxY = py;
    const v2 = vx * vx + vy * vy;
    if (v2 > speed2) speed2 = v2;
  }
  const w = maxX - minX;
  const h = maxY - minY;
  frames[f] = 0.5 * (minX + maxX);
  frames[f + 1] = 0.5 * (minY + maxY);
  frames[f + 2] = Math.sqrt(w * w + h * h);
  frames[f + 3] = Math.sqrt(speed2);
}

/** The centre of bodies a and b in one pose (offset 0), its frame and shared pin found here; see `instantCentreInto`. */
function centreAtPose(plan: Plan, a: number, b: number, pose: Float64Array, rates: Float64Array, out: Float64Array): number {
  const pin = sharedPin(plan, a, b);
  // A pin needs no frame: out[4..7] (scratch, overwritten below) holds it meanwhile.
  if (pin < 0) frameInto(plan, pose, rates, 0, out, 4);
  return instantCentreAt(plan, a, b, pin, pose, rates, 0, out, 4, out);
}

/**
 * The centre for the pose and rates stored from `offset`, given the bodies' shared pin
 * (sharedPin) and the pose's frame in frames[f..f+3] (frameInto); see `instantCentreInto`.
 */
function instantCentreAt(
  plan: Plan,
  a: number,
  b: number,
  pin: number,
  poses: Float64Array,
  rates: Float64Array,
  offset: number,
  frames: Float64Array,
  f: number,
  out: Float64Array,
): number {
  // A pin is the permanent centre of the two bodies it joins: exact, and still right at
  // an instant when they happen to move as one (a four-bar's coupler and output while the
  // input lies along the ground line), where their velocities alone say nothing.
  if (pin >= 0) {
    out[0] = poses[offset + 2 * pin];
    out[1] = poses[offset + 2 * pin + 1];
    return Number.isFinite(out[0]) && Number.isFinite(out[1]) ? IC_FINITE : IC_INDETERMINATE;
  }
  // Work about the centre of the linkage's bounding box, so that far-off coordinates
  // do not cost precision, and measure against the linkage's own size and speed.
  const rx = frames[f];
  const ry = frames[f + 1];
  const size = frames[f + 2];
  const speed = frames[f + 3];
  if (!motionInto(plan, a, poses, rates, offset, rx, ry, out, 2)) return IC_INDETERMINATE;
  if (!motionInto(plan, b, poses, rates, offset, rx, ry, out, 5)) return IC_INDETERMINATE;
  const dOmega = out[2] - out[5];
  const dvx = out[3] - out[6];
  const dvy = out[4] - out[7];
  const dv = Math.sqrt(dvx * dvx + dvy * dvy);
  const turn = Math.abs(dOmega) * size;
  if (!(dv + turn > STILL_MOTION_REL_TOL * speed)) return IC_INDETERMINATE;
  if (turn <= INFINITE_CENTRE_REL_TOL * dv) {
    let dx = -dvy / dv;
    let dy = dvx / dv;
    // ±(dx, dy) is the same point at infinity; report one sign, for repeatable output.
    if (dx < 0 || (!(dx > 0) && dy < 0)) {
      dx = -dx;
      dy = -dy;
    }
    out[0] = dx;
    out[1] = dy;
    return IC_INFINITE;
  }
  // Δv(ref) + Δω × (X − ref) = 0
  out[0] = rx - dvy / dOmega;
  out[1] = ry + dvx / dOmega;
  return IC_FINITE;
}

/**
 * Writes ω and the velocity of the body point at (rx, ry) to out[o..o+2]. Ground does
 * not move. Another body's field comes from the two of its slots farthest apart in the
 * pose; false when it has no two distinct solved slots.
 */
function motionInto(
  plan: Plan,
  body: number,
  poses: Float64Array,
  rates: Float64Array,
  offset: number,
  rx: number,
  ry: number,
  out: Float64Array,
  o: number,
): boolean {
  if (body === 0) {
    out[o] = 0;
    out[o + 1] = 0;
    out[o + 2] = 0;
    return true;
  }
  const slots = plan.bodies[body].slots;
  let bestP = -1;
  let bestQ = -1;
  let bestD2 = 0;
  for (let i = 0; i < slots.length; i++) {
    const pi = offset + 2 * slots[i];
    for (let j = i + 1; j < slots.length; j++) {
      const pj = offset + 2 * slots[j];
      const d2 = (poses[pj] - poses[pi]) ** 2 + (poses[pj + 1] - poses[pi + 1]) ** 2;
      if (d2 > bestD2) {
        bestD2 = d2;
        bestP = pi;
        bestQ = pj;
      }
    }
  }
  if (bestP < 0) return false;
  const dx = poses[bestQ] - poses[bestP];
  const dy = poses[bestQ + 1] - poses[bestP + 1];
  const dvx = rates[bestQ] - rates[bestP];
  const dvy = rates[bestQ + 1] - rates[bestP + 1];
  const omega = (dx * dvy - dy * dvx) / bestD2;
  if (!Number.isFinite(omega)) return false;
  // from the midpoint of the two slots to (rx, ry)
  const mx = 0.5 * (poses[bestP] + poses[bestQ]);
  const my = 0.5 * (poses[bestP + 1] + poses[bestQ + 1]);
  const vmx = 0.5 * (rates[bestP] + rates[bestQ]);
  const vmy = 0.5 * (rates[bestP + 1] + rates[bestQ + 1]);
  out[o] = omega;
  out[o + 1] = vmx - omega * (ry - my);
  out[o + 2] = vmy + omega * (rx - mx);
  return Number.isFinite(out[o + 1]) && Number.isFinite(out[o + 2]);
}

/**
 * The joint slot that bodies a and b both carry, when there is exactly one and it does
 * not slide on either (a prismatic pair is no pin); -1 otherwise. Two shared joints lock
 * the bodies together: no relative motion, left to the velocity test.
 */
function sharedPin(plan: Plan, a: number, b: number): number {
  if (a === b) return -1;
  const jointCount = plan.jointIds.length;
  const slotsA = plan.bodies[a].slots;
  const slotsB = plan.bodies[b].slots;
  let pin = -1;
  for (let i = 0; i < slotsA.length; i++) {
    const s = slotsA[i];
    if (s >= jointCount) continue;
    for (let j = 0; j < slotsB.length; j++) {
      if (slotsB[j] !== s) continue;
      if (pin >= 0) return -1;
      pin = s;
    }
  }
  if (pin < 0) return -1;
  const sliders = plan.linkage.sliders;
  if (sliders !== undefined) {
    const jointId = plan.jointIds[pin];
    for (let k = 0; k < sliders.length; k++) {
      const slider = sliders[k];
      if (slider.joint === jointId && (slider.body === plan.bodies[a].id || slider.body === plan.bodies[b].id)) return -1;
    }
  }
  return pin;
}

function centreFromCode(code: number, out: Float64Array): InstantCentre {
  if (code === IC_FINITE) return { kind: 'finite', x: out[0], y: out[1] };
  if (code === IC_INFINITE) return { kind: 'infinite', dx: out[0], dy: out[1] };
  return { kind: 'indeterminate' };
}

function resolveBody(plan: Plan, body: BodyRef, where: string): number {
  if (typeof body === 'string') {
    const index = plan.bodyIndex.get(body);
    if (index === undefined) {
      throw new RangeError(`${where}: no body "${body}"; expected one of ${plan.bodies.map((b) => b.id).join(', ')}`);
    }
    return index;
  }
  if (!(Number.isInteger(body) && body >= 0 && body < plan.bodies.length)) {
    throw new RangeError(`${where}: body index ${body}; expected an integer in [0, ${plan.bodies.length - 1}]`);
  }
  return body;
}

function checkPoseAndRates(plan: Plan, pose: Float64Array, rates: Float64Array, where: string): void {
  const n = 2 * plan.slotCount;
  if (pose.length !== n || rates.length !== n) {
    throw new RangeError(`${where}: pose has ${pose.length} and rates ${rates.length} numbers; expected ${n} (2 × ${plan.slotCount} slots)`);
  }
}
