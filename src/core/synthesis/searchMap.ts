/**
 * How a point u of the search box [0, 1]^dim becomes a design x of the problem: the
 * search's coordinates, never the problem's. The objective, its bounds and the
 * reported design stay those of the problem; only where the search's samples and steps
 * fall in the design space changes.
 *
 * 'affine' (the default): x = lower + u · (upper − lower), each coordinate alone.
 *
 * 'fourbar-boundary', for the literature four-bar encoding (fixed placement; variables
 * r1, r2, r3, r4, rcx, rcy, θ0, x0, y0, then the driver angles when timing is free).
 * Every point of the box maps into the box of the problem, and the constraints the map
 * can satisfy by construction it satisfies (a decoder in the sense of Koziel and
 * Michalewicz, 1999, "Evolutionary algorithms, homomorphous mappings, and constrained
 * parameter optimization", Evolutionary Computation 7(1):19-44; from memory):
 * - lengths and offsets on a logarithmic scale from the low end (lengths) or from the
 *   centre (signed offsets), so a search box spanning links from far below to far above
 *   the target's size samples each scale alike (common practice for scale variables);
 * - r4 as r1 plus a signed logarithmic offset, clamped to its box: the rocker of a
 *   crank-rocker near change point follows the ground link when r1 moves;
 * - r2 as a share u2 of the largest crank the other three links admit under Grashof's
 *   condition with the crank shortest (Grashof, 1883), strictly inside the change-point
 *   band: every u2 gives a crank that turns fully when any does, and u2 → 1 is the
 *   Grashof boundary, where the best designs of closed18 sit;
 * - free driver angles as increasing order statistics: t_i is the smallest of n − i + 1
 *   uniforms on [t_{i−1}, upper], drawn by inversion, t_i = t_{i−1} + (upper − t_{i−1})
 *   (1 − (1 − u_i)^{1/(n − i + 1)}) (Devroye, 1986, "Non-Uniform Random Variate
 *   Generation", Springer, ch. V, sorted uniforms generated in order; from memory). The
 *   angles are increasing for every u, and a uniform u gives uniformly spread sorted
 *   angles, not a pile at the top end.
 *
 * A point outside the unit box (a peer's step) maps outside the problem's box, or to
 * NaN for the angles, so the objective's bounds violation still counts it; only r4 is
 * clamped into its box.
 *
 * Measured on closed18-untimed (tests/reference/path-synthesis.test.ts header): the map
 * takes the hybrid from a median of 4.2 × the reference to 1.0032 × at 2e5 evaluations.
 * It is no default: on line6-untimed and timed5 the logarithmic scale makes the search
 * worse, their optimum links being of the box's own size.
 */
import { CHANGE_POINT_REL_TOL as CHANGE_POINT_REL_TOL_BINDING } from '../linkage/analysis/grashof';

const CHANGE_POINT_REL_TOL = CHANGE_POINT_REL_TOL_BINDING;

// What this module reads of a problem, by shape: problem.ts imports this module, so this
// one imports nothing from it (no import cycle).
type Placement = 'fixed' | 'free';

export const SEARCH_MAP_KINDS = ['affine', 'fourbar-boundary'] as const;
export type SearchMapKind = (typeof SEARCH_MAP_KINDS)[number];

export interface SearchMap {
  readonly kind: SearchMapKind;
  /** Writes into x the design that search-box point u stands for; allocates nothing. */
  fromSearchBoxInto(u: ArrayLike<number>, x: Float64Array): Float64Array;
  /**
   * Writes into u a search-box point (in [0, 1]^dim) that stands for design x: the
   * inverse where the map is one to one; where it clamps (r4 at its bounds) or where
   * x breaks what the map guarantees (r2 above the largest crank, angles out of order),
   * the nearest point the box holds.
   */
  toSearchBoxInto(x: ArrayLike<number>, u: Float64Array): Float64Array;
}

/**
 * Rate a of the logarithmic scale x = lo + w (e^{a s} − 1) / (e^a − 1), s ∈ [0, 1]: the
 * slope at the low end is e^a ≈ 8100 times smaller than at the high end. Measured on
 * closed18 (seeds 1 … 10, 2e5 evaluations): a = 9 reaches the reference on 10 of 10
 * seeds, a = 6.9 on 9 of 10.
 */
