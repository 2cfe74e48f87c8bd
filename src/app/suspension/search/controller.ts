/**
 * The suspension workspace's search: one job per layout on the same bicycle and targets,
 * through the shared search controller (src/app/search/controller.ts: progress, Stop,
 * checkpoints under the run's id and resuming after a reload).
 */
import type { SuspensionProblemInput } from '../../../core/synthesis';
import { SearchController, type SearchControllerDeps, type SearchKind } from '../../search/controller';
import { candidateOf, type SearchCandidate } from './results';
import { RESULTS_PER_LAYOUT, searchStartIssues, suspensionRunInput } from './runInput';

export { IDLE_SESSION, SEARCH_PROGRESS_EVERY_MS, resumedMessage, type SearchSession, type SearchStatus } from '../../search/controller';

/** Designs ranked over all layouts described at the end, beside each layout's own best (RESULTS_PER_LAYOUT). */
const TOP_OVERALL = 10;

export const SUSPENSION_SEARCH: SearchKind<SuspensionProblemInput, SearchCandidate> = {
  topK: TOP_OVERALL,
  perJob: RESULTS_PER_LAYOUT,
  startIssues: searchStartIssues,
  runInput: suspensionRunInput,
  candidatesOf: (_running, ranked) => ranked.flatMap((c) => (c.detail.kind === 'suspension' ? [candidateOf(c.rank, c.detail.candidate)] : [])),
};

export class SuspensionSearchController extends SearchController<SuspensionProblemInput, SearchCandidate> {
  constructor(deps: SearchControllerDeps<SuspensionProblemInput, SearchCandidate>) {
    super(SUSPENSION_SEARCH, deps);
  }
}
