/**
 * A curve's samples, with their rates, read between them as a cubic: the Hermite
 * interpolant through each pair of neighbouring samples with their rates (the samples
 * over one turn of the driver, taken as periodic, as the in-order match takes them).
 * Within about h⁴/384 · |P⁗| of the curve for a sample step h, it costs a few products
 * where the curve costs a solve of the linkage, so a refinement of the driver values
 * can iterate on it and take only its last steps on the curve itself. It asks the curve
 * itself between samples the cubic does not resolve: where either did not assemble, and
 * where either end's rate times h is not within a factor RESOLVED_RATIO of the chord
 * (the curve turns or speeds up within the step, as near a lock, where a dyad nears its
 * toggle and its rates grow without bound).
 *
 * Hermite interpolation: e.g. Burden & Faires, Numerical Analysis, § 3.4.
 */
import {
  CURVE_DX as CURVE_DX_BINDING,
  CURVE_DY as CURVE_DY_BINDING,
  CURVE_MARGIN as CURVE_MARGIN_BINDING,
  CURVE_T as CURVE_T_BINDING,
  CURVE_X as CURVE_X_BINDING,
  CURVE_Y as CURVE_Y_BINDING,
  type CurveEvaluator,
} from './curve';

// Imported constants as locals: a module transform (tsx, vitest) may turn each read of an
// imported binding into a getter call, which `atIo` cannot afford.
const CURVE_X = CURVE_X_BINDING;
const CURVE_Y = CURVE_Y_BINDING;
const CURVE_DX = CURVE_DX_BINDING;
const CURVE_DY = CURVE_DY_BINDING;
const CURVE_MARGIN = CURVE_MARGIN_BINDING;
const CURVE_T = CURVE_T_BINDING;
const TAU = 2 * Math.PI;
/** Largest ratio, either way, of an end's rate times the step to the chord, for a cubic to be read between two samples. */
const RESOLVED_RATIO = 2;

export class SampledCurve implements CurveEvaluator {
  readonly secondDerivatives = false;
  /** x, y, dx/dt, dy/dt of each sample. */
  readonly samples: Float64Array;
  /** 1 where the sample assembled. */
  readonly valid: Uint8Array;
  /** 1 where the cubic is read between sample j and the next (sampledFrom). */
  private readonly resolved: Uint8Array;
  private readonly count: number;
  private readonly step: number;
  private curve: CurveEvaluator | null = null;

  constructor(count: number) {
    this.count = count;
    this.step = TAU / count;
    this.samples = new Float64Array(4 * count);
    this.valid = new Uint8Array(count);
    this.resolved = new Uint8Array(count);
  }

  /** The curve the samples were taken from (at j · 2π / count, j = 0 … count − 1): the one asked where they do not serve. */
  sampledFrom(curve: CurveEvaluator): void {
    this.curve = curve;
    const count = this.count;
    const s = this.samples;
    const valid = this.valid;
    const r2 = RESOLVED_RATIO * RESOLVED_RATIO;
    const h2 = this.step * this.step;
    for (let j = 0; j < count; j++) {
      const k = j + 1 < count ? j + 1 : 0;
      const a = 4 * j;
      const b = 4 * k;
      const cx = s[b] - s[a];
      const cy = s[b + 1] - s[a + 1];
      const chord = cx * cx + cy * cy;
      const ra = (s[a + 2] * s[a + 2] + s[a + 3] * s[a + 3]) * h2;
      const rb = (s[b + 2] * s[b + 2] + s[b + 3] * s[b + 3]) * h2;
      const ok = valid[j] === 1 && valid[k] === 1 && ra <= r2 * chord && chord <= r2 * ra && rb <= r2 * chord && chord <= r2 * rb;
      this.resolved[j] = ok ? 1 : 0;
    }
  }

  atIo(order: 0 | 1 | 2, out: Float64Array): void {
    const t = out[CURVE_T];
    const count = this.count;
    const u = (t - Math.floor(t / TAU) * TAU) / this.step;
    let j = Math.floor(u);
    // Rounding can put u at count itself.
    if (j >= count) j = count - 1;
    const k = j + 1 < count ? j + 1 : 0;
    if (!(u >= 0) || this.resolved[j] !== 1) {
      (this.curve as CurveEvaluator).atIo(order, out);
      return;
    }
    const h = this.step;
    const s = this.samples;
    const a = 4 * j;
    const b = 4 * k;
    const w = u - j;
    const w2 = w * w;
    const w3 = w2 * w;
    // Hermite's basis on [0, 1], the rates scaled by the interval h.
    const h01 = 3 * w2 - 2 * w3;
    const h10 = (w3 - 2 * w2 + w) * h;
    const h11 = (w3 - w2) * h;
    out[CURVE_X] = s[a] + h01 * (s[b] - s[a]) + h10 * s[a + 2] + h11 * s[b + 2];
    out[CURVE_Y] = s[a + 1] + h01 * (s[b + 1] - s[a + 1]) + h10 * s[a + 3] + h11 * s[b + 3];
    if (order > 0) {
      // d/dt of the basis: (d/dw) / h.
      const d01 = (6 * w - 6 * w2) / h;
      const d10 = 3 * w2 - 4 * w + 1;
      const d11 = 3 * w2 - 2 * w;
      out[CURVE_DX] = d01 * (s[b] - s[a]) + d10 * s[a + 2] + d11 * s[b + 2];
      out[CURVE_DY] = d01 * (s[b + 1] - s[a + 1]) + d10 * s[a + 3] + d11 * s[b + 3];
    }
    out[CURVE_MARGIN] = 1;
  }
}
