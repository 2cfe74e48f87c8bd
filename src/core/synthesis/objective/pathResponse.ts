/**
 * The response of a path problem: for one design, the output point at each target
 * point after the timing solve (prescribed, free, or matched in order and refined) and
 * the placement fit, the squared distances to the targets, and the normalised
 * violations, for every assembly branch asked for. Everything is allocated when the
 * response is built; evaluating allocates nothing.
 */
import {
  SIM_A as SIM_A_BINDING,
  SIM_B as SIM_B_BINDING,
  SIM_LENGTH as SIM_LENGTH_BINDING,
  SIM_SSE as SIM_SSE_BINDING,
  SIM_TX as SIM_TX_BINDING,
  SIM_TY as SIM_TY_BINDING,
  similarityFitInto,
} from '../../geometry';
import {
  CURVE_DX as CURVE_DX_BINDING,
  CURVE_DY as CURVE_DY_BINDING,
  CURVE_MARGIN as CURVE_MARGIN_BINDING,
  CURVE_OUT_LENGTH as CURVE_OUT_LENGTH_BINDING,
  CURVE_T as CURVE_T_BINDING,
  CURVE_X as CURVE_X_BINDING,
  CURVE_Y as CURVE_Y_BINDING,
  type CurveEvaluator,
} from '../curve';
import {
  V_ASSEMBLY as V_ASSEMBLY_BINDING,
  V_BOUNDS as V_BOUNDS_BINDING,
  V_ORDER as V_ORDER_BINDING,
  V_SLOTS as V_SLOTS_BINDING,
} from '../encoding';
import { JOINT_FIT_HALVINGS, createJointFit } from '../jointFit';
import { measureValueInto } from '../measures';
import { SampledCurve } from '../sampledCurve';
import { DEFAULT_MATCH_SAMPLES, type Problem } from '../problem';
import { boxViolationInto, type PathDesignSpace } from './designSpace';
import { PE_PENALTY, PE_SIZE_VIOLATION, PE_TRANSMISSION_VIOLATION, createPathExtent, type PathExtent } from './pathExtent';
import { bestRanked, sumViolationsInto } from './score';
import {
  REFINE_HI as REFINE_HI_BINDING,
  REFINE_IO_LENGTH,
  REFINE_LO as REFINE_LO_BINDING,
  REFINE_MAX_STEP as REFINE_MAX_STEP_BINDING,
  REFINE_QX as REFINE_QX_BINDING,
  REFINE_QY as REFINE_QY_BINDING,
  REFINE_T as REFINE_T_BINDING,
  createMatchScratch,
  matchInOrder,
  orderViolationInto,
  refineDriverValue,
} from '../timing';

// Imported constants as locals: a module transform (tsx, vitest) may turn each read of an
// imported binding into a getter call, which the hot loops below cannot afford.
const SIM_A = SIM_A_BINDING;
const SIM_B = SIM_B_BINDING;
const SIM_LENGTH = SIM_LENGTH_BINDING;
const SIM_SSE = SIM_SSE_BINDING;
const SIM_TX = SIM_TX_BINDING;
const SIM_TY = SIM_TY_BINDING;
const CURVE_OUT_LENGTH = CURVE_OUT_LENGTH_BINDING;
const CURVE_X = CURVE_X_BINDING;
const CURVE_Y = CURVE_Y_BINDING;
const CURVE_DX = CURVE_DX_BINDING;
const CURVE_DY = CURVE_DY_BINDING;
const CURVE_T = CURVE_T_BINDING;
const CURVE_MARGIN = CURVE_MARGIN_BINDING;
const V_ASSEMBLY = V_ASSEMBLY_BINDING;
const V_BOUNDS = V_BOUNDS_BINDING;
const V_ORDER = V_ORDER_BINDING;
const V_SLOTS = V_SLOTS_BINDING;
const REFINE_T = REFINE_T_BINDING;
const REFINE_QX = REFINE_QX_BINDING;
const REFINE_QY = REFINE_QY_BINDING;
const REFINE_LO = REFINE_LO_BINDING;
const REFINE_HI = REFINE_HI_BINDING;
const REFINE_MAX_STEP = REFINE_MAX_STEP_BINDING;

const TAU = 2 * Math.PI;
/** Newton steps per target point in a timing refinement. */
export const REFINE_ITERATIONS = 8;
/** Largest Newton step of a free-timing refinement, rad. */
export const FREE_REFINE_MAX_STEP_RAD = 0.25;
/** Starting offsets tried when a free placement is aligned by arc length. */
export const ALIGNMENT_OFFSETS = 12;
/** Alternations of matching and fitting in a free placement with matched timing. */
export const ALIGNMENT_ITERATIONS = 3;
/**
 * Shares of the curve's arc length an open target's points are spread along when it is
 * aligned (matchPlacedTiming): the whole curve, and parts of it, since an open target
 * may follow any stretch of the curve. Aligned with the whole curve only, the generating
 * designs of open arcs over a sixth to three quarters of a turn scored up to 0.13 of
 * the target's size (bench/README.md, Reach).
 */
