/**
 * Timing solvers: which driver value goes with which target point.
 *
 * - `matchInOrder`: dynamic programming over the samples of the output curve, each
 *   target point matched to a sample, the sample indices non-decreasing in target
 *   order (cyclically when the curve is a closed loop); O(n·M) per pass, cyclic starts
 *   abandoned by a lower bound once they cannot win, and blocks of samples a point
 *   cannot take on a winning match skipped unevaluated (branch and bound, Land and
 *   Doig, 1960) — the answer, ties included, that of the plain programme; optionally no
 *   two consecutive points on either side of a sample where the mechanism does not assemble;
 * - `refineDriverValue`: safeguarded Newton steps on the continuous curve, so the
 *   reported error is the error at a genuine driver value, not at a sample;
 * - `orderViolation`: how far a list of driver values is from increasing.
 */

import {
  CURVE_DDX as CURVE_DDX_BINDING,
  CURVE_DDY as CURVE_DDY_BINDING,
  CURVE_DX as CURVE_DX_BINDING,
  CURVE_DY as CURVE_DY_BINDING,
  CURVE_T as CURVE_T_BINDING,
  CURVE_X as CURVE_X_BINDING,
  CURVE_Y as CURVE_Y_BINDING,
  type CurveEvaluator,
} from './curve';

// Imported constants as locals: a module transform (tsx, vitest) may turn each read of an
// imported binding into a getter call, which the hot loops below cannot afford.
const CURVE_DDX = CURVE_DDX_BINDING;
const CURVE_DDY = CURVE_DDY_BINDING;
const CURVE_DX = CURVE_DX_BINDING;
const CURVE_DY = CURVE_DY_BINDING;
const CURVE_T = CURVE_T_BINDING;
const CURVE_X = CURVE_X_BINDING;
const CURVE_Y = CURVE_Y_BINDING;

/** Below this step (rad or mm of driver value) Newton has converged. */
export const DRIVER_STEP_TOLERANCE = 1e-13;
/**
 * Candidate starts tried for a cyclic match: the cheapest local minima of the first
 * point's distance along the loop, up to this many. A six-bar's coupler curve can pass
 * near one point several times, and fewer starts missed the best one often enough to
 * cost the closed unprescribed cases their reach (bench/README.md, Reach); a start that
 * cannot win is abandoned early by its bound, so more starts cost little.
 */
export const CYCLIC_START_CANDIDATES = 8;
/**
 * Relative margin on the lower bound that abandons a pass: the bound adds the same
 * non-negative terms as the pass, in another order, so it may round up by a few ulps
 * per point; this margin covers that many times over for any target the problem allows.
 */
const BOUND_ROUNDING_MARGIN = 1e-10;
/** Samples per block of the cyclic match's bounds: each block is bounded by a circle. */
export const MATCH_BLOCK = 16;
/**
 * A block's bounding radius is enlarged by this share and this length (mm), so the
 * distance bound it gives stays below every sample's distance despite rounding.
 */
const BLOCK_RADIUS_SHARE = 1e-9;
const BLOCK_RADIUS_MM = 1e-9;

