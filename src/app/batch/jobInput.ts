/**
 * A new job as the user types it, checked once: the queue file's own schema
 * (parseBatchQueue, with the queue's other jobs, so a name already taken is caught as
 * the command line catches it) and the start checks a search runs on the target and
 * settings it keeps. Each issue is given beside the field it is about; nothing is
 * rounded or clamped into range.
 */
import { BATCH_FORMAT, BATCH_VERSION, parseBatchQueue } from '../../core/io/batchQueue';
import { startIssuesOf } from '../run/runInput';
import type { Project } from '../state/project';
import { jobProject, type AppJobSpec, type PathJobSpec, type WorkspaceJobProblem, type WorkspaceJobSpec } from './jobs';
import { problemFamilies, workspaceStartIssues } from './workspaceJobs';

export type BudgetUnit = 'evaluations' | 'seconds';

export interface JobDraft {
  readonly name: string;
  /** Families (a suspension job's layouts) by id. */
  readonly families: readonly string[];
  readonly budgetUnit: BudgetUnit;
  /** As typed. */
  readonly budget: string;
  readonly seed: string;
}

export type JobField = 'name' | 'families' | 'budget' | 'seed' | 'problem';

export type JobInputResult =
  | { readonly ok: true; readonly spec: AppJobSpec }
  | { readonly ok: false; readonly issues: Readonly<Partial<Record<JobField, string>>> };

/** A number as typed, or why it is not one: no unit letters, no commas, nothing guessed. */
function readNumber(text: string, what: string): { ok: true; value: number } | { ok: false; reason: string } {
  const t = text.trim();
  if (t === '') return { ok: false, reason: `missing; expected ${what}` };
  const value = Number(t);
  if (!Number.isFinite(value) || !/^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(t)) return { ok: false, reason: `expected ${what}, got "${t}"` };
  return { ok: true, value };
}

const FIELD_OF: readonly (readonly [RegExp, JobField])[] = [
  [/\.name$/, 'name'],
  [/\.families/, 'families'],
  [/\.(evaluations|seconds)$/, 'budget'],
  [/\.seed$/, 'seed'],
];

interface DraftFields {
  readonly issues: Partial<Record<JobField, string>>;
  readonly name: string;
  readonly families: string[];
  readonly seed: number;
  readonly budgetField: { evaluations: number } | { seconds: number };
}

/** The name, budget and seed of a draft, by the queue file's schema (the one source of a job's rules), against the jobs queued already. */
function readDraftFields(draft: JobDraft, others: readonly { readonly name: string }[]): DraftFields {
  const issues: Partial<Record<JobField, string>> = {};
  const budgetWhat = draft.budgetUnit === 'evaluations' ? 'a whole number of evaluations' : 'a number of seconds';
  const budget = readNumber(draft.budget, budgetWhat);
  if (!budget.ok) issues.budget = budget.reason;
  const seed = readNumber(draft.seed, 'a whole number ≥ 0');
  if (!seed.ok) issues.seed = seed.reason;
  // The draft is read as the last job of a queue.
  const budgetValue = budget.ok ? budget.value : 1;
  const budgetField = draft.budgetUnit === 'evaluations' ? { evaluations: budgetValue } : { seconds: budgetValue };
  const job = { name: draft.name, problem: 'workspace', families: [...draft.families], seed: seed.ok ? seed.value : 0, ...budgetField };
  const index = others.length;
  const parsed = parseBatchQueue({
    format: BATCH_FORMAT,
    version: BATCH_VERSION,
    name: 'app queue',
    jobs: [...others.map((o) => ({ name: o.name, problem: 'workspace', seed: 0, evaluations: 1 })), job],
  });
  if (!parsed.ok) {
    for (const issue of parsed.issues) {
      if (!issue.path.startsWith(`jobs[${index}]`)) continue;
      const field = FIELD_OF.find(([pattern]) => pattern.test(issue.path))?.[1] ?? 'problem';
      // The schema names other jobs by index; the page numbers them from 1.
      issues[field] ??= issue.message.replace(/jobs\[(\d+)\]/g, (_, k: string) => `job ${Number(k) + 1}`);
    }
  }
  if (draft.families.length === 0) issues.families = 'choose at least one family';
  return { issues, name: job.name, families: job.families, seed: job.seed, budgetField };
}

/**
 * Checks a draft against the jobs in the queue already (`others`) and the workspace's
 * project whose target and settings the job keeps. `workers` is what the run would use.
 */
export function readJobDraft(draft: JobDraft, others: readonly { readonly name: string }[], project: Project, workers: number): JobInputResult {
  const { issues, name, families, seed, budgetField } = readDraftFields(draft, others);
  const spec: PathJobSpec = {
    name,
    families,
    seed,
    skip: false,
    ...budgetField,
    problem: { kind: 'path', projectName: project.name, target: project.target, settings: project.settings },
  };
  if (Object.keys(issues).length === 0) {
    // What a search on this target and these settings would refuse, found now rather than at night.
    const refused = startIssuesOf(jobProject(spec), workers);
    if (refused.length > 0) issues.problem = refused.join('; ');
  }
  return Object.keys(issues).length > 0 ? { ok: false, issues } : { ok: true, spec };
}

/**
 * The same checks for a rear-suspension or walking-leg job: its families are the layouts
 * (families) the workspace has ticked, and what the workspace's own search would refuse
 * of the job (with its seed and budget) is the problem's issue.
 */
export function readWorkspaceJobDraft(draft: JobDraft, others: readonly { readonly name: string }[], problem: WorkspaceJobProblem, workers: number): JobInputResult {
  const { issues, name, families, seed, budgetField } = readDraftFields(draft, others);
  const offered = problemFamilies(problem);
  const foreign = families.filter((f) => !offered.includes(f));
  if (foreign.length > 0) issues.families ??= `${foreign.join(', ')} ${foreign.length === 1 ? 'is' : 'are'} not in the workspace's problem; expected some of ${offered.join(', ')}`;
  const spec: WorkspaceJobSpec = { name, families, seed, skip: false, ...budgetField, problem };
  if (Object.keys(issues).length === 0) {
    const refused = workspaceStartIssues(spec, workers);
    if (refused.length > 0) issues.problem = refused.join('; ');
  }
  return Object.keys(issues).length > 0 ? { ok: false, issues } : { ok: true, spec };
}
