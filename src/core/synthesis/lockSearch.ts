/**
 * Locks along a driver range found from an assembly margin rather than from samples
 * alone: a lock narrower than the sample spacing leaves no failed sample, but the margin
 * falls towards it from both sides, so every sampled local minimum of the margin is
 * refined by Brent's minimisation (Brent, 1973: golden-section steps, Kiefer 1953, and
 * parabolic ones through the three best probes where they are safe) until a probe fails
 * to assemble or the bracket is below LOCK_BRACKET_TOL_RAD: a smooth minimum well clear
 * of a lock takes a few parabolic steps where golden sections alone take thirty.
 * The margin is every joint's at once, and next to a dyad's lock it can fall to zero
 * within a fraction of a degree while its sampled minimum leads the refinement to a
 * shallower dip beside it; so a range the margin finds free is searched again dyad by
 * dyad, from each one's signed sine, by the condition and the screen the analysis of an
 * exported linkage reads (linkage/dyadSine.ts).
 * Allocates nothing after construction.
 */

import { refinesDyadMinimum } from '../linkage/dyadSine';
import { GOLDEN_PROBE_AT, GOLDEN_PROBE_VALUE, goldenSectionMinimum, type DriverProbe } from '../linkage/goldenSection';
import { DEAD_CENTRE_SIN_TOL, SWEEP_REFINE_REL_TOL } from '../linkage/tolerances';

/**
 * A refinement stops when its bracket is narrower than this (rad, 6e-6°): a lock narrower
 * still is below any drive's resolution; at most 31 golden-section steps from a 10° bracket.
 */
export const LOCK_BRACKET_TOL_RAD = 1e-7;
/** Cap on probes per minimum (0.618^80 of a 5° bracket is far below LOCK_BRACKET_TOL_RAD). */
export const LOCK_REFINE_MAX_STEPS = 80;
/** (3 − √5) / 2: the golden section's share of a bracket. */
const GOLDEN_SHARE = 0.5 * (3 - Math.sqrt(5));
/**
 * A refined minimum of the margin below this is a dead centre within tolerance (a change
 * point): the margin (see MarginCurve) is below 1e-6 when the joints move more than a
 * million crank lengths per radian of the driver, which only a toggle pose does.
 */
export const DEAD_CENTRE_MARGIN = 1e-6;

export interface MarginCurve {
  /** The pose `marginAt` left: the one it solved. */
  readonly pose: Float64Array;
  /**
   * The next `marginAt` starts from `pose`, the one solved at driver value t (a copy is
   * taken): a curve that moves its start on from the value it solved last takes it
   * from t, not from the value of the pose it held.
   */
  startFrom(pose: Float64Array, t: number): void;
  /**
   * The assembly margin at driver value `t`: < 0 (or NaN) where the linkage does not
   * assemble; in (0, 1] where it does, falling to 0 at a toggle (dead centre).
   */
  marginAt(t: number): number;
  /**
   * The plan's dyads (linkage/dyadSine.ts), whose windows and dead centres between two
   * samples that assemble the search finds from their signed sines, as the analysis does
   * (sweep.ts); absent where the curve has none to show.
   */
  readonly dyadCount?: number;
  /** Dyad d's signed sine in each of `count` poses at poses[k · stride …], into out[k]. */
  dyadSinesInto?(d: number, poses: Float64Array, stride: number, count: number, out: Float64Array): void;
  /**
   * Dyad d's signed sine at the driver value io[GOLDEN_PROBE_AT], solved from `start`
   * without moving the curve, into io[GOLDEN_PROBE_VALUE] (the golden-section search's
   * probe, goldenSection.ts); −1 where it cannot be placed. The numbers cross in `io`: V8
   * boxes a number passed to or returned from a call it does not inline.
   */
  dyadSineAt?(d: number, io: Float64Array, start: Float64Array): void;
}

/** A curve that shows its dyads to the search (MarginCurve's optional members). */
type DyadCurve = MarginCurve & Required<Pick<MarginCurve, 'dyadCount' | 'dyadSinesInto' | 'dyadSineAt'>>;

