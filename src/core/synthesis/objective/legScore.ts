/**
 * The score of a leg design from its sampled gait figures (legResponse.ts). Each target
 * is a term with a deviation in its own unit and a tolerance in that unit (the deviation
 * that counts as 1), adding weight × (deviation / tolerance)² to the value, as the
 * suspension terms do (weightedTerms.ts); a limit (minimum duty factor, maximum flatness, …) deviates only
 * beyond it. Without stance the stance figures are 0 and their limits cost nothing: the
 * ground violation (L_GROUND) ranks such a design first. Allocates nothing.
 */
import type { LegProblem } from '../legProblem';
import {
  G_DUTY,
  G_FLAT_PP,
  G_HEIGHT,
  G_SPEED_VARIATION,
  G_STEP_HEIGHT,
  G_STRIDE,
  G_TRAJECTORY_RMS,
  G_WIDTH,
  G_WORST_TRANSMISSION_DEG,
  L_UNDEFINED,
} from './legResponse';
import { createWeightedTerms, sumWeightedTerms, type TermSpec, type WeightedTerms } from './weightedTerms';

export const LT_FOOT_PATH = 0;
export const LT_STRIDE = 1;
export const LT_STEP_HEIGHT = 2;
export const LT_DUTY = 3;
export const LT_FLATNESS = 4;
export const LT_SPEED = 5;
export const LT_TRANSMISSION = 6;
export const LT_SIZE = 7;
export const LT_COUNT = 8;

export const LEG_TERM_NAMES: readonly string[] = [
  'foot trajectory (RMS distance)',
  'stride',
  'step height',
  'minimum duty factor',
  'maximum stance flatness (peak-to-peak)',
  'maximum stance speed variation',
  'minimum transmission angle in stance',
  'size box',
];
export const LEG_TERM_UNITS: readonly string[] = ['mm', 'mm', 'mm', '', 'mm', '', '°', 'mm'];
/** The figure each term reads, as the report names it. */
export const LEG_TERM_FIGURES: readonly string[] = ['trajectoryRmsMm', 'strideMm', 'stepHeightMm', 'dutyFactor', 'flatnessPeakToPeakMm', 'speedVariation', 'worstTransmissionInStanceDeg', 'sizeMm'];

/** A leg problem's terms, resolved once (none is a constraint; the size box's target sides are in the problem). */
export type LegTerms = WeightedTerms;

export function createLegTerms(problem: LegProblem): LegTerms {
  const t = problem.targets;
  const specs = new Array<TermSpec | undefined>(LT_COUNT);
  specs[LT_FOOT_PATH] = t.footPath;
  specs[LT_STRIDE] = t.strideMm;
  specs[LT_STEP_HEIGHT] = t.stepHeightMm;
  specs[LT_DUTY] = t.minDutyFactor;
  specs[LT_FLATNESS] = t.maxFlatnessMm;
  specs[LT_SPEED] = t.maxSpeedVariation;
  specs[LT_TRANSMISSION] = t.minTransmissionDegInStance;
  specs[LT_SIZE] = t.sizeBoxMm;
  return createWeightedTerms(specs, { undefinedSlot: L_UNDEFINED, undefinedWhen: 'non-finite' });
}

const over = (v: number, limit: number) => (v > limit ? v - limit : Number.isNaN(v) ? Number.NaN : 0);

/** Fills terms.deviation from the figures, counts undefined ones into parts[L_UNDEFINED], and returns the value. */
export function scoreLeg(problem: LegProblem, terms: LegTerms, figures: Float64Array, parts: Float64Array): number {
  const dev = terms.deviation;
  const target = terms.target;
  dev[LT_FOOT_PATH] = figures[G_TRAJECTORY_RMS];
  dev[LT_STRIDE] = Math.abs(figures[G_STRIDE] - target[LT_STRIDE]);
  dev[LT_STEP_HEIGHT] = Math.abs(figures[G_STEP_HEIGHT] - target[LT_STEP_HEIGHT]);
  dev[LT_DUTY] = over(target[LT_DUTY], figures[G_DUTY]);
  dev[LT_FLATNESS] = over(figures[G_FLAT_PP], target[LT_FLATNESS]);
  dev[LT_SPEED] = over(figures[G_SPEED_VARIATION], target[LT_SPEED]);
  dev[LT_TRANSMISSION] = over(target[LT_TRANSMISSION], figures[G_WORST_TRANSMISSION_DEG]);
  const box = problem.targets.sizeBoxMm;
  dev[LT_SIZE] = box === undefined ? 0 : Math.hypot(Math.max(0, figures[G_WIDTH] - box.widthMm), Math.max(0, figures[G_HEIGHT] - box.heightMm));
  return sumWeightedTerms(terms, parts);
}
