import { CURVE_MARGIN, CURVE_T, type CurveEvaluator } from '../../src/core/synthesis/curve';

/** The curve at driver value t into `out` (CURVE_* layout); returns the assembly margin. */
export function curveAt(curve: CurveEvaluator, t: number, order: 0 | 1 | 2, out: Float64Array): number {
  out[CURVE_T] = t;
  curve.atIo(order, out);
  return out[CURVE_MARGIN];
}