function showsDyads(curve: MarginCurve): curve is DyadCurve {
  return curve.dyadCount !== undefined && curve.dyadSinesInto !== undefined && curve.dyadSineAt !== undefined;
}

/** A dyad's signed sine along a curve, each probe solved from one start pose: reused, so a search allocates nothing. */
class DyadSineProbe implements DriverProbe {
  private curve: DyadCurve | undefined;
  private dyad = 0;
  private start: Float64Array = new Float64Array(0);

  aim(curve: DyadCurve, dyad: number, start: Float64Array): void {
    this.curve = curve;
    this.dyad = dyad;
    this.start = start;
  }

  probe(io: Float64Array): void {
    if (this.curve === undefined) throw new Error('a dyad sine probe must be aimed at a curve first');
    this.curve.dyadSineAt(this.dyad, io, this.start);
  }
}

export class LockSearch {
  private readonly stride: number;
  private readonly maxSteps: number;
  private readonly margins: Float64Array;
  private readonly poses: Float64Array;
  private readonly start: Float64Array;
  /** The driver value of `start`'s pose. */
  private startT = NaN;
  /** Each sample's driver value, and the ends of the bracket a minimum there is refined in. */
  private readonly at: Float64Array;
  private readonly below: Float64Array;
  private readonly above: Float64Array;
  /** A dyad's signed sine at each sample (dyadWindows); its golden-section search's probe, and its answer (goldenSection.ts). */
  private readonly sines: Float64Array;
  private readonly dyadSine = new DyadSineProbe();
  private readonly probeIo = new Float64Array(2);
  private readonly found = new Float64Array(2);

  constructor(stride: number, maxSteps: number) {
    this.stride = stride;
    this.maxSteps = maxSteps;
    this.margins = new Float64Array(maxSteps + 1);
    this.at = new Float64Array(maxSteps + 1);
    this.below = new Float64Array(maxSteps + 1);
    this.above = new Float64Array(maxSteps + 1);
    this.sines = new Float64Array(maxSteps + 1);
    this.poses = new Float64Array((maxSteps + 1) * stride);
    this.start = new Float64Array(stride);
  }

  /**
   * The number of locks met driving from `a` to `b` ≥ a, sampled at most `stepRad` apart
   * (capped at maxSteps samples): runs of samples that fail, plus refined minima of the
   * margin that fail or fall below DEAD_CENTRE_MARGIN. `cyclic`: b = a + 2π and the
   * samples close up. The curve starts from the pose it holds and is left to start from the
   * pose of the last sample.
   */
  count(curve: MarginCurve, a: number, b: number, stepRad: number, cyclic: boolean, gridRad = 0): number {
    if (!(b > a)) return 0;
    const last = this.place(a, b, stepRad, cyclic, gridRad);
    const at = this.at;
    const m = this.margins;
    const stride = this.stride;
    for (let k = 0; k <= last; k++) {
      const v = curve.marginAt(at[k]);
      m[k] = v >= 0 ? v : -1;
      this.poses.set(curve.pose, k * stride);
    }
    let locks = 0;
    for (let k = 0; k <= last; k++) {
      const here = m[k];
      const before = k > 0 ? m[k - 1] : cyclic ? m[last] : Infinity;
      const after = k < last ? m[k + 1] : cyclic ? m[0] : Infinity;
      if (here < 0) {
        // A run of failed samples counts once, at its start.
        if (!(before < 0)) locks++;
        continue;
      }
      if (!(here < before && here <= after)) continue;
      if (this.refine(curve, k, this.below[k], this.above[k])) locks++;
    }
    // Every sample failed in a cyclic range: one lock, not a run without a start.
    if (cyclic && locks === 0 && m[0] < 0) locks = 1;
    // A motion free of locks so far: a dyad may still fail, or pass its dead centre,
    // between two samples, where the margin dips too narrowly for its minima to lead
    // there. Each dyad's own assembly condition finds it, as the analysis finds it.
    if (locks === 0) locks = this.dyadWindows(curve, last, cyclic);
    this.copyPose(last, this.start);
    curve.startFrom(this.start, at[last]);
    return locks;
  }