export const OPEN_SPAN_SHARES: readonly number[] = [1, 0.6, 0.35, 0.2];
/** Alignments along parts of the curve, the best by their first fit, each alternated once before the best of them goes on. */
export const OPEN_PART_STARTS = 2;
/**
 * Curve samples of refined free timing's refit (refitTiming): its match has only to find
 * each point's stretch of the curve, the fits after it go on from there. With 48 the
 * reach set's five free-timing cases reached on every seed (bench/README.md, Reach).
 */
export const REFIT_SAMPLES = 48;
/**
 * Gauss–Newton steps of the refit's joint fit on the curve itself, after its steps on the
 * samples' cubics: without them the refitted values are only as exact as the cubics of
 * REFIT_SAMPLES samples, and a search whose every design is refitted stops there
 * (bench/README.md, Reach).
 */
export const REFIT_CURVE_ITERATIONS = 8;


/** The scratch a path response leaves describing the branch it evaluated last. */
export interface PathResponse {
  readonly n: number;
  readonly branchCount: number;
  /** (value, violation) of each branch, flat. */
  readonly evaluation: Float64Array;
  /** Violation slots of the branch evaluated last (encoding.ts V_*). */
  readonly parts: Float64Array;
  /** Driver values of every branch, n each. */
  readonly times: Float64Array;
  /** The driver values of the last branch unwrapped along its motion. */
  readonly unwrapped: Float64Array;
  /** The placed output points and their squared distances to the targets. */
  readonly points: Float64Array;
  /** With a fixed placement, each branch's output points (branch k at [2n·k …]), as `points` holds the last one's. */
  readonly branchPoints: Float64Array;
  readonly d2: Float64Array;
  /** The fitted similarity of a free placement (SIM_A … SIM_TY). */
  readonly sim: Float64Array;
  readonly weights: Float64Array | undefined;
  readonly refineFree: boolean;
  /** The size limit and terms (pathExtent.ts) of the branch evaluated last; null when the problem has none. */
  readonly extent: PathExtent | null;
  /**
   * Evaluates branch k into evaluation[2k], [2k + 1]; driver values into times[k·n …].
   * With `droppedIfInfeasible` (the search drops the design if it is infeasible, see
   * Optimizer.infeasibleDroppedInto) it may stop as soon as it knows the design
   * infeasible, writing Infinity for both and returning false; true when evaluated in full.
   */
  evaluateBranch(x: Float64Array, k: number, droppedIfInfeasible: boolean): boolean;
  /** Evaluates every branch (evaluateBranch); returns the best one's index. */
  evaluateAll(x: Float64Array, droppedIfInfeasible?: boolean): number;
  /** Whether evaluateAll stopped early on some branch of the design it evaluated last: its outputs are not that design's. */
  stoppedEarly(): boolean;
  /** The placement, and with refined free timing the driver values, that fit x's branch k to the target (see the function), right after evaluateAll(x). */
  fitDesign(x: Float64Array, k: number, turns: boolean, out: Float64Array): boolean;
  /** Whether the last fitDesign refitted the driver values (into times): refined free timing's refit. */
  timingRefitted(): boolean;
}

