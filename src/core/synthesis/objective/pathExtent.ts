/**
 * The size limit, the least transmission angle and the size and transmission terms of a
 * path problem, taken over the motion the design makes: a full turn from the first
 * target point where the driver turns fully (or must), else the travel between the
 * target's driver values. The search samples that motion (EXTENT_STEPS_PER_TURN a
 * turn); the report then checks the limits on the analysis `loci analyze` runs
 * (pathReport.ts), so a limit reported met is met along the candidate's motion. Built
 * only for a problem that asks for one of them: a problem without them evaluates
 * exactly as before.
 */
import {
  EXTENT_COS,
  EXTENT_LENGTH,
  EXTENT_MAX_X,
  EXTENT_MAX_Y,
  EXTENT_MIN_X,
  EXTENT_MIN_Y,
  targetFrame,
  type MechanismEncoding,
} from '../encoding';
import { DEFAULT_TRANSMISSION_GUIDELINE_RAD, TERM_ERROR_SHARE, type Problem } from '../problem';

const TAU = 2 * Math.PI;
/** Samples of a full turn in the search's size and transmission sweep (5° apart). */
export const EXTENT_STEPS_PER_TURN = 72;
/**
 * The search holds the sampled size this share below the limit. A joint turning on a
 * circle of radius R ≤ size/2 passes its extreme within R (1 − cos(h/2)) of a sample h
 * apart, so samples miss at most size · (1 − cos(h/2)) of a side; twice that covers
 * coupler curves that bend harder, so a design the search finds within the limit is
 * within it on the analysis' finer steps too.
 */
export const EXTENT_SAMPLING_MARGIN = 2 * (1 - Math.cos(Math.PI / EXTENT_STEPS_PER_TURN));
/**
 * The search holds the sampled worst transmission angle this far above the limit, rad
 * (0.1°). Near its extreme the angle departs from the sampled one by at most
 * ½ |μ''| (h/2)² for samples h = 5° apart: 0.1° covers |μ''| up to about 1.8, the
 * smooth loops; for a loop near a toggle the report checks the exact range and counts
 * what the samples missed.
 */
export const TRANSMISSION_SAMPLING_MARGIN_RAD = Math.PI / 1800;
/** Most samples of one travel (ten turns), a cap on a long prescribed motion. */
const EXTENT_MAX_STEPS = 10 * EXTENT_STEPS_PER_TURN;

/** What the sweep found, for the value, the violation and the report. */
export const PE_SIZE_MM = 0;
/** Largest side of the motion beyond the limit, as a share of the limit (0 within it). */
export const PE_SIZE_VIOLATION = 1;
/** Worst transmission angle over the motion, rad, in [0, π/2] (min of μ and π − μ). */
export const PE_WORST_MU_RAD = 2;
/** The terms' sum, in the measure's units. */
export const PE_PENALTY = 3;
/** Worst transmission angle below the limit (with its sampling margin), as a share of the limit (0 within it). */
export const PE_TRANSMISSION_VIOLATION = 4;
export const PE_LENGTH = 5;

export interface PathExtent {
  /** Scratch of the branch evaluated last (PE_*). */
  readonly figures: Float64Array;
  /**
   * Sweeps the loaded design over its motion (`unwrapped`: its driver values at the
   * target points, in order along the motion), placed by `placement`, into `figures`.
   */
  evaluate(unwrapped: Float64Array, n: number, placement: Float64Array): void;
}

/** Null when the problem asks for no limit and no term taken over the motion: nothing to sweep. */
export function createPathExtent(problem: Problem, encoding: MechanismEncoding, weightSum: number): PathExtent | null {
  const maxSizeMm = problem.constraints.maxSizeMm;
  const minMu = problem.constraints.minTransmissionRad ?? 0;
  const sizeWeight = problem.terms?.sizeWeight ?? 0;
  const transmissionWeight = problem.terms?.transmissionWeight ?? 0;
  if (maxSizeMm === undefined && !(minMu > 0) && !(sizeWeight > 0) && !(transmissionWeight > 0)) return null;
  const searchMinMu = minMu > 0 ? Math.min(Math.PI / 2, minMu + TRANSMISSION_SAMPLING_MARGIN_RAD) : 0;
  const guideline = problem.terms?.transmissionGuidelineRad ?? DEFAULT_TRANSMISSION_GUIDELINE_RAD;
  const fullTurnRequired = problem.constraints.fullTurnCrank === true;
  const searchLimitMm = maxSizeMm === undefined ? Infinity : maxSizeMm * (1 - EXTENT_SAMPLING_MARGIN);
  const spanMm = targetFrame(problem.target.points).size;
  // The measure of an error of TERM_ERROR_SHARE of the span at every point: a term of
  // weight 1 and figure 1 costs that much.
  const errorMm = TERM_ERROR_SHARE * spanMm;
  const unit = problem.measure === 'sum-of-squares' ? weightSum * errorMm * errorMm : errorMm;
  const extent = new Float64Array(EXTENT_LENGTH);
  const figures = new Float64Array(PE_LENGTH);

  function evaluate(unwrapped: Float64Array, n: number, placement: Float64Array): void {
    const first = unwrapped[0];
    let lo = first;
    let hi = first;
    for (let i = 1; i < n; i++) {
      if (unwrapped[i] < lo) lo = unwrapped[i];
      if (unwrapped[i] > hi) hi = unwrapped[i];
    }
    // A full turn first: where every sample assembles, the driver turns fully and the
    // candidate's motion is that turn; else the travel between the target's values.
    const failed = encoding.sweepExtent(first, first + TAU, EXTENT_STEPS_PER_TURN, placement, extent);
    if (!fullTurnRequired && failed > 0 && hi - lo < TAU) {
      const steps = Math.min(EXTENT_MAX_STEPS, Math.max(1, Math.ceil(((hi - lo) / TAU) * EXTENT_STEPS_PER_TURN)));
      encoding.sweepExtent(lo, hi, steps, placement, extent);
    }
    const width = extent[EXTENT_MAX_X] - extent[EXTENT_MIN_X];
    const height = extent[EXTENT_MAX_Y] - extent[EXTENT_MIN_Y];
    // Nothing assembled (−Infinity) or a non-finite joint: no size to speak of, the worst.
    let size = Math.max(width, height);
    if (!(size >= 0 && size < Infinity)) size = Infinity;
    const worstMu = Math.acos(Math.min(1, extent[EXTENT_COS]));
    figures[PE_SIZE_MM] = size;
    figures[PE_SIZE_VIOLATION] = maxSizeMm === undefined || size <= searchLimitMm ? 0 : size < Infinity ? (size - searchLimitMm) / maxSizeMm : 1;
    let penalty = 0;
    if (sizeWeight > 0) penalty += sizeWeight * (size < Infinity ? Math.max(0, size / spanMm - 1) : 1 / TERM_ERROR_SHARE);
    if (transmissionWeight > 0) penalty += transmissionWeight * (Math.max(0, guideline - worstMu) / guideline);
    figures[PE_WORST_MU_RAD] = worstMu;
    figures[PE_PENALTY] = unit * penalty;
    // NaN (nothing assembled) takes the worst branch.
    figures[PE_TRANSMISSION_VIOLATION] = !(searchMinMu > 0) || worstMu >= searchMinMu ? 0 : worstMu >= 0 ? (searchMinMu - worstMu) / searchMinMu : 1;
  }

  return { figures, evaluate };
}
