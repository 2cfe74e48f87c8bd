/**
 * What the timing solvers need from a mechanism: the output point as a function of
 * the driver value, with exact rates. Each family encoding provides one, bound to the
 * design being evaluated.
 */

/** Layout of `CurveEvaluator.at` output: x, y, dx/dt, dy/dt, d²x/dt², d²y/dt². */
export const CURVE_X = 0;
export const CURVE_Y = 1;
export const CURVE_DX = 2;
export const CURVE_DY = 3;
export const CURVE_DDX = 4;
export const CURVE_DDY = 5;
/** Slots 6 and 7 are the evaluator's own scratch. */
export const CURVE_OUT_LENGTH = 8;

export interface CurveEvaluator {
  /** True when `at(t, 2, …)` fills second derivatives; otherwise Newton drops the curvature term. */
  readonly secondDerivatives: boolean;
  /**
   * The output point at driver value `t` with rates up to `order`, into `out`
   * (CURVE_* layout). Returns the assembly margin: ≥ 0 when the mechanism assembles
   * at `t`, < 0 (or NaN) when it does not; the point is then a finite stand-in.
   */
  at(t: number, order: 0 | 1 | 2, out: Float64Array): number;
}
