/**
 * The leg workspace's search: one job per family on the same leg and targets, through
 * the shared search controller (src/app/search/controller.ts: progress, Stop,
 * checkpoints under the run's id and resuming after a reload).
 */
import type { LegProblemInput } from '../../../core/synthesis/legProblem';
import { SearchController, type SearchControllerDeps, type SearchKind } from '../../search/controller';
import { candidateOf, type LegCandidate } from './results';
import { RESULTS_PER_FAMILY, TOP_OVERALL, legRunInput, legRunIssues } from './runInput';

export type { SearchSession as LegSearchSession } from '../../search/controller';

export const LEG_SEARCH: SearchKind<LegProblemInput, LegCandidate> = {
  topK: TOP_OVERALL,
  perJob: RESULTS_PER_FAMILY,
  startIssues: (input, settings, workers) => legRunIssues(input, settings, workers).map((i) => i.message),
  runInput: legRunInput,
  candidatesOf: ({ problem }, ranked) => {
    const withTrajectory = problem.targets.footPath !== undefined;
    return ranked.flatMap((c) => (c.detail.kind === 'leg' ? [candidateOf(c.rank, problem.name, c.detail.candidate, withTrajectory)] : []));
  },
};

export class LegSearchController extends SearchController<LegProblemInput, LegCandidate> {
  constructor(deps: SearchControllerDeps<LegProblemInput, LegCandidate>) {
    super(LEG_SEARCH, deps);
  }
}
