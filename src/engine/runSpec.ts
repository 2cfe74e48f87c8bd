/**
 * What a run is, as plain JSON (it travels inside every checkpoint): the jobs, the
 * budget and the schedule. `defineRun` checks a caller's input once and fills in the
 * defaults; the same check reads the spec back from a checkpoint.
 */
import { MAX_STREAM } from '../core/optimize';
import type { IslandOptimizerConfig, ObjectiveSpec } from '../../workers/api';
import { MAX_ARCHIVE_CAPACITY } from '../core/synthesis';

/** One job: an objective (target × family), a seed, and the islands that search it as one migration ring. */
export interface JobSpec {
  readonly id: string;
  readonly objective: ObjectiveSpec;
  readonly seed: number;
  /** Islands of this job; island k uses stream k of the seed. */
  readonly islands: number;
  readonly optimizer: IslandOptimizerConfig;
}

export interface RunSpec {
  readonly jobs: readonly JobSpec[];
  /**
   * Evaluations (shared equally by all islands) and/or active seconds. With seconds only,
   * an island's budget is `DEFAULT_ISLAND_EVALUATIONS` (no cap).
   */
  readonly budget: { readonly evaluations: number | null; readonly seconds: number | null };
  /**
   * Deterministic schedule: each step runs `stepEvaluations` evaluations instead of
   * `stepMs`, so the same spec gives the same result however fast the machine is and
   * however many workers it has (a seconds budget, if also set, can still cut it short).
   */
  readonly deterministic: boolean;
  readonly stepMs: number;
  readonly stepEvaluations: number;
  /** Every `everyRounds` rounds, each island sends its `count` best to the next island of its ring. */
  readonly migration: { readonly everyRounds: number; readonly count: number };
  /** Capacity of each archive (island and run, per job), and the distinctness distance (box units, RMS). */
  readonly archive: { readonly capacity: number; readonly distance: number };
  /** Checkpoint interval, milliseconds of wall time. */
  readonly checkpointEveryMs: number;
}

/** What a caller writes: the jobs and a budget; the rest has defaults. */
export interface RunInput {
  readonly jobs: readonly (Omit<JobSpec, 'islands' | 'optimizer'> & Partial<Pick<JobSpec, 'islands' | 'optimizer'>>)[];
  readonly budget: { readonly evaluations?: number | null; readonly seconds?: number | null };
  readonly deterministic?: boolean;
  readonly stepMs?: number;
  readonly stepEvaluations?: number;
  readonly migration?: Partial<RunSpec['migration']>;
  readonly archive?: Partial<RunSpec['archive']>;
  readonly checkpointEveryMs?: number;
}

export const DEFAULT_STEP_MS = 200;
export const DEFAULT_STEP_EVALUATIONS = 2000;
export const DEFAULT_MIGRATION = { everyRounds: 5, count: 2 } as const;
/** Each job (a family) keeps its 64 best distinct designs: room for the 50 a results table shows per family. */
export const DEFAULT_ARCHIVE = { capacity: 64, distance: 0.01 } as const;
/** Designs per family a results table asks the run to describe (RunOptions.perJob). */
export const DEFAULT_RESULTS_PER_FAMILY = 50;
export const DEFAULT_CHECKPOINT_EVERY_MS = 30_000;
/**
 * The range of checkpoint intervals the command line and the app take, seconds. Below a
 * second, saving (a few ms to about a second for a long run's many islands) would take a
 * noticeable share of the run; above a day, a run would not checkpoint at all.
 */
export const MIN_CHECKPOINT_EVERY_S = 1;
export const MAX_CHECKPOINT_EVERY_S = 86_400;
/**
 * An island's evaluation budget when the run has a time budget only: no cap, so the island
 * searches until the time is up (its restart scheme sizes each run, workers/island.ts).
 */
export const DEFAULT_ISLAND_EVALUATIONS = Number.MAX_SAFE_INTEGER;
/** Upper limits that keep one spec from asking for absurd work. */
export const MAX_JOBS = 1000;
export const MAX_ISLANDS_PER_JOB = 256;
export const MAX_ISLANDS = 4096;
const MAX_STEP_MS = 600_000;
const MAX_STEP_EVALUATIONS = 100_000_000;
/** Largest evaluation budget of a run: far past any search worth running, and far inside exact integers. */
export const MAX_BUDGET_EVALUATIONS = 1_000_000_000;
/** Longest time budget of a run, seconds: 30 days. */
export const MAX_BUDGET_SECONDS = 30 * 24 * 3600;