  /**
   * The samples' driver values into `at`, and each one's bracket (the samples on either
   * side, the range's end where there is none) into `below` and `above`; returns the last
   * sample's index. With `gridRad` > 0 the samples are a, the multiples of gridRad
   * strictly inside the range, and b (cyclic: 0 and the multiples below 2π), where the
   * caller's curve has its poses solved already; a range that would take more than
   * maxSteps of them is sampled evenly instead, at most `stepRad` apart.
   */
  private place(a: number, b: number, stepRad: number, cyclic: boolean, gridRad: number): number {
    const at = this.at;
    const below = this.below;
    const above = this.above;
    if (gridRad > 0) {
      at[0] = a;
      let k = 1;
      for (let multiple = Math.floor(a / gridRad) + 1; multiple * gridRad < b; multiple++) {
        // More samples than fit: the range is sampled evenly instead (below).
        if (k > this.maxSteps) break;
        at[k++] = multiple * gridRad;
      }
      const last = cyclic ? k - 1 : k;
      if (k <= this.maxSteps && last >= 1) {
        if (!cyclic) at[last] = b;
        for (let j = 0; j <= last; j++) {
          below[j] = j > 0 ? at[j - 1] : cyclic ? at[last] - (b - a) : a;
          above[j] = j < last ? at[j + 1] : b;
        }
        return last;
      }
    }
    const steps = Math.min(this.maxSteps, Math.max(2, Math.ceil((b - a) / stepRad)));
    const h = (b - a) / steps;
    // Cyclic: samples 0 … steps − 1, the last neighbouring the first; else 0 … steps.
    const last = cyclic ? steps - 1 : steps;
    for (let k = 0; k <= last; k++) {
      at[k] = a + k * h;
      below[k] = k > 0 || cyclic ? a + (k - 1) * h : a;
      above[k] = k < last || cyclic ? a + (k + 1) * h : b;
    }
    return last;
  }

  /**
   * Brent's search for the least margin on [lo, hi] from the pose of sample k; true when
   * it finds a lock (a probe that fails, or a least margin below DEAD_CENTRE_MARGIN).
   * Brent, 1973, "Algorithms for Minimization without Derivatives", ch. 5.
   */
  private refine(curve: MarginCurve, k: number, lo: number, hi: number): boolean {
    this.copyPose(k, this.start);
    this.startT = this.at[k];
    // The bracket ends within 4 tol of the least probe: below LOCK_BRACKET_TOL_RAD.
    const tol = 0.25 * LOCK_BRACKET_TOL_RAD;
    let a = lo;
    let b = hi;
    // x: the least probe; w: the one before; v: the one before that.
    let x = a + GOLDEN_SHARE * (b - a);
    let fx = this.probe(curve, x);
    if (!(fx >= 0)) return true;
    let w = x;
    let v = x;
    let fw = fx;
    let fv = fx;
    let d = 0;
    let e = 0;
    for (let i = 0; i < LOCK_REFINE_MAX_STEPS; i++) {
      const mid = 0.5 * (a + b);
      if (Math.abs(x - mid) <= 2 * tol - 0.5 * (b - a)) break;
      let golden = true;
      if (Math.abs(e) > tol) {
        // The parabola through x, w, v: its vertex at x + p / q.
        const r = (x - w) * (fx - fv);
        let q = (x - v) * (fx - fw);
        let p = (x - v) * q - (x - w) * r;
        q = 2 * (q - r);
        if (q > 0) p = -p;
        else q = -q;
        const before = e;
        e = d;
        // Safe only inside the bracket and shorter than half the step before last.
        if (Math.abs(p) < Math.abs(0.5 * q * before) && p > q * (a - x) && p < q * (b - x)) {
          d = p / q;
          const u = x + d;
          if (u - a < 2 * tol || b - u < 2 * tol) d = mid >= x ? tol : -tol;
          golden = false;
        }
      }
      if (golden) {
        e = x >= mid ? a - x : b - x;
        d = GOLDEN_SHARE * e;
      }
      const u = Math.abs(d) >= tol ? x + d : x + (d >= 0 ? tol : -tol);
      const fu = this.probe(curve, u);
      if (!(fu >= 0)) return true;
      if (fu <= fx) {
        if (u >= x) a = x;
        else b = x;
        v = w;
        fv = fw;
        w = x;
        fw = fx;
        x = u;
        fx = fu;
      } else {
        if (u < x) a = u;
        else b = u;
        if (fu <= fw || w === x) {
          v = w;
          fv = fw;
          w = u;
          fw = fu;
        } else if (fu <= fv || v === x || v === w) {
          v = u;
          fv = fu;
        }
      }
    }
    return !(fx >= DEAD_CENTRE_MARGIN);
  }

