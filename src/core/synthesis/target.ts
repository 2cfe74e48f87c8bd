/**
 * The target path: points in mm, open or closed, with optional weights. Checked once
 * here, at the boundary; everything downstream trusts it.
 */

export interface Target {
  /** x0, y0, x1, y1, … mm. */
  readonly points: Float64Array;
  /** A closed path returns from the last point to the first. */
  readonly closed: boolean;
  /** One non-negative weight per point, not all zero; absent = all 1. */
  readonly weights?: Float64Array;
}

/** A path needs at least this many points. */
export const MIN_TARGET_POINTS = 3;
/** Two consecutive points closer than this (mm) are the same point entered twice. */
export const REPEATED_POINT_TOLERANCE_MM = 1e-9;

export interface TargetIssue {
  readonly path: string;
  readonly message: string;
}

/**
 * Checks target data and returns a defensive copy, or null after pushing every issue
 * (with paths under `target.`) onto `issues`.
 */
export function validateTarget(
  points: readonly (readonly number[])[],
  closed: boolean,
  weights: readonly number[] | undefined,
  issues: TargetIssue[],
): Target | null {
  const start = issues.length;
  const n = points.length;
  if (n < MIN_TARGET_POINTS) {
    issues.push({ path: 'target.points', message: `target has ${n} point${n === 1 ? '' : 's'}; a path needs at least ${MIN_TARGET_POINTS}` });
  }
  const flat = new Float64Array(2 * n);
  points.forEach((p, i) => {
    if (p.length !== 2) {
      issues.push({ path: `target.points[${i}]`, message: `has ${p.length} numbers; expected a point [x, y] in mm` });
      return;
    }
    if (!Number.isFinite(p[0]) || !Number.isFinite(p[1])) {
      issues.push({ path: `target.points[${i}]`, message: `is [${p[0]}, ${p[1]}]; expected finite coordinates in mm` });
      return;
    }
    flat[2 * i] = p[0];
    flat[2 * i + 1] = p[1];
  });
  if (issues.length === start) {
    const pairs = closed ? n : n - 1;
    for (let i = 0; i < pairs; i++) {
      const j = (i + 1) % n;
      const d = Math.hypot(flat[2 * j] - flat[2 * i], flat[2 * j + 1] - flat[2 * i + 1]);
      if (!(d > REPEATED_POINT_TOLERANCE_MM)) {
        const what = j === 0 ? `the last point repeats the first (${i + 1} and 1) on a closed path` : `points ${i + 1} and ${j + 1} are the same point`;
        issues.push({ path: `target.points[${j}]`, message: `${what}; consecutive points must differ by more than ${REPEATED_POINT_TOLERANCE_MM} mm` });
      }
    }
  }
  let w: Float64Array | undefined;
  if (weights !== undefined) {
    if (weights.length !== n) {
      issues.push({ path: 'target.weights', message: `has ${weights.length} weights for ${n} points; expected one weight per point` });
    } else {
      let sum = 0;
      weights.forEach((v, i) => {
        if (!(Number.isFinite(v) && v >= 0)) issues.push({ path: `target.weights[${i}]`, message: `is ${v}; expected a finite weight ≥ 0` });
        else sum += v;
      });
      if (!(sum > 0)) issues.push({ path: 'target.weights', message: 'are all zero; expected at least one positive weight' });
      w = Float64Array.from(weights);
    }
  }
  if (issues.length > start) return null;
  return w === undefined ? { points: flat, closed } : { points: flat, closed, weights: w };
}
