/**
 * The literature four-bar in closed form: the coupler point and its first two
 * derivatives with respect to the crank angle, for the path-synthesis encoding used
 * by Cabrera, Simon and Prado (2002) and the benchmark papers after them.
 *
 * Variables (the first nine of a design vector): r1 ground, r2 crank, r3 coupler,
 * r4 rocker, rcx, rcy (coupler point in the coupler frame: x from the crank pin A to
 * the coupler–rocker joint B), θ0 ground angle, x0, y0 crank pivot. The crank angle θ2
 * is measured from the ground line (crank pivot O2 → rocker pivot O4), CCW.
 *
 * Assembly branch: sign +1 ('open') puts B to the left of the directed line A → O4,
 * so with the crank pointing up (θ2 = 90°) the loop O2 A B O4 is not crossed; sign −1
 * ('crossed') is its mirror across A–O4.
 *
 * The construction in complex numbers: δ = O4 − A, B − A = (α + iσβ) δ with
 * α = ½ + (r3² − r4²)/(2|δ|²) and β² = r3²/|δ|² − α², and the coupler point
 * C = A + (rcx + i rcy)(B − A)/r3. Everything is differentiated by hand, so a point
 * with its rates costs a few dozen flops, one sqrt and one cos/sin pair.
 */

import { CURVE_DDX, CURVE_DDY, CURVE_DX, CURVE_DY, CURVE_MARGIN, CURVE_OUT_LENGTH, CURVE_T, CURVE_X, CURVE_Y } from './curve';

/** Indices of the nine literature variables in a design vector. */
export const R1 = 0;
export const R2 = 1;
export const R3 = 2;
export const R4 = 3;
export const RCX = 4;
export const RCY = 5;
export const THETA0 = 6;
export const X0 = 7;
export const Y0 = 8;
export const FOUR_BAR_LENGTH_VARIABLES = 9;

/**
 * Layout of the output written by `fourBarCouplerPointInto`: a curve's (curve.ts), so the
 * four-bar's curve hands its array straight through. The crank angle passed in and the
 * assembly margin passed out have slots of their own.
 */
export const OUT_X = CURVE_X;
export const OUT_Y = CURVE_Y;
export const OUT_DX = CURVE_DX;
export const OUT_DY = CURVE_DY;
export const OUT_DDX = CURVE_DDX;
export const OUT_DDY = CURVE_DDY;
export const OUT_THETA2 = CURVE_T;
export const OUT_MARGIN = CURVE_MARGIN;
export const FOUR_BAR_OUT_LENGTH = CURVE_OUT_LENGTH;

/**
 * The coupler point at crank angle `theta2` (rad, from the ground line) in world
 * coordinates, with d/dθ2 and d²/dθ2² when `order` asks for them, written into
 * `out` (layout OUT_*). `p` holds the nine variables from `offset`.
 *
 * Returns the assembly margin β² = r3²/|δ|² − α² (dimensionless): ≥ 0 when the loop
 * closes at this angle; < 0 when it cannot, in which case the point is that of the
 * nearest flat (β = 0) configuration and its rates are those of β = 0, so callers
 * get a finite, continuous value to rank while they count the margin as a violation.
 */
export function fourBarCouplerPointInto(
  p: Float64Array,
  offset: number,
  theta2: number,
  sign: number,
  order: 0 | 1 | 2,
  out: Float64Array,
): number {
  // Small enough to inline: the angle and the margin cross through `out`, since a double
  // passed to or returned from a call that is not inlined is boxed (an allocation).
  out[OUT_THETA2] = theta2;
  fourBarCouplerPointIo(p, offset, sign, order, out);
  return out[OUT_MARGIN];
}

/**
 * fourBarCouplerPointInto with the crank angle read from out[OUT_THETA2] and the margin
 * written to out[OUT_MARGIN], for loops that must not rely on the wrapper being inlined.
 */
