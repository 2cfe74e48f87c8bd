/**
 * A run taken up again from a store of checkpoints: the newest that decodes, with word of
 * the newer ones passed over and why.
 */
import type { CheckpointListing, CheckpointStore } from './checkpointStore';
import type { EngineEnvironment } from './environment';
import { restoreRun } from './run';
import type { RestoreFromStoreResult, RunOptions } from './runTypes';

async function listStore(store: CheckpointStore): Promise<CheckpointListing> {
  if (store.list !== undefined) return store.list();
  const texts = await store.load();
  return { found: texts.map((text, k) => ({ source: `checkpoint ${k + 1} (newest first)`, text })), notes: [] };
}

/**
 * The run of the newest checkpoint in `store` that decodes, where it came from, and what
 * was wrong with newer ones it passed over. `{ ok: false }` when the store holds none,
 * or none that decodes.
 */
export async function restoreRunFromStore(env: EngineEnvironment, store: CheckpointStore, options: Omit<RunOptions, 'store'> = {}): Promise<RestoreFromStoreResult> {
  const { found, notes } = await listStore(store);
  if (found.length === 0) return { ok: false, reason: 'the store holds no checkpoint', empty: true, notes };
  const passedOver: { source: string; reason: string }[] = [];
  for (const { source, text } of found) {
    const made = restoreRun(env, text, { ...options, store });
    if (made.ok) return { ok: true, run: made.run, skipped: passedOver.map((p) => p.reason), source, passedOver, notes };
    passedOver.push({ source, reason: made.reason });
  }
  return { ok: false, reason: passedOver.map((p) => `${p.source}: ${p.reason}`).join('; '), empty: false, notes };
}