export interface MatchScratch {
  readonly pointCount: number;
  readonly sampleCount: number;
  /**
   * Point 0's weighted squared distance to each sample; Infinity where it does not
   * assemble. A pass computes the other points' as it needs them.
   */
  readonly cost: Float64Array;
  readonly previous: Float64Array;
  readonly argPrevious: Int32Array;
  readonly unrolled: Int32Array;
  readonly starts: Int32Array;
  readonly startCost: Float64Array;
  /** The starts by ascending cost. */
  readonly order: Int32Array;
  /** Sample blocks (MATCH_BLOCK samples each): centre x, y and radius; NaN radius when none assembles. */
  readonly blockCircle: Float64Array;
  /**
   * Per sample block (a cyclic match's, fillBounds), 1 where a sample of it does not
   * assemble: a barrier where the match honours them (matchInOrder).
   */
  readonly blockBroken: Uint8Array;
  /** Lower bound on point i's cost in block b at [i·blocks + b]. */
  readonly blockBound: Float64Array;
  /** A pass's runs of indices within one block: first index of each run, and its block. */
  readonly runStart: Int32Array;
  readonly runBlock: Int32Array;
  /** Per run, 1 where the row in force skipped it (its sums are not written: Infinity). */
  readonly skipped: Uint8Array;
  /** Per run of the row in force: its least partial sum and the first index holding it. */
  readonly runLeast: Float64Array;
  readonly runLeastAt: Int32Array;
  /**
   * A pass's lower bound on the cost of points i … n − 1 matched in order at or after
   * its run q (boundedPass), at [i·(runs + 1) + q]: the least sum of their block bounds
   * over every in-order assignment of them to runs q, q + 1, …; Infinity past the last.
   */
  readonly after: Float64Array;
}

export function createMatchScratch(pointCount: number, sampleCount: number): MatchScratch {
  return {
    pointCount,
    sampleCount,
    cost: new Float64Array(sampleCount),
    previous: new Float64Array(sampleCount),
    argPrevious: new Int32Array(pointCount * sampleCount),
    unrolled: new Int32Array(pointCount),
    starts: new Int32Array(CYCLIC_START_CANDIDATES),
    startCost: new Float64Array(CYCLIC_START_CANDIDATES),
    order: new Int32Array(CYCLIC_START_CANDIDATES),
    blockCircle: new Float64Array(3 * blockCount(sampleCount)),
    blockBroken: new Uint8Array(blockCount(sampleCount)),
    blockBound: new Float64Array(pointCount * blockCount(sampleCount)),
    runStart: new Int32Array(blockCount(sampleCount) + 2),
    runBlock: new Int32Array(blockCount(sampleCount) + 2),
    skipped: new Uint8Array(blockCount(sampleCount) + 2),
    runLeast: new Float64Array(blockCount(sampleCount) + 2),
    runLeastAt: new Int32Array(blockCount(sampleCount) + 2),
    after: new Float64Array((pointCount + 1) * (blockCount(sampleCount) + 3)),
  };
}

function blockCount(sampleCount: number): number {
  return Math.ceil(sampleCount / MATCH_BLOCK);
}

/**
 * Point 0's cost at each sample (the starts and passes read it), each sample block's
 * bounding circle and whether a sample of it does not assemble, and each later point's
 * least cost in each block from below (the distance to the circle).
 */
