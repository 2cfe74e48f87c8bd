/**
 * One-dimensional root and extremum finders over a bracket of crank angle, each with a
 * cap on its steps and a safe branch for NaN. Not hot: a gait evaluation calls them a
 * few times per crossing.
 */

/** Band crossings, extrema and guideline edges are located to this crank angle (rad). */
export const GAIT_ANGLE_TOL_RAD = 1e-12;
/** Cap on the steps of every finder here: bisection from a 10° bracket needs about 38. */
export const GAIT_SOLVE_MAX_STEPS = 100;

/** Writes f(t) into out[0] and df/dt into out[1]; false where it cannot be evaluated. */
export type ValueAndRate = (t: number, out: Float64Array) => boolean;

/**
 * A root of f in [a, b], where f(a) and f(b) differ in sign (fa is f(a)): Newton steps
 * on the exact rate, kept inside a shrinking bracket and replaced by bisection whenever
 * a step would leave it or not halve it (Press et al., Numerical Recipes, 1992, rtsafe).
 */
export function rootInBracket(f: ValueAndRate, a: number, b: number, fa: number, scratch: Float64Array): number {
  let lo = a;
  let hi = b;
  const loNegative = fa < 0;
  let t = 0.5 * (a + b);
  let lastWidth = Math.abs(b - a);
  for (let step = 0; step < GAIT_SOLVE_MAX_STEPS; step++) {
    if (!f(t, scratch)) return t; // cannot happen inside an assembled full turn; t is within the bracket
    const value = scratch[0];
    const rate = scratch[1];
    if (value < 0 === loNegative) lo = t;
    else hi = t;
    if (!(Math.abs(hi - lo) > GAIT_ANGLE_TOL_RAD)) break;
    const newton = t - value / rate;
    const inside = (newton - lo) * (newton - hi) < 0;
    const width = Math.abs(hi - lo);
    t = inside && Math.abs(newton - t) < 0.5 * lastWidth ? newton : 0.5 * (lo + hi);
    lastWidth = width;
  }
  return t;
}

/** The place in [a, b] where sign(g) changes (g(a) has the sign of ga), by bisection. */
export function signChange(g: (t: number) => number, a: number, b: number, ga: number): number {
  let lo = a;
  let hi = b;
  const loNegative = ga < 0;
  for (let step = 0; step < GAIT_SOLVE_MAX_STEPS && Math.abs(hi - lo) > GAIT_ANGLE_TOL_RAD; step++) {
    const mid = 0.5 * (lo + hi);
    const v = g(mid);
    if (!Number.isFinite(v)) break;
    if (v < 0 === loNegative) lo = mid;
    else hi = mid;
  }
  return 0.5 * (lo + hi);
}

const INV_PHI = (Math.sqrt(5) - 1) / 2;

/**
 * The largest (sense 1) or smallest (sense −1) value of a unimodal f on [a, b], by
 * golden-section search (Kiefer, 1953), for figures whose rate is not known exactly.
 */
export function extremum(f: (t: number) => number, a: number, b: number, sense: 1 | -1): { t: number; value: number } {
  let lo = a;
  let hi = b;
  let x1 = hi - INV_PHI * (hi - lo);
  let x2 = lo + INV_PHI * (hi - lo);
  let f1 = sense * f(x1);
  let f2 = sense * f(x2);
  for (let step = 0; step < GAIT_SOLVE_MAX_STEPS && Math.abs(hi - lo) > GAIT_ANGLE_TOL_RAD; step++) {
    if (!(f1 <= f2)) {
      hi = x2; x2 = x1; f2 = f1;
      x1 = hi - INV_PHI * (hi - lo); f1 = sense * f(x1);
    } else {
      lo = x1; x1 = x2; f1 = f2;
      x2 = lo + INV_PHI * (hi - lo); f2 = sense * f(x2);
    }
  }
  const t = 0.5 * (lo + hi);
  return { t, value: f(t) };
}
