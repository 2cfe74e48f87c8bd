/**
 * What the search-resume unit tests of the suspension and leg workspaces share: the
 * checkpoints kept in memory as the browser's IndexedDB store keeps them, and a capped poll.
 */
import { memoryCheckpointStore, type CheckpointStore } from '../../src/engine';
import type { SearchCheckpoints } from '../../src/app/search/checkpoints';

/** Polls are capped; each waits this long, ms (a wait, never a measured time). */
const POLL_MS = 50;
const POLL_CAP = 2400;

export type MemoryCheckpoints = SearchCheckpoints & { stores: Map<string, CheckpointStore & { texts: readonly string[] }> };

/** Checkpoints in memory, as the browser's IndexedDB store keeps them: the newest three of each run. */
export function memoryCheckpoints(seed: Record<string, readonly string[]> = {}): MemoryCheckpoints {
  const stores = new Map<string, CheckpointStore & { texts: readonly string[] }>();
  const storeOf = (runId: string) => {
    let s = stores.get(runId);
    if (s === undefined) {
      s = memoryCheckpointStore(3);
      // Oldest first, so the newest ends first.
      for (const text of [...(seed[runId] ?? [])].reverse()) void s.save(text);
      stores.set(runId, s);
    }
    return s;
  };
  return {
    stores,
    store: storeOf,
    dropExcept: (keep) => {
      for (const id of [...stores.keys()]) if (!keep.includes(id)) stores.delete(id);
      return Promise.resolve();
    },
    durable: () => Promise.resolve(true),
  };
}

export async function pollUntil(done: () => boolean): Promise<void> {
  for (let i = 0; i < POLL_CAP && !done(); i++) await new Promise((r) => setTimeout(r, POLL_MS));
  if (!done()) throw new Error('gave up waiting');
}
