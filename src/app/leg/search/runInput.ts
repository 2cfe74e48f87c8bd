/**
 * A leg problem as the engine's run: one job per family, all reading one problem file
 * (format loci-problem, kind leg), with the seed and the budget. An evaluation budget
 * alone makes the run deterministic: the same problem, seed and budget give the same
 * designs.
 */
import { PROBLEM_FILE_FORMAT, PROBLEM_FILE_VERSION } from '../../../core/io/problem';
import type { LegProblemInput } from '../../../core/synthesis/legProblem';
import { defineRun, type RunInput } from '../../../engine';
import type { LegSearchSettings, SetupIssue } from '../readSetup';

/** Best distinct designs of each family kept in the results. */
export const RESULTS_PER_FAMILY = 5;
/** Designs ranked over all families described at the end, beside each family's own best. */
export const TOP_OVERALL = 10;
/** The run takes stock this often, ms: each time the best of each family shown is brought up to date. */
export const LEG_CHECKPOINT_EVERY_MS = 1_000;

export function legProblemFile(input: LegProblemInput): Record<string, unknown> {
  return { format: PROBLEM_FILE_FORMAT, version: PROBLEM_FILE_VERSION, ...JSON.parse(JSON.stringify(input)) as object };
}

export function legRunInput(input: LegProblemInput, settings: LegSearchSettings, workers: number): RunInput {
  const problem = legProblemFile(input);
  // Enough islands for every worker to have one, at least one per family.
  const islands = Math.max(1, Math.ceil(workers / Math.max(1, input.families.length)));
  return {
    jobs: input.families.map((family) => ({
      id: family,
      objective: { kind: 'synthesis', problem, family: family as never },
      seed: settings.seed,
      islands,
      optimizer: { kind: 'hybrid' },
    })),
    budget: { evaluations: settings.budget.evaluations, seconds: settings.budget.seconds },
    deterministic: settings.budget.seconds === null,
    checkpointEveryMs: LEG_CHECKPOINT_EVERY_MS,
  };
}

/** The engine's fields, as the set-up names them. */
const RUN_FIELDS: readonly (readonly [RegExp, string])[] = [
  [/^budget\.evaluations\b/, 'budget.evaluations'],
  [/^budget\.seconds\b/, 'budget.seconds'],
  [/^jobs\[\d+\]\.seed\b/, 'seed'],
];

/** What the engine would refuse of this run (the problem already read), at the field it belongs to. */
export function legRunIssues(input: LegProblemInput, settings: LegSearchSettings, workers: number): SetupIssue[] {
  const run = defineRun(legRunInput(input, settings, workers));
  if (run.ok) return [];
  const field = RUN_FIELDS.find(([pattern]) => pattern.test(run.reason));
  return [field === undefined ? { path: '', message: `Search settings: ${run.reason}` } : { path: field[1], message: run.reason.replace(field[0], '').trim() }];
}
