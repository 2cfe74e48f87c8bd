/**
 * A Newton block that is a triad (an Assur group of class III): a rigid ternary link
 * whose three joints each lie on a circle about a joint placed before the block, as the
 * floating ternary of a Stephenson II or III. Its six equations reduce to one unknown,
 * the angle φ of one joint X_i about its centre K_i: a dyad then places a second joint
 * X_j (on the side of the line X_i → K_j it starts on), the link places the third X_k,
 * and what is left is one residual, g(φ) = (|X_k − K_k|² − r_k²) / 2 r_k (≈ |X_k − K_k|
 * − r_k, mm). Newton's method on g, with the exact g′, converges in two or three steps
 * from a warm start, and where there is no root near the start (the design does not
 * assemble there) it stops within a few cheap steps instead of many expensive ones.
 * X_i's angle is held as its unit direction (cos φ, sin φ) about K_i, and a step turns it
 * in the tangent chart (τ = tan Δφ, the direction (u + τ perp u) / √(1 + τ²)): Newton's
 * step in τ is its step in φ to first order, so it converges as fast, and no step calls
 * a trigonometric function.
 *
 * Of the six choices of (i, j), the one whose dyad is furthest from its toggle at the
 * start is taken: there the reduction is well conditioned, and g′(φ) vanishes only where
 * the whole block's Jacobian does (a dead centre of the triad). Everything works in the
 * plan's Newton scratch; nothing is allocated.
 *
 * Assur, 1914: the triad as a structural group of a planar linkage.
 */
import { circleCircleIntersectInto as circleCircleImport } from '../geometry/intersect';
import type { EQ_DIST, EQ_RIGID, EQ_STRIDE, PlanInternal } from './plan';
import * as tolerances from './tolerances';

// Imports bound to locals, literals checked against plan.ts by `satisfies`, and
// tolerances read once: see the note in run.ts on dev-time module transforms.
const circleCircleIntersectInto = circleCircleImport;
const STRIDE = 5 satisfies typeof EQ_STRIDE;
const DIST = 0 satisfies typeof EQ_DIST;
const RIGID = 1 satisfies typeof EQ_RIGID;
const NEWTON_MAX_ITERATIONS = tolerances.NEWTON_MAX_ITERATIONS;
const NEWTON_ROUNDING_FLOOR_FACTOR = tolerances.NEWTON_ROUNDING_FLOOR_FACTOR;
const SINGULAR_PIVOT_REL_TOL = tolerances.SINGULAR_PIVOT_REL_TOL;

/**
 * Largest change of φ in one Newton step (rad): where g′ is small far from a root, an
 * unbounded step could land on another root of the same dyad branch, another assembly.
 * A warm start moves φ by hundredths of this.
 */
const TRIAD_MAX_STEP_RAD = 0.5;
/** TRIAD_MAX_STEP_RAD in the tangent chart the steps are taken in: |τ| = tan |Δφ|. */
const TRIAD_MAX_STEP_TAN = Math.tan(TRIAD_MAX_STEP_RAD);

/**
 * An unbounded Newton step that leaves |g| above this share of what it was is slow:
 * Newton contracts |g| quadratically near a simple root and by 4 a step near a double
 * one (a fold), so steps that do not even halve it are creeping to an extremum of g
 * that stops short of zero.
 */
const TRIAD_CONTRACTION = 0.5;

/** Slow steps in a row after which the triad has no root near the start. */
const TRIAD_MAX_SLOW_STEPS = 2;

/**
 * Halvings of a Newton step that does not lower |g| (to 1/8 of it). In one unknown a
 * warm start's full step is accepted; a step that must be cut further is overshooting
 * an extremum of g, where more halvings only crawl towards the extremum.
 */
const TRIAD_MAX_HALVINGS = 3;

/**
 * A triad's layout, TRIAD_FIELDS int32: pose offsets of X1, X2, X3 (X3 the link's point
 * set from X1 and X2 by EQ_RIGID), of their centres K1, K2, K3, the param offsets of the
 * radii r1, r2, r3, of |X1 X2|, and of the link's (u, v).
 */
const TRIAD_FIELDS = 11;
const F_CENTRE = 3;
const F_RADIUS = 6;
const F_SPAN = 9;
const F_RIGID = 10;

