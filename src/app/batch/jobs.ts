/**
 * A queued job in the app: the queue file's job (src/core/io/batchQueue.ts) whose problem
 * is a workspace's problem as it was when the job was added, so later edits in the
 * workspace never change a job waiting overnight. Three kinds: the path workspace's
 * target and settings, the rear-suspension workspace's problem (its layouts are the job's
 * families) and the walking-leg workspace's problem (its families). The kind is stored
 * with the job; a job stored before there were kinds has none and is a path job.
 */
import type { QueuedJobSpec, QueueEntry, QueueState } from '../../engine/queue';
import type { SuspensionProblemInput } from '../../core/synthesis';
import type { LegProblemInput } from '../../core/synthesis/legProblem';
import type { FamilyId } from '../state/families';
import { DEFAULT_CHECKPOINT_EVERY_S } from '../state/settings';
import { IDLE_RUN, PROJECT_FORMAT, PROJECT_VERSION, type Project, type SearchSettings, type TargetState } from '../state/project';

export type JobKind = 'path' | 'suspension' | 'leg';
export const JOB_KINDS: readonly JobKind[] = ['path', 'suspension', 'leg'];

export interface PathJobProblem {
  /** Absent in queues stored before jobs had kinds. */
  readonly kind?: 'path';
  /** The project's name when the job was added. */
  readonly projectName: string;
  readonly target: TargetState;
  /** The checkpoint interval is absent in jobs stored before it was a setting. */
  readonly settings: StoredSettings;
}

type StoredSettings = Omit<SearchSettings, 'checkpointEverySeconds'> & { readonly checkpointEverySeconds?: number };

export interface SuspensionJobProblem {
  readonly kind: 'suspension';
  readonly projectName: string;
  /** The problem as its file holds it; its layouts are replaced by the job's families when it runs. */
  readonly input: SuspensionProblemInput;
}

export interface LegJobProblem {
  readonly kind: 'leg';
  readonly projectName: string;
  /** The problem as its file holds it; its families are replaced by the job's when it runs. */
  readonly input: LegProblemInput;
}

export type JobProblem = PathJobProblem | SuspensionJobProblem | LegJobProblem;
export type WorkspaceJobProblem = SuspensionJobProblem | LegJobProblem;

export type AppJobSpec = QueuedJobSpec<JobProblem>;
export type PathJobSpec = QueuedJobSpec<PathJobProblem>;
export type WorkspaceJobSpec = QueuedJobSpec<WorkspaceJobProblem>;
export type AppQueueEntry = QueueEntry<JobProblem>;
export type AppQueueState = QueueState<JobProblem>;

export function jobKind(problem: JobProblem): JobKind {
  return problem.kind ?? 'path';
}

export function isPathJob(spec: AppJobSpec): spec is PathJobSpec {
  return jobKind(spec.problem) === 'path';
}

function isObject(v: unknown): v is Record<string, unknown> {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}

/** Whether a stored job's problem can be read as one of the three kinds (the problem itself is checked again when the job runs). */
export function isJobProblem(v: unknown): v is JobProblem {
  if (!isObject(v) || typeof v.projectName !== 'string') return false;
  if (v.kind === 'suspension') return isObject(v.input) && Array.isArray(v.input.layouts);
  if (v.kind === 'leg') return isObject(v.input) && Array.isArray(v.input.families);
  if (v.kind !== undefined && v.kind !== 'path') return false;
  if (!isObject(v.target) || !isObject(v.settings)) return false;
  return Array.isArray(v.target.points) && Array.isArray(v.settings.families) && isObject(v.settings.budget) && isObject(v.settings.constraints);
}

/**
 * The settings a path job runs with: the kept settings with the job's own families, seed
 * and budget (the job's fields are the one source of these three).
 */
export function jobSettings(spec: PathJobSpec): SearchSettings {
  const s = spec.problem.settings;
  const budget: SearchSettings['budget'] =
    spec.evaluations !== undefined ? { ...s.budget, mode: 'evaluations', evaluations: spec.evaluations } : { ...s.budget, mode: 'time', seconds: spec.seconds ?? s.budget.seconds };
  const checkpointEverySeconds = s.checkpointEverySeconds ?? DEFAULT_CHECKPOINT_EVERY_S;
  return { ...s, families: (spec.families ?? s.families) as readonly FamilyId[], seed: spec.seed, budget, checkpointEverySeconds };
}

/** The path job as a project, the form the run input and the start checks read. */
export function jobProject(spec: PathJobSpec): Project {
  return {
    format: PROJECT_FORMAT,
    version: PROJECT_VERSION,
    name: spec.name,
    target: spec.problem.target,
    settings: jobSettings(spec),
    run: IDLE_RUN,
    candidates: [],
    candidatesTarget: null,
  };
}
