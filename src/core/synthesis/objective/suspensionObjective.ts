/**
 * The objective of a suspension problem on one layout: design space (the pivots at full
 * extension and the shock's direction, boxed by the problem's regions) → response (the
 * curves over the stroke, feasibility slots) → score (weighted, normalised terms; bands
 * as constraints or penalties) → report (the linkage and suspensionCurves' figures).
 */
import type { Linkage } from '../../linkage';
import { buildLayout, LAYOUT_NAMES, SUSPENSION_CAUTION, suspensionCurves, type LayoutKind, type SuspensionReport } from '../../suspension';
import type { SuspensionCurves } from '../../suspension/curves';
import { createSearchMap } from '../searchMap';
import { layoutVariableNames, type SuspensionProblem } from '../suspensionProblem';
import { boxViolationInto, objectiveSpace, variableRecord } from './designSpace';
import { sumViolationsInto, violatedSlotNames } from './score';
import { S_BOUNDS, S_SLOTS, SUSPENSION_DEFECT_NAMES, createSuspensionResponse } from './suspensionResponse';
import { TERM_NAMES, TERM_UNITS, T_LEVERAGE, createSuspensionTerms, scoreSuspension } from './suspensionScore';
import { reportTerms } from './weightedTerms';
import type { SearchObjectiveOf } from './types';

/** The value of a design whose curves cannot be scored (it locks at once, or a figure is undefined): after every scored design of the same violation. */
export const UNSCORED_VALUE = 1e12;
/** Violation added when the full analysis (suspensionCurves) refuses a design the search's checks passed: a dead centre between samples. */
export const MISSED_TROUBLE_VIOLATION = 1e-3;

export interface SuspensionTermReport {
  readonly name: string;
  /** Distance from the target, in `unit` (0 inside a band or under a limit). */
  readonly deviation: number;
  readonly unit: string;
  readonly tolerance: number;
  readonly weight: number;
  readonly as: 'target' | 'penalty' | 'constraint';
  /** What it adds to the value (target, penalty) or to the violation (constraint). */
  readonly contribution: number;
}

export interface SuspensionCandidateReport {
  readonly kind: 'suspension';
  readonly family: LayoutKind;
  readonly layoutName: string;
  readonly x: number[];
  readonly variables: Record<string, number>;
  readonly value: number;
  readonly violation: number;
  readonly feasible: boolean;
  readonly defects: string[];
  readonly terms: SuspensionTermReport[];
  /** Every pivot at full extension, the shock's frame eye included, mm. */
  readonly pivots: Record<string, { x: number; y: number }>;
  /** The design as a linkage drawn at full extension, on the problem's bicycle. */
  readonly linkage: Linkage;
  /**
   * suspensionCurves of `linkage` on the bicycle with the problem's steps, its curves as
   * plain arrays (a report crosses worker boundaries and goes into files); null with the
   * reason when it refuses the design.
   */
  readonly suspension: PlainSuspensionReport | null;
  readonly suspensionFailure?: string;
  readonly caution: string;
}

type Plain<T> = T extends Float64Array | Uint8Array ? number[] : T extends readonly (infer E)[] ? Plain<E>[] : T extends object ? { readonly [K in keyof T]: Plain<T[K]> } : T;

/** A SuspensionReport with every typed array as a plain array of the same numbers. */
export type PlainSuspensionReport = Omit<SuspensionReport, 'curves'> & { readonly curves: Plain<SuspensionCurves> };

/** The report with its curves as plain arrays: the same numbers, structured-clone and JSON safe. */
export function plainSuspensionReport(report: SuspensionReport): PlainSuspensionReport {
  const c = report.curves;
  const a = (v: Float64Array | Uint8Array) => Array.from(v);
  return {
    ...report,
    curves: {
      steps: c.steps,
      shockLengthMm: a(c.shockLengthMm),
      shockTravelMm: a(c.shockTravelMm),
      travelMm: a(c.travelMm),
      axleXMm: a(c.axleXMm),
      axleYMm: a(c.axleYMm),
      rearwardMm: a(c.rearwardMm),
      leverageRatio: a(c.leverageRatio),
      springForceN: c.springForceN === null ? null : a(c.springForceN),
      wheelRateNPerMm: c.wheelRateNPerMm === null ? null : a(c.wheelRateNPerMm),
      cogTeeth: [...c.cogTeeth],
      antiSquatPct: c.antiSquatPct.map(a),
      chainGrowthMm: c.chainGrowthMm.map(a),
      chainGrowthTurningCogMm: c.chainGrowthTurningCogMm.map(a),
      kickbackDeg: c.kickbackDeg.map(a),
      antiRisePct: a(c.antiRisePct),
      antiRiseFloatingPct: c.antiRiseFloatingPct === null ? null : a(c.antiRiseFloatingPct),
      icPath: { kind: a(c.icPath.kind), xMm: a(c.icPath.xMm), yMm: a(c.icPath.yMm) },
    },
  };
}