/** The (i, j) pairs of joints: X_i turns about K_i, a dyad places X_j; k is the third. */
const PAIR_I = Int8Array.of(0, 0, 1, 1, 2, 2);
const PAIR_J = Int8Array.of(1, 2, 0, 2, 0, 1);

/** solveTriad's outcomes. */
export const TRIAD_SOLVED = 1;
export const TRIAD_NO_ROOT = 0;
/** No dyad of the triad assembles from the start pose: the caller solves the block otherwise. */
export const TRIAD_NO_START = -1;

/**
 * Block `block`'s triad layout, or null when the block is not a triad: three unknown
 * joints, one EQ_RIGID among them, one EQ_DIST between the two it is set from, and one
 * EQ_DIST from each to a known slot, nothing else.
 */
export function triadLayout(p: PlanInternal, block: number): Int32Array | null {
  if (p.blockUnknownCount[block] !== 3 || p.blockEqCount[block] !== 5) return null;
  const eqs = p.blockEqs;
  const columnBase = block * p.slotCount;
  const known = (s: number) => p.blockColumns[columnBase + (s >> 1)] < 0;
  const layout = new Int32Array(TRIAD_FIELDS).fill(-1);
  const start = p.blockEqStart[block] * STRIDE;
  const end = start + 5 * STRIDE;
  for (let e = start; e < end; e += STRIDE) {
    if (eqs[e] !== RIGID) continue;
    if (layout[0] >= 0 || known(eqs[e + 1]) || known(eqs[e + 2]) || known(eqs[e + 3])) return null;
    layout[0] = eqs[e + 1];
    layout[1] = eqs[e + 2];
    layout[2] = eqs[e + 3];
    layout[F_RIGID] = eqs[e + 4];
  }
  if (layout[0] < 0) return null;
  for (let e = start; e < end; e += STRIDE) {
    if (eqs[e] === RIGID) continue;
    if (eqs[e] !== DIST) return null;
    const a = eqs[e + 1];
    const b = eqs[e + 2];
    if (!known(a) && !known(b)) {
      const between = (a === layout[0] && b === layout[1]) || (a === layout[1] && b === layout[0]);
      if (!between || layout[F_SPAN] >= 0) return null;
      layout[F_SPAN] = eqs[e + 4];
      continue;
    }
    const joint = known(a) ? b : a;
    const centre = known(a) ? a : b;
    const m = joint === layout[0] ? 0 : joint === layout[1] ? 1 : joint === layout[2] ? 2 : -1;
    if (m < 0 || known(joint) || layout[F_CENTRE + m] >= 0) return null;
    layout[F_CENTRE + m] = centre;
    layout[F_RADIUS + m] = eqs[e + 4];
  }
  for (let f = 0; f < TRIAD_FIELDS; f++) if (layout[f] < 0) return null;
  return layout;
}

// Scratch layout (in the plan's Jacobian scratch, 36 numbers for a three-joint block):
// X_i, X_j, X_k now; the same at a trial φ; then the reduction's constants.
const NOW = 0;
const TRIAL = 6;
const KI = 12;
const RI = 14;
const KJ = 15;
const RJ = 17;
const DIJ = 18;
const SIDE = 19;
const Z = 20;
const KK = 22;
const RK = 24;
/** X_i's unit direction (cos φ, sin φ) about K_i at the start. */
const DIR = 25;
/** Six scores, one per pair. */
const SCORE = 27;
/**
 * What place and slope give (g, or g′), and place's direction in. Numbers cross the
 * calls here in the scratch, not as arguments and return values: V8 boxes a number
 * passed to or returned from a call it does not inline (an allocation), and neither is
 * inlined everywhere.
 */
const OUT = 33;
const PHI = 34;

/**
 * Places X_i at direction s[PHI ..] = (cos φ, sin φ), X_j by its dyad, X_k by the link
 * into s[at .. at + 6), and g(φ) (mm) into s[OUT], NaN where the dyad does not
 * assemble.
 */