function fillBounds(samples: Float64Array, valid: Uint8Array, targets: Float64Array, weights: Float64Array | undefined, s: MatchScratch): void {
  const m = s.sampleCount;
  const n = s.pointCount;
  const blocks = blockCount(m);
  const cost = s.cost;
  const circle = s.blockCircle;
  const broken = s.blockBroken;
  const bounds = s.blockBound;
  const qx0 = targets[0];
  const qy0 = targets[1];
  const w0 = weights === undefined ? 1 : weights[0];
  for (let j = 0; j < m; j++) {
    if (valid[j] === 0) {
      cost[j] = Infinity;
    } else {
      const dx = samples[2 * j] - qx0;
      const dy = samples[2 * j + 1] - qy0;
      cost[j] = w0 * (dx * dx + dy * dy);
    }
  }
  for (let b = 0; b < blocks; b++) {
    const from = b * MATCH_BLOCK;
    const to = Math.min(m, from + MATCH_BLOCK);
    let xLo = Infinity;
    let xHi = -Infinity;
    let yLo = Infinity;
    let yHi = -Infinity;
    broken[b] = 0;
    for (let j = from; j < to; j++) {
      if (valid[j] === 0) {
        broken[b] = 1;
        continue;
      }
      const x = samples[2 * j];
      const y = samples[2 * j + 1];
      if (x < xLo) xLo = x;
      if (x > xHi) xHi = x;
      if (y < yLo) yLo = y;
      if (y > yHi) yHi = y;
    }
    const cx = 0.5 * (xLo + xHi);
    const cy = 0.5 * (yLo + yHi);
    let r2 = -1;
    for (let j = from; j < to; j++) {
      if (valid[j] === 0) continue;
      const dx = samples[2 * j] - cx;
      const dy = samples[2 * j + 1] - cy;
      const d2 = dx * dx + dy * dy;
      if (d2 > r2) r2 = d2;
    }
    circle[3 * b] = cx;
    circle[3 * b + 1] = cy;
    // No sample assembles (or none is finite): NaN, no bound but Infinity.
    circle[3 * b + 2] = r2 >= 0 ? Math.sqrt(r2) * (1 + BLOCK_RADIUS_SHARE) + BLOCK_RADIUS_MM : NaN;
  }
  for (let i = 1; i < n; i++) {
    const qx = targets[2 * i];
    const qy = targets[2 * i + 1];
    const w = weights === undefined ? 1 : weights[i];
    const row = i * blocks;
    for (let b = 0; b < blocks; b++) {
      const r = circle[3 * b + 2];
      let bound = Infinity;
      if (r >= 0) {
        const dx = qx - circle[3 * b];
        const dy = qy - circle[3 * b + 1];
        const gap = Math.sqrt(dx * dx + dy * dy) - r;
        bound = gap > 0 ? w * gap * gap : 0;
      }
      bounds[row + b] = bound;
    }
  }
}

/**
 * The in-order programme of one pass, point 0 at pass index 0 … `firstSpan` (pass
 * index u at sample first + u, round the loop), each later point at an index at least
 * the one before, at most M − 1; costs computed as needed: the indices are taken in
 * runs that each lie in one sample block, and a run whose cells cannot lie on a match
 * of total ≤ `threshold` (the least partial sum before it plus the block's bound plus
 * the bound on the later points matched in order after it, MatchScratch.after, is above
 * it) is skipped unevaluated, and the pass is abandoned once every match through a row
 * is bounded above it. A cell that can is computed as in the plain pass, from the same
 * partial sums, so the answer is the same whenever it is ≤ threshold; otherwise the
 * pass loses anyway. Returns the pass's least total where it beats `bound` (or ties it,
 * with `tieWins`), its match in scratch.unrolled; Infinity otherwise. `barriers`: the
 * samples that do not assemble part the points (blockBroken marks their blocks).
 */
