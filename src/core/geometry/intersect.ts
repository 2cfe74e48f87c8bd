/**
 * Intersections of circles and lines. Each comes as a small allocating form on Vec2
 * and, where hot loops need it, an `…Into` form on flat numbers that writes into a
 * Float64Array and returns whether a solution exists. Guards are written so that NaN
 * input takes the "no solution" branch.
 */
import type { Vec2 } from './vec2';

/**
 * Which of two intersections: +1 is left of the directed line from the first centre
 * (or the line's point) to the second (counter-clockwise side), −1 is right of it.
 */
export type Branch = 1 | -1;

/**
 * Sine of the angle between two directions below which lines count as parallel. At
 * 1e-12 the intersection would lie about 1e12 line-lengths away: no finite answer is
 * meaningful in mm.
 */
export const PARALLEL_SIN_TOL = 1e-12;

/**
 * The point at distance rA from (ax, ay) and rB from (bx, by) on the `branch` side of
 * the line from A to B, written to out[offset], out[offset + 1]. Returns false (and
 * leaves out alone) when the circles do not meet or the centres coincide.
 */
export function circleCircleIntersectInto(
  ax: number, ay: number, rA: number,
  bx: number, by: number, rB: number,
  branch: number, out: Float64Array, offset: number,
): boolean {
  const dx = bx - ax;
  const dy = by - ay;
  const inv = 1 / (dx * dx + dy * dy);
  // Along-line share k and height share m of the intersection, both in units of |AB|.
  const k = 0.5 * (rA * rA - rB * rB) * inv + 0.5;
  const h2 = rA * rA * inv - k * k;
  if (!(h2 >= 0) || !(inv < Infinity)) return false;
  const m = branch * Math.sqrt(h2);
  out[offset] = ax + k * dx - m * dy;
  out[offset + 1] = ay + k * dy + m * dx;
  return true;
}

export function circleCircleIntersect(a: Vec2, rA: number, b: Vec2, rB: number, branch: Branch): Vec2 | null {
  const out = new Float64Array(2);
  return circleCircleIntersectInto(a.x, a.y, rA, b.x, b.y, rB, branch, out, 0) ? { x: out[0], y: out[1] } : null;
}

/**
 * The point at distance r from centre (cx, cy) on the line through (px, py) with
 * direction (dx, dy) (any non-zero length); `branch` +1 takes the intersection further
 * along the direction, −1 the nearer one. Returns false when the circle misses the
 * line or the direction is zero.
 */
export function circleLineIntersectInto(
  cx: number, cy: number, r: number,
  px: number, py: number, dx: number, dy: number,
  branch: number, out: Float64Array, offset: number,
): boolean {
  // Math.sqrt, not Math.hypot: this runs in the kernel's inner loop, and hypot is slow in V8.
  const inv = 1 / Math.sqrt(dx * dx + dy * dy);
  const ux = dx * inv;
  const uy = dy * inv;
  const wx = cx - px;
  const wy = cy - py;
  const t0 = wx * ux + wy * uy;
  const h = ux * wy - uy * wx;
  const disc = r * r - h * h;
  if (!(disc >= 0) || !(inv < Infinity)) return false;
  const t = t0 + branch * Math.sqrt(disc);
  out[offset] = px + t * ux;
  out[offset + 1] = py + t * uy;
  return true;
}

export function circleLineIntersect(c: Vec2, r: number, p: Vec2, direction: Vec2, branch: Branch): Vec2 | null {
  const out = new Float64Array(2);
  return circleLineIntersectInto(c.x, c.y, r, p.x, p.y, direction.x, direction.y, branch, out, 0)
    ? { x: out[0], y: out[1] }
    : null;
}

/**
 * Two lines p1 + t d1 and p2 + u d2. Either the crossing point with both parameters,
 * or, when the directions are parallel within PARALLEL_SIN_TOL, `parallel` with the
 * distance between the lines (0 when they coincide; NaN when a direction is zero).
 */
export type LineLineIntersection =
  | { readonly kind: 'point'; readonly x: number; readonly y: number; readonly t: number; readonly u: number }
  | { readonly kind: 'parallel'; readonly separation: number };

export function lineLineIntersect(p1: Vec2, d1: Vec2, p2: Vec2, d2: Vec2): LineLineIntersection {
  const denom = d1.x * d2.y - d1.y * d2.x;
  const wx = p2.x - p1.x;
  const wy = p2.y - p1.y;
  if (!(Math.abs(denom) > PARALLEL_SIN_TOL * Math.hypot(d1.x, d1.y) * Math.hypot(d2.x, d2.y))) {
    return { kind: 'parallel', separation: Math.abs(d1.x * wy - d1.y * wx) / Math.hypot(d1.x, d1.y) };
  }
  const t = (wx * d2.y - wy * d2.x) / denom;
  const u = (wx * d1.y - wy * d1.x) / denom;
  return { kind: 'point', x: p1.x + t * d1.x, y: p1.y + t * d1.y, t, u };
}
