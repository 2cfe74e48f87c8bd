/**
 * Whether a leg meets each target the problem set, beside the figure the table shows.
 * "Feasible" is about constraints; a design can be feasible and still miss a weighted
 * target, so each targeted cell says met or missed and what was wanted. A value target
 * (stride, step height) is met within its tolerance; a limit (minimum duty factor, maximum
 * flatness, …) is met on its side of the limit, its tolerance being only the search's
 * penalty scale; the trajectory is met when its RMS is within its tolerance; the size box
 * side by side (width, height).
 */
import { createLegProblem, type LegProblem, type LegProblemInput } from '../../../core/synthesis/legProblem';
import { figure } from '../../suspension/labels';
import type { LegCandidate } from './results';

export interface TargetMark {
  readonly met: boolean;
  /** What the target asks, in the figure's unit: "≥ 0.4", "60 ± 2 mm". */
  readonly wanted: string;
}

/** The table's column keys a target can mark. */
export type MarkedColumn = 'trajectoryRmsMm' | 'strideMm' | 'stepHeightMm' | 'dutyFactor' | 'flatnessPeakToPeakMm' | 'speedVariation' | 'worstTransmissionInStanceDeg' | 'widthMm' | 'heightMm';

export type TargetMarks = Partial<Record<MarkedColumn, TargetMark>>;

type Judge = (c: LegCandidate) => TargetMark;

/** The judges of one problem's targets, by column; a problem that no longer reads has none. */
export function targetJudges(input: LegProblemInput): Partial<Record<MarkedColumn, Judge>> {
  const made = createLegProblem(input);
  return made.ok ? judgesOf(made.problem) : {};
}

/** Every target's mark on one candidate (none where the gait analysis refused it: nothing was judged). */
export function targetMarksOf(judges: Partial<Record<MarkedColumn, Judge>>, c: LegCandidate): TargetMarks {
  const marks: TargetMarks = {};
  if (c.figures === null) return marks;
  for (const key of Object.keys(judges) as MarkedColumn[]) {
    const judge = judges[key];
    if (judge !== undefined) marks[key] = judge(c);
  }
  return marks;
}

/** Met, of the targets marked. */
export function metCount(marks: TargetMarks): { met: number; of: number } {
  const all = Object.values(marks);
  return { met: all.filter((m) => m.met).length, of: all.length };
}

function judgesOf(problem: LegProblem): Partial<Record<MarkedColumn, Judge>> {
  const t = problem.targets;
  const judges: Partial<Record<MarkedColumn, Judge>> = {};
  const mm = (v: number) => `${figure(v)} mm`;
  if (t.footPath !== undefined) {
    const tol = t.footPath.tolerance;
    judges.trajectoryRmsMm = (c) => ({ met: c.trajectoryRmsMm !== null && c.trajectoryRmsMm <= tol, wanted: `≤ ${mm(tol)}` });
  }
  if (t.strideMm !== undefined) {
    const { value, tolerance } = t.strideMm;
    judges.strideMm = (c) => ({ met: within(c.figures?.strideMm, value, tolerance), wanted: `${figure(value)} ± ${mm(tolerance)}` });
  }
  if (t.stepHeightMm !== undefined) {
    const { value, tolerance } = t.stepHeightMm;
    judges.stepHeightMm = (c) => ({ met: within(c.figures?.stepHeightMm, value, tolerance), wanted: `${figure(value)} ± ${mm(tolerance)}` });
  }
  if (t.minDutyFactor !== undefined) {
    const min = t.minDutyFactor.value;
    judges.dutyFactor = (c) => ({ met: atLeast(c.figures?.dutyFactor, min), wanted: `≥ ${figure(min)}` });
  }
  if (t.maxFlatnessMm !== undefined) {
    const max = t.maxFlatnessMm.value;
    judges.flatnessPeakToPeakMm = (c) => ({ met: atMost(c.figures?.flatnessPeakToPeakMm, max), wanted: `≤ ${mm(max)}` });
  }
  if (t.maxSpeedVariation !== undefined) {
    const max = t.maxSpeedVariation.value;
    judges.speedVariation = (c) => ({ met: atMost(c.figures?.speedVariation, max), wanted: `≤ ${figure(max)}` });
  }
  if (t.minTransmissionDegInStance !== undefined) {
    const min = t.minTransmissionDegInStance.value;
    judges.worstTransmissionInStanceDeg = (c) => ({ met: atLeast(c.figures?.worstTransmissionInStanceDeg, min), wanted: `≥ ${figure(min)}°` });
  }
  if (t.sizeBoxMm !== undefined) {
    const { widthMm, heightMm } = t.sizeBoxMm;
    judges.widthMm = (c) => ({ met: atMost(c.figures?.widthMm, widthMm), wanted: `≤ ${mm(widthMm)}` });
    judges.heightMm = (c) => ({ met: atMost(c.figures?.heightMm, heightMm), wanted: `≤ ${mm(heightMm)}` });
  }
  return judges;
}

// A figure the design does not have (no stance: no stride, flatness or stance speed) misses its target.
const within = (v: number | null | undefined, value: number, tolerance: number) => typeof v === 'number' && Math.abs(v - value) <= tolerance;
const atLeast = (v: number | null | undefined, min: number) => typeof v === 'number' && v >= min;
const atMost = (v: number | null | undefined, max: number) => typeof v === 'number' && v <= max;
