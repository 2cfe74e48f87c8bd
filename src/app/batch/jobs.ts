/**
 * A queued job in the app: the queue file's job (src/core/io/batchQueue.ts) whose problem
 * is the workspace's target and settings as they were when the job was added, so later
 * edits in the workspace never change a job waiting overnight.
 */
import type { QueuedJobSpec, QueueEntry, QueueState } from '../../engine/queue';
import type { FamilyId } from '../state/families';
import { IDLE_RUN, PROJECT_FORMAT, PROJECT_VERSION, type Project, type SearchSettings, type TargetState } from '../state/project';

export interface JobProblem {
  /** The project's name when the job was added. */
  readonly projectName: string;
  readonly target: TargetState;
  readonly settings: SearchSettings;
}

export type AppJobSpec = QueuedJobSpec<JobProblem>;
export type AppQueueEntry = QueueEntry<JobProblem>;
export type AppQueueState = QueueState<JobProblem>;

function isObject(v: unknown): v is Record<string, unknown> {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}

/** Whether a stored job's problem can be read as one. */
export function isJobProblem(v: unknown): v is JobProblem {
  if (!isObject(v) || typeof v.projectName !== 'string' || !isObject(v.target) || !isObject(v.settings)) return false;
  return Array.isArray(v.target.points) && Array.isArray(v.settings.families) && isObject(v.settings.budget) && isObject(v.settings.constraints);
}

/**
 * The settings a job runs with: the kept settings with the job's own families, seed and
 * budget (the job's fields are the one source of these three).
 */
export function jobSettings(spec: AppJobSpec): SearchSettings {
  const s = spec.problem.settings;
  const budget: SearchSettings['budget'] =
    spec.evaluations !== undefined ? { ...s.budget, mode: 'evaluations', evaluations: spec.evaluations } : { ...s.budget, mode: 'time', seconds: spec.seconds ?? s.budget.seconds };
  return { ...s, families: (spec.families ?? s.families) as readonly FamilyId[], seed: spec.seed, budget };
}

/** The job as a project, the form the run input and the start checks read. */
export function jobProject(spec: AppJobSpec): Project {
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