function place(s: Float64Array, at: number): void {
  const xi = s[KI] + s[RI] * s[PHI];
  const yi = s[KI + 1] + s[RI] * s[PHI + 1];
  if (!circleCircleIntersectInto(xi, yi, s[DIJ], s[KJ], s[KJ + 1], s[RJ], s[SIDE], s, at + 2)) {
    s[OUT] = NaN;
    return;
  }
  s[at] = xi;
  s[at + 1] = yi;
  const wx = s[at + 2] - xi;
  const wy = s[at + 3] - yi;
  const xk = xi + s[Z] * wx - s[Z + 1] * wy;
  const yk = yi + s[Z] * wy + s[Z + 1] * wx;
  s[at + 4] = xk;
  s[at + 5] = yk;
  const dx = xk - s[KK];
  const dy = yk - s[KK + 1];
  const rk = s[RK];
  s[OUT] = (dx * dx + dy * dy - rk * rk) / (2 * rk);
}

/**
 * dg/dφ at the joints in s[NOW ..] into s[OUT]: X_i′ = perp(X_i − K_i); the dyad's X_j′
 * from (X_j − X_i)·(X_j′ − X_i′) = 0 and (X_j − K_j)·X_j′ = 0; X_k′ by the link.
 */
function slope(s: Float64Array): void {
  const xi = s[NOW];
  const yi = s[NOW + 1];
  const dxi = -(yi - s[KI + 1]);
  const dyi = xi - s[KI];
  const ax = s[NOW + 2] - xi;
  const ay = s[NOW + 3] - yi;
  const cx = s[NOW + 2] - s[KJ];
  const cy = s[NOW + 3] - s[KJ + 1];
  const along = (ax * dxi + ay * dyi) / (ax * cy - ay * cx);
  const wx = along * cy - dxi;
  const wy = -along * cx - dyi;
  const dxk = dxi + s[Z] * wx - s[Z + 1] * wy;
  const dyk = dyi + s[Z] * wy + s[Z + 1] * wx;
  s[OUT] = ((s[NOW + 4] - s[KK]) * dxk + (s[NOW + 5] - s[KK + 1]) * dyk) / s[RK];
}

/**
 * Sets up the reduction on pair `pair` from the pose (s[NOW ..] the joints at the
 * start's angle, s[DIR ..] its direction); g there into s[OUT], NaN where the dyad does
 * not assemble or X_i sits on K_i.
 */
function setUp(p: PlanInternal, t: Int32Array, pose: Float64Array, pair: number): void {
  const s = p.jacobian;
  const prm = p.params;
  const i = PAIR_I[pair];
  const j = PAIR_J[pair];
  const k = 3 - i - j;
  // The link's joints in its own frame, in units of |X1 X2|: β1 = 0, β2 = 1, β3 = u + iv;
  // X_k = X_i + z (X_j − X_i) as complex numbers, z = (β_k − β_i) / (β_j − β_i).
  const u = prm[t[F_RIGID]];
  const v = prm[t[F_RIGID] + 1];
  const bix = i === 2 ? u : i === 1 ? 1 : 0;
  const biy = i === 2 ? v : 0;
  const bjx = (j === 2 ? u : j === 1 ? 1 : 0) - bix;
  const bjy = (j === 2 ? v : 0) - biy;
  const bkx = (k === 2 ? u : k === 1 ? 1 : 0) - bix;
  const bky = (k === 2 ? v : 0) - biy;
  const bj2 = bjx * bjx + bjy * bjy;
  s[Z] = (bkx * bjx + bky * bjy) / bj2;
  s[Z + 1] = (bky * bjx - bkx * bjy) / bj2;
  s[DIJ] = prm[t[F_SPAN]] * Math.sqrt(bj2);
  const xi = t[i];
  const xj = t[j];
  const ki = t[F_CENTRE + i];
  const kj = t[F_CENTRE + j];
  const kk = t[F_CENTRE + k];
  s[KI] = pose[ki];
  s[KI + 1] = pose[ki + 1];
  s[RI] = prm[t[F_RADIUS + i]];
  s[KJ] = pose[kj];
  s[KJ + 1] = pose[kj + 1];
  s[RJ] = prm[t[F_RADIUS + j]];
  s[KK] = pose[kk];
  s[KK + 1] = pose[kk + 1];
  s[RK] = prm[t[F_RADIUS + k]];
  // The side of the line X_i → K_j that X_j starts on.
  const side = (s[KJ] - pose[xi]) * (pose[xj + 1] - pose[xi + 1]) - (s[KJ + 1] - pose[xi + 1]) * (pose[xj] - pose[xi]);
  s[SIDE] = side < 0 ? -1 : 1;
  const ux = pose[xi] - s[KI];
  const uy = pose[xi + 1] - s[KI + 1];
  const inv = 1 / Math.sqrt(ux * ux + uy * uy);
  if (!(inv < Infinity)) {
    s[OUT] = NaN;
    return;
  }
  s[DIR] = ux * inv;
  s[DIR + 1] = uy * inv;
  s[PHI] = s[DIR];
  s[PHI + 1] = s[DIR + 1];
  place(s, NOW);
}

