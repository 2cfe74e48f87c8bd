/**
 * What the timing solvers need from a mechanism: the output point as a function of
 * the driver value, with exact rates. Each family encoding provides one, bound to the
 * design being evaluated.
 */

/**
 * Layout of the `io` array of `CurveEvaluator.atIo`: the driver value in; out, the point
 * x, y, its rates dx/dt, dy/dt, d²x/dt², d²y/dt², and the assembly margin.
 */
export const CURVE_X = 0;
export const CURVE_Y = 1;
export const CURVE_DX = 2;
export const CURVE_DY = 3;
export const CURVE_DDX = 4;
export const CURVE_DDY = 5;
export const CURVE_T = 6;
export const CURVE_MARGIN = 7;
export const CURVE_OUT_LENGTH = 8;

export interface CurveEvaluator {
  /** True when `atIo(2, …)` fills second derivatives; otherwise Newton drops the curvature term. */
  readonly secondDerivatives: boolean;
  /**
   * The output point at driver value io[CURVE_T] with rates up to `order`, into `io`
   * (CURVE_* layout), and the assembly margin into io[CURVE_MARGIN]: ≥ 0 when the
   * mechanism assembles there, < 0 (or NaN) when it does not; the point is then a finite
   * stand-in. The value and the margin cross in the array because every family's curve
   * answers at the same call sites: V8 does not inline a call that sees several of them,
   * and a double passed to or returned from a call it does not inline is boxed (an
   * allocation on every call). `io` must hold CURVE_OUT_LENGTH numbers: a typed array
   * drops a write past its end without a word and reads undefined there (no check here,
   * on the hot path: one cost the six-bars 7 % of their rate).
   */
  atIo(order: 0 | 1 | 2, io: Float64Array): void;
  /**
   * Optional: what atIo(order, …) at t = j · 2π / count gives, for j = 0 … count − 1 in
   * turn, into out[j · CURVE_OUT_LENGTH …] (CURVE_* layout, the driver value too), with
   * the curve left as those calls would leave it; for a curve that holds those answers
   * already and can read them without the calls.
   */
  atIoAround?(order: 0 | 1, count: number, out: Float64Array): void;
}