function boundedPass(
  samples: Float64Array,
  valid: Uint8Array,
  targets: Float64Array,
  weights: Float64Array | undefined,
  first: number,
  firstSpan: number,
  bound: number,
  tieWins: boolean,
  threshold: number,
  s: MatchScratch,
  barriers: boolean,
): number {
  const m = s.sampleCount;
  const n = s.pointCount;
  const blocks = blockCount(m);
  const blockBroken = s.blockBroken;
  const cost = s.cost;
  const bounds = s.blockBound;
  const sums = s.previous;
  const arg = s.argPrevious;
  const runStart = s.runStart;
  const runBlock = s.runBlock;
  const skipped = s.skipped;
  const runLeast = s.runLeast;
  const runLeastAt = s.runLeastAt;
  // Runs: a new one where the sample index reaches a block's first (0 included).
  let runs = 0;
  for (let u = 0, j = first; u < m; u++, j++) {
    if (j === m) j = 0;
    if (u === 0 || j % MATCH_BLOCK === 0) {
      runStart[runs] = u;
      runBlock[runs] = Math.floor(j / MATCH_BLOCK);
      runs++;
    }
  }
  runStart[runs] = m;
  const split = m - first;
  // Point 0's costs in the pass's first window.
  let least0 = Infinity;
  for (let q = 0; q < runs; q++) {
    const from = runStart[q];
    const to = runStart[q + 1];
    skipped[q] = from > firstSpan ? 1 : 0;
    if (from > firstSpan) continue;
    let least = Infinity;
    let leastAt = from;
    for (let u = from; u < to; u++) {
      const v = u <= firstSpan ? cost[u < split ? first + u : u - split] : Infinity;
      sums[u] = v;
      if (v < least) {
        least = v;
        leastAt = u;
      }
    }
    runLeast[q] = least;
    runLeastAt[q] = leastAt;
    if (least < least0) least0 = least;
  }
  // Every match of the pass costs at least point 0's least: a start that cannot win on
  // that alone (most, once a good match bounds the rest) is abandoned before the bound below.
  const lower0 = least0 * (1 - BOUND_ROUNDING_MARGIN);
  if (tieWins ? lower0 > bound : lower0 >= bound) return Infinity;
  if (lower0 > threshold) return Infinity;
  // The in-order bound on the points after each row (MatchScratch.after), for this pass's runs.
  const width = runs + 1;
  const after = s.after;
  for (let q = 0; q <= runs; q++) after[n * width + q] = 0;
  for (let i = n - 1; i >= 1; i--) {
    const row = i * width;
    const boundRow = i * blocks;
    after[row + runs] = Infinity;
    for (let q = runs - 1; q >= 0; q--) {
      const here = bounds[boundRow + runBlock[q]] + after[row + width + q];
      const later = after[row + q + 1];
      after[row + q] = here < later ? here : later;
    }
  }
  // The least total of a match through each row's cells: its least partial sum in a run plus the bound after it.
  let rowLower = Infinity;
  for (let q = 0; q < runs; q++) {
    if (skipped[q] === 0) {
      const total = runLeast[q] + after[width + q];
      if (total < rowLower) rowLower = total;
    }
  }
  for (let i = 1; i < n; i++) {
    // Every match of this pass adds at least rowLower (its rounding aside).
    const lower = rowLower * (1 - BOUND_ROUNDING_MARGIN);
    if (tieWins ? lower > bound : lower >= bound) return Infinity;
    if (lower > threshold) return Infinity;
    rowLower = Infinity;
    const row = i * m;
    const boundRow = i * blocks;
    const afterNext = (i + 1) * width;
    const qx = targets[2 * i];
    const qy = targets[2 * i + 1];
    const w = weights === undefined ? 1 : weights[i];
    let best = Infinity;
    let bestU = 0;
    for (let q = 0; q < runs; q++) {
      const from = runStart[q];
      const to = runStart[q + 1];
      const before = skipped[q] === 1;
      // A run with a barrier (see matchInOrder) is never skipped: past its barrier the
      // least partial sum is not the run's least.
      const barrierRun = barriers && blockBroken[runBlock[q]] === 1;
      // The least partial sum up to the run's end: the run's own least, kept when it was
      // written (its first index, as a scan keeping strict improvements would find).
      let runBest = best;
      let runBestU = bestU;
      if (!before && runLeast[q] < runBest) {
        runBest = runLeast[q];
        runBestU = runLeastAt[q];
      }
      // A match through a cell of the run: at least the least partial sum up to the run's
      // end, plus the block's bound, plus the bound on the later points in order after it.
      const lower = (runBest + bounds[boundRow + runBlock[q]] + after[afterNext + q]) * (1 - BOUND_ROUNDING_MARGIN);
      if (lower > threshold && !barrierRun) {
        skipped[q] = 1;
        best = runBest;
        bestU = runBestU;
        continue;
      }
      skipped[q] = 0;
      let least = Infinity;
      let leastAt = from;
      let j = from < split ? first + from : from - split;
      // Four loops, not tests per cell: a run the row before skipped holds no sums to
      // read, and a run whose samples all assemble (the common case) needs no test of
      // them; the same arithmetic in each.
      if (blockBroken[runBlock[q]] === 0) {
        if (before) {
          for (let u = from; u < to; u++, j++) {
            arg[row + u] = bestU;
            const dx = samples[2 * j] - qx;
            const dy = samples[2 * j + 1] - qy;
            const v = best + w * (dx * dx + dy * dy);
            sums[u] = v;
            if (v < least) {
              least = v;
              leastAt = u;
            }
          }
        } else {
          for (let u = from; u < to; u++, j++) {
            const here = sums[u];
            if (here < best) {
              best = here;
              bestU = u;
            }
            arg[row + u] = bestU;
            const dx = samples[2 * j] - qx;
            const dy = samples[2 * j + 1] - qy;
            const v = best + w * (dx * dx + dy * dy);
            sums[u] = v;
            if (v < least) {
              least = v;
              leastAt = u;
            }
          }
        }
      } else if (before) {
        for (let u = from; u < to; u++, j++) {
          if (barrierRun && valid[j] === 0) best = Infinity;
          arg[row + u] = bestU;
          let c = Infinity;
          if (valid[j] !== 0) {
            const dx = samples[2 * j] - qx;
            const dy = samples[2 * j + 1] - qy;
            c = w * (dx * dx + dy * dy);
          }
          const v = best + c;
          sums[u] = v;
          if (v < least) {
            least = v;
            leastAt = u;
          }
        }
      } else {
        for (let u = from; u < to; u++, j++) {
          const here = sums[u];
          if (barrierRun && valid[j] === 0) best = Infinity;
          else if (here < best) {
            best = here;
            bestU = u;
          }
          arg[row + u] = bestU;
          let c = Infinity;
          if (valid[j] !== 0) {
            const dx = samples[2 * j] - qx;
            const dy = samples[2 * j + 1] - qy;
            c = w * (dx * dx + dy * dy);
          }
          const v = best + c;
          sums[u] = v;
          if (v < least) {
            least = v;
            leastAt = u;
          }
        }
      }
      runLeast[q] = least;
      runLeastAt[q] = leastAt;
      const total = least + after[afterNext + q];
      if (total < rowLower) rowLower = total;
    }
  }
  let best = Infinity;
  let bestU = 0;
  for (let q = 0; q < runs; q++) {
    if (skipped[q] === 0 && runLeast[q] < best) {
      best = runLeast[q];
      bestU = runLeastAt[q];
    }
  }
  return unrollBest(s, best, bestU, bound, tieWins);
}