/** Pair c's dyad's squared sine at X_j: |(X_j − X_i) × (X_j − K_j)|² over both lengths squared (0 at its dead centre). */
function pairScore(t: Int32Array, pose: Float64Array, c: number): number {
  const xi = t[PAIR_I[c]];
  const xj = t[PAIR_J[c]];
  const kj = t[F_CENTRE + PAIR_J[c]];
  const ax = pose[xj] - pose[xi];
  const ay = pose[xj + 1] - pose[xi + 1];
  const cx = pose[xj] - pose[kj];
  const cy = pose[xj + 1] - pose[kj + 1];
  const cross = ax * cy - ay * cx;
  return (cross * cross) / ((ax * ax + ay * ay) * (cx * cx + cy * cy));
}

/**
 * The pair with the largest pairScore, -1 when none is a number: the same choice, with
 * the three joints' vectors to each other and to their centres found once for the six
 * pairs, and the scores (fractions) compared by cross-multiplication, not divided out.
 */
function choosePair(t: Int32Array, pose: Float64Array): number {
  const x0 = pose[t[0]];
  const y0 = pose[t[0] + 1];
  const x1 = pose[t[1]];
  const y1 = pose[t[1] + 1];
  const x2 = pose[t[2]];
  const y2 = pose[t[2] + 1];
  // X_j − K_j, and |X_j − K_j|².
  const e0x = x0 - pose[t[F_CENTRE]];
  const e0y = y0 - pose[t[F_CENTRE] + 1];
  const e1x = x1 - pose[t[F_CENTRE + 1]];
  const e1y = y1 - pose[t[F_CENTRE + 1] + 1];
  const e2x = x2 - pose[t[F_CENTRE + 2]];
  const e2y = y2 - pose[t[F_CENTRE + 2] + 1];
  const e0 = e0x * e0x + e0y * e0y;
  const e1 = e1x * e1x + e1y * e1y;
  const e2 = e2x * e2x + e2y * e2y;
  // The links between the joints, X_b − X_a, and their lengths squared.
  const d01x = x1 - x0;
  const d01y = y1 - y0;
  const d02x = x2 - x0;
  const d02y = y2 - y0;
  const d12x = x2 - x1;
  const d12y = y2 - y1;
  const l01 = d01x * d01x + d01y * d01y;
  const l02 = d02x * d02x + d02y * d02y;
  const l12 = d12x * d12x + d12y * d12y;
  // Pair (i, j)'s cross product (X_j − X_i) × (X_j − K_j), in PAIR_I / PAIR_J order.
  const c01 = d01x * e1y - d01y * e1x;
  const c02 = d02x * e2y - d02y * e2x;
  const c10 = d01x * e0y - d01y * e0x;
  const c12 = d12x * e2y - d12y * e2x;
  const c20 = d02x * e0y - d02y * e0x;
  const c21 = d12x * e1y - d12y * e1x;
  // The best score so far as a fraction num / den; any number beats the -1 it starts at.
  let pair = -1;
  let num = -1;
  let den = 1;
  let n = c01 * c01;
  let l = l01 * e1;
  if (n * den > num * l) {
    pair = 0;
    num = n;
    den = l;
  }
  n = c02 * c02;
  l = l02 * e2;
  if (n * den > num * l) {
    pair = 1;
    num = n;
    den = l;
  }
  n = c10 * c10;
  l = l01 * e0;
  if (n * den > num * l) {
    pair = 2;
    num = n;
    den = l;
  }
  n = c12 * c12;
  l = l12 * e2;
  if (n * den > num * l) {
    pair = 3;
    num = n;
    den = l;
  }
  n = c20 * c20;
  l = l02 * e0;
  if (n * den > num * l) {
    pair = 4;
    num = n;
    den = l;
  }
  n = c21 * c21;
  l = l12 * e1;
  if (n * den > num * l) pair = 5;
  return pair;
}

