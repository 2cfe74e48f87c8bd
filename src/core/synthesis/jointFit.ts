/**
 * Driver values and a free placement refined together: Gauss–Newton on
 * Σ wᵢ |S P(tᵢ) + T − Qᵢ|² over (t₁ … tₙ, a, b, tx, ty), S = (a −b; b a). Each tᵢ
 * couples only with the four placement unknowns, so the normal equations are an arrow
 * matrix, solved through its 4 × 4 Schur complement: O(n) work per step. Alternating
 * "refine the tᵢ, refit the placement" converges linearly; this converges
 * quadratically on a path the mechanism can trace. Steps are capped and halved until
 * the sum falls; each tᵢ stays between its neighbours. A trial's evaluation of the
 * curve keeps the rates too, so an accepted step's normal equations need no second one.
 * Coarse to fine (refineOnSamples), the steps run on the curve's samples read as cubics
 * (SampledCurve, no solve of the linkage) and only the last on the curve itself.
 */
import { CURVE_MARGIN as CURVE_MARGIN_BINDING, CURVE_OUT_LENGTH, CURVE_T as CURVE_T_BINDING, type CurveEvaluator } from './curve';
import type { SampledCurve } from './sampledCurve';

/** Gauss–Newton steps at most. */
export const JOINT_FIT_ITERATIONS = 20;
/** Halvings of a step at most, until the sum falls. */
export const JOINT_FIT_HALVINGS = 4;
/**
 * Gauss–Newton steps on the curve itself after the refinement on the samples' cubic
 * (refineOnSamples). Where that refinement converged, its answer is within the cubic's
 * error of the curve's and one step finishes it; mostly it stops first, at its step cap
 * or a refused step, and this step goes on from there, lowering some designs' values by
 * far more than rounding (bench/README.md, Family rates).
 */
export const JOINT_FIT_CURVE_ITERATIONS = 1;
/**
 * Halvings of that step: where the full step does not lower the sum, the halved one does
 * on a few designs, by more than rounding (bench/README.md, Family rates).
 */
export const JOINT_FIT_CURVE_HALVINGS = 1;
/** Stop when a step lowers the sum by less than this share of it. */
export const JOINT_FIT_REL_TOL = 1e-14;

// An imported constant as a local: a module transform (tsx, vitest) may turn each read of
// an imported binding into a getter call, which the sums below cannot afford.
const CURVE_T = CURVE_T_BINDING;
const CURVE_MARGIN = CURVE_MARGIN_BINDING;

/** Placement layout shared with geometry's similarity fit: a = s cos θ, b = s sin θ, tx, ty. */
const A = 0;
const B = 1;
const TX = 2;
const TY = 3;

export interface JointFit {
  /**
   * Refines t[o … o+n) and `placement` (a, b, tx, ty) in place for targets Q (x0, y0, …).
   * `limits` holds lo, hi: the limits of the first and last value's outer neighbours
   * (a cyclic match passes t[o+n−1] − period and t[o] + period), then the cap on each
   * driver step (in the array because a double passed to a call is boxed). At most
   * `iterations` Gauss–Newton steps, each halved at most `halvings` times until the sum falls.
   */
  refine(
    curve: CurveEvaluator,
    targets: Float64Array,
    weights: Float64Array | undefined,
    t: Float64Array,
    o: number,
    placement: Float64Array,
    limits: Float64Array,
    iterations: number,
    halvings: number,
  ): void;
  /**
   * refine, coarse to fine: on `sampled` (the curve's samples read as cubics) as far as
   * refine goes, then JOINT_FIT_CURVE_ITERATIONS steps on `curve` itself.
   */
  refineOnSamples(
    sampled: SampledCurve,
    curve: CurveEvaluator,
    targets: Float64Array,
    weights: Float64Array | undefined,
    t: Float64Array,
    o: number,
    placement: Float64Array,
    limits: Float64Array,
  ): void;
  /**
   * The points of the curve the last refine ran on, at the driver values it left (as that
   * curve gave them there: no evaluation again), x0, y0, … into `points`, and each one's
   * assembly margin (CURVE_MARGIN) into `margins`.
   */
  pointsInto(points: Float64Array, margins: Float64Array): void;
}