/**
 * A pass's end: its least total `best` (ending at unrolled sample `bestU`) if it beats
 * `bound` (or ties it when `tieWins`), the match unrolled into `s.unrolled` from the
 * pass's back-pointers; Infinity otherwise.
 */
function unrollBest(s: MatchScratch, best: number, bestU: number, bound: number, tieWins: boolean): number {
  if (!(best < Infinity) || (tieWins ? best > bound : best >= bound)) return Infinity;
  const n = s.pointCount;
  const m = s.sampleCount;
  const arg = s.argPrevious;
  const unrolled = s.unrolled;
  unrolled[n - 1] = bestU;
  for (let i = n - 1; i > 0; i--) unrolled[i - 1] = arg[i * m + unrolled[i]];
  return best;
}

/**
 * An upper bound on the answer from `hint` (unrolled indices): for each start's pass, the
 * hint moved into what that pass can find (hintCostInPass), the least of their costs;
 * Infinity where the hint is not in order. Each is a match its pass may find, so the
 * answer is at most this. Moved, not refused: a closed target's match spans nearly the
 * whole loop, so a hint fits a pass as it is only where its first point sits early in the
 * window, which an alignment's seldom does.
 */
function hintCeiling(
  samples: Float64Array,
  valid: Uint8Array,
  targets: Float64Array,
  weights: Float64Array | undefined,
  hint: Int32Array,
  found: number,
  half: number,
  s: MatchScratch,
  barriers: boolean,
): number {
  const m = s.sampleCount;
  if (!inOrder(hint, s.pointCount)) return Infinity;
  let ceiling = Infinity;
  for (let k = 0; k < found; k++) {
    const first = (s.starts[k] - half + m) % m;
    const cost = hintCostInPass(samples, valid, targets, weights, hint, first, 2 * half, true, s, barriers, ceiling);
    if (cost < ceiling) ceiling = cost;
  }
  return ceiling;
}

