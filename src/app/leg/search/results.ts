/**
 * A finished leg search as the project keeps it: the problem it ran, its seed and budget,
 * and every family's best designs ranked feasibility first, each with its leg file (the
 * design in its reference pose and the problem's leg) and the gait figures the engine's
 * report gave: gaitFigures of that leg file, as `loci analyze` prints them.
 */
import type { GaitFiguresJson } from '../../../core/synthesis/objective/legGait';
import type { LegCandidateReport } from '../../../core/synthesis';
import type { LegProblemInput } from '../../../core/synthesis/legProblem';
import type { PoseFamilyId } from '../../../core/synthesis/poseFamilies';
import { toLegFile, type LegFileV1 } from '../../../core/io/legFile';
import { MAX_NAME_LENGTH } from '../../../core/io/linkageFile';
import type { RunningSearchOf, SearchRunOf } from '../../search/types';

/** The figures the table shows of a design, from its gait figures (null where the leg has no stance). */
export interface LegRowFigures {
  readonly strideMm: number | null;
  readonly stepHeightMm: number;
  readonly dutyFactor: number;
  /** The stance tolerance the duty factor is taken at, mm. */
  readonly dutyToleranceMm: number;
  readonly flatnessPeakToPeakMm: number | null;
  readonly speedVariation: number | null;
  readonly worstTransmissionInStanceDeg: number | null;
  readonly widthMm: number;
  readonly heightMm: number;
}

export interface LegCandidate {
  /** 1 for the best of the run (feasibility first). */
  readonly rank: number;
  readonly family: PoseFamilyId;
  readonly value: number;
  readonly violation: number;
  readonly feasible: boolean;
  readonly defects: readonly string[];
  /** RMS distance of the wanted foot trajectory's points from the foot's path, mm (the search's samples); null without that target. */
  readonly trajectoryRmsMm: number | null;
  /** Null when the full gait analysis refuses the design (`failure` says why). */
  readonly figures: LegRowFigures | null;
  readonly failure: string | null;
  readonly legFile: LegFileV1;
}

/** A finished leg search as the project keeps it. */
export type LegSearchRun = SearchRunOf<LegProblemInput, LegCandidate>;

/** A leg search running now, as the project keeps it until the search ends (resumed after a reload). */
export type RunningLegSearch = RunningSearchOf<LegProblemInput>;

export function rowFiguresOf(g: GaitFiguresJson): LegRowFigures {
  return {
    strideMm: g.strideMm,
    stepHeightMm: g.stepHeightMm,
    dutyFactor: g.dutyFactor.value,
    dutyToleranceMm: g.dutyFactor.toleranceMm,
    flatnessPeakToPeakMm: g.stanceFlatness?.peakToPeakMm ?? null,
    speedVariation: g.stanceSpeed?.variation ?? null,
    worstTransmissionInStanceDeg: g.transmissionInStance.worstDeg,
    widthMm: g.size.widthMm,
    heightMm: g.size.heightMm,
  };
}

/** The leg file's name: the problem, family and rank, held to the length its reader takes. */
export function legFileName(problemName: string, family: string, rank: number): string {
  return `${problemName}: ${family} #${rank}`.slice(0, MAX_NAME_LENGTH);
}

export function candidateOf(rank: number, problemName: string, report: LegCandidateReport, withTrajectory: boolean): LegCandidate {
  return {
    rank,
    family: report.family,
    value: report.value,
    violation: report.violation,
    feasible: report.feasible,
    defects: [...report.defects],
    trajectoryRmsMm: withTrajectory ? (report.searchFigures.trajectoryRmsMm ?? null) : null,
    figures: report.gait === null ? null : rowFiguresOf(report.gait),
    failure: report.gait === null ? (report.gaitFailure ?? 'the gait analysis refused the design') : null,
    legFile: toLegFile({ name: legFileName(problemName, report.family, rank), linkage: report.linkage, leg: report.leg }),
  };
}

/** The best (first ranked) design of each family, in rank order. */
export function bestOfEachFamily(candidates: readonly LegCandidate[]): LegCandidate[] {
  const seen = new Set<PoseFamilyId>();
  return [...candidates].sort((a, b) => a.rank - b.rank).filter((c) => !seen.has(c.family) && (seen.add(c.family), true));
}