export const LOG_SCALE_RATE = 9;

/** The fixed-placement `fourbar-lengths` variable order (fourBarLengths.ts). */
const R1 = 0;
const R2 = 1;
const R3 = 2;
const R4 = 3;
const RCX = 4;
const RCY = 5;
const THETA0 = 6;
const X0 = 7;
const Y0 = 8;
const MECHANISM_VARIABLES = 9;
/**
 * How far inside the change-point band (CHANGE_POINT_REL_TOL of the sum of the links,
 * where a four-bar counts as a change point and does not turn fully) the map puts the
 * largest crank, in bands: r2 ≤ r1 + r3 + r4 so the sum is at most 2 (r1 + r3 + r4),
 * and two bands leave room for rounding, so u2 = 1 is a crank that turns fully.
 */
const BOUNDARY_MARGIN_BANDS = 2;
/** The signed offsets, mapped about their box centres. */
const SIGNED_OFFSETS: readonly number[] = [RCX, RCY, X0, Y0];

/** s ∈ [0, 1] on the logarithmic scale: 0 ↦ 0, 1 ↦ 1. */
function logScale(s: number): number {
  return Math.expm1(LOG_SCALE_RATE * s) / Math.expm1(LOG_SCALE_RATE);
}

/** u ∈ [0, 1] ↦ a signed share in [−1, 1], logarithmic in its size, 0.5 ↦ 0. */
function signedLogScale(u: number): number {
  const z = 2 * u - 1;
  return z < 0 ? -logScale(-z) : logScale(z);
}

/** The inverse of logScale on [0, 1], clamped. */
function logScaleInverse(v: number): number {
  const c = v < 0 ? 0 : v > 1 ? 1 : v;
  return Math.log1p(c * Math.expm1(LOG_SCALE_RATE)) / LOG_SCALE_RATE;
}

/** The inverse of signedLogScale on [−1, 1], clamped. */
function signedLogScaleInverse(v: number): number {
  const z = v < 0 ? -logScaleInverse(-v) : logScaleInverse(v);
  return 0.5 * (z + 1);
}

function clampUnit(v: number): number {
  return v > 0 ? (v < 1 ? v : 1) : 0;
}

function affine(lower: Float64Array, upper: Float64Array): SearchMap {
  return {
    kind: 'affine',
    fromSearchBoxInto(u: ArrayLike<number>, x: Float64Array): Float64Array {
      for (let j = 0; j < x.length; j++) x[j] = lower[j] + u[j] * (upper[j] - lower[j]);
      return x;
    },
    toSearchBoxInto(x: ArrayLike<number>, u: Float64Array): Float64Array {
      for (let j = 0; j < u.length; j++) {
        const w = upper[j] - lower[j];
        u[j] = w > 0 ? clampUnit((x[j] - lower[j]) / w) : 0.5;
      }
      return u;
    },
  };
}

export interface SearchMapContext {
  readonly family: string;
  readonly placement: Placement;
  /** Free driver variables after the mechanism's (0 for prescribed timing). */
  readonly freeDrivers: number;
  readonly lower: Float64Array;
  readonly upper: Float64Array;
}

/** Why map `kind` does not apply to `family` with `placement`, or null when it does. */
export function searchMapMisfit(kind: SearchMapKind, family: string, placement: Placement): string | null {
  if (kind === 'affine') return null;
  if (family !== 'fourbar-lengths' || placement !== 'fixed') {
    return `search map "${kind}" is for fourbar-lengths with a fixed placement; got ${family} with a ${placement} placement`;
  }
  return null;
}

