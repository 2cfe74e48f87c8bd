/**
 * The score of a suspension design from its curves. Each target is a term with a
 * deviation in its own unit and a tolerance in that unit (the deviation that counts as
 * 1): a target curve's deviation is the RMS of its differences over the target's
 * points (or over the samples, for a leverage shape); a band's is the RMS over its cogs
 * of the distance outside [min, max]; a limit's is the excess of the largest |value|
 * over the travel. A target, or a band or limit set as a penalty, adds
 * weight × (deviation / tolerance)² to the value; a band or limit set as a constraint
 * adds deviation / tolerance to the violation, ranked first. Figures at sag are read at
 * sag × the design's travel by linear interpolation between samples (the sum in
 * weightedTerms.ts). Allocates nothing.
 */
import type { SuspensionCurves } from '../../suspension/curves';
import type { SuspensionProblem } from '../suspensionProblem';
import { S_BAND, S_TRAVEL, S_UNDEFINED } from './suspensionResponse';
import { createWeightedTerms, sumWeightedTerms, type TermSpec, type WeightedTerms } from './weightedTerms';

export const T_AXLE_PATH = 0;
export const T_LEVERAGE = 1;
export const T_ANTI_SQUAT = 2;
export const T_ANTI_RISE = 3;
export const T_TRAVEL = 4;
export const T_CHAIN_GROWTH = 5;
export const T_KICKBACK = 6;
export const T_COUNT = 7;

export const TERM_NAMES: readonly string[] = ['axle path', 'leverage ratio', 'anti-squat at sag', 'anti-rise at sag', 'wheel travel', 'chain growth', 'pedal kickback'];
export const TERM_UNITS: readonly string[] = ['mm', '', '%', '%', 'mm', 'mm', '°'];

/** What a suspension problem's terms are, resolved once, with the cogs each cog term reads. */
export interface SuspensionTerms extends WeightedTerms {
  /** Index of each scored cog in the curves, per term that reads cogs. */
  readonly antiSquatCogs: Int32Array;
  readonly chainGrowthCogs: Int32Array;
  readonly kickbackCogs: Int32Array;
}

export function createSuspensionTerms(problem: SuspensionProblem, cogTeeth: readonly number[]): SuspensionTerms {
  const t = problem.targets;
  const specs = new Array<TermSpec | undefined>(T_COUNT);
  specs[T_AXLE_PATH] = t.axlePath;
  specs[T_LEVERAGE] = t.leverageRatio;
  specs[T_ANTI_SQUAT] = t.antiSquatAtSag;
  specs[T_ANTI_RISE] = t.antiRiseAtSag;
  specs[T_TRAVEL] = t.travelMm;
  specs[T_CHAIN_GROWTH] = t.chainGrowthMm;
  specs[T_KICKBACK] = t.kickbackDeg;
  const cogIndex = (cogs: readonly number[] | undefined) => Int32Array.from(cogs ?? [], (z) => cogTeeth.indexOf(z));
  return {
    ...createWeightedTerms(specs, { undefinedSlot: S_UNDEFINED, constraintSlot: S_BAND, undefinedWhen: 'nan' }),
    antiSquatCogs: cogIndex(t.antiSquatAtSag?.cogs),
    chainGrowthCogs: cogIndex(t.chainGrowthMm?.cogs),
    kickbackCogs: cogIndex(t.kickbackDeg?.cogs),
  };
}

/** Linear interpolation of curve y over increasing x (first `count` samples) at x = at, held at the ends. */
export function interpolateAt(x: Float64Array, y: Float64Array, count: number, at: number): number {
  if (!(at > x[0])) return y[0];
  for (let k = 1; k < count; k++) {
    if (at <= x[k]) {
      const span = x[k] - x[k - 1];
      return span > 0 ? y[k - 1] + ((at - x[k - 1]) / span) * (y[k] - y[k - 1]) : y[k];
    }
  }
  return y[count - 1];
}

function outside(v: number, lo: number, hi: number): number {
  if (v < lo) return lo - v;
  if (v > hi) return v - hi;
  return Number.isNaN(v) ? Number.NaN : 0;
}

function curveRms(points: readonly (readonly [number, number])[], travel: Float64Array, y: Float64Array, count: number): number {
  let sum = 0;
  for (let i = 0; i < points.length; i++) {
    const d = interpolateAt(travel, y, count, points[i][0]) - points[i][1];
    sum += d * d;
  }
  return Math.sqrt(sum / points.length);
}

