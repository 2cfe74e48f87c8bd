/**
 * Path synthesis: targets, error measures, timing, placement, family encodings,
 * constraints and the objective a search minimises; ranking and an archive of
 * distinct candidates.
 */
export type { FamilyId, Timing, Placement, Measure, Branch, Constraints, KeepOutCircle, BoundsOverrides, Problem, ProblemInput, ProblemIssue, ProblemResult } from './problem';
export { FAMILY_IDS, FAMILY_NAMES, createProblem, DEFAULT_MATCH_SAMPLES, MIN_MATCH_SAMPLES, MAX_MATCH_SAMPLES } from './problem';
export type { Target } from './target';
export { validateTarget, MIN_TARGET_POINTS, REPEATED_POINT_TOLERANCE_MM } from './target';
export type { ErrorSummary } from './measures';
export { MEASURES, errorSummary, measureValue } from './measures';
export type { CandidateReport, Objective, SearchObjectiveOf, PlainSuspensionReport, SuspensionCandidateReport, SuspensionObjective, SuspensionTermReport, SynthesisProblem } from './objective';
export type { SearchMap, SearchMapKind } from './searchMap';
export { createSearchMap, LOG_SCALE_RATE, SEARCH_MAP_KINDS, searchMapMisfit } from './searchMap';
export type { GaitFiguresJson, LegCandidateReport, LegObjective, LegTermReport, TurnRangeDeg } from './objective';
export { gaitFiguresJson, isLegProblem, LEG_DEFECT_NAMES, LEG_TERM_NAMES } from './objective';
export type { LegProblem, LegProblemInput, LegProblemResult, LegTargets, LegTerm } from './legProblem';
export { createLegProblem, DEFAULT_LEG_STEPS, LEG_FAMILY_IDS, LEG_FOOT_ID, LEG_STEPS_RANGE } from './legProblem';
export { createObjective, isSuspensionProblem, objectiveVariableNames, REFINE_ITERATIONS, FREE_REFINE_MAX_STEP_RAD, SUSPENSION_DEFECT_NAMES, SUSPENSION_TERM_NAMES, plainSuspensionReport } from './objective';
export type { BandMode, LayoutBodies, SuspensionKeepOut, SuspensionProblem, SuspensionProblemInput, SuspensionProblemIssue, SuspensionProblemResult, SuspensionTargets } from './suspensionProblem';
export { createSuspensionProblem, defaultLayoutBounds, layoutVariableNames, DEFAULT_TOLERANCES, DEFAULT_SUSPENSION_STEPS, SHOCK_ANGLE_VARIABLE } from './suspensionProblem';
export type { Ranked } from './ranking';
export { compareCandidates, compareRanks } from './ranking';
export type { ArchiveEntry } from './archive';
export { CandidateArchive, MAX_ARCHIVE_CAPACITY, mergeArchive } from './archive';
export type { CurveEvaluator } from './curve';
export { createMatchScratch, matchInOrder, orderViolation, refineDriverValue, DRIVER_STEP_TOLERANCE } from './timing';
export type { MatchScratch } from './timing';
export { DEFECT_NAMES } from './encoding';
export {
  FOUR_BAR_LENGTH_VARIABLES,
  FOUR_BAR_OUT_LENGTH,
  fourBarCouplerPointInto,
  fourBarJointsInto,
} from './fourBarClosedForm';
