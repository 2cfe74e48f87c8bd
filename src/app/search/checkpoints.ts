/**
 * Where a workspace's search keeps its checkpoints: in IndexedDB under its own run id,
 * in a scope of its own (the run id's prefix: `suspension`, `leg`, apart from the path
 * search's `run`), so one workspace's search starting never drops another's that may yet
 * resume, and a search a reload interrupted goes on from its last checkpoint. A browser
 * that gives no IndexedDB keeps them in memory: the search runs, but a reload loses it
 * (the controller says so at the start).
 */
import { memoryCheckpointStore, type CheckpointStore } from '../../engine';
import { CHECKPOINTS_KEPT, dropCheckpointsExcept, indexedDbCheckpointStore, openLociDb, type LociDb } from '../storage';

export interface SearchCheckpoints {
  /** The run's store: IndexedDB, or memory when the browser gives none. */
  readonly store: (runId: string) => CheckpointStore;
  /** Drops the checkpoints of every run of this scope but `keepRunIds`. */
  readonly dropExcept: (keepRunIds: readonly string[]) => Promise<void>;
  /** Whether the checkpoints outlive the page. */
  readonly durable: () => Promise<boolean>;
}

/** A scope is the run id's text before its first '-' (checkpointScope): letters only. */
const SCOPE = /^[a-z]+$/;

/** Makes the run ids of `scope`: unique on this page and across reloads. */
export function runIdMaker(scope: string): () => string {
  if (!SCOPE.test(scope)) throw new Error(`runIdMaker: scope must be lower-case letters, got ${JSON.stringify(scope)}`);
  let counter = 0;
  return () => `${scope}-${Date.now().toString(36)}-${crypto.randomUUID().slice(0, 8)}-${(counter++).toString(36)}`;
}

/** The browser's checkpoints of `scope`: one database connection, opened on first use. */
export function browserSearchCheckpoints(scope: string, open: () => Promise<LociDb> = openLociDb): SearchCheckpoints {
  if (!SCOPE.test(scope)) throw new Error(`browserSearchCheckpoints: scope must be lower-case letters, got ${JSON.stringify(scope)}`);
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
      await dropCheckpointsExcept(d, keepRunIds, scope);
    },
    durable: async () => (await db()) !== null,
  };
}
