/**
 * A leg problem as the engine's run: one job per family, all reading one problem file
 * (format loci-problem, kind leg), with the seed and the budget. An evaluation budget
 * alone makes the run deterministic: the same problem, seed and budget give the same
 * designs.
 */
import type { LegProblemInput } from '../../../core/synthesis/legProblem';
import { defineRun, type RunInput } from '../../../engine';
import { jobsRunInput } from '../../search/runInput';
import type { LegSearchSettings, SetupIssue } from '../readSetup';

/** Best distinct designs of each family kept in the results. */
export const RESULTS_PER_FAMILY = 5;
/** Designs ranked over all families described at the end, beside each family's own best. */
export const TOP_OVERALL = 10;
/**
 * A running search checkpoints this often, ms (into IndexedDB in the app): a reload loses
 * at most about this much of the search, and each checkpoint updates the best per family shown.
 */
export const LEG_CHECKPOINT_EVERY_MS = 1_000;

export function legRunInput(input: LegProblemInput, settings: LegSearchSettings, workers: number): RunInput {
  return jobsRunInput(input, input.families, settings, workers, LEG_CHECKPOINT_EVERY_MS);
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
