/**
 * Closed-form least-squares similarity between two point sets: the rotation R (no
 * reflection), uniform scale s and translation t minimising
 * Σ wᵢ |yᵢ − (s R xᵢ + t)|² for source points x and target points y.
 *
 * Umeyama, "Least-squares estimation of transformation parameters between two point
 * patterns", IEEE Trans. PAMI 13(4), 1991. In the plane his SVD solution with the
 * reflection correction S = diag(1, det U det V) reduces to one complex number: with
 * centred points written as complex x', y', s R = Σ w conj(x') y' / Σ w |x'|²; a
 * proper rotation is built in, so a reflected target gets the best rotation instead.
 *
 * Point sets are interleaved [x0, y0, x1, y1, ...] in mm.
 */

/**
 * Relative spread below which the source counts as one point: the centred second
 * moment against the second moment about the origin, (1e-12)². Coordinates carry about
 * 1e-16 relative error, so a spread this small is rounding, not shape.
 */
export const SIMILARITY_SPREAD_REL_TOL = 1e-24;

/** Layout of the `out` array of similarityFitInto. */
export const SIM_A = 0; // s cos θ
export const SIM_B = 1; // s sin θ
export const SIM_TX = 2;
export const SIM_TY = 3;
export const SIM_SSE = 4; // Σ w |y − (s R x + t)|², mm²
export const SIM_LENGTH = 5;

/**
 * Fits the first `count` points of `source` to those of `target` and writes
 * [s cos θ, s sin θ, tx, ty, sse] to out (length ≥ SIM_LENGTH); allocation-free.
 * `weights` (optional, length ≥ count) must be non-negative.
 *
 * `turns` false: no rotation but by π (s R = a real number), for a mechanism that cannot
 * turn in the plane.
 *
 * Returns true when the fit is unique. Returns false when it is not:
 * - no points, weights summing to ≤ 0, or a non-finite input: out is all NaN;
 * - the source has no spread (all points coincide): out holds the least-squares
 *   answer with scale 0 (every point sent to the target centroid) and its sse.
 * A target without spread, or one no rotation correlates with (Σ conj(x') y' = 0),
 * gives a unique fit with scale 0: true.
 */
export function similarityFitInto(
  source: Float64Array,
  target: Float64Array,
  count: number,
  out: Float64Array,
  weights: Float64Array | null = null,
  turns = true,
): boolean {
  let sumW = 0;
  let sx = 0;
  let sy = 0;
  let tx = 0;
  let ty = 0;
  for (let i = 0; i < count; i++) {
    const w = weights === null ? 1 : weights[i];
    sumW += w;
    sx += w * source[2 * i];
    sy += w * source[2 * i + 1];
    tx += w * target[2 * i];
    ty += w * target[2 * i + 1];
  }
  if (!(sumW > 0) || !Number.isFinite(sx + sy + tx + ty)) {
    for (let k = 0; k < SIM_LENGTH; k++) out[k] = NaN;
    return false;
  }
  const mxs = sx / sumW;
  const mys = sy / sumW;
  const mxt = tx / sumW;
  const myt = ty / sumW;
  let spread = 0;
  let moment = 0;
  let a = 0;
  let b = 0;
  for (let i = 0; i < count; i++) {
    const w = weights === null ? 1 : weights[i];
    const px = source[2 * i];
    const py = source[2 * i + 1];
    const dx = px - mxs;
    const dy = py - mys;
    const ex = target[2 * i] - mxt;
    const ey = target[2 * i + 1] - myt;
    spread += w * (dx * dx + dy * dy);
    moment += w * (px * px + py * py);
    a += w * (dx * ex + dy * ey);
    b += w * (dx * ey - dy * ex);
  }
  const unique = spread > SIMILARITY_SPREAD_REL_TOL * moment;
  // Without turns (b = 0) the least-squares a is the same quotient: s R restricted to ±s.
  const c = unique ? a / spread : 0;
  const s = unique && turns ? b / spread : 0;
  const offX = mxt - (c * mxs - s * mys);
  const offY = myt - (s * mxs + c * mys);
  // The residual from a second pass: the closed form Σ|y'|² − |Σ conj(x') y'|² / Σ|x'|²
  // cancels catastrophically for good fits, which are the ones a search ranks.
  let sse = 0;
  for (let i = 0; i < count; i++) {
    const w = weights === null ? 1 : weights[i];
    const px = source[2 * i];
    const py = source[2 * i + 1];
    const rx = target[2 * i] - (c * px - s * py + offX);
    const ry = target[2 * i + 1] - (s * px + c * py + offY);
    sse += w * (rx * rx + ry * ry);
  }
  out[SIM_A] = c;
  out[SIM_B] = s;
  out[SIM_TX] = offX;
  out[SIM_TY] = offY;
  out[SIM_SSE] = sse;
  return unique;
}

export type SimilarityFit =
  | {
      readonly ok: true;
      readonly scale: number;
      /** Rotation (rad, counter-clockwise, in (−π, π]); 0 when scale is 0. */
      readonly rotationRad: number;
      readonly tx: number;
      readonly ty: number;
      /** Σ w |y − (s R x + t)|², mm². */
      readonly sse: number;
    }
  | { readonly ok: false; readonly reason: string };

/** The allocating form of similarityFitInto, for code outside hot loops. */
export function similarityFit(source: Float64Array, target: Float64Array, weights?: Float64Array): SimilarityFit {
  if (source.length !== target.length || (source.length & 1) !== 0) {
    return {
      ok: false,
      reason: `source has ${source.length} numbers and target ${target.length}; expected equal, even counts (x, y pairs)`,
    };
  }
  const count = source.length >> 1;
  if (weights !== undefined && weights.length !== count) {
    return { ok: false, reason: `weights has ${weights.length} entries; expected one per point (${count})` };
  }
  const out = new Float64Array(SIM_LENGTH);
  if (!similarityFitInto(source, target, count, out, weights ?? null)) {
    return {
      ok: false,
      reason: Number.isNaN(out[SIM_SSE])
        ? `no fit for ${count} points: expected at least one point, positive total weight and finite coordinates`
        : 'the source points coincide; a rotation and scale need at least two distinct source points',
    };
  }
  const scale = Math.hypot(out[SIM_A], out[SIM_B]);
  return {
    ok: true,
    scale,
    rotationRad: scale > 0 ? Math.atan2(out[SIM_B], out[SIM_A]) : 0,
    tx: out[SIM_TX],
    ty: out[SIM_TY],
    sse: out[SIM_SSE],
  };
}

/** Applies a fit written by similarityFitInto to `count` points: out = s R xy + t (out may be xy). */
export function applySimilarityInto(fit: Float64Array, xy: Float64Array, count: number, out: Float64Array): void {
  const c = fit[SIM_A];
  const s = fit[SIM_B];
  const offX = fit[SIM_TX];
  const offY = fit[SIM_TY];
  for (let i = 0; i < count; i++) {
    const px = xy[2 * i];
    const py = xy[2 * i + 1];
    out[2 * i] = c * px - s * py + offX;
    out[2 * i + 1] = s * px + c * py + offY;
  }
}
