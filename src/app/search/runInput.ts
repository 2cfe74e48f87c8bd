/**
 * A workspace's problem as the engine's run: one job per family (or layout), all reading
 * one problem file (format loci-problem), with the seed and the budget. An evaluation
 * budget alone makes the run deterministic: the same problem, seed and budget give the
 * same designs.
 */
import { PROBLEM_FILE_FORMAT, PROBLEM_FILE_VERSION } from '../../core/io/problem';
import type { RunInput } from '../../engine';
import type { SearchSettings } from './controller';

/** The problem file's JSON for a problem input (what a worker reads). */
export function problemFileOf(input: object): Record<string, unknown> {
  return { format: PROBLEM_FILE_FORMAT, version: PROBLEM_FILE_VERSION, ...JSON.parse(JSON.stringify(input)) as object };
}

/** One job per id of `jobIds` on the same problem file; a running search checkpoints every `checkpointEveryMs`. */
export function jobsRunInput(input: object, jobIds: readonly string[], settings: SearchSettings, workers: number, checkpointEveryMs: number): RunInput {
  const problem = problemFileOf(input);
  // Enough islands for every worker to have one, at least one per job.
  const islands = Math.max(1, Math.ceil(workers / Math.max(1, jobIds.length)));
  return {
    jobs: jobIds.map((id) => ({
      id,
      objective: { kind: 'synthesis', problem, family: id as never },
      seed: settings.seed,
      islands,
      optimizer: { kind: 'hybrid' },
    })),
    budget: { evaluations: settings.budget.evaluations, seconds: settings.budget.seconds },
    deterministic: settings.budget.seconds === null,
    checkpointEveryMs,
  };
}
