/**
 * A finished suspension search as the project keeps it: the problem it ran (bicycle,
 * layouts, targets), its seed and budget, and every layout's best designs ranked
 * feasibility first, each with the figures the engine's report gave (suspensionCurves,
 * the analysis `loci analyze` runs). Compact: the curves are not kept; the compare view
 * takes them again from the same analysis of the design's pivots.
 */
import type { Vec2 } from '../../../core/geometry';
import type { LayoutKind } from '../../../core/suspension';
import type { PlainSuspensionReport, SuspensionCandidateReport, SuspensionProblemInput } from '../../../core/synthesis';
import type { RunningSearchOf, SearchRunOf } from '../../search/types';

/** The figures of a design the table shows, per cog where a figure depends on the gear. */
export interface CandidateFigures {
  readonly totalTravelMm: number;
  readonly leverageRatioStart: number;
  readonly leverageRatioEnd: number;
  readonly progressionPct: number;
  readonly cogTeeth: readonly number[];
  /** At the sag point, solved there. */
  readonly sagAntiSquatPct: readonly number[];
  readonly sagAntiRisePct: number;
  /** At full travel (the last sample of the sweep). */
  readonly endRearwardMm: number;
  readonly endKickbackDeg: readonly number[];
  readonly endChainGrowthMm: readonly number[];
}

export interface SearchCandidate {
  /** 1 for the best of the run (feasibility first). */
  readonly rank: number;
  readonly family: LayoutKind;
  readonly x: readonly number[];
  /** Every pivot at full extension, the shock's frame eye included, mm. */
  readonly pivots: Readonly<Record<string, Vec2>>;
  readonly value: number;
  readonly violation: number;
  readonly feasible: boolean;
  readonly defects: readonly string[];
  /** Null when the full analysis refuses the design (`failure` says why). */
  readonly figures: CandidateFigures | null;
  readonly failure: string | null;
}

/** A finished suspension search as the project keeps it. */
export type SearchRun = SearchRunOf<SuspensionProblemInput, SearchCandidate>;

/** A search running now, as the project keeps it until the search ends (resumed after a reload). */
export type RunningSearch = RunningSearchOf<SuspensionProblemInput>;

/** The latest run, and the one before it (kept, labelled, when a new search ends). */
export interface SearchRecord {
  readonly current: SearchRun;
  readonly previous: SearchRun | null;
}

/** The table's figures from the engine's report of a design. */
export function figuresOf(s: PlainSuspensionReport): CandidateFigures {
  const last = s.curves.steps - 1;
  return {
    totalTravelMm: s.totalTravelMm,
    leverageRatioStart: s.leverageRatioStart,
    leverageRatioEnd: s.leverageRatioEnd,
    progressionPct: s.progressionPct,
    cogTeeth: [...s.cogTeeth],
    sagAntiSquatPct: [...s.sagPoint.antiSquatPct],
    sagAntiRisePct: s.sagPoint.antiRisePct,
    endRearwardMm: s.curves.rearwardMm[last],
    endKickbackDeg: s.curves.kickbackDeg.map((a) => a[last]),
    endChainGrowthMm: s.curves.chainGrowthMm.map((a) => a[last]),
  };
}

export function candidateOf(rank: number, report: SuspensionCandidateReport): SearchCandidate {
  return {
    rank,
    family: report.family,
    x: [...report.x],
    pivots: Object.fromEntries(Object.entries(report.pivots).map(([name, p]) => [name, { x: p.x, y: p.y }])),
    value: report.value,
    violation: report.violation,
    feasible: report.feasible,
    defects: [...report.defects],
    figures: report.suspension === null ? null : figuresOf(report.suspension),
    failure: report.suspension === null ? (report.suspensionFailure ?? 'the analysis refused the design') : null,
  };
}

/** The record after a run ends: the new run is current, the one it replaces is kept as the previous run. */
export function recordAfter(record: SearchRecord | undefined, run: SearchRun): SearchRecord {
  return { current: run, previous: record?.current ?? null };
}

/**
 * Pivot span: the largest distance between two pivots of the design (the shock's frame
 * eye included, the rear axle not), mm; how much of the frame the linkage occupies.
 */
export function pivotSpanMm(pivots: Readonly<Record<string, Vec2>>): number {
  const points = Object.values(pivots);
  let span = 0;
  for (let i = 0; i < points.length; i++) {
    for (let j = i + 1; j < points.length; j++) span = Math.max(span, Math.hypot(points[i].x - points[j].x, points[i].y - points[j].y));
  }
  return span;
}

/** The best (first ranked) design of each layout, in rank order. */
export function bestOfEachLayout(candidates: readonly SearchCandidate[]): SearchCandidate[] {
  const seen = new Set<LayoutKind>();
  const best: SearchCandidate[] = [];
  for (const c of candidates) {
    if (seen.has(c.family)) continue;
    seen.add(c.family);
    best.push(c);
  }
  return best;
}