/** The first n of `hint`'s indices never decrease, as a match's do not. */
function inOrder(hint: Int32Array, n: number): boolean {
  for (let i = 1; i < n; i++) if (!(hint[i] >= hint[i - 1])) return false;
  return true;
}

/**
 * The cost of `hint` (unrolled indices, in order) moved into what one pass can find, its
 * index 0 at sample `first`: point 0 into [0, span], every index at most M − 1 past
 * `first`, each at least the one before; with `cyclic`, the hint's first index taken the
 * nearer way round the loop. Infinity where the moved match meets a sample that does not
 * assemble (or, with barriers, passes one); at least `ceiling` where its sum reaches it
 * (the sum stops there).
 */
function hintCostInPass(
  samples: Float64Array,
  valid: Uint8Array,
  targets: Float64Array,
  weights: Float64Array | undefined,
  hint: Int32Array,
  first: number,
  span: number,
  cyclic: boolean,
  s: MatchScratch,
  barriers: boolean,
  ceiling: number,
): number {
  const m = s.sampleCount;
  const n = s.pointCount;
  let v0 = hint[0] - first;
  if (cyclic) {
    v0 = ((v0 % m) + m) % m;
    if (v0 > m >> 1) v0 -= m;
  }
  let sum = 0;
  let previous = 0;
  for (let i = 0; i < n && sum < ceiling; i++) {
    let w = v0 + (hint[i] - hint[0]);
    if (i === 0) w = w < 0 ? 0 : w > span ? span : w;
    else if (w < previous) w = previous;
    if (w > m - 1) w = m - 1;
    // No sample that does not assemble between two points (see matchInOrder).
    for (let u = previous + 1; barriers && i > 0 && u < w; u++) if (valid[(first + u) % m] === 0) sum = Infinity;
    const j = (first + w) % m;
    if (valid[j] === 0) {
      sum = Infinity;
    } else {
      const dx = samples[2 * j] - targets[2 * i];
      const dy = samples[2 * j + 1] - targets[2 * i + 1];
      sum += (weights === undefined ? 1 : weights[i]) * (dx * dx + dy * dy);
    }
    previous = w;
  }
  return sum;
}

/**
 * Match target points (x0, y0, x1, y1, …) to curve samples in order. `samples` holds
 * `M` points (2M numbers) at equally spaced driver values; `valid[j]` is 1 where the
 * mechanism assembles. Non-cyclic: the indices are non-decreasing in 0..M-1. Cyclic:
 * the samples form a closed loop and the indices may pass once through M − 1 → 0;
 * tried from the few best local minima of the first point's distance, each start
 * abandoned once it cannot beat the best before it. With `barriers`, a sample that does
 * not assemble is a barrier: no point is matched before it and the next after it, since
 * the driver cannot turn through a value where the mechanism does not assemble (the
 * motion between the two would lock there). An open path's match honours them; a closed
 * path's need not (its motion is a whole turn, which any such sample locks).
 *
 * Writes into `outIndex` an unrolled index per point (non-decreasing; in a cyclic
 * match it may be negative or ≥ M: the driver value is start + index · step either
 * way). Returns the weighted sum of squared distances at the samples (Infinity when
 * no sample assembles).
 *
 * `hint` (optional): unrolled indices of a match believed near the answer, such as the
 * last one of an alternation or an alignment's; moved into what each pass can find
 * (hintCeiling, hintCostInPass), its cost bounds the answer from above and lets every
 * pass skip more. The answer does not depend on it.
 */