/**
 * blockJacobianSign for a triad (+1 or −1; 0 where singular), times a factor fixed for the
 * plan. The link's two equations set X3 from X1 and X2 with an identity block in X3's
 * columns, so by block elimination det J is, up to the fixed sign of the plan's row and
 * column order, the determinant of the 4 × 4 system in X1 and X2 left: the rows
 * a = X1 − K1 (in X1's columns), c = X2 − K2 (in X2's), (s, −s) with s = X1 − X2, and
 * X3's link's gradient g3 = X3 − K3 carried through X3 = X1 + R (X2 − X1),
 * R = [[u, −v], [v, u]], as (g3ᵀ(I − R), g3ᵀR); each row over its link's length (r1,
 * r2, |X1 X2|, r3), a positive factor. The first three rows' cofactor vector is −n, n = ((c × s) a⊥, (a × s) c⊥)
 * (it is orthogonal to the three rows, and det of the three rows with n is −|n|²), so
 * det = −(g3ᵀ(I − R) n₁ + g3ᵀR n₂): the rate of X3's equation along the one motion the
 * other three allow, no elimination. A comparison with the reference pose's sign, taken
 * the same way, cancels the factor. Singular where |det| is within SINGULAR_PIVOT_REL_TOL
 * of the fourth power of the rows' largest entry (the scale of a 4 × 4 determinant of
 * them).
 */
export function triadJacobianSign(p: PlanInternal, t: Int32Array, pose: Float64Array): number {
  const prm = p.params;
  const x0 = t[0];
  const x1 = t[1];
  const x2 = t[2];
  const k0 = t[F_CENTRE];
  const k1 = t[F_CENTRE + 1];
  const k2 = t[F_CENTRE + 2];
  const u = prm[t[F_RIGID]];
  const v = prm[t[F_RIGID] + 1];
  const ax = (pose[x0] - pose[k0]) / prm[t[F_RADIUS]];
  const ay = (pose[x0 + 1] - pose[k0 + 1]) / prm[t[F_RADIUS]];
  const cx = (pose[x1] - pose[k1]) / prm[t[F_RADIUS + 1]];
  const cy = (pose[x1 + 1] - pose[k1 + 1]) / prm[t[F_RADIUS + 1]];
  const gx = (pose[x2] - pose[k2]) / prm[t[F_RADIUS + 2]];
  const gy = (pose[x2 + 1] - pose[k2 + 1]) / prm[t[F_RADIUS + 2]];
  const span = prm[t[F_SPAN]];
  const sx = (pose[x0] - pose[x1]) / span;
  const sy = (pose[x0 + 1] - pose[x1 + 1]) / span;
  // The fourth row: g3ᵀ(I − R) in X1's columns, g3ᵀR in X2's.
  const d1x = gx * (1 - u) - gy * v;
  const d1y = gx * v + gy * (1 - u);
  const d2x = gx * u + gy * v;
  const d2y = gy * u - gx * v;
  // n₁ = (c × s) a⊥ and n₂ = (a × s) c⊥, a⊥ = (−a_y, a_x).
  const cs = cx * sy - cy * sx;
  const as = ax * sy - ay * sx;
  const det = -(cs * (ay * -d1x + ax * d1y) + as * (cy * -d2x + cx * d2y));
  const largest = Math.max(
    Math.abs(ax), Math.abs(ay), Math.abs(cx), Math.abs(cy), Math.abs(sx), Math.abs(sy),
    Math.abs(d1x), Math.abs(d1y), Math.abs(d2x), Math.abs(d2y),
  );
  const square = largest * largest;
  if (!(Math.abs(det) > SINGULAR_PIVOT_REL_TOL * square * square)) return 0;
  return det > 0 ? 1 : -1;
}

