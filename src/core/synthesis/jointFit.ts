/**
 * Driver values and a free placement refined together: Gauss–Newton on
 * Σ wᵢ |S P(tᵢ) + T − Qᵢ|² over (t₁ … tₙ, a, b, tx, ty), S = (a −b; b a). Each tᵢ
 * couples only with the four placement unknowns, so the normal equations are an arrow
 * matrix, solved through its 4 × 4 Schur complement: O(n) work per step. Alternating
 * "refine the tᵢ, refit the placement" converges linearly; this converges
 * quadratically on a path the mechanism can trace. Steps are capped and halved until
 * the sum falls; each tᵢ stays between its neighbours.
 */
import type { CurveEvaluator } from './curve';

/** Gauss–Newton steps at most. */
export const JOINT_FIT_ITERATIONS = 20;
/** Stop when a step lowers the sum by less than this share of it. */
export const JOINT_FIT_REL_TOL = 1e-14;

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
   * driver step (in the array because a double passed to a call is boxed).
   */
  refine(
    curve: CurveEvaluator,
    targets: Float64Array,
    weights: Float64Array | undefined,
    t: Float64Array,
    o: number,
    placement: Float64Array,
    limits: Float64Array,
  ): void;
}

export function createJointFit(n: number): JointFit {
  const px = new Float64Array(n);
  const py = new Float64Array(n);
  const dpx = new Float64Array(n);
  const dpy = new Float64Array(n);
  const dt = new Float64Array(n);
  const dInv = new Float64Array(n);
  const c = new Float64Array(4 * n);
  const gt = new Float64Array(n);
  const trial = new Float64Array(n);
  const m = new Float64Array(20); // 4 × 5 augmented Schur system
  const dTheta = new Float64Array(4);
  const trialPlacement = new Float64Array(4);
  const buf = new Float64Array(8);
  const gx = new Float64Array(4);
  const gy = new Float64Array(4);
  gx[2] = 1;
  gy[3] = 1;

  function sumSquares(curve: CurveEvaluator, targets: Float64Array, weights: Float64Array | undefined, ts: Float64Array, to: number, p: Float64Array): number {
    let sum = 0;
    for (let i = 0; i < n; i++) {
      curve.at(ts[to + i], 0, buf);
      const x = p[A] * buf[0] - p[B] * buf[1] + p[TX] - targets[2 * i];
      const y = p[B] * buf[0] + p[A] * buf[1] + p[TY] - targets[2 * i + 1];
      sum += (weights === undefined ? 1 : weights[i]) * (x * x + y * y);
    }
    return sum;
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

  return {
    refine(curve, targets, weights, t, o, placement, limits) {
      const maxStep = limits[2];
      let f = sumSquares(curve, targets, weights, t, o, placement);
      for (let it = 0; it < JOINT_FIT_ITERATIONS; it++) {
        const a = placement[A];
        const b = placement[B];
        m.fill(0);
        for (let i = 0; i < n; i++) {
          curve.at(t[o + i], 1, buf);
          px[i] = buf[0];
          py[i] = buf[1];
          dpx[i] = buf[2];
          dpy[i] = buf[3];
          const w = weights === undefined ? 1 : weights[i];
          const rx = a * px[i] - b * py[i] + placement[TX] - targets[2 * i];
          const ry = b * px[i] + a * py[i] + placement[TY] - targets[2 * i + 1];
          const jx = a * dpx[i] - b * dpy[i];
          const jy = b * dpx[i] + a * dpy[i];
          // G = [[px, −py, 1, 0], [py, px, 0, 1]]: columns ∂r/∂(a, b, tx, ty).
          gx[0] = px[i];
          gy[0] = py[i];
          gx[1] = -py[i];
          gy[1] = px[i];
          const d = w * (jx * jx + jy * jy);
          dInv[i] = d > 0 ? 1 / d : 0;
          const ci = 4 * i;
          c[ci] = w * (jx * gx[0] + jy * gy[0]);
          c[ci + 1] = w * (jx * gx[1] + jy * gy[1]);
          c[ci + 2] = w * jx;
          c[ci + 3] = w * jy;
          gt[i] = w * (jx * rx + jy * ry);
          // E = Σ w Gᵀ G and −g_θ = −Σ w Gᵀ r, then minus the Schur terms.
          for (let r = 0; r < 4; r++) {
            for (let k = 0; k < 4; k++) m[5 * r + k] += w * (gx[r] * gx[k] + gy[r] * gy[k]) - c[ci + r] * c[ci + k] * dInv[i];
            m[5 * r + 4] += -w * (gx[r] * rx + gy[r] * ry) + c[ci + r] * gt[i] * dInv[i];
          }
        }
        if (!solve4()) break;
        for (let i = 0; i < n; i++) {
          const ci = 4 * i;
          dt[i] = -(gt[i] + c[ci] * dTheta[0] + c[ci + 1] * dTheta[1] + c[ci + 2] * dTheta[2] + c[ci + 3] * dTheta[3]) * dInv[i];
        }
        let scale = 1;
        for (let i = 0; i < n; i++) if (Math.abs(dt[i]) * scale > maxStep) scale = maxStep / Math.abs(dt[i]);
        let accepted = false;
        let fNew = f;
        for (let halving = 0; halving < 5; halving++) {
          for (let i = 0; i < n; i++) {
            let v = t[o + i] + scale * dt[i];
            const lo = i > 0 ? trial[i - 1] : limits[0];
            const hi = i + 1 < n ? t[o + i + 1] + Math.max(0, scale * dt[i + 1]) : limits[1];
            if (v < lo) v = lo;
            if (v > hi) v = hi;
            trial[i] = v;
          }
          for (let k = 0; k < 4; k++) trialPlacement[k] = placement[k] + scale * dTheta[k];
          fNew = sumSquares(curve, targets, weights, trial, 0, trialPlacement);
          if (fNew < f) {
            accepted = true;
            break;
          }
          scale *= 0.5;
        }
        if (!accepted) break;
        for (let i = 0; i < n; i++) t[o + i] = trial[i];
        for (let k = 0; k < 4; k++) placement[k] = trialPlacement[k];
        const gain = f - fNew;
        f = fNew;
        if (!(gain > JOINT_FIT_REL_TOL * f)) break;
      }
    },
  };
}
