/**
 * The objective of a leg problem on one family: design space (the family's pose
 * variables, as for a path problem) → response (the foot over one crank turn, sampled,
 * with the encoding's violations) → score (weighted, normalised gait terms; feasibility
 * first) → report: the design as a linkage in its reference pose, and gaitFigures of it
 * with the problem's leg over the same turn, exactly as `loci analyze` gives them of the
 * exported leg file.
 */
import type { Linkage } from '../../linkage';
import { GAIT_CAUTION, gaitFigures, type LegSpec } from '../../gait';
import { DEFECT_NAMES } from '../encoding';
import { LEG_FOOT_ID, type LegProblem } from '../legProblem';
import type { PoseFamilyId } from '../poseFamilies';
import { FAMILY_NAMES } from '../problem';
import { gaitFiguresJson, type GaitFiguresJson } from './legGait';
import {
  G_DUTY,
  G_FLAT_PP,
  G_HEIGHT,
  G_SPEED_VARIATION,
  G_STANCE_SAMPLES,
  G_STEP_HEIGHT,
  G_STRIDE,
  G_TRAJECTORY_RMS,
  G_WIDTH,
  G_WORST_TRANSMISSION_DEG,
  L_SLOTS,
  L_UNDEFINED,
  createLegResponse,
} from './legResponse';
import { LEG_TERM_FIGURES, LEG_TERM_NAMES, LEG_TERM_UNITS, createLegTerms, scoreLeg } from './legScore';
import { objectiveSpace, variableRecord } from './designSpace';
import { violatedSlotNames } from './score';
import { reportTerms } from './weightedTerms';
import type { SearchObjectiveOf } from './types';

/** Violation added when gaitFigures refuses a design the search's samples passed (a dead centre or lock between them). */
export const MISSED_GAIT_VIOLATION = 1e-3;

/** Each violation slot in words: the encoding's (V_*), then L_GROUND, L_DIRECTION, L_UNDEFINED. */
export const LEG_DEFECT_NAMES: readonly string[] = [
  ...DEFECT_NAMES,
  'the foot\'s lowest point is not within the stance tolerance of the ground line (it never stands, or it digs in)',
  'in stance the foot moves forward relative to the body: the leg walks the other way',
  'a scored gait figure is not a number',
];

export interface LegTermReport {
  readonly name: string;
  /** Which of `searchFigures` the term reads. */
  readonly figure: string;
  /** Distance from the target, in `unit` (0 within a limit). */
  readonly deviation: number;
  readonly unit: string;
  readonly tolerance: number;
  readonly weight: number;
  /** weight × (deviation / tolerance)², what it adds to the value. */
  readonly contribution: number;
}

export interface LegCandidateReport {
  readonly kind: 'leg';
  readonly family: PoseFamilyId;
  readonly familyName: string;
  readonly x: number[];
  readonly variables: Record<string, number>;
  readonly value: number;
  readonly violation: number;
  readonly feasible: boolean;
  readonly defects: string[];
  readonly terms: LegTermReport[];
  /** The figures the search scored, on the problem's `steps` samples (stance ends and extremes at samples). */
  readonly searchFigures: Record<string, number>;
  /** The design drawn in its reference pose (crank angle 0 of the turn). */
  readonly linkage: Linkage;
  /** The leg the leg file carries with `linkage`. */
  readonly leg: LegSpec;
  /** gaitFigures of `linkage` and `leg` (default steps), as `loci analyze` prints them of the leg file; null with the reason when it refuses the design. */
  readonly gait: GaitFiguresJson | null;
  readonly gaitFailure?: string;
  readonly caution: string;
}

export type LegObjective = SearchObjectiveOf<PoseFamilyId, LegCandidateReport>;

export function createLegObjective(problem: LegProblem, family: PoseFamilyId): LegObjective {
  const response = createLegResponse(problem, family);
  const { space, parts, figures } = response;
  const terms = createLegTerms(problem);

  function evaluate(x: Float64Array, out: Float64Array): void {
    const violation = response.respond(x);
    const value = scoreLeg(problem, terms, figures, parts);
    out[0] = value;
    // scoreLeg may add an undefined figure to the slots.
    out[1] = violation + parts[L_UNDEFINED];
  }

  function legSpecFor(): LegSpec {
    const path = problem.targets.footPath;
    return { ...problem.leg, foot: LEG_FOOT_ID, ...(path === undefined ? {} : { footPath: path.points.map((p) => ({ x: p.x, y: p.y })) }) };
  }

  function describe(xIn: Float64Array): LegCandidateReport {
    const x = Float64Array.from(xIn);
    const out = new Float64Array(2);
    evaluate(x, out);
    const defects = violatedSlotNames(parts, L_SLOTS, LEG_DEFECT_NAMES);
    const termReports = reportTerms(terms, (i, deviation, contribution): LegTermReport => ({
      name: LEG_TERM_NAMES[i],
      figure: LEG_TERM_FIGURES[i],
      deviation,
      unit: LEG_TERM_UNITS[i],
      tolerance: terms.tolerance[i],
      weight: terms.weight[i],
      contribution,
    }));
    const searchFigures: Record<string, number> = {
      trajectoryRmsMm: figures[G_TRAJECTORY_RMS],
      strideMm: figures[G_STRIDE],
      stepHeightMm: figures[G_STEP_HEIGHT],
      dutyFactor: figures[G_DUTY],
      flatnessPeakToPeakMm: figures[G_FLAT_PP],
      speedVariation: figures[G_SPEED_VARIATION],
      worstTransmissionInStanceDeg: figures[G_WORST_TRANSMISSION_DEG],
      sizeMm: Math.max(figures[G_WIDTH], figures[G_HEIGHT]),
      widthMm: figures[G_WIDTH],
      heightMm: figures[G_HEIGHT],
      stanceSamples: figures[G_STANCE_SAMPLES],
    };
    // Drawn at crank angle 0: the turn gaitFigures takes from the linkage's reference pose is the search's.
    const { linkage } = space.encoding.report(0, 1, 0, 0, 0);
    const leg = legSpecFor();
    const analysed = gaitFigures(linkage, leg);
    let violation = out[1];
    if (!analysed.ok && violation <= 0) {
      defects.push(`the full gait analysis refuses it: ${analysed.reason}`);
      violation += MISSED_GAIT_VIOLATION;
    }
    return {
      kind: 'leg',
      family,
      familyName: FAMILY_NAMES[family],
      x: Array.from(x),
      variables: variableRecord(space.names, x),
      value: out[0],
      violation,
      feasible: violation <= 0,
      defects,
      terms: termReports,
      searchFigures,
      linkage,
      leg,
      gait: analysed.ok ? gaitFiguresJson(analysed.figures) : null,
      ...(analysed.ok ? {} : { gaitFailure: analysed.reason }),
      caution: GAIT_CAUTION,
    };
  }

  return { family, ...objectiveSpace(space), evaluate, describe };
}
