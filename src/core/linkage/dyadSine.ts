/**
 * A dyad's assembly condition as one number, its signed sine: what the analysis of a
 * linkage (sweep.ts) and the synthesis' lock search (lockSearch.ts) both read to find a
 * window where a dyad cannot assemble, or a dead centre it passes, between two samples
 * that assemble. One module, so that the search and its report's analysis read one
 * condition through one screen, each probe placing the joints the sine reads by one rule
 * (placesBeforeOnBranch).
 */
import { DEAD_CENTRE_SIN_TOL } from './tolerances';
import { blockJacobianSign } from './newton';
import { OP_CIRCLE_BODY_LINE, OP_CIRCLE_GROUND_LINE, OP_DYAD, OP_NEWTON, OP_STRIDE, type PlanInternal } from './plan';
import { runPrefix } from './run';

/**
 * A dyad's signed sine at the joint it places, from the positions of the joints it
 * places it from (so also where it fails): for two circles (radii rA, rB, centres d
 * apart) sign(h²) √|h²| d² / (rA rB), h² the kernel's own squared height share, which
 * is |(J − A) × (J − B)| / (rA rB) where J exists and negative where the circles miss;
 * for a circle and a line sign(r² − h²) √|r² − h²| / r, h the centre's distance from
 * the line. Zero at a dead centre; NaN where its centres are not placed. The pose is
 * read from `base`.
 */
export function signedDyadSine(p: PlanInternal, o: number, pose: Float64Array, base: number): number {
  const a = base + p.ops[o + 1];
  const q = p.ops[o + 5];
  const prm = p.params;
  if (p.ops[o] === OP_DYAD) {
    const b = base + p.ops[o + 2];
    const rA = prm[q];
    const rB = prm[q + 1];
    const dx = pose[b] - pose[a];
    const dy = pose[b + 1] - pose[a + 1];
    const d2 = dx * dx + dy * dy;
    const inv = 1 / d2;
    const k = 0.5 * (rA * rA - rB * rB) * inv + 0.5;
    const h2 = rA * rA * inv - k * k;
    return Math.sign(h2) * Math.sqrt(Math.abs(h2)) * d2 / (rA * rB);
  }
  const r = prm[q];
  let px: number;
  let py: number;
  let dx: number;
  let dy: number;
  if (p.ops[o] === OP_CIRCLE_GROUND_LINE) {
    px = prm[q + 2];
    py = prm[q + 3];
    dx = prm[q + 4];
    dy = prm[q + 5];
  } else {
    const e = base + p.ops[o + 2];
    const f = base + p.ops[o + 4];
    const wx = pose[f] - pose[e];
    const wy = pose[f + 1] - pose[e + 1];
    const u = prm[q + 2];
    const v = prm[q + 3];
    px = pose[e] + u * wx - v * wy;
    py = pose[e + 1] + u * wy + v * wx;
    dx = prm[q + 4] * wx - prm[q + 5] * wy;
    dy = prm[q + 4] * wy + prm[q + 5] * wx;
  }
  const h = (dx * (pose[a + 1] - py) - dy * (pose[a] - px)) / Math.sqrt(dx * dx + dy * dy);
  const disc = r * r - h * h;
  return Math.sign(disc) * Math.sqrt(Math.abs(disc)) / r;
}

/** Each Newton block's operation index in the plan, by block number (blocks are numbered in plan order). */
export function blockOperations(p: PlanInternal): Int32Array {
  const ops = new Int32Array(p.blockCount);
  for (let i = 0; i < p.opCount; i++) if (p.ops[i * OP_STRIDE] === OP_NEWTON) ops[p.ops[i * OP_STRIDE + 1]] = i;
  return ops;
}

/**
 * Runs the operations before `endOp` (those a dyad's signed sine reads, where endOp is
 * the dyad's) at driver value `value` on `pose`, from what it holds: true when they all
 * place and every Newton block among them keeps its reference pose's Jacobian sign
 * (`referenceSigns`, by block; `blockOps`: blockOperations), the branch rule of a sweep.
 */
export function placesBeforeOnBranch(
  p: PlanInternal, value: number, pose: Float64Array, endOp: number, blockOps: Int32Array, referenceSigns: Int8Array,
): boolean {
  if (runPrefix(p, value, pose, endOp) >= 0) return false;
  for (let b = 0; b < p.blockCount && blockOps[b] < endOp; b++) {
    if (blockJacobianSign(p, b, pose) !== referenceSigns[b]) return false;
  }
  return true;
}

/** The operations whose joint signedDyadSine reads: two circles, or a circle and a line. */
export function isDyadOp(code: number): boolean {
  return code === OP_DYAD || code === OP_CIRCLE_GROUND_LINE || code === OP_CIRCLE_BODY_LINE;
}

/**
 * A sampled minimum s of a dyad's signed sine is refined only where
 * s − DYAD_REFINE_RISE_FACTOR × r < DEAD_CENTRE_SIN_TOL (a pure number), r the largest
 * change of the sine between neighbour samples within two samples of it, or where
 * s < DYAD_REFINE_NEAR_SINE. Near a dead centre the sine falls to zero about linearly
 * in the driver (V-shaped through a change point, the root of a quadratic about a narrow
 * window), so a sample next to a zero lies within about one step's change of it; the
 * factor leaves room for curvature. Like the sampling itself, this takes the sine to
 * change within a step by not much more than between steps. Refining every minimum would
 * run the plan up to the dyad for each probe: for all the dyads of a long chain, work
 * that grows as the square of its length.
 */
const DYAD_REFINE_RISE_FACTOR = 8;

/** Sampled minima of a dyad's signed sine below this (about 3° from a toggle) are refined whatever their rise. */
const DYAD_REFINE_NEAR_SINE = 0.05;

/**
 * Whether the sampled minimum sine[k] of samples 0 … last is refined (see
 * DYAD_REFINE_RISE_FACTOR); `cyclic`: sample last neighbours sample 0.
 */
export function refinesDyadMinimum(sine: Float64Array, k: number, last: number, cyclic: boolean): boolean {
  return sine[k] < DYAD_REFINE_NEAR_SINE || sine[k] - DYAD_REFINE_RISE_FACTOR * sampledChange(sine, k, last, cyclic) < DEAD_CENTRE_SIN_TOL;
}

/**
 * The largest change of a sampled sine between neighbour samples from k − 2 to k + 2
 * (within samples 0 … last, or round them when `cyclic`): how much it can fall within a
 * step next to sample k. Infinity where one of them is not defined, so that the minimum
 * is refined.
 */
function sampledChange(sine: Float64Array, k: number, last: number, cyclic: boolean): number {
  let change = 0;
  const from = cyclic ? k - 2 : Math.max(k - 2, 0);
  const to = cyclic ? k + 2 : Math.min(k + 2, last);
  const count = last + 1;
  for (let j = from; j < to; j++) {
    const here = cyclic ? (j + count) % count : j;
    const next = cyclic ? (j + 1 + count) % count : j + 1;
    const d = Math.abs(sine[next] - sine[here]);
    if (!(d <= change)) change = Number.isNaN(d) ? Infinity : d;
  }
  return change;
}
