/**
 * Where a suspension search keeps its checkpoints: in IndexedDB under its own run id
 * (scope `suspension`, apart from the path search's), so a search a reload interrupted
 * goes on from its last checkpoint. A browser that gives no IndexedDB keeps them in
 * memory: the search runs, but a reload loses it (the controller says so at the start).
 */
import { memoryCheckpointStore, type CheckpointStore } from '../../../engine';
import { CHECKPOINTS_KEPT, dropCheckpointsExcept, indexedDbCheckpointStore, openLociDb, type LociDb } from '../../storage';

/** The scope of a suspension search's run id (checkpointScope): never dropped by the path search. */
export const SUSPENSION_RUN_SCOPE = 'suspension';

let runCounter = 0;
export function newSuspensionRunId(): string {
  return `${SUSPENSION_RUN_SCOPE}-${Date.now().toString(36)}-${crypto.randomUUID().slice(0, 8)}-${(runCounter++).toString(36)}`;
}

export interface SearchCheckpoints {
  /** The run's store: IndexedDB, or memory when the browser gives none. */
  readonly store: (runId: string) => CheckpointStore;
  /** Drops the checkpoints of every suspension run but `keepRunIds`. */
  readonly dropExcept: (keepRunIds: readonly string[]) => Promise<void>;
  /** Whether the checkpoints outlive the page. */
  readonly durable: () => Promise<boolean>;
}

/** The browser's: one database connection, opened on first use. */
export function browserSearchCheckpoints(open: () => Promise<LociDb> = openLociDb): SearchCheckpoints {
  let opening: Promise<LociDb | null> | null = null;
  const db = () => (opening ??= open().catch(() => null));
  const memory = new Map<string, CheckpointStore>();
  const inMemory = (runId: string) => {
    let store = memory.get(runId);
    if (store === undefined) memory.set(runId, (store = memoryCheckpointStore(CHECKPOINTS_KEPT)));
    return store;
  };
  return {
    store: (runId) => ({
      async save(text) {
        const d = await db();
        return d === null ? inMemory(runId).save(text) : indexedDbCheckpointStore(d, runId).save(text);
      },
      async load() {
        const d = await db();
        return d === null ? inMemory(runId).load() : indexedDbCheckpointStore(d, runId).load();
      },
    }),
    async dropExcept(keepRunIds) {
      const d = await db();
      if (d === null) {
        for (const id of [...memory.keys()]) if (!keepRunIds.includes(id)) memory.delete(id);
        return;
      }
      await dropCheckpointsExcept(d, keepRunIds, SUSPENSION_RUN_SCOPE);
    },
    durable: async () => (await db()) !== null,
  };
}
