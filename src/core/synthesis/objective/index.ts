/**
 * The function a search minimises, in parts with one job each: the design space
 * (designSpace.ts), the response of a design (pathResponse.ts, suspensionResponse.ts,
 * legResponse.ts), its score (score.ts, suspensionScore.ts, legScore.ts; the last two sum
 * their terms in weightedTerms.ts) and its report
 * (pathReport.ts, suspensionObjective.ts, legObjective.ts). createObjective builds them once per family or layout;
 * evaluate allocates nothing.
 */
import type { LayoutKind } from '../../suspension';
import { createEncoding, pathVariableNames } from './designSpace';
import { createPathObjective } from './pathObjective';
import { createSuspensionObjective, type SuspensionObjective } from './suspensionObjective';
import { createLegObjective, type LegObjective } from './legObjective';
import type { LegProblem } from '../legProblem';
import type { PoseFamilyId } from '../poseFamilies';
import type { FamilyId, Problem } from '../problem';
import type { SuspensionProblem } from '../suspensionProblem';
import type { Objective } from './types';

export type { CandidateReport, Objective, SearchObjectiveOf } from './types';
export type { PlainSuspensionReport, SuspensionCandidateReport, SuspensionObjective, SuspensionTermReport } from './suspensionObjective';
export { ALIGNMENT_ITERATIONS, ALIGNMENT_OFFSETS, FREE_REFINE_MAX_STEP_RAD, REFINE_ITERATIONS } from './pathResponse';
export { SUSPENSION_DEFECT_NAMES } from './suspensionResponse';
export { MISSED_TROUBLE_VIOLATION, UNSCORED_VALUE, plainSuspensionReport } from './suspensionObjective';
export { TERM_NAMES as SUSPENSION_TERM_NAMES } from './suspensionScore';
export { boxViolationInto } from './designSpace';
export type { LegCandidateReport, LegObjective, LegTermReport } from './legObjective';
export { LEG_DEFECT_NAMES } from './legObjective';
export { LEG_TERM_NAMES } from './legScore';
export type { GaitFiguresJson, TurnRangeDeg } from './legGait';
export { gaitFiguresJson } from './legGait';

/** A problem of any kind: a path (no `kind`, or 'path'), a rear suspension or a walking leg. */
export type SynthesisProblem = Problem | SuspensionProblem | LegProblem;

export function isSuspensionProblem(problem: SynthesisProblem): problem is SuspensionProblem {
  return (problem as { kind?: unknown }).kind === 'suspension';
}

export function isLegProblem(problem: SynthesisProblem): problem is LegProblem {
  return (problem as { kind?: unknown }).kind === 'leg';
}

/** The objective of one family (path) or layout (suspension) of a problem made by createProblem or createSuspensionProblem. */
export function createObjective(problem: SuspensionProblem, layout: LayoutKind): SuspensionObjective;
export function createObjective(problem: LegProblem, family: PoseFamilyId): LegObjective;
// The path overload last: ReturnType<typeof createObjective> is the path objective, as before.
export function createObjective(problem: Problem, family: FamilyId): Objective;
export function createObjective(problem: SynthesisProblem, family: FamilyId | LayoutKind): Objective | SuspensionObjective | LegObjective {
  if (isSuspensionProblem(problem)) return createSuspensionObjective(problem, family as LayoutKind);
  if (isLegProblem(problem)) return createLegObjective(problem, family as PoseFamilyId);
  return createPathObjective(problem, family as FamilyId);
}

/** The variable names of `family` on `problem`, in design-vector order. */
export function objectiveVariableNames(problem: Problem, family: FamilyId): string[] {
  return pathVariableNames(createEncoding(problem, family), problem);
}
