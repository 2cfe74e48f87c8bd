/**
 * A suspension problem as the engine's run: one job per layout on the same bicycle and
 * targets, all reading one problem file (format loci-problem, kind suspension), with
 * the seed and the budget. An evaluation budget alone makes the run deterministic: the
 * same problem, seed and budget give the same designs.
 */
import { createSuspensionProblem, type SuspensionProblemInput, type SuspensionProblemIssue } from '../../../core/synthesis';
import { defineRun, type RunInput } from '../../../engine';

import type { SearchSettings } from '../../search/types';
import { jobsRunInput } from '../../search/runInput';

/** The seed and budget of a suspension search (the set-up's SearchRunSettings). */
export type { SearchSettings } from '../../search/types';

/** Best distinct designs of each layout kept in the results. */
export const RESULTS_PER_LAYOUT = 5;
/**
 * A running search checkpoints this often, ms (into IndexedDB in the app): a reload loses
 * at most about this much of the search, and each checkpoint updates the best per layout shown.
 */
export const SEARCH_CHECKPOINT_EVERY_MS = 1_000;

export function suspensionRunInput(input: SuspensionProblemInput, settings: SearchSettings, workers: number): RunInput {
  return jobsRunInput(input, input.layouts, settings, workers, SEARCH_CHECKPOINT_EVERY_MS);
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