  /**
   * Windows where a dyad cannot assemble, and dead centres it passes, between samples
   * 0 … last (all assembled): each dyad's sampled minima of its signed sine that
   * refinesDyadMinimum lets through are refined by the analysis' golden-section search
   * (goldenSection.ts) to SWEEP_REFINE_REL_TOL of a sample step, as it refines them (sweep.ts);
   * each least sine below DEAD_CENTRE_SIN_TOL inside the range counts as a lock.
   */
  private dyadWindows(curve: MarginCurve, last: number, cyclic: boolean): number {
    if (!showsDyads(curve) || last < 1) return 0;
    const at = this.at;
    const sine = this.sines;
    const stride = this.stride;
    let locks = 0;
    for (let d = 0; d < curve.dyadCount; d++) {
      curve.dyadSinesInto(d, this.poses, stride, last + 1, sine);
      for (let k = 0; k <= last; k++) {
        const before = k > 0 ? sine[k - 1] : cyclic ? sine[last] : Infinity;
        const after = k < last ? sine[k + 1] : cyclic ? sine[0] : Infinity;
        if (!(sine[k] < before && sine[k] <= after)) continue;
        if (!refinesDyadMinimum(sine, k, last, cyclic)) continue;
        const lo = this.below[k];
        const hi = this.above[k];
        const tol = SWEEP_REFINE_REL_TOL * Math.max(at[k] - lo, hi - at[k]);
        this.copyPose(k, this.start);
        this.dyadSine.aim(curve, d, this.start);
        goldenSectionMinimum(this.dyadSine, lo, hi, tol, this.probeIo, this.found);
        // A minimum at an end of the range is not passed within it.
        const where = this.found[GOLDEN_PROBE_AT];
        if (!cyclic && (Math.abs(where - at[0]) <= tol || Math.abs(where - at[last]) <= tol)) continue;
        if (this.found[GOLDEN_PROBE_VALUE] < DEAD_CENTRE_SIN_TOL) locks++;
      }
    }
    return locks;
  }

  /** Copies the pose of sample k into `out` (a loop: a subarray would allocate). */
  private copyPose(k: number, out: Float64Array): void {
    const o = k * this.stride;
    for (let i = 0; i < this.stride; i++) out[i] = this.poses[o + i];
  }

  private probe(curve: MarginCurve, t: number): number {
    curve.startFrom(this.start, this.startT);
    return curve.marginAt(t);
  }
}

/** Layout of fourBarLockArcs' output: per arc its centre and half-width in crank angle from the ground line (rad); half-width < 0 when there is none. */
export const LOCK_ARC_CENTRE_NEAR = 0;
export const LOCK_ARC_HALF_NEAR = 1;
export const LOCK_ARC_CENTRE_FAR = 2;
export const LOCK_ARC_HALF_FAR = 3;
/** Slot 4: the crank's angle from the ground line in the reference pose (rad). */
export const LOCK_ARC_CRANK_AT = 4;
export const LOCK_ARC_LENGTH = 5;