export function createPathResponse(problem: Problem, space: PathDesignSpace): PathResponse {
  const { encoding, mechanismDim: m, dim, lower, upper } = space;
  const targets = Float64Array.from(problem.target.points);
  const weights = problem.target.weights === undefined ? undefined : Float64Array.from(problem.target.weights);
  const n = targets.length / 2;
  const closed = problem.target.closed;
  const timing = problem.timing;
  const freePlacement = problem.placement === 'free';
  /** Unprescribed timing with a free placement: matched, then driver values and placement fitted together (matchPlacedTiming). */
  const fitsPlacement = timing.mode === 'unprescribed' && freePlacement;
  /** Free timing's driver values refined on each design's curve (refineFreeTiming) and refitted by fitDesign (refitTiming). */
  const refineFree = timing.mode === 'free' && timing.refine === true;
  /** The scratch of the match and alternation: a free placement's evaluation, a fixed one's fitDesign, refined free timing's refit. */
  const matchesPlaced = timing.mode === 'unprescribed' || refineFree;
  const measure = problem.measure;

  // Scratch, allocated once.
  const parts = new Float64Array(V_SLOTS);
  const refineIo = new Float64Array(REFINE_IO_LENGTH);
  const span = new Float64Array(2);
  /** The order violation before it is added to its slot. */
  const order = new Float64Array(1);
  /** The motion's spans (from, to) between target points, and back to the first on a closed path. */
  const spans = new Float64Array(2 * n);
  const buf = new Float64Array(CURVE_OUT_LENGTH);
  const sim = new Float64Array(SIM_LENGTH);
  const branchCount = encoding.branchCount;
  const times = new Float64Array(branchCount * n);
  const unwrapped = new Float64Array(n);
  const points = new Float64Array(2 * n);
  const branchPoints = new Float64Array(freePlacement ? 0 : branchCount * 2 * n);
  /** The points fitDesign fits a placement to. */
  const fitSource = new Float64Array(2 * n);
  /** Each point's assembly margin (CURVE_MARGIN). */
  const margins = new Float64Array(n);
  const d2 = new Float64Array(n);
  const driverValues = timing.mode === 'prescribed' ? Float64Array.from(timing.driverValues) : new Float64Array(0);
  const wrap = timing.mode === 'free' ? timing.wrap : timing.mode === 'unprescribed' ? timing.wrap !== false : false;
  /** Refined free timing with a free placement: the targets in the design's frame, and the points and weights of the fit that takes them there (ownPlacementInto). */
  const refinesInFrame = refineFree && freePlacement;
  const frameTargets = new Float64Array(refinesInFrame ? 2 * n : 0);
  const frameSource = new Float64Array(refinesInFrame ? 2 * n : 0);
  const frameWeights = new Float64Array(refinesInFrame ? n : 0);
  const frameSim = new Float64Array(SIM_LENGTH);
  /** Whether the last fitDesign refitted the driver values. */
  let refitted = false;
  const sampleCount = timing.mode === 'unprescribed' ? (timing.samples ?? DEFAULT_MATCH_SAMPLES) : refineFree ? REFIT_SAMPLES : 0;
  const samples = new Float64Array(2 * sampleCount);
  /** The curve's answers at the samples (CURVE_* layout, one after another). */
  const around = new Float64Array(sampleCount * CURVE_OUT_LENGTH);
  // The samples with their rates serve the joint refinement of driver values and placement only.
  const sampled = new SampledCurve(matchesPlaced ? Math.max(sampleCount, 1) : 1);
  const placedSamples = new Float64Array(matchesPlaced ? 2 * sampleCount : 0);
  const valid = new Uint8Array(sampleCount);
  const arc = new Float64Array(matchesPlaced ? sampleCount + 1 : 0);
  const targetArc = new Float64Array(n);
  /** The alignments' shares of the curve, and how many of the best are alternated (matchPlacedTiming). */
  const spanShares = Float64Array.from(closed ? [1] : OPEN_SPAN_SHARES);
  const startSlots = closed ? 1 : 1 + OPEN_PART_STARTS;
  /** The alignments kept (alignAlong): the whole curve's best, then partCount along parts of it, best first; their first fits' SSE, similarities and hints. */
  let partCount = 0;
  const startSse = new Float64Array(startSlots);
  const startSims = new Float64Array(startSlots * SIM_LENGTH);
  const startMatches = new Int32Array(startSlots * n);
  /** The part's alternation that ends best so far: its placement and match. */
  const bestSim = new Float64Array(SIM_LENGTH);
  const bestMatched = new Int32Array(n);
  /** The curve's points at the fitted driver values, and their margins (refineMatch). */
  const placedPoints = new Float64Array(matchesPlaced ? 2 * n : 0);
  const placedMargins = new Float64Array(matchesPlaced ? n : 0);
  /** The part's refined fit, kept aside while the whole curve's is made: driver values, placement, points, margins. */
  const partTimes = new Float64Array(n);
  const partSim = new Float64Array(SIM_LENGTH);
  const partPoints = new Float64Array(2 * n);
  const partMargins = new Float64Array(n);
  /** An alternation's last fit's SSE, and the whole curve's and the part's refined fits' (alternate, placedSseInto). */
  const fitSse = new Float64Array(2);
  const matchScratch = createMatchScratch(n, Math.max(sampleCount, 1));
  const matched = new Int32Array(n);
  const previousMatched = new Int32Array(n);
  const jointFit = createJointFit(n);
  /** lo, hi and the step cap of the joint refinement. */
  const limits = new Float64Array(3);
  /** a, b, tx, ty of the placement in force (identity when fixed); the layout of SIM_A … SIM_TY. */
  const placement = new Float64Array(4);
  const curve = encoding.curve;
  const evaluation = new Float64Array(2 * branchCount);
  let weightSum = n;
  if (weights !== undefined) {
    weightSum = 0;
    for (let i = 0; i < n; i++) weightSum += weights[i];
  }
  const extent = createPathExtent(problem, encoding, weightSum);

  if (freePlacement || matchesPlaced) {
    // Arc-length share of each target point along the path (closed: with the closing segment).
    let total = 0;
    for (let i = 1; i <= n; i++) {
      if (i === n && !closed) break;
      const a = i - 1;
      const b = i % n;
      total += Math.hypot(targets[2 * b] - targets[2 * a], targets[2 * b + 1] - targets[2 * a + 1]);
      if (i < n) targetArc[i] = total;
    }
    for (let i = 0; i < n; i++) targetArc[i] /= total;
  }

  /** The curve at the samples, with rates when `order` is 1 (into `sampled`, for the joint refinement). */
  function sampleCurve(order: 0 | 1): void {
    if (curve.atIoAround !== undefined) {
      curve.atIoAround(order, sampleCount, around);
    } else {
      const step = TAU / sampleCount;
      for (let j = 0; j < sampleCount; j++) {
        buf[CURVE_T] = j * step;
        curve.atIo(order, buf);
        around.set(buf, j * CURVE_OUT_LENGTH);
      }
    }
    const withRates = sampled.samples;
    let any = false;
    for (let j = 0; j < sampleCount; j++) {
      const o = j * CURVE_OUT_LENGTH;
      const x = around[o + CURVE_X];
      const y = around[o + CURVE_Y];
      samples[2 * j] = x;
      samples[2 * j + 1] = y;
      const ok = around[o + CURVE_MARGIN] >= 0 && Number.isFinite(x + y);
      valid[j] = ok ? 1 : 0;
      any = any || ok;
      if (order === 0) continue;
      const dx = around[o + CURVE_DX];
      const dy = around[o + CURVE_DY];
      withRates[4 * j] = x;
      withRates[4 * j + 1] = y;
      withRates[4 * j + 2] = dx;
      withRates[4 * j + 3] = dy;
      sampled.valid[j] = ok && Number.isFinite(dx + dy) ? 1 : 0;
    }
    if (order === 1) sampled.sampledFrom(curve);
    // Nothing assembles: match anyway on the stand-in curve, so the value still ranks.
    if (!any) for (let j = 0; j < sampleCount; j++) valid[j] = Number.isFinite(samples[2 * j] + samples[2 * j + 1]) ? 1 : 0;
  }

  /** Newton refinement of matched driver values t[o..o+n) on `c`, each kept between its neighbours. */
  function refineMatched(c: CurveEvaluator, t: Float64Array, o: number, maxStep: number): void {
    for (let i = 0; i < n; i++) {
      let lo: number;
      let hi: number;
      if (wrap) {
        lo = i > 0 ? t[o + i - 1] : t[o + n - 1] - TAU;
        hi = i + 1 < n ? t[o + i + 1] : t[o] + TAU;
      } else {
        lo = i > 0 ? t[o + i - 1] : 0;
        hi = i + 1 < n ? t[o + i + 1] : TAU;
      }
      refineIo[REFINE_T] = t[o + i];
      refineIo[REFINE_QX] = targets[2 * i];
      refineIo[REFINE_QY] = targets[2 * i + 1];
      refineIo[REFINE_LO] = lo;
      refineIo[REFINE_HI] = hi;
      refineIo[REFINE_MAX_STEP] = maxStep;
      refineDriverValue(c, refineIo, REFINE_ITERATIONS, buf);
      t[o + i] = refineIo[REFINE_T];
    }
  }

  /** Unprescribed timing with a fixed placement: match in order on the samples, refine. */
  function matchTiming(t: Float64Array, o: number): void {
    sampleCurve(0);
    // The last match made (the design before's, in a search often near this one's) as the
    // hint: a bound that lets the match skip more; its answer does not depend on it.
    for (let i = 0; i < n; i++) previousMatched[i] = matched[i];
    matchInOrder(samples, valid, targets, weights, wrap, !closed, matchScratch, matched, previousMatched);
    const step = TAU / sampleCount;
    for (let i = 0; i < n; i++) t[o + i] = matched[i] * step;
    refineMatched(curve, t, o, step);
  }

  function placeSamples(): void {
    const a = sim[SIM_A];
    const b = sim[SIM_B];
    for (let j = 0; j < sampleCount; j++) {
      const x = samples[2 * j];
      const y = samples[2 * j + 1];
      placedSamples[2 * j] = a * x - b * y + sim[SIM_TX];
      placedSamples[2 * j + 1] = b * x + a * y + sim[SIM_TY];
    }
  }

  /**
   * The target's points spread along `share` of the curve's arc length from `offset` of
   * it, each at the sample there; the similarity that fits them to the target kept as a
   * start of the alternation where it is among the best (keepStart).
   */
  function alignAlong(offset: number, share: number, total: number): void {
    let j = 0;
    for (let i = 0; i < n; i++) {
      let at = offset + share * targetArc[i];
      if (at >= 1) at -= 1;
      // The shares increase, so j only moves forward, once around the loop at most: the
      // first j from here with arc[j + 1] past the share (arc never decreases, and once
      // NaN stays NaN), found by bisection.
      if (i === 0 || at < offset) j = 0;
      const length = at * total;
      let hi = sampleCount - 1;
      while (j < hi) {
        const mid = (j + hi) >> 1;
        if (arc[mid + 1] <= length) j = mid + 1;
        else hi = mid;
      }
      points[2 * i] = samples[2 * j];
      points[2 * i + 1] = samples[2 * j + 1];
      matched[i] = j;
    }
    similarityFitInto(points, targets, n, buf, weights ?? null);
    const sse = buf[SIM_SSE];
    if (share === 1) {
      // Slot 0: the whole curve's best (the first offered, then any with a lower SSE).
      if (offset === 0 || sse < startSse[0]) keepStart(0);
      return;
    }
    // Slots 1 …: the best along parts of the curve, in order, an earlier one first where two tie.
    let slot = 1 + partCount;
    while (slot > 1 && sse < startSse[slot - 1]) slot--;
    if (slot >= startSlots) return;
    for (let c = Math.min(partCount, startSlots - 2) + 1; c > slot; c--) copyStart(c - 1, c);
    keepStart(slot);
    if (1 + partCount < startSlots) partCount++;
  }

  /** The alignment in buf (its similarity and SSE) and matched as start `slot`. */
  function keepStart(slot: number): void {
    startSse[slot] = buf[SIM_SSE];
    for (let q = 0; q < SIM_LENGTH; q++) startSims[slot * SIM_LENGTH + q] = buf[q];
    // Unrolled (once round the loop at most), the first match's hint.
    for (let i = 0; i < n; i++) startMatches[slot * n + i] = matched[i] + (i > 0 && matched[i] < matched[0] ? sampleCount : 0);
  }

  function copyStart(from: number, to: number): void {
    startSse[to] = startSse[from];
    for (let q = 0; q < SIM_LENGTH; q++) startSims[to * SIM_LENGTH + q] = startSims[from * SIM_LENGTH + q];
    for (let i = 0; i < n; i++) startMatches[to * n + i] = startMatches[from * n + i];
  }

  /**
   * Iterations first … last − 1 of the alternation from the placement in sim and the hint
   * in previousMatched: matched and sim left at its answer, and the SSE of the last fit
   * made into fitSse[0] (Infinity: none). Numbers cross in arrays, not as arguments or
   * return values: V8 boxes a double passed to or returned from a call it does not inline.
   */
  function alternate(first: number, last: number): void {
    fitSse[0] = Infinity;
    for (let it = first; it < last; it++) {
      placeSamples();
      // The last match (first: the alignment's), near this one once the fit settles, bounds it and speeds it up.
      matchInOrder(placedSamples, valid, targets, weights, wrap, !closed, matchScratch, matched, previousMatched);
      // The match repeats the last one: the fit below would repeat too, and so would every
      // later iteration (a fixed point), so stop with the same answer.
      let same = it > 0;
      for (let i = 0; same && i < n; i++) same = matched[i] === previousMatched[i];
      if (same) break;
      for (let i = 0; i < n; i++) previousMatched[i] = matched[i];
      if (!fitToMatch()) break;
    }
  }

  /**
   * The similarity that fits the samples `matched` names to the target, into sim and its
   * SSE into fitSse[0]; false, sim left as it was, where it is not finite.
   */
  function fitToMatch(): boolean {
    for (let i = 0; i < n; i++) {
      const j = ((matched[i] % sampleCount) + sampleCount) % sampleCount;
      points[2 * i] = samples[2 * j];
      points[2 * i + 1] = samples[2 * j + 1];
    }
    similarityFitInto(points, targets, n, buf, weights ?? null);
    if (!Number.isFinite(buf[SIM_A] + buf[SIM_B] + buf[SIM_TX] + buf[SIM_TY])) return false;
    for (let q = 0; q < SIM_LENGTH; q++) sim[q] = buf[q];
    fitSse[0] = buf[SIM_SSE];
    return true;
  }

  /**
   * Unprescribed timing with a free placement: align by arc length from a few starting
   * offsets (the curve unknown in size and pose, the target's points spread along it
   * as along the target), then alternate matching in order and refitting (an iterative
   * closest point scheme, Besl and McKay, 1992), then refine driver values and placement
   * together: on the samples read as cubics, then a last step on the curve (jointFit.ts).
   * A closed target goes round the whole curve: its best alignment is the start. An open
   * one may follow any stretch of the curve, so its points are also spread along parts
   * of it (OPEN_SPAN_SHARES); the best OPEN_PART_STARTS of those are each alternated
   * once, the best of them on and refined, and its fit replaces the whole curve's where
   * it ends nearer the target (so it is never worse than the whole curve's alone).
   */
  function matchPlacedTiming(t: Float64Array, o: number): void {
    sampleCurve(1);
    arc[0] = 0;
    for (let j = 1; j <= sampleCount; j++) {
      const a = j - 1;
      const b = j % sampleCount;
      // Math.sqrt, not Math.hypot: hypot allocates its answer in V8, and the sides here are
      // mm, far from overflow.
      const dx = samples[2 * b] - samples[2 * a];
      const dy = samples[2 * b + 1] - samples[2 * a + 1];
      arc[j] = arc[j - 1] + (valid[a] === 1 && valid[b] === 1 ? Math.sqrt(dx * dx + dy * dy) : 0);
    }
    const total = arc[sampleCount];
    partCount = 0;
    for (let s = 0; s < spanShares.length; s++) {
      for (let k = 0; k < ALIGNMENT_OFFSETS; k++) alignAlong(k / ALIGNMENT_OFFSETS, spanShares[s], total);
    }
    if (partCount > 0) {
      // Along a part of the curve: each start alternated once, the best of them on, then
      // refined, and kept aside.
      let bestSse = Infinity;
      for (let c = 1; c <= partCount; c++) {
        startFrom(c);
        alternate(0, 1);
        if (c === 1 || fitSse[0] < bestSse) {
          bestSse = fitSse[0];
          for (let q = 0; q < SIM_LENGTH; q++) bestSim[q] = sim[q];
          for (let i = 0; i < n; i++) bestMatched[i] = matched[i];
        }
      }
      for (let q = 0; q < SIM_LENGTH; q++) sim[q] = bestSim[q];
      for (let i = 0; i < n; i++) previousMatched[i] = bestMatched[i];
      alternate(1, ALIGNMENT_ITERATIONS);
      refineMatch(t, o);
      placedSseInto(1);
      for (let i = 0; i < n; i++) partTimes[i] = t[o + i];
      for (let q = 0; q < SIM_LENGTH; q++) partSim[q] = sim[q];
      for (let i = 0; i < 2 * n; i++) partPoints[i] = placedPoints[i];
      for (let i = 0; i < n; i++) partMargins[i] = placedMargins[i];
    }
    // Along the whole curve, kept unless the part's fit ends nearer the target.
    startFrom(0);
    alternate(0, ALIGNMENT_ITERATIONS);
    refineMatch(t, o);
    if (partCount === 0) return;
    placedSseInto(0);
    if (fitSse[1] < fitSse[0]) {
      for (let i = 0; i < n; i++) t[o + i] = partTimes[i];
      for (let q = 0; q < SIM_LENGTH; q++) sim[q] = partSim[q];
      for (let i = 0; i < 2 * n; i++) placedPoints[i] = partPoints[i];
      for (let i = 0; i < n; i++) placedMargins[i] = partMargins[i];
    }
  }

  /**
   * Refined free timing's refit of the loaded design whose driver values are times[o …]:
   * the target matched in order on the curve's samples, the placement the design has (a
   * fixed one's own; a free one's fitted to its points: ownPlacementInto) and its own
   * driver values as the match's hint. Where the match moves no point further than the
   * next sample from its own value, the evaluation's Newton steps have found what a refit
   * would: false, nothing changed. Otherwise the alternation goes on from that match,
   * driver values and placement are fitted together (refineMatch) and then on the curve
   * itself, REFIT_CURVE_ITERATIONS steps: the values into times[o …], the placement into
   * sim, the points into placedPoints; true.
   */
  function refitTiming(o: number): boolean {
    sampleCurve(1);
    if (freePlacement) {
      if (!ownPlacementInto(times, o, sim)) return false;
    } else {
      sim[SIM_A] = 1;
      sim[SIM_B] = 0;
      sim[SIM_TX] = 0;
      sim[SIM_TY] = 0;
    }
    // The own values as sample indices, unrolled once round the loop where cyclic.
    const step = TAU / sampleCount;
    for (let i = 0; i < n; i++) {
      const j = Math.round(times[o + i] / step);
      previousMatched[i] = wrap ? ((j % sampleCount) + sampleCount) % sampleCount : j < 0 ? 0 : j > sampleCount - 1 ? sampleCount - 1 : j;
    }
    if (wrap) for (let i = 1; i < n; i++) if (previousMatched[i] < previousMatched[0]) previousMatched[i] += sampleCount;
    placeSamples();
    matchInOrder(placedSamples, valid, targets, weights, wrap, !closed, matchScratch, matched, previousMatched);
    let moves = false;
    for (let i = 0; i < n && !moves; i++) {
      const d = (((matched[i] - previousMatched[i]) % sampleCount) + sampleCount) % sampleCount;
      moves = d > 1 && d < sampleCount - 1;
    }
    if (!moves) return false;
    for (let i = 0; i < n; i++) previousMatched[i] = matched[i];
    if (fitToMatch()) alternate(1, ALIGNMENT_ITERATIONS);
    refineMatch(times, o);
    jointFit.refine(curve, targets, weights, times, o, sim, limits, REFIT_CURVE_ITERATIONS, JOINT_FIT_HALVINGS);
    jointFit.pointsInto(placedPoints, placedMargins);
    return true;
  }

  /** Start `slot` (alignAlong) as the placement in force and the first match's hint. */
  function startFrom(slot: number): void {
    for (let q = 0; q < SIM_LENGTH; q++) sim[q] = startSims[slot * SIM_LENGTH + q];
    for (let i = 0; i < n; i++) previousMatched[i] = startMatches[slot * n + i];
  }

  /**
   * The driver values of the match, then driver values and placement refined together
   * (jointFit.ts), the curve's points there and their margins into placedPoints and
   * placedMargins.
   */
  function refineMatch(t: Float64Array, o: number): void {
    const step = TAU / sampleCount;
    for (let i = 0; i < n; i++) t[o + i] = matched[i] * step;
    if (wrap) {
      limits[0] = t[o + n - 1] - TAU;
      limits[1] = t[o] + TAU;
    } else {
      limits[0] = 0;
      limits[1] = TAU;
    }
    limits[2] = step;
    jointFit.refineOnSamples(sampled, curve, targets, weights, t, o, sim, limits);
    jointFit.pointsInto(placedPoints, placedMargins);
  }

  /** The points of the last matchPlacedTiming (x0, y0, …) and their margins, into `into` and `intoMargins`. */
  function placedPointsInto(into: Float64Array, intoMargins: Float64Array): void {
    for (let i = 0; i < 2 * n; i++) into[i] = placedPoints[i];
    for (let i = 0; i < n; i++) intoMargins[i] = placedMargins[i];
  }

  /** Σ wᵢ |S pᵢ + T − Qᵢ|² of placedPoints under the placement in force, into fitSse[slot]. */
  function placedSseInto(slot: number): void {
    let sum = 0;
    for (let i = 0; i < n; i++) {
      const x = placedPoints[2 * i];
      const y = placedPoints[2 * i + 1];
      const dx = sim[SIM_A] * x - sim[SIM_B] * y + sim[SIM_TX] - targets[2 * i];
      const dy = sim[SIM_B] * x + sim[SIM_A] * y + sim[SIM_TY] - targets[2 * i + 1];
      sum += (weights === undefined ? 1 : weights[i]) * (dx * dx + dy * dy);
    }
    fitSse[slot] = sum;
  }

  /**
   * Free timing's refinement: each driver value moved by Newton to where the curve passes
   * nearest its target point, staying between its neighbours. A free placement's curve
   * lies in the design's own frame, so its targets are first taken into that frame
   * through the placement that fits the curve's points at the values as they are
   * (targetsInDesignFrame): refined towards the targets as given, the values followed
   * points of another frame, and the very design that traced a target scored far from
   * it (tests/unit/synthesis/freeTimingRefine.test.ts).
   */
  function refineFreeTiming(x: Float64Array, t: Float64Array, o: number): void {
    let aim = targets;
    if (freePlacement) {
      if (!targetsInDesignFrame(t, o)) return;
      aim = frameTargets;
    }
    for (let i = 0; i < n; i++) {
      let lo = lower[m + i];
      let hi = upper[m + i];
      const here = t[o + i];
      // Stay between neighbours that are in order, so refining never creates an order defect.
      if (i > 0 && t[o + i - 1] <= here) lo = Math.max(lo, t[o + i - 1]);
      if (i + 1 < n && x[m + i + 1] >= here) hi = Math.min(hi, x[m + i + 1]);
      if (!(lo <= here && here <= hi)) continue;
      refineIo[REFINE_T] = here;
      refineIo[REFINE_QX] = aim[2 * i];
      refineIo[REFINE_QY] = aim[2 * i + 1];
      refineIo[REFINE_LO] = lo;
      refineIo[REFINE_HI] = hi;
      refineIo[REFINE_MAX_STEP] = FREE_REFINE_MAX_STEP_RAD;
      refineDriverValue(curve, refineIo, REFINE_ITERATIONS, buf);
      t[o + i] = refineIo[REFINE_T];
    }
  }

  /** The targets taken into the design's frame (frameTargets) through its own placement (ownPlacementInto); false where it has none. */
  function targetsInDesignFrame(t: Float64Array, o: number): boolean {
    if (!ownPlacementInto(t, o, frameSim)) return false;
    const a = frameSim[SIM_A];
    const b = frameSim[SIM_B];
    const s2 = a * a + b * b;
    for (let i = 0; i < n; i++) {
      const dx = targets[2 * i] - frameSim[SIM_TX];
      const dy = targets[2 * i + 1] - frameSim[SIM_TY];
      frameTargets[2 * i] = (a * dx + b * dy) / s2;
      frameTargets[2 * i + 1] = (a * dy - b * dx) / s2;
    }
    return true;
  }

  /**
   * The similarity that fits the loaded design's points at driver values t[o …] to the
   * target, the points where it does not assemble left out, into `into` (SIM_* layout);
   * false where none of scale above 0 is found.
   */
  function ownPlacementInto(t: Float64Array, o: number, into: Float64Array): boolean {
    for (let i = 0; i < n; i++) {
      buf[CURVE_T] = t[o + i];
      curve.atIo(0, buf);
      const ok = buf[CURVE_MARGIN] >= 0 && Number.isFinite(buf[CURVE_X] + buf[CURVE_Y]);
      frameSource[2 * i] = ok ? buf[CURVE_X] : 0;
      frameSource[2 * i + 1] = ok ? buf[CURVE_Y] : 0;
      frameWeights[i] = ok ? (weights === undefined ? 1 : weights[i]) : 0;
    }
    similarityFitInto(frameSource, targets, n, into, frameWeights);
    const s2 = into[SIM_A] * into[SIM_A] + into[SIM_B] * into[SIM_B];
    return s2 > 0 && Number.isFinite(s2 + into[SIM_TX] + into[SIM_TY]);
  }

  /** Evaluates branch k into evaluation[2k], [2k + 1]; driver values into times[k·n …]. */
  function evaluateBranch(x: Float64Array, k: number, droppedIfInfeasible: boolean): boolean {
    parts.fill(0);
    boxViolationInto(x, lower, upper, dim, parts, V_BOUNDS);
    encoding.load(x, k, parts);
    // A closed path's motion is a whole turn (the spans below cover one whatever the
    // timing), which a design that cannot turn does not make: infeasible before its fit.
    if (droppedIfInfeasible && closed && encoding.cannotTurn()) {
      evaluation[2 * k] = Infinity;
      evaluation[2 * k + 1] = Infinity;
      return false;
    }
    const o = k * n;
    if (timing.mode === 'prescribed') {
      for (let i = 0; i < n; i++) times[o + i] = driverValues[i];
    } else if (timing.mode === 'free') {
      for (let i = 0; i < n; i++) times[o + i] = x[m + i];
      if (refineFree) refineFreeTiming(x, times, o);
      orderViolationInto(times, o, n, wrap, TAU, order, 0);
      parts[V_ORDER] += order[0];
    } else if (fitsPlacement) {
      matchPlacedTiming(times, o);
    } else {
      matchTiming(times, o);
    }

    // Output points at the driver values; assembly at each. A free placement's fit
    // evaluated the curve at them last, and has them.
    if (fitsPlacement) {
      placedPointsInto(points, margins);
    } else {
      for (let i = 0; i < n; i++) {
        buf[CURVE_T] = times[o + i];
        curve.atIo(0, buf);
        margins[i] = buf[CURVE_MARGIN];
        points[2 * i] = buf[CURVE_X];
        points[2 * i + 1] = buf[CURVE_Y];
      }
    }
    let assembly = 0;
    for (let i = 0; i < n; i++) {
      const margin = margins[i];
      if (!(margin >= 0)) assembly += margin < 0 ? Math.min(1, -margin) : 1;
    }
    parts[V_ASSEMBLY] += assembly / n;

    // The motion from point to point (and, on a closed path, back to the first).
    const cyclic = wrap && timing.mode !== 'prescribed';
    unwrapped[0] = times[o];
    for (let i = 1; i < n; i++) {
      let d = times[o + i] - times[o + i - 1];
      if (cyclic) d -= Math.floor(d / TAU) * TAU;
      unwrapped[i] = unwrapped[i - 1] + d;
    }
    let spanCount = 0;
    for (let i = 1; i < n; i++) {
      const a = unwrapped[i - 1];
      const b = unwrapped[i];
      spans[2 * spanCount] = Math.min(a, b);
      spans[2 * spanCount + 1] = Math.max(a, b);
      spanCount++;
    }
    if (closed && unwrapped[n - 1] < unwrapped[0] + TAU) {
      spans[2 * spanCount] = unwrapped[n - 1];
      spans[2 * spanCount + 1] = unwrapped[0] + TAU;
      spanCount++;
    }
    for (let i = 0; i < spanCount; i++) {
      span[0] = spans[2 * i];
      span[1] = spans[2 * i + 1];
      encoding.motion(span, parts);
    }

    // Placement.
    placement[0] = 1;
    placement[1] = 0;
    placement[2] = 0;
    placement[3] = 0;
    if (freePlacement) {
      similarityFitInto(points, targets, n, sim, weights ?? null);
      for (let q = 0; q < 4; q++) placement[q] = sim[q];
      const sa = sim[SIM_A];
      const sb = sim[SIM_B];
      const tx = sim[SIM_TX];
      const ty = sim[SIM_TY];
      for (let i = 0; i < n; i++) {
        const px = points[2 * i];
        const py = points[2 * i + 1];
        points[2 * i] = sa * px - sb * py + tx;
        points[2 * i + 1] = sb * px + sa * py + ty;
      }
    }
    encoding.placed(placement, parts);
    if (!freePlacement) for (let i = 0; i < 2 * n; i++) branchPoints[2 * n * k + i] = points[i];

    for (let i = 0; i < n; i++) {
      const ex = points[2 * i] - targets[2 * i];
      const ey = points[2 * i + 1] - targets[2 * i + 1];
      d2[i] = ex * ex + ey * ey;
    }
    // Value and violation go straight into `evaluation`: no double crosses a call boundary.
    const slot = 2 * k;
    sumViolationsInto(parts, V_SLOTS, evaluation, slot + 1);
    if (evaluation[slot + 1] <= 0) {
      // Otherwise feasible: look for the locks narrower than the samples above.
      encoding.verify(spans, spanCount, parts);
      sumViolationsInto(parts, V_SLOTS, evaluation, slot + 1);
    }
    measureValueInto(measure, d2, n, weights, evaluation, slot);
    if (extent !== null) {
      extent.evaluate(unwrapped, n, placement);
      evaluation[slot + 1] += extent.figures[PE_SIZE_VIOLATION] + extent.figures[PE_TRANSMISSION_VIOLATION];
      evaluation[slot] += extent.figures[PE_PENALTY];
    }
    return true;
  }

  /** Whether evaluateAll stopped early on the design it evaluated last. */
  let stopped = false;

  /** Evaluates every branch; returns the best one's index. */
  function evaluateAll(x: Float64Array, droppedIfInfeasible = false): number {
    stopped = false;
    for (let k = 0; k < branchCount; k++) if (!evaluateBranch(x, k, droppedIfInfeasible)) stopped = true;
    return bestRanked(evaluation, branchCount);
  }

  /**
   * The placement that fits design x's branch k to the target, into out (SIM_* layout),
   * as a free placement's evaluation fits it: unprescribed timing matched and refined
   * together with the placement (matchPlacedTiming); refined free timing refitted where
   * its match moves a point to another stretch of the curve (refitTiming; the driver
   * values into times[k·n …], timingRefitted() true), else the fixed placement's similarity
   * as below, and a free placement none; prescribed or unrefined free timing, the
   * least-squares similarity of the branch's points at its driver values. evaluateAll
   * must have run on x last. `turns` false: no rotation but by π (similarityFitInto).
   * False where no fit is found.
   */
  function fitDesign(x: Float64Array, k: number, turns: boolean, out: Float64Array): boolean {
    refitted = false;
    if (matchesPlaced) {
      // evaluateAll loads the branches in turn: the last is loaded still.
      if (k !== branchCount - 1) {
        parts.fill(0);
        encoding.load(x, k, parts);
      }
      if (!refineFree) {
        matchPlacedTiming(times, k * n);
        placedPointsInto(fitSource, margins);
      } else if (refitTiming(k * n)) {
        refitted = true;
        placedPointsInto(fitSource, margins);
      } else if (freePlacement) {
        return false;
      } else {
        for (let i = 0; i < 2 * n; i++) fitSource[i] = branchPoints[2 * n * k + i];
      }
    } else {
      for (let i = 0; i < 2 * n; i++) fitSource[i] = branchPoints[2 * n * k + i];
    }
    return similarityFitInto(fitSource, targets, n, out, weights ?? null, turns);
  }

  return {
    n,
    branchCount,
    evaluation,
    parts,
    times,
    unwrapped,
    points,
    branchPoints,
    d2,
    sim,
    weights,
    refineFree,
    extent,
    evaluateBranch,
    evaluateAll,
    stoppedEarly: () => stopped,
    fitDesign,
    timingRefitted: () => refitted,
  };
}
