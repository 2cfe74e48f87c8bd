/**
 * Where a suspension search keeps its checkpoints: the shared store
 * (src/app/search/checkpoints.ts) in the scope `suspension`, apart from the path
 * search's and the leg search's.
 */
import { browserSearchCheckpoints, runIdMaker, type SearchCheckpoints } from '../../search/checkpoints';
import type { LociDb } from '../../storage';

export type { SearchCheckpoints } from '../../search/checkpoints';

/** The scope of a suspension search's run id (checkpointScope): never dropped by another workspace's search. */
export const SUSPENSION_RUN_SCOPE = 'suspension';

export const newSuspensionRunId: () => string = runIdMaker(SUSPENSION_RUN_SCOPE);

export function suspensionSearchCheckpoints(open?: () => Promise<LociDb>): SearchCheckpoints {
  return browserSearchCheckpoints(SUSPENSION_RUN_SCOPE, open);
}