/**
 * Where a four-bar's crank cannot go, in closed form: with ground g = |B0 − A0|, crank
 * r = |A − A0|, coupler b = |B − A| and rocker c = |B − B0| (offsets of x, y in `pose`),
 * the pin A is d from B0, d² = g² + r² − 2gr cos ψ (law of cosines, ψ the crank's angle
 * from A0 → B0), and the dyad A–B–B0 closes only while |b − c| ≤ d ≤ b + c. The crank
 * locks where coupler and rocker line up: cos ψ = (g² + r² − (b − c)²) / 2gr (folded,
 * near ψ = 0) or (g² + r² − (b + c)²) / 2gr (stretched, near ψ = π). Writes the two
 * arcs of ψ that do not assemble (closed, edges included: a dead centre is a lock) and
 * the reference ψ, in LOCK_ARC_* layout.
 */
export function fourBarLockArcs(pose: Float64Array, a0: number, a: number, b: number, b0: number, out: Float64Array): void {
  const gx = pose[b0] - pose[a0];
  const gy = pose[b0 + 1] - pose[a0 + 1];
  const rx = pose[a] - pose[a0];
  const ry = pose[a + 1] - pose[a0 + 1];
  const cx = pose[b] - pose[a];
  const cy = pose[b + 1] - pose[a + 1];
  const ox = pose[b] - pose[b0];
  const oy = pose[b + 1] - pose[b0 + 1];
  const g2 = gx * gx + gy * gy;
  const r2 = rx * rx + ry * ry;
  const coupler = Math.sqrt(cx * cx + cy * cy);
  const rocker = Math.sqrt(ox * ox + oy * oy);
  const twoGr = 2 * Math.sqrt(g2 * r2);
  const folded = (g2 + r2 - (coupler - rocker) * (coupler - rocker)) / twoGr;
  const stretched = (g2 + r2 - (coupler + rocker) * (coupler + rocker)) / twoGr;
  out[LOCK_ARC_CENTRE_NEAR] = 0;
  // cos ψ ≥ folded fails: |ψ| ≤ acos(folded); none when folded > 1. A crank or ground
  // of no length (±∞ or NaN here): d is constant, so a motion that assembled has no lock.
  out[LOCK_ARC_HALF_NEAR] = folded <= 1 ? Math.acos(Math.max(-1, folded)) : -1;
  out[LOCK_ARC_CENTRE_FAR] = Math.PI;
  // cos ψ ≤ stretched fails: |ψ − π| ≤ π − acos(stretched).
  out[LOCK_ARC_HALF_FAR] = stretched >= -1 ? Math.PI - Math.acos(Math.min(1, stretched)) : -1;
  out[LOCK_ARC_CRANK_AT] = Math.atan2(gx * ry - gy * rx, gx * rx + gy * ry);
}

/**
 * The locks a four-bar's crank meets over driver spans (from, to) spans[2i], spans[2i + 1]
 * (rotations from the reference pose, rad): the copies (every turn) of the arcs of
 * `arcs` (fourBarLockArcs) that touch each span, summed over the spans. A span starting
 * or ending inside an arc meets that lock too.
 */
export function fourBarLockCount(arcs: Float64Array, spans: Float64Array, count: number): number {
  const turn = 2 * Math.PI;
  const at = arcs[LOCK_ARC_CRANK_AT];
  let locks = 0;
  for (let i = 0; i < count; i++) {
    const lo = at + spans[2 * i];
    const hi = at + spans[2 * i + 1];
    if (!(hi >= lo)) continue;
    for (let q = 0; q < 4; q += 2) {
      const half = arcs[q + 1];
      if (!(half >= 0)) continue;
      const centre = arcs[q];
      // Copies k with centre + k·turn − half ≤ hi and centre + k·turn + half ≥ lo.
      const first = Math.ceil((lo - half - centre) / turn);
      const last = Math.floor((hi + half - centre) / turn);
      if (last >= first) locks += last - first + 1;
    }
  }
  return locks;
}