export function createJointFit(n: number): JointFit {
  /** The curve at the driver values in force: point and rate, per target point. */
  const px = new Float64Array(n);
  const py = new Float64Array(n);
  const dpx = new Float64Array(n);
  const dpy = new Float64Array(n);
  const pm = new Float64Array(n);
  /** The same at the trial values; swapped with the above when a trial is accepted. */
  const tx = new Float64Array(n);
  const ty = new Float64Array(n);
  const tdx = new Float64Array(n);
  const tdy = new Float64Array(n);
  const tm = new Float64Array(n);
  const dt = new Float64Array(n);
  const dInv = new Float64Array(n);
  const c = new Float64Array(4 * n);
  const gt = new Float64Array(n);
  const trial = new Float64Array(n);
  const m = new Float64Array(20); // 4 × 5 augmented Schur system
  const dTheta = new Float64Array(4);
  const trialPlacement = new Float64Array(4);
  const buf = new Float64Array(CURVE_OUT_LENGTH);
  const sums = new Float64Array(1);
  /** Which of the two sets of arrays holds the values in force (0: px…, 1: tx…). */
  let current = 0;

  /**
   * Σ wᵢ |S P(tᵢ) + T − Qᵢ|² at driver values ts[to …], keeping each point and rate in
   * the set `into` (their rates serve the next step's normal equations: positions are
   * those of order 0 either way, so one evaluation serves both).
   */
  function sumSquares(
    curve: CurveEvaluator,
    targets: Float64Array,
    weights: Float64Array | undefined,
    ts: Float64Array,
    to: number,
    p: Float64Array,
    into: number,
  ): void {
    const ox = into === 0 ? px : tx;
    const oy = into === 0 ? py : ty;
    const odx = into === 0 ? dpx : tdx;
    const ody = into === 0 ? dpy : tdy;
    const om = into === 0 ? pm : tm;
    let sum = 0;
    for (let i = 0; i < n; i++) {
      buf[CURVE_T] = ts[to + i];
      curve.atIo(1, buf);
      ox[i] = buf[0];
      oy[i] = buf[1];
      odx[i] = buf[2];
      ody[i] = buf[3];
      om[i] = buf[CURVE_MARGIN];
      const x = p[A] * buf[0] - p[B] * buf[1] + p[TX] - targets[2 * i];
      const y = p[B] * buf[0] + p[A] * buf[1] + p[TY] - targets[2 * i + 1];
      sum += (weights === undefined ? 1 : weights[i]) * (x * x + y * y);
    }
    sums[0] = sum;
  }

  /** Gaussian elimination with partial pivoting on the 4 × 5 system m; false when singular. */
  function solve4(): boolean {
    for (let col = 0; col < 4; col++) {
      let pivot = col;
      for (let r = col + 1; r < 4; r++) if (Math.abs(m[5 * r + col]) > Math.abs(m[5 * pivot + col])) pivot = r;
      const pv = m[5 * pivot + col];
      if (!(Math.abs(pv) > 0)) return false;
      if (pivot !== col) {
        for (let k = 0; k < 5; k++) {
          const tmp = m[5 * col + k];
          m[5 * col + k] = m[5 * pivot + k];
          m[5 * pivot + k] = tmp;
        }
      }
      for (let r = col + 1; r < 4; r++) {
        const f = m[5 * r + col] / pv;
        for (let k = col; k < 5; k++) m[5 * r + k] -= f * m[5 * col + k];
      }
    }
    for (let r = 3; r >= 0; r--) {
      let s = m[5 * r + 4];
      for (let k = r + 1; k < 4; k++) s -= m[5 * r + k] * dTheta[k];
      dTheta[r] = s / m[5 * r + r];
    }
    return Number.isFinite(dTheta[0] + dTheta[1] + dTheta[2] + dTheta[3]);
  }

  const refine: JointFit['refine'] = (curve, targets, weights, t, o, placement, limits, iterations, halvings) => {
    const maxStep = limits[2];
    current = 0;
    sumSquares(curve, targets, weights, t, o, placement, current);
    let f = sums[0];
    for (let it = 0; it < iterations; it++) {
      const a = placement[A];
      const b = placement[B];
      const ox = current === 0 ? px : tx;
      const oy = current === 0 ? py : ty;
      const odx = current === 0 ? dpx : tdx;
      const ody = current === 0 ? dpy : tdy;
      // E = Σ w Gᵀ G and −g_θ = −Σ w Gᵀ r, minus the Schur terms, G = [[px, −py, 1, 0],
      // [py, px, 0, 1]] (columns ∂r/∂(a, b, tx, ty)). Each entry is written out in the
      // general form's order of operations (so the sums are those of the 4 × 4 loop, to
      // the bit), the lower triangle mirrored from the upper.
      let m00 = 0;
      let m01 = 0;
      let m02 = 0;
      let m03 = 0;
      let m11 = 0;
      let m12 = 0;
      let m13 = 0;
      let m22 = 0;
      let m23 = 0;
      let m33 = 0;
      let r0 = 0;
      let r1 = 0;
      let r2 = 0;
      let r3 = 0;
      for (let i = 0; i < n; i++) {
        const x = ox[i];
        const y = oy[i];
        const nx = -y;
        const w = weights === undefined ? 1 : weights[i];
        const rx = a * x - b * y + placement[TX] - targets[2 * i];
        const ry = b * x + a * y + placement[TY] - targets[2 * i + 1];
        const jx = a * odx[i] - b * ody[i];
        const jy = b * odx[i] + a * ody[i];
        const d = w * (jx * jx + jy * jy);
        const di = d > 0 ? 1 / d : 0;
        dInv[i] = di;
        const c0 = w * (jx * x + jy * y);
        const c1 = w * (jx * nx + jy * x);
        const c2 = w * jx;
        const c3 = w * jy;
        const ci = 4 * i;
        c[ci] = c0;
        c[ci + 1] = c1;
        c[ci + 2] = c2;
        c[ci + 3] = c3;
        const g = w * (jx * rx + jy * ry);
        gt[i] = g;
        m00 += w * (x * x + y * y) - c0 * c0 * di;
        m01 += w * (x * nx + y * x) - c0 * c1 * di;
        m02 += w * (x * 1 + y * 0) - c0 * c2 * di;
        m03 += w * (x * 0 + y * 1) - c0 * c3 * di;
        m11 += w * (nx * nx + x * x) - c1 * c1 * di;
        m12 += w * (nx * 1 + x * 0) - c1 * c2 * di;
        m13 += w * (nx * 0 + x * 1) - c1 * c3 * di;
        m22 += w * (1 * 1 + 0 * 0) - c2 * c2 * di;
        m23 += w * (1 * 0 + 0 * 1) - c2 * c3 * di;
        m33 += w * (0 * 0 + 1 * 1) - c3 * c3 * di;
        r0 += -w * (x * rx + y * ry) + c0 * g * di;
        r1 += -w * (nx * rx + x * ry) + c1 * g * di;
        r2 += -w * (1 * rx + 0 * ry) + c2 * g * di;
        r3 += -w * (0 * rx + 1 * ry) + c3 * g * di;
      }
      m[0] = m00;
      m[1] = m01;
      m[2] = m02;
      m[3] = m03;
      m[4] = r0;
      m[5] = m01;
      m[6] = m11;
      m[7] = m12;
      m[8] = m13;
      m[9] = r1;
      m[10] = m02;
      m[11] = m12;
      m[12] = m22;
      m[13] = m23;
      m[14] = r2;
      m[15] = m03;
      m[16] = m13;
      m[17] = m23;
      m[18] = m33;
      m[19] = r3;
      if (!solve4()) break;
      for (let i = 0; i < n; i++) {
        const ci = 4 * i;
        dt[i] = -(gt[i] + c[ci] * dTheta[0] + c[ci + 1] * dTheta[1] + c[ci + 2] * dTheta[2] + c[ci + 3] * dTheta[3]) * dInv[i];
      }
      let scale = 1;
      for (let i = 0; i < n; i++) if (Math.abs(dt[i]) * scale > maxStep) scale = maxStep / Math.abs(dt[i]);
      let accepted = false;
      let fNew = f;
      for (let halving = 0; halving <= halvings; halving++) {
        for (let i = 0; i < n; i++) {
          let v = t[o + i] + scale * dt[i];
          const lo = i > 0 ? trial[i - 1] : limits[0];
          const hi = i + 1 < n ? t[o + i + 1] + Math.max(0, scale * dt[i + 1]) : limits[1];
          if (v < lo) v = lo;
          if (v > hi) v = hi;
          trial[i] = v;
        }
        // Where a value's step took it past the next one's limit, that one stayed at its
        // limit, below it: brought back to it, so the values stay in order (on a closed
        // path a value below the one before is read as most of a turn between them).
        for (let i = n - 2; i >= 0; i--) if (trial[i] > trial[i + 1]) trial[i] = trial[i + 1];
        for (let k = 0; k < 4; k++) trialPlacement[k] = placement[k] + scale * dTheta[k];
        sumSquares(curve, targets, weights, trial, 0, trialPlacement, 1 - current);
        fNew = sums[0];
        if (fNew < f) {
          accepted = true;
          break;
        }
        scale *= 0.5;
      }
      if (!accepted) break;
      current = 1 - current;
      for (let i = 0; i < n; i++) t[o + i] = trial[i];
      for (let k = 0; k < 4; k++) placement[k] = trialPlacement[k];
      const gain = f - fNew;
      f = fNew;
      if (!(gain > JOINT_FIT_REL_TOL * f)) break;
    }
  };

  return {
    refine,
    refineOnSamples(sampled, curve, targets, weights, t, o, placement, limits) {
      refine(sampled, targets, weights, t, o, placement, limits, JOINT_FIT_ITERATIONS, JOINT_FIT_HALVINGS);
      refine(curve, targets, weights, t, o, placement, limits, JOINT_FIT_CURVE_ITERATIONS, JOINT_FIT_CURVE_HALVINGS);
    },
    pointsInto(points, margins) {
      const ox = current === 0 ? px : tx;
      const oy = current === 0 ? py : ty;
      const om = current === 0 ? pm : tm;
      for (let i = 0; i < n; i++) {
        points[2 * i] = ox[i];
        points[2 * i + 1] = oy[i];
        margins[i] = om[i];
      }
    },
  };
}