/**
 * Solves the triad in place in pose from its joints' current values (finite; the caller
 * sees to that). Returns TRIAD_SOLVED with every equation within the plan's newtonTolMm
 * (or at the rounding floor just above), TRIAD_NO_ROOT when Newton's method on g finds no
 * root near the start, TRIAD_NO_START when no dyad of the triad assembles at the start's
 * angle.
 */
export function solveTriad(p: PlanInternal, t: Int32Array, pose: Float64Array): number {
  const s = p.jacobian;
  // Read here, not passed: a number passed to a call V8 does not inline is boxed.
  const tolMm = p.newtonTolMm;
  // Start from the pair whose dyad's sine at X_j, |(X_j − X_i) × (X_j − K_j)|, is
  // largest, else the next that assembles at the start's angle.
  let pair = choosePair(t, pose);
  let g = NaN;
  if (pair >= 0) {
    setUp(p, t, pose, pair);
    g = s[OUT];
  }
  if (Number.isNaN(g)) {
    const tried = pair >= 0 ? 1 : 0;
    for (let c = 0; c < 6; c++) {
      const score = pairScore(t, pose, c);
      s[SCORE + c] = c === pair ? -Infinity : score >= 0 ? score : -1;
    }
    for (let attempt = tried; attempt < 6 && Number.isNaN(g); attempt++) {
      pair = -1;
      let best = -Infinity;
      for (let c = 0; c < 6; c++) {
        if (s[SCORE + c] > best) {
          best = s[SCORE + c];
          pair = c;
        }
      }
      if (pair < 0) return TRIAD_NO_START;
      s[SCORE + pair] = -Infinity;
      setUp(p, t, pose, pair);
      g = s[OUT];
    }
  }
  if (Number.isNaN(g)) return TRIAD_NO_START;
  const i = PAIR_I[pair];
  const j = PAIR_J[pair];
  const xi = t[i];
  const xj = t[j];
  const xk = t[3 - i - j];
  let cosPhi = s[DIR];
  let sinPhi = s[DIR + 1];
  let norm = Math.abs(g);
  let slow = 0;
  let solved = false;
  for (let iteration = 0; iteration < NEWTON_MAX_ITERATIONS; iteration++) {
    if (norm <= tolMm) {
      solved = true;
      break;
    }
    // The step in the tangent chart at the current direction: τ = tan Δφ.
    slope(s);
    let step = -g / s[OUT];
    if (!(Math.abs(step) < Infinity)) break;
    const bounded = !(Math.abs(step) <= TRIAD_MAX_STEP_TAN);
    if (bounded) step = step > 0 ? TRIAD_MAX_STEP_TAN : -TRIAD_MAX_STEP_TAN;
    let tau = step;
    let next = NaN;
    let nextCos = cosPhi;
    let nextSin = sinPhi;
    for (let halving = 0; halving <= TRIAD_MAX_HALVINGS; halving++) {
      const scale = 1 / Math.sqrt(1 + tau * tau);
      nextCos = (cosPhi - tau * sinPhi) * scale;
      nextSin = (sinPhi + tau * cosPhi) * scale;
      s[PHI] = nextCos;
      s[PHI + 1] = nextSin;
      place(s, TRIAL);
      next = s[OUT];
      if (Math.abs(next) < norm) break;
      tau *= 0.5;
    }
    // No step along Newton's direction lowers |g|: rounding (converged) or an
    // extremum of g short of zero, a fold of the assembly with no root nearby.
    if (!(Math.abs(next) < norm)) {
      solved = norm <= NEWTON_ROUNDING_FLOOR_FACTOR * tolMm;
      break;
    }
    cosPhi = nextCos;
    sinPhi = nextSin;
    for (let q = 0; q < 6; q++) s[NOW + q] = s[TRIAL + q];
    slow = !bounded && Math.abs(next) > TRIAD_CONTRACTION * norm ? slow + 1 : 0;
    g = next;
    norm = Math.abs(next);
    if (slow >= TRIAD_MAX_SLOW_STEPS) break;
  }
  if (!solved && !(norm <= tolMm)) return TRIAD_NO_ROOT;
  pose[xi] = s[NOW];
  pose[xi + 1] = s[NOW + 1];
  pose[xj] = s[NOW + 2];
  pose[xj + 1] = s[NOW + 3];
  pose[xk] = s[NOW + 4];
  pose[xk + 1] = s[NOW + 5];
  return TRIAD_SOLVED;
}