/** The map of `kind` on a problem; throws RangeError when it does not apply to it. */
export function createSearchMap(kind: SearchMapKind, context: SearchMapContext): SearchMap {
  const { lower, upper } = context;
  if (kind === 'affine') return affine(lower, upper);
  const misfit = searchMapMisfit(kind, context.family, context.placement);
  if (misfit !== null) throw new RangeError(misfit);
  const n = context.freeDrivers;
  const dim = MECHANISM_VARIABLES + n;
  if (lower.length !== dim || upper.length !== dim) throw new RangeError(`search map '${kind}': expected ${dim} variables, got ${lower.length}`);
  const driverLo = n > 0 ? lower[MECHANISM_VARIABLES] : 0;
  const driverHi = n > 0 ? upper[MECHANISM_VARIABLES] : 0;
  for (let i = 0; i < n; i++) {
    if (lower[MECHANISM_VARIABLES + i] !== driverLo || upper[MECHANISM_VARIABLES + i] !== driverHi) {
      throw new RangeError(`search map '${kind}': the driver angles need one common box`);
    }
  }
  const width = (j: number) => upper[j] - lower[j];
  /** The largest r2 in its box that is the shortest link and turns fully (s + l below p + q by the margin); its lower bound when none is. */
  const largestCrank = (r1: number, r3: number, r4: number): number => {
    const l = Math.max(r1, r3, r4);
    const top = Math.min(r1, r3, r4, r1 + r3 + r4 - 2 * l - BOUNDARY_MARGIN_BANDS * CHANGE_POINT_REL_TOL * 2 * (r1 + r3 + r4), upper[R2]);
    return top >= lower[R2] ? top : lower[R2];
  };

  return {
    kind,
    fromSearchBoxInto(u: ArrayLike<number>, x: Float64Array): Float64Array {
      x[R1] = lower[R1] + width(R1) * logScale(u[R1]);
      x[R3] = lower[R3] + width(R3) * logScale(u[R3]);
      const r4 = x[R1] + width(R4) * signedLogScale(u[R4]);
      x[R4] = r4 < lower[R4] ? lower[R4] : r4 > upper[R4] ? upper[R4] : r4;
      for (let k = 0; k < SIGNED_OFFSETS.length; k++) {
        const j = SIGNED_OFFSETS[k];
        x[j] = 0.5 * (lower[j] + upper[j]) + 0.5 * width(j) * signedLogScale(u[j]);
      }
      x[THETA0] = lower[THETA0] + u[THETA0] * width(THETA0);

      x[R2] = lower[R2] + u[R2] * (largestCrank(x[R1], x[R3], x[R4]) - lower[R2]);

      let t = driverLo;
      for (let i = 0; i < n; i++) {
        // The smallest of the n − i uniforms left on [t, driverHi], by inversion.
        const share = 1 - Math.pow(1 - u[MECHANISM_VARIABLES + i], 1 / (n - i));
        t += (driverHi - t) * share;
        x[MECHANISM_VARIABLES + i] = t;
      }
      return x;
    },
    toSearchBoxInto(x: ArrayLike<number>, u: Float64Array): Float64Array {
      const share = (j: number) => (width(j) > 0 ? (x[j] - lower[j]) / width(j) : 0);
      u[R1] = logScaleInverse(share(R1));
      u[R3] = logScaleInverse(share(R3));
      u[R4] = width(R4) > 0 ? signedLogScaleInverse((x[R4] - x[R1]) / width(R4)) : 0.5;
      for (let k = 0; k < SIGNED_OFFSETS.length; k++) {
        const j = SIGNED_OFFSETS[k];
        u[j] = width(j) > 0 ? signedLogScaleInverse((x[j] - 0.5 * (lower[j] + upper[j])) / (0.5 * width(j))) : 0.5;
      }
      u[THETA0] = width(THETA0) > 0 ? clampUnit(share(THETA0)) : 0.5;
      const span = largestCrank(x[R1], x[R3], x[R4]) - lower[R2];
      u[R2] = span > 0 ? clampUnit((x[R2] - lower[R2]) / span) : 0.5;
      let t = driverLo;
      for (let i = 0; i < n; i++) {
        const left = driverHi - t;
        const next = x[MECHANISM_VARIABLES + i];
        const step = left > 0 ? clampUnit((next - t) / left) : 0;
        u[MECHANISM_VARIABLES + i] = clampUnit(1 - Math.pow(1 - step, n - i));
        if (next > t) t = next < driverHi ? next : driverHi;
      }
      return u;
    },
  };
}
