/**
 * The rear-suspension and walking-leg jobs of the queue: the run input, the start checks
 * and the designs kept are those of the workspace's own search (its SearchKind in
 * src/app/suspension/search/controller.ts and src/app/leg/search/controller.ts), read
 * with the job's families (layouts), seed and budget in place of the workspace's.
 */
import { GAIT_CAUTION } from '../../core/gait';
import { LAYOUT_NAMES, SUSPENSION_CAUTION, type LayoutKind } from '../../core/suspension';
import type { SuspensionProblemInput } from '../../core/synthesis';
import type { LegProblemInput } from '../../core/synthesis/legProblem';
import type { PoseFamilyId } from '../../core/synthesis/poseFamilies';
import type { RankedCandidate, RunInput } from '../../engine';
import { LEG_SEARCH } from '../leg/search/controller';
import { familyName } from '../results/format';
import type { RankedDesign, RunningSearchOf, SearchRunOf, SearchSettings } from '../search/types';
import { SUSPENSION_SEARCH } from '../suspension/search/controller';
import type { AppJobSpec, JobKind, WorkspaceJobProblem, WorkspaceJobSpec } from './jobs';

/** The seed and budget of a workspace job: the job's fields are their one source. */
export function workspaceJobSettings(spec: Pick<WorkspaceJobSpec, 'seed' | 'evaluations' | 'seconds'>): SearchSettings {
  return { seed: spec.seed, budget: { evaluations: spec.evaluations ?? null, seconds: spec.seconds ?? null } };
}

/** The families (layouts) a workspace problem searches when the job names none. */
export function problemFamilies(problem: WorkspaceJobProblem): readonly string[] {
  return problem.kind === 'suspension' ? problem.input.layouts : problem.input.families;
}

/** The families (layouts) a job searches. */
export function specFamilies(spec: AppJobSpec): readonly string[] {
  if (spec.families !== undefined) return spec.families;
  const p = spec.problem;
  return p.kind === 'suspension' || p.kind === 'leg' ? problemFamilies(p) : p.settings.families;
}

/** The problem as the job runs it: the workspace's, with the job's families (layouts). */
export function jobInput(spec: WorkspaceJobSpec): SuspensionProblemInput | LegProblemInput {
  const p = spec.problem;
  const families = spec.families ?? problemFamilies(p);
  return p.kind === 'suspension'
    ? { ...p.input, layouts: families as readonly LayoutKind[] }
    : { ...p.input, families: families as readonly PoseFamilyId[] };
}

/** What the workspace's own search would refuse of this job, in its words; empty when it can run. */
export function workspaceStartIssues(spec: WorkspaceJobSpec, workers: number): string[] {
  const settings = workspaceJobSettings(spec);
  return spec.problem.kind === 'suspension'
    ? SUSPENSION_SEARCH.startIssues(jobInput(spec) as SuspensionProblemInput, settings, workers)
    : LEG_SEARCH.startIssues(jobInput(spec) as LegProblemInput, settings, workers);
}

export function workspaceRunInput(spec: WorkspaceJobSpec, workers: number): RunInput {
  const settings = workspaceJobSettings(spec);
  return spec.problem.kind === 'suspension'
    ? SUSPENSION_SEARCH.runInput(jobInput(spec) as SuspensionProblemInput, settings, workers)
    : LEG_SEARCH.runInput(jobInput(spec) as LegProblemInput, settings, workers);
}

/** How many designs the run keeps, as the workspace's own search keeps them. */
export function workspaceRunKeep(kind: 'suspension' | 'leg'): { topK: number; perJob: number } {
  const k = kind === 'suspension' ? SUSPENSION_SEARCH : LEG_SEARCH;
  return { topK: k.topK, perJob: k.perJob };
}

/** A workspace job's finished run as its workspace keeps a run of its own (SearchRunOf). */
export type WorkspaceJobRun = SearchRunOf<SuspensionProblemInput | LegProblemInput, RankedDesign & { readonly feasible: boolean }>;

/** The job's designs as the workspace keeps a finished run. */
export function workspaceJobRun(spec: WorkspaceJobSpec, runId: string, startedAt: string, finishedAt: string, ranked: readonly RankedCandidate[], evaluations: number, stopReason: WorkspaceJobRun['stopReason']): WorkspaceJobRun {
  const settings = workspaceJobSettings(spec);
  const problem = jobInput(spec);
  const base = { runId, startedAt, settings };
  const candidates = spec.problem.kind === 'suspension'
    ? SUSPENSION_SEARCH.candidatesOf({ ...base, problem: problem as SuspensionProblemInput } satisfies RunningSearchOf<SuspensionProblemInput>, ranked)
    : LEG_SEARCH.candidatesOf({ ...base, problem: problem as LegProblemInput } satisfies RunningSearchOf<LegProblemInput>, ranked);
  return { id: runId, finishedAt, problem, seed: settings.seed, budget: settings.budget, evaluations, stopReason, candidates };
}

/** A family's (layout's) name as the job's workspace writes it. */
export function jobFamilyName(kind: JobKind, family: string): string {
  return kind === 'suspension' ? (LAYOUT_NAMES as Readonly<Record<string, string>>)[family] ?? family : familyName(family);
}

/** The caution every view and export of a job of this kind carries; null for path jobs. */
export function jobCaution(kind: JobKind): string | null {
  return kind === 'suspension' ? SUSPENSION_CAUTION : kind === 'leg' ? GAIT_CAUTION : null;
}

export const KIND_WORDS: Readonly<Record<JobKind, string>> = { path: 'path', suspension: 'rear suspension', leg: 'walking leg' };