export type DefineResult = { readonly ok: true; readonly spec: RunSpec } | { readonly ok: false; readonly reason: string };

function isObject(v: unknown): v is Record<string, unknown> {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}

function isInteger(v: unknown, min: number, max: number): v is number {
  return typeof v === 'number' && Number.isInteger(v) && v >= min && v <= max;
}

function show(v: unknown): string {
  return v === undefined ? 'missing' : JSON.stringify(v) ?? String(v);
}

class SpecError extends Error {}

function need(ok: boolean, what: string, got: unknown, expected: string): void {
  if (!ok) throw new SpecError(`${what} is ${show(got)}; expected ${expected}`);
}

function readJob(v: unknown, k: number, ids: Set<string>): JobSpec {
  const at = `jobs[${k}]`;
  need(isObject(v), at, v, 'an object { id, objective, seed, islands?, optimizer? }');
  const o = v as Record<string, unknown>;
  need(typeof o.id === 'string' && o.id.length > 0, `${at}.id`, o.id, 'a non-empty string');
  const id = o.id as string;
  need(!ids.has(id), `${at}.id`, id, 'an id no other job has');
  ids.add(id);
  need(isObject(o.objective), `${at}.objective`, o.objective, 'an objective { kind: "synthesis" | "test-function", … }');
  need(isInteger(o.seed, 0, Number.MAX_SAFE_INTEGER), `${at}.seed`, o.seed, 'a safe integer ≥ 0');
  const islands = o.islands ?? 1;
  need(isInteger(islands, 1, Math.min(MAX_ISLANDS_PER_JOB, MAX_STREAM + 1)), `${at}.islands`, islands, `an integer in [1, ${MAX_ISLANDS_PER_JOB}]`);
  const optimizer = o.optimizer ?? { kind: 'lshade' };
  need(isObject(optimizer), `${at}.optimizer`, optimizer, 'an optimizer configuration such as { "kind": "lshade" }');
  return JSON.parse(JSON.stringify({ id, objective: o.objective, seed: o.seed, islands, optimizer })) as JobSpec;
}

function readBudget(v: unknown): RunSpec['budget'] {
  need(isObject(v), 'budget', v, 'an object { evaluations?, seconds? }');
  const o = v as Record<string, unknown>;
  const evaluations = o.evaluations ?? null;
  const seconds = o.seconds ?? null;
  need(evaluations === null || isInteger(evaluations, 1, MAX_BUDGET_EVALUATIONS), 'budget.evaluations', evaluations, `an integer in [1, ${MAX_BUDGET_EVALUATIONS}], or null`);
  need(seconds === null || (typeof seconds === 'number' && seconds > 0 && seconds <= MAX_BUDGET_SECONDS), 'budget.seconds', seconds, `a number of seconds in (0, ${MAX_BUDGET_SECONDS}], or null`);
  need(evaluations !== null || seconds !== null, 'budget', v, 'an evaluation budget, a time budget, or both');
  return { evaluations: evaluations as number | null, seconds: seconds as number | null };
}