export function matchInOrder(
  samples: Float64Array,
  valid: Uint8Array,
  targets: Float64Array,
  weights: Float64Array | undefined,
  cyclic: boolean,
  barriers: boolean,
  scratch: MatchScratch,
  outIndex: Int32Array,
  hint?: Int32Array,
): number {
  const m = scratch.sampleCount;
  const n = scratch.pointCount;
  // Barriers to honour: some sample does not assemble.
  let barred = false;
  for (let j = 0; barriers && j < m && !barred; j++) barred = valid[j] === 0;
  fillBounds(samples, valid, targets, weights, scratch);
  if (!cyclic) {
    // One pass, point 0 anywhere on the curve; the hint, in order and moved onto the curve, bounds it.
    const ceiling = hint !== undefined && inOrder(hint, n) ? hintCostInPass(samples, valid, targets, weights, hint, 0, m - 1, false, scratch, barred, Infinity) : Infinity;
    const total = boundedPass(samples, valid, targets, weights, 0, m - 1, Infinity, true, ceiling, scratch, barred);
    for (let i = 0; i < n; i++) outIndex[i] = total < Infinity ? scratch.unrolled[i] : 0;
    return total;
  }
  const cost = scratch.cost;
  // Local minima of the first point's distance along the loop: where the match starts.
  const starts = scratch.starts;
  const startCost = scratch.startCost;
  let found = 0;
  for (let j = 0; j < m; j++) {
    const c = cost[j];
    if (!(c < Infinity)) continue;
    const before = cost[j === 0 ? m - 1 : j - 1];
    const after = cost[j === m - 1 ? 0 : j + 1];
    if (!(c <= before && c < after)) continue;
    if (found < starts.length) {
      starts[found] = j;
      startCost[found] = c;
      found++;
    } else {
      let worst = 0;
      for (let k = 1; k < found; k++) if (startCost[k] > startCost[worst]) worst = k;
      if (c < startCost[worst]) {
        starts[worst] = j;
        startCost[worst] = c;
      }
    }
  }
  if (found === 0) {
    // No interior minimum (a constant or invalid curve): start anywhere.
    starts[0] = 0;
    found = 1;
  }
  // Point 0 may sit a little before or after its minimum: a window of ±M/16 samples.
  const half = Math.max(1, Math.floor(m / 16));
  // The cheapest start first, so its total abandons the others early. The answer is
  // the least total, a tie going to the lower slot of `starts` (the order tried before).
  const order = scratch.order;
  for (let k = 0; k < found; k++) {
    let q = k;
    while (q > 0 && startCost[order[q - 1]] > startCost[k]) {
      order[q] = order[q - 1];
      q--;
    }
    order[q] = k;
  }
  const ceiling = hint === undefined ? Infinity : hintCeiling(samples, valid, targets, weights, hint, found, half, scratch, barred);
  let best = Infinity;
  let chosen = found;
  for (let r = 0; r < found; r++) {
    const k = order[r];
    const first = (starts[k] - half + m) % m;
    const total = boundedPass(samples, valid, targets, weights, first, 2 * half, best, k < chosen, Math.min(best, ceiling), scratch, barred);
    if (total < best || (total === best && k < chosen)) {
      best = total;
      chosen = k;
      const base = starts[k] - half;
      // A pass with no finite cost leaves every point at its first sample, as its backtrack would.
      for (let i = 0; i < n; i++) outIndex[i] = base + (total < Infinity ? scratch.unrolled[i] : 0);
    }
  }
  return best;
}

/** Layout of the `io` array of refineDriverValue. */
export const REFINE_T = 0;
export const REFINE_QX = 1;
export const REFINE_QY = 2;
export const REFINE_LO = 3;
export const REFINE_HI = 4;
export const REFINE_MAX_STEP = 5;
export const REFINE_IO_LENGTH = 6;