/**
 * The triad's rates from its centres' rates, exact, by the same reduction: with φ′ = 0
 * the joints move with their centres (X_i′ = K_i′, X_j′ from the dyad's two
 * differentiated distances, X_k′ by the link), each unit of φ′ adds the slope's motion,
 * and the closure (X_k − K_k)·(X_k′ − K_k′) = 0 fixes φ′. False where the triad is at a
 * dead centre (φ′ not finite) or a length of it moves with the driver (the caller then
 * solves the block's differentiated equations whole).
 */
export function triadRates(p: PlanInternal, t: Int32Array, pose: Float64Array, rates: Float64Array): boolean {
  const pr = p.paramRates;
  if (pr[t[F_RADIUS]] !== 0 || pr[t[F_RADIUS + 1]] !== 0 || pr[t[F_RADIUS + 2]] !== 0 || pr[t[F_SPAN]] !== 0) return false;
  const pair = choosePair(t, pose);
  if (pair < 0) return false;
  const i = PAIR_I[pair];
  const j = PAIR_J[pair];
  const k = 3 - i - j;
  const xi = t[i];
  const xj = t[j];
  const xk = t[k];
  const ki = t[F_CENTRE + i];
  const kj = t[F_CENTRE + j];
  const kk = t[F_CENTRE + k];
  // z as in setUp, from where the joints are.
  const wx = pose[xj] - pose[xi];
  const wy = pose[xj + 1] - pose[xi + 1];
  const vx = pose[xk] - pose[xi];
  const vy = pose[xk + 1] - pose[xi + 1];
  const w2 = wx * wx + wy * wy;
  const zx = (vx * wx + vy * wy) / w2;
  const zy = (vy * wx - vx * wy) / w2;
  const ax = wx;
  const ay = wy;
  const cx = pose[xj] - pose[kj];
  const cy = pose[xj + 1] - pose[kj + 1];
  const det = ax * cy - ay * cx;
  // φ′ = 0: X_i′ = K_i′.
  const ix0 = rates[ki];
  const iy0 = rates[ki + 1];
  const alongA = ax * ix0 + ay * iy0;
  const alongC = cx * rates[kj] + cy * rates[kj + 1];
  const jx0 = (alongA * cy - alongC * ay) / det;
  const jy0 = (alongC * ax - alongA * cx) / det;
  const kx0 = ix0 + zx * (jx0 - ix0) - zy * (jy0 - iy0);
  const ky0 = iy0 + zx * (jy0 - iy0) + zy * (jx0 - ix0);
  // Per unit φ′ with the centres still: X_i′ = perp(X_i − K_i), K_j′ = 0.
  const ix1 = -(pose[xi + 1] - pose[ki + 1]);
  const iy1 = pose[xi] - pose[ki];
  const along1 = (ax * ix1 + ay * iy1) / det;
  const jx1 = along1 * cy;
  const jy1 = -along1 * cx;
  const kx1 = ix1 + zx * (jx1 - ix1) - zy * (jy1 - iy1);
  const ky1 = iy1 + zx * (jy1 - iy1) + zy * (jx1 - ix1);
  const ex = pose[xk] - pose[kk];
  const ey = pose[xk + 1] - pose[kk + 1];
  const dPhi = -(ex * (kx0 - rates[kk]) + ey * (ky0 - rates[kk + 1])) / (ex * kx1 + ey * ky1);
  if (!(Math.abs(dPhi) < Infinity)) return false;
  rates[xi] = ix0 + dPhi * ix1;
  rates[xi + 1] = iy0 + dPhi * iy1;
  rates[xj] = jx0 + dPhi * jx1;
  rates[xj + 1] = jy0 + dPhi * jy1;
  rates[xk] = kx0 + dPhi * kx1;
  rates[xk + 1] = ky0 + dPhi * ky1;
  return true;
}
