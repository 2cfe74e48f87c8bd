import { CURVE_MARGIN, CURVE_T, type CurveEvaluator } from '../../src/core/synthesis/curve';

/** A smooth closed curve with exact rates: a circle of radius r0 with a 3-lobed ripple; `calls` counts evaluations. */
export class RippleCurve implements CurveEvaluator {
  readonly secondDerivatives = false;
  calls = 0;
  constructor(
    readonly r0: number,
    readonly ripple: number,
  ) {}
  atIo(order: 0 | 1 | 2, out: Float64Array): void {
    this.calls++;
    const t = out[CURVE_T];
    const { r0, ripple } = this;
    out[0] = r0 * Math.cos(t) + ripple * Math.cos(3 * t);
    out[1] = r0 * Math.sin(t) - ripple * Math.sin(3 * t);
    if (order > 0) {
      out[2] = -r0 * Math.sin(t) - 3 * ripple * Math.sin(3 * t);
      out[3] = r0 * Math.cos(t) - 3 * ripple * Math.cos(3 * t);
    }
    out[CURVE_MARGIN] = 1;
  }
}