function largestAbs(curves: readonly Float64Array[], cogs: Int32Array, count: number): number {
  let m = 0;
  for (let c = 0; c < cogs.length; c++) {
    const a = curves[cogs[c]];
    for (let k = 0; k < count; k++) {
      const v = Math.abs(a[k]);
      if (!(v <= m)) m = v;
    }
  }
  return m;
}

/**
 * Scores the first `count` samples of `curves` (count ≥ 2): fills terms.deviation, adds
 * the constraint terms, the travel shortfall and undefined figures into `parts`, and
 * returns the value (the weighted sum of the normalised target and penalty terms).
 */
export function scoreSuspension(problem: SuspensionProblem, terms: SuspensionTerms, curves: SuspensionCurves, count: number, parts: Float64Array): number {
  const t = problem.targets;
  const dev = terms.deviation;
  dev.fill(0);
  const travel = curves.travelMm;
  const total = travel[count - 1];
  const sagTravel = problem.bicycle.sag * total;
  let farthest = 0;

  if (t.axlePath !== undefined) {
    dev[T_AXLE_PATH] = curveRms(t.axlePath.points, travel, curves.axleXMm, count);
    farthest = Math.max(farthest, t.axlePath.points[t.axlePath.points.length - 1][0]);
  }
  const lr = t.leverageRatio;
  if (lr !== undefined) {
    if (lr.form === 'points') {
      dev[T_LEVERAGE] = curveRms(lr.points, travel, curves.leverageRatio, count);
      farthest = Math.max(farthest, lr.points[lr.points.length - 1][0]);
    } else {
      let sum = 0;
      for (let k = 0; k < count; k++) {
        const u = total > 0 ? travel[k] / total : 0;
        const d = curves.leverageRatio[k] - (lr.start + (lr.end - lr.start) * Math.pow(u < 0 ? 0 : u, lr.exponent));
        sum += d * d;
      }
      dev[T_LEVERAGE] = Math.sqrt(sum / count);
    }
  }
  if (t.antiSquatAtSag !== undefined) {
    let sum = 0;
    const cogs = terms.antiSquatCogs;
    for (let c = 0; c < cogs.length; c++) {
      const d = outside(interpolateAt(travel, curves.antiSquatPct[cogs[c]], count, sagTravel), t.antiSquatAtSag.min, t.antiSquatAtSag.max);
      sum += d * d;
    }
    dev[T_ANTI_SQUAT] = Math.sqrt(sum / cogs.length);
  }
  if (t.antiRiseAtSag !== undefined) {
    dev[T_ANTI_RISE] = outside(interpolateAt(travel, curves.antiRisePct, count, sagTravel), t.antiRiseAtSag.min, t.antiRiseAtSag.max);
  }
  if (t.travelMm !== undefined) dev[T_TRAVEL] = outside(total, t.travelMm.min, t.travelMm.max);
  if (t.chainGrowthMm !== undefined) dev[T_CHAIN_GROWTH] = Math.max(0, largestAbs(curves.chainGrowthMm, terms.chainGrowthCogs, count) - t.chainGrowthMm.max);
  if (t.kickbackDeg !== undefined) dev[T_KICKBACK] = Math.max(0, largestAbs(curves.kickbackDeg, terms.kickbackCogs, count) - t.kickbackDeg.max);
  // A NaN deviation: the largest-|value| scan above skips NaN samples, so mark them here.
  if (t.chainGrowthMm !== undefined && hasNaN(curves.chainGrowthMm, terms.chainGrowthCogs, count)) dev[T_CHAIN_GROWTH] = Number.NaN;
  if (t.kickbackDeg !== undefined && hasNaN(curves.kickbackDeg, terms.kickbackCogs, count)) dev[T_KICKBACK] = Number.NaN;

  if (farthest > 0 && total < farthest) parts[S_TRAVEL] += (farthest - total) / farthest;
  return sumWeightedTerms(terms, parts);
}

function hasNaN(curves: readonly Float64Array[], cogs: Int32Array, count: number): boolean {
  for (let c = 0; c < cogs.length; c++) for (let k = 0; k < count; k++) if (Number.isNaN(curves[cogs[c]][k])) return true;
  return false;
}
