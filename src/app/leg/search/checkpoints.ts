/**
 * Where a leg search keeps its checkpoints: the shared store
 * (src/app/search/checkpoints.ts) in the scope `leg`, apart from the path search's and
 * the suspension search's.
 */
import { browserSearchCheckpoints, runIdMaker, type SearchCheckpoints } from '../../search/checkpoints';
import type { LociDb } from '../../storage';

/** The scope of a leg search's run id (checkpointScope): never dropped by another workspace's search. */
export const LEG_RUN_SCOPE = 'leg';

export const newLegRunId: () => string = runIdMaker(LEG_RUN_SCOPE);

export function legSearchCheckpoints(open?: () => Promise<LociDb>): SearchCheckpoints {
  return browserSearchCheckpoints(LEG_RUN_SCOPE, open);
}
