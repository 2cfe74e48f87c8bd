/**
 * A suspension problem as the engine's run: one job per layout on the same bicycle and
 * targets, all reading one problem file (format loci-problem, kind suspension), with
 * the seed and the budget. An evaluation budget alone makes the run deterministic: the
 * same problem, seed and budget give the same designs.
 */
import { PROBLEM_FILE_FORMAT, PROBLEM_FILE_VERSION } from '../../../core/io/problem';
import { createSuspensionProblem, type SuspensionProblemInput, type SuspensionProblemIssue } from '../../../core/synthesis';
import { defineRun, type RunInput } from '../../../engine';

/** The seed and budget of a suspension search (the set-up's SearchRunSettings). */
export interface SearchSettings {
  readonly seed: number;
  /** Evaluations and seconds of the whole search (all layouts); null: not limited by it; at least one is given. */
  readonly budget: { readonly evaluations: number | null; readonly seconds: number | null };
}

/** Best distinct designs of each layout kept in the results. */
export const RESULTS_PER_LAYOUT = 5;
/**
 * A running search checkpoints this often, ms (into IndexedDB in the app): a reload loses
 * at most about this much of the search, and each checkpoint updates the best per layout shown.
 */
export const SEARCH_CHECKPOINT_EVERY_MS = 1_000;

/** The problem file's JSON for a problem input (what a worker reads). */
export function suspensionProblemFile(input: SuspensionProblemInput): Record<string, unknown> {
  return { format: PROBLEM_FILE_FORMAT, version: PROBLEM_FILE_VERSION, ...JSON.parse(JSON.stringify(input)) as object };
}

/** Islands per layout: enough for every worker to have one, at least one each. */
function islandsPerLayout(layouts: number, workers: number): number {
  return Math.max(1, Math.ceil(workers / Math.max(1, layouts)));
}

export function suspensionRunInput(input: SuspensionProblemInput, settings: SearchSettings, workers: number): RunInput {
  const problem = suspensionProblemFile(input);
  const islands = islandsPerLayout(input.layouts.length, workers);
  return {
    jobs: input.layouts.map((layout) => ({
      id: layout,
      objective: { kind: 'synthesis', problem, family: layout as never },
      seed: settings.seed,
      islands,
      optimizer: { kind: 'hybrid' },
    })),
    budget: { evaluations: settings.budget.evaluations, seconds: settings.budget.seconds },
    deterministic: settings.budget.seconds === null,
    checkpointEveryMs: SEARCH_CHECKPOINT_EVERY_MS,
  };
}

/** The engine's fields, as the page names them. */
const RUN_FIELDS: readonly (readonly [RegExp, string])[] = [
  [/^budget\.evaluations\b/, 'Budget in evaluations'],
  [/^budget\.seconds\b/, 'Budget in seconds'],
  [/^jobs\[\d+\]\.seed\b/, 'Seed'],
];

function issueWords(issue: SuspensionProblemIssue): string {
  return issue.path === '' ? issue.message : `${issue.path}: ${issue.message}`;
}

/**
 * What the problem reader and the engine would refuse, in words, before Start is offered
 * (the same checks a search makes at its start); empty when the search can start.
 */
export function searchStartIssues(input: SuspensionProblemInput, settings: SearchSettings, workers: number): string[] {
  const problem = createSuspensionProblem(input);
  if (!problem.ok) return problem.issues.map(issueWords);
  const run = defineRun(suspensionRunInput(input, settings, workers));
  if (run.ok) return [];
  const field = RUN_FIELDS.find(([pattern]) => pattern.test(run.reason));
  return [field === undefined ? `Search settings: ${run.reason}` : run.reason.replace(field[0], field[1])];
}