/** Checks a run input (or the spec inside a checkpoint) and fills in the defaults. */
export function defineRun(input: unknown): DefineResult {
  try {
    need(isObject(input), 'run', input, 'an object { jobs, budget, … }');
    const o = input as Record<string, unknown>;
    need(Array.isArray(o.jobs) && o.jobs.length >= 1 && o.jobs.length <= MAX_JOBS, 'jobs', o.jobs, `an array of 1 to ${MAX_JOBS} jobs`);
    const ids = new Set<string>();
    const jobs = (o.jobs as unknown[]).map((job, k) => readJob(job, k, ids));
    const islandCount = jobs.reduce((sum, job) => sum + job.islands, 0);
    need(islandCount <= MAX_ISLANDS, 'jobs', `${islandCount} islands`, `at most ${MAX_ISLANDS} islands in all`);
    const budget = readBudget(o.budget);
    if (budget.evaluations !== null) {
      need(budget.evaluations >= islandCount, 'budget.evaluations', budget.evaluations, `at least one evaluation per island (${islandCount})`);
    }
    const deterministic = o.deterministic ?? false;
    need(typeof deterministic === 'boolean', 'deterministic', deterministic, 'true or false');
    const stepMs = o.stepMs ?? DEFAULT_STEP_MS;
    need(typeof stepMs === 'number' && stepMs > 0 && stepMs <= MAX_STEP_MS, 'stepMs', stepMs, `a number of milliseconds in (0, ${MAX_STEP_MS}]`);
    const stepEvaluations = o.stepEvaluations ?? DEFAULT_STEP_EVALUATIONS;
    need(isInteger(stepEvaluations, 1, MAX_STEP_EVALUATIONS), 'stepEvaluations', stepEvaluations, `an integer in [1, ${MAX_STEP_EVALUATIONS}]`);
    const migration = o.migration ?? {};
    need(isObject(migration), 'migration', migration, 'an object { everyRounds?, count? }');
    const m = migration as Record<string, unknown>;
    const everyRounds = m.everyRounds ?? DEFAULT_MIGRATION.everyRounds;
    const count = m.count ?? DEFAULT_MIGRATION.count;
    need(isInteger(everyRounds, 1, 1_000_000), 'migration.everyRounds', everyRounds, 'an integer ≥ 1');
    need(isInteger(count, 0, MAX_ARCHIVE_CAPACITY), 'migration.count', count, `an integer in [0, ${MAX_ARCHIVE_CAPACITY}]`);
    const archive = o.archive ?? {};
    need(isObject(archive), 'archive', archive, 'an object { capacity?, distance? }');
    const a = archive as Record<string, unknown>;
    const capacity = a.capacity ?? DEFAULT_ARCHIVE.capacity;
    const distance = a.distance ?? DEFAULT_ARCHIVE.distance;
    need(isInteger(capacity, 1, MAX_ARCHIVE_CAPACITY), 'archive.capacity', capacity, `an integer in [1, ${MAX_ARCHIVE_CAPACITY}]`);
    need(typeof distance === 'number' && distance >= 0 && distance <= 1, 'archive.distance', distance, 'a number in [0, 1] (box units)');
    const checkpointEveryMs = o.checkpointEveryMs ?? DEFAULT_CHECKPOINT_EVERY_MS;
    need(typeof checkpointEveryMs === 'number' && checkpointEveryMs > 0, 'checkpointEveryMs', checkpointEveryMs, 'a number of milliseconds > 0');
    const spec: RunSpec = {
      jobs,
      budget,
      deterministic: deterministic as boolean,
      stepMs: stepMs as number,
      stepEvaluations: stepEvaluations as number,
      migration: { everyRounds: everyRounds as number, count: count as number },
      archive: { capacity: capacity as number, distance: distance as number },
      checkpointEveryMs: checkpointEveryMs as number,
    };
    return { ok: true, spec };
  } catch (error) {
    if (error instanceof SpecError) return { ok: false, reason: error.message };
    throw error;
  }
}

/** One island of a run: which job, which stream, and its share of the budget. */
export interface IslandPlan {
  readonly islandId: string;
  readonly job: JobSpec;
  readonly jobIndex: number;
  readonly stream: number;
  readonly maxEvaluations: number;
}

/** The islands of a spec in a fixed order (job by job), with equal shares of the evaluation budget. */
export function planIslands(spec: RunSpec): IslandPlan[] {
  const total = spec.jobs.reduce((sum, job) => sum + job.islands, 0);
  const plans: IslandPlan[] = [];
  const budget = spec.budget.evaluations;
  for (const [jobIndex, job] of spec.jobs.entries()) {
    for (let stream = 0; stream < job.islands; stream++) {
      const k = plans.length;
      const maxEvaluations =
        budget === null ? DEFAULT_ISLAND_EVALUATIONS : Math.floor(budget / total) + (k < budget % total ? 1 : 0);
      plans.push({ islandId: `${job.id}#${stream}`, job, jobIndex, stream, maxEvaluations });
    }
  }
  return plans;
}