/**
 * Safeguarded Newton on f(t) = |P(t) − Q|² from t = io[REFINE_T], kept inside
 * [io[REFINE_LO], io[REFINE_HI]]: the step uses f'' with the curvature term when the
 * curve provides it and that term leaves f'' clearly positive, else the Gauss–Newton
 * value 2|P'|² (always downhill); steps are capped at io[REFINE_MAX_STEP], and a step
 * that raises f is halved (at most 4 times). Writes the refined value to io[REFINE_T].
 * Numbers cross through `io` because a double passed to a call that is not inlined is
 * boxed. `buf` is the curve's io (CURVE_OUT_LENGTH).
 */
export function refineDriverValue(curve: CurveEvaluator, io: Float64Array, maxIterations: number, buf: Float64Array): void {
  let t = io[REFINE_T];
  const qx = io[REFINE_QX];
  const qy = io[REFINE_QY];
  const lo = io[REFINE_LO];
  const hi = io[REFINE_HI];
  const maxStep = io[REFINE_MAX_STEP];
  const order = curve.secondDerivatives ? 2 : 1;
  buf[CURVE_T] = t;
  curve.atIo(order, buf);
  let ex = buf[CURVE_X] - qx;
  let ey = buf[CURVE_Y] - qy;
  let f = ex * ex + ey * ey;
  for (let it = 0; it < maxIterations; it++) {
    const px = buf[CURVE_DX];
    const py = buf[CURVE_DY];
    const gaussNewton = px * px + py * py;
    const g = ex * px + ey * py;
    let h = gaussNewton;
    if (order === 2) {
      const full = gaussNewton + ex * buf[CURVE_DDX] + ey * buf[CURVE_DDY];
      if (full > 0.1 * gaussNewton) h = full;
    }
    if (!(h > 0)) break;
    let step = -g / h;
    if (!(step <= maxStep)) step = step > maxStep ? maxStep : 0;
    if (step < -maxStep) step = -maxStep;
    let accepted = false;
    for (let halving = 0; halving < 5; halving++) {
      let next = t + step;
      if (next < lo) next = lo;
      if (next > hi) next = hi;
      if (!(Math.abs(next - t) > DRIVER_STEP_TOLERANCE)) break;
      buf[CURVE_T] = next;
      curve.atIo(order, buf);
      const nx = buf[CURVE_X] - qx;
      const ny = buf[CURVE_Y] - qy;
      const fn = nx * nx + ny * ny;
      if (fn <= f) {
        t = next;
        ex = nx;
        ey = ny;
        f = fn;
        accepted = true;
        break;
      }
      step *= 0.5;
    }
    if (!accepted) break;
  }
  io[REFINE_T] = t;
}

/**
 * How far driver values `values[offset .. offset + n)` are from increasing, as a share
 * of `period`, into `out[index]` (a double returned from a call that is not inlined is
 * boxed: an allocation). Without wrap: the sum of the decreases. With wrap (a full-turn
 * driver whose sequence may pass once through `period`): the cyclic increments must add
 * up to less than one period; the excess is the violation.
 */
export function orderViolationInto(
  values: ArrayLike<number>,
  offset: number,
  n: number,
  wrap: boolean,
  period: number,
  out: Float64Array,
  index: number,
): void {
  let sum = 0;
  if (!wrap) {
    for (let i = 0; i + 1 < n; i++) {
      const d = values[offset + i] - values[offset + i + 1];
      if (d > 0) sum += d;
    }
    out[index] = sum / period;
    return;
  }
  for (let i = 0; i + 1 < n; i++) {
    let d = values[offset + i + 1] - values[offset + i];
    d -= Math.floor(d / period) * period;
    sum += d;
  }
  const excess = sum - period;
  out[index] = excess > 0 ? excess / period : 0;
}

/** orderViolationInto's answer before it is returned (no call in between can reenter). */
const orderScratch = new Float64Array(1);

/** orderViolationInto, returned. */
export function orderViolation(values: ArrayLike<number>, offset: number, n: number, wrap: boolean, period: number): number {
  orderViolationInto(values, offset, n, wrap, period, orderScratch, 0);
  return orderScratch[0];
}
