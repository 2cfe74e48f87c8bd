/**
 * The anti-squat and anti-rise constructions in homogeneous coordinates, so that an
 * instant centre at infinity (a translating body) or a chain line parallel to the
 * axle–centre line needs no special case: a point is (x, y, w), at infinity when w = 0,
 * and the line through two points, or the point on two lines, is their cross product.
 *
 * The height functions return the height (mm) above the level ground through the rear contact patch C
 * at which the line from C through the constructed point crosses x = frontX.
 */

/**
 * Height of the line from C = (cx, cy) through the homogeneous point (px, py, pw) at x = frontX.
 * NaN when that line is vertical (the point straight above C: no finite height).
 */
export function heightThroughMm(cx: number, cy: number, px: number, py: number, pw: number, frontX: number): number {
  const run = px - cx * pw;
  const rise = py - cy * pw;
  if (!(Math.abs(run) > 0)) return Number.NaN;
  return (rise / run) * (frontX - cx);
}

/**
 * Anti-squat construction: the chain line {n·X = c} meets the line m through the axle A
 * and the instant centre I of the axle-carrying body relative to the front frame
 * (m = (ax, ay, 1) × I, written by axleLineInto); the height of the line from C through
 * that point at x = frontX. m is shared by every cog on the axle, so it is found once.
 */
export function antiSquatHeightMm(
  nx: number, ny: number, c: number,
  m0: number, m1: number, m2: number,
  cx: number, cy: number, frontX: number,
): number {
  // X = (nx, ny, −c) × m
  const x0 = ny * m2 + c * m1;
  const x1 = -c * m0 - nx * m2;
  const x2 = nx * m1 - ny * m0;
  return heightThroughMm(cx, cy, x0, x1, x2, frontX);
}

/** The line through the axle A and the homogeneous point I = (ix, iy, iw): m = (ax, ay, 1) × I, into out[at..at+2]. */
export function axleLineInto(ax: number, ay: number, ix: number, iy: number, iw: number, out: Float64Array, at: number): void {
  out[at] = ay * iw - iy;
  out[at + 1] = ix - ax * iw;
  out[at + 2] = ax * iy - ay * ix;
}

/**
 * The homogeneous point W where a wheel whose centre moves at (vax, vay) and which turns
 * at ω (with the body that reacts the brake torque) has zero velocity: v_A + ω × (W − A) = 0.
 * For a body that carries the axle this is its instant centre relative to the frame;
 * ω = 0 puts W at infinity, perpendicular to v_A. Written to out[0..2].
 */
export function brakeCentreInto(ax: number, ay: number, vax: number, vay: number, omega: number, out: Float64Array): void {
  out[0] = omega * ax - vay;
  out[1] = omega * ay + vax;
  out[2] = omega;
}