export type SuspensionObjective = SearchObjectiveOf<LayoutKind, SuspensionCandidateReport>;

export function createSuspensionObjective(problem: SuspensionProblem, kind: LayoutKind): SuspensionObjective {
  const names = layoutVariableNames(kind);
  const dim = names.length;
  const lower = new Float64Array(dim);
  const upper = new Float64Array(dim);
  const boxes = problem.bounds[kind] ?? {};
  names.forEach((name, j) => {
    const box = boxes[name];
    // createSuspensionProblem gives every listed layout every box.
    if (box === undefined) throw new Error(`suspension objective: no box for ${kind}.${name}; was the problem made by createSuspensionProblem with this layout?`);
    lower[j] = box[0];
    upper[j] = box[1];
  });
  const searchMap = createSearchMap('affine', { family: kind, placement: 'fixed', freeDrivers: 0, lower, upper });
  const response = createSuspensionResponse(problem, kind, names);
  const terms = createSuspensionTerms(problem, response.cogTeeth);
  const parts = response.parts;

  /** Value and violation of x into out; leaves the response and terms describing x. */
  function evaluate(x: Float64Array, out: Float64Array): void {
    response.respond(x);
    boxViolationInto(x, lower, upper, dim, parts, S_BOUNDS);
    let value = response.reached >= 2 ? scoreSuspension(problem, terms, response.curves, response.reached, parts) : UNSCORED_VALUE;
    if (!(value < Infinity)) value = UNSCORED_VALUE;
    out[0] = value;
    sumViolationsInto(parts, S_SLOTS, out, 1);
  }

  function describe(xIn: Float64Array): SuspensionCandidateReport {
    const x = Float64Array.from(xIn);
    const out = new Float64Array(2);
    evaluate(x, out);
    const defects = violatedSlotNames(parts, S_SLOTS, SUSPENSION_DEFECT_NAMES);
    const termReports = reportTerms(terms, (i, deviation, contribution): SuspensionTermReport => ({
      name: TERM_NAMES[i],
      deviation,
      unit: TERM_UNITS[i],
      tolerance: terms.tolerance[i],
      weight: terms.weight[i],
      // The curve terms (axle path, leverage ratio) are targets; the bands and limits penalties or constraints.
      as: terms.constraint[i] === 1 ? 'constraint' : i <= T_LEVERAGE ? 'target' : 'penalty',
      contribution,
    }));
    const pivots = response.pivotsOf(x);
    const linkage = buildLayout(kind, pivots, problem.bicycle.rearAxleMm, response.axleBody, response.shock);
    const analysed = suspensionCurves(linkage, problem.bicycleInput, { steps: problem.steps });
    let violation = out[1];
    if (!analysed.ok && violation <= 0) {
      // The full analysis finds what the search's samples passed over (a dead centre between them): say so, and count it.
      defects.push(`the full analysis refuses it: ${analysed.reason}`);
      violation += MISSED_TROUBLE_VIOLATION;
    }
    return {
      kind: 'suspension',
      family: kind,
      layoutName: LAYOUT_NAMES[kind],
      x: Array.from(x),
      variables: variableRecord(names, x),
      value: out[0],
      violation,
      feasible: violation <= 0,
      defects,
      terms: termReports,
      pivots,
      linkage,
      suspension: analysed.ok ? plainSuspensionReport(analysed.report) : null,
      ...(analysed.ok ? {} : { suspensionFailure: analysed.reason }),
      caution: SUSPENSION_CAUTION,
    };
  }

  return { family: kind, ...objectiveSpace({ names, dim, lower, upper, searchMap }), evaluate, describe };
}