export function fourBarCouplerPointIo(p: Float64Array, offset: number, sign: number, order: 0 | 1 | 2, out: Float64Array): void {
  const theta2 = out[OUT_THETA2];
  const r1 = p[offset + R1];
  const r2 = p[offset + R2];
  const r3 = p[offset + R3];
  const r4 = p[offset + R4];
  const rcx = p[offset + RCX];
  const rcy = p[offset + RCY];
  const theta0 = p[offset + THETA0];
  const x0 = p[offset + X0];
  const y0 = p[offset + Y0];

  const c2 = Math.cos(theta2);
  const s2 = Math.sin(theta2);
  // Crank pin A and δ = O4 − A in the ground frame (O2 at the origin, O4 at (r1, 0)).
  const ax = r2 * c2;
  const ay = r2 * s2;
  const dx = r1 - ax;
  const dy = -ay;
  const q = dx * dx + dy * dy;
  const k = 0.5 * (r3 * r3 - r4 * r4);
  const alpha = 0.5 + k / q;
  const margin = (r3 * r3) / q - alpha * alpha;
  // NaN takes the clamped branch too.
  const beta = margin > 0 ? Math.sqrt(margin) : 0;
  // w = α + iσβ; B − A = w δ; C = A + ρ w δ with ρ = (rcx + i rcy)/r3.
  const wr = alpha;
  const wi = sign * beta;
  const rhor = rcx / r3;
  const rhoi = rcy / r3;
  // m = ρ w
  const mr = rhor * wr - rhoi * wi;
  const mi = rhor * wi + rhoi * wr;
  // Local C = A + m δ
  const cx = ax + (mr * dx - mi * dy);
  const cy = ay + (mr * dy + mi * dx);

  const ct = Math.cos(theta0);
  const st = Math.sin(theta0);
  out[OUT_X] = x0 + ct * cx - st * cy;
  out[OUT_Y] = y0 + st * cx + ct * cy;
  out[OUT_MARGIN] = margin;
  if (order === 0) return;

  // A' = iA, δ' = −A' ; A'' = −A, δ'' = A.
  const a1x = -ay;
  const a1y = ax;
  const d1x = -a1x;
  const d1y = -a1y;
  const q1 = 2 * (dx * d1x + dy * d1y);
  const alpha1 = (-k * q1) / (q * q);
  const g1 = (-(r3 * r3) * q1) / (q * q) - 2 * alpha * alpha1;
  const beta1 = beta > 0 ? g1 / (2 * beta) : 0;
  const w1r = alpha1;
  const w1i = sign * beta1;
  const m1r = rhor * w1r - rhoi * w1i;
  const m1i = rhor * w1i + rhoi * w1r;
  // C' = A' + m' δ + m δ'
  const c1x = a1x + (m1r * dx - m1i * dy) + (mr * d1x - mi * d1y);
  const c1y = a1y + (m1r * dy + m1i * dx) + (mr * d1y + mi * d1x);
  out[OUT_DX] = ct * c1x - st * c1y;
  out[OUT_DY] = st * c1x + ct * c1y;
  if (order === 1) return;

  const a2x = -ax;
  const a2y = -ay;
  const d2x = ax;
  const d2y = ay;
  const q2 = 2 * (d1x * d1x + d1y * d1y + dx * d2x + dy * d2y);
  const q3 = q * q * q;
  const alpha2 = (-k * (q2 * q - 2 * q1 * q1)) / q3;
  const g2 = (-(r3 * r3) * (q2 * q - 2 * q1 * q1)) / q3 - 2 * (alpha1 * alpha1 + alpha * alpha2);
  const beta2 = beta > 0 ? (g2 - 2 * beta1 * beta1) / (2 * beta) : 0;
  const w2r = alpha2;
  const w2i = sign * beta2;
  const m2r = rhor * w2r - rhoi * w2i;
  const m2i = rhor * w2i + rhoi * w2r;
  // C'' = A'' + m'' δ + 2 m' δ' + m δ''
  const c2x = a2x + (m2r * dx - m2i * dy) + 2 * (m1r * d1x - m1i * d1y) + (mr * d2x - mi * d2y);
  const c2y = a2y + (m2r * dy + m2i * dx) + 2 * (m1r * d1y + m1i * d1x) + (mr * d2y + mi * d2x);
  out[OUT_DDX] = ct * c2x - st * c2y;
  out[OUT_DDY] = st * c2x + ct * c2y;
}

/** The crank angle into fourBarJointsIo and the assembly margin out of it (fourBarJointsInto's). */
const jointsIo = new Float64Array(2);
const JOINTS_THETA2 = 0;
const JOINTS_MARGIN = 1;

/**
 * The four joints of the literature four-bar at crank angle `theta2`, world
 * coordinates, into `out` as O2x, O2y, Ax, Ay, Bx, By, O4x, O4y. For reports and for
 * building the linkage model and the keep-out check; no allocation.
 */
export function fourBarJointsInto(p: Float64Array, offset: number, theta2: number, sign: number, out: Float64Array): number {
  // Small enough to inline, as fourBarCouplerPointInto: the angle and the margin cross
  // the call below through an array, so neither is boxed.
  jointsIo[JOINTS_THETA2] = theta2;
  fourBarJointsIo(p, offset, sign, jointsIo, out);
  return jointsIo[JOINTS_MARGIN];
}

/**
 * fourBarJointsInto with the crank angle read from io[0] and the assembly margin written
 * to io[1], for loops that must not rely on the wrapper being inlined.
 */
export function fourBarJointsIo(p: Float64Array, offset: number, sign: number, io: Float64Array, out: Float64Array): void {
  const theta2 = io[JOINTS_THETA2];
  const r1 = p[offset + R1];
  const r2 = p[offset + R2];
  const r3 = p[offset + R3];
  const r4 = p[offset + R4];
  const theta0 = p[offset + THETA0];
  const x0 = p[offset + X0];
  const y0 = p[offset + Y0];
  const ax = r2 * Math.cos(theta2);
  const ay = r2 * Math.sin(theta2);
  const dx = r1 - ax;
  const dy = -ay;
  const q = dx * dx + dy * dy;
  const alpha = 0.5 + (0.5 * (r3 * r3 - r4 * r4)) / q;
  const margin = (r3 * r3) / q - alpha * alpha;
  const beta = sign * (margin > 0 ? Math.sqrt(margin) : 0);
  const bx = ax + alpha * dx - beta * dy;
  const by = ay + alpha * dy + beta * dx;
  const ct = Math.cos(theta0);
  const st = Math.sin(theta0);
  out[0] = x0;
  out[1] = y0;
  out[2] = x0 + ct * ax - st * ay;
  out[3] = y0 + st * ax + ct * ay;
  out[4] = x0 + ct * bx - st * by;
  out[5] = y0 + st * bx + ct * by;
  out[6] = x0 + ct * r1;
  out[7] = y0 + st * r1;
  io[JOINTS_MARGIN] = margin;
}
