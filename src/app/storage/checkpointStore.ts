/**
 * The engine's CheckpointStore on IndexedDB: each run's checkpoints under its run id,
 * the newest `keep` of them. A save adds the new one and drops the oldest in one
 * transaction, so a crash mid-save leaves the previous set whole. `load` gives them
 * newest first; the engine takes the first whose checksum holds, so a corrupt latest
 * checkpoint is skipped for the one before it.
 */
import type { CheckpointStore } from '../../engine';
import type { LociDb } from './db';
import { saveFailureReason, storageStatus, type StorageStatusStore } from './storageStatus';

/** Checkpoints kept per run: the latest and two before it. */
export const CHECKPOINTS_KEPT = 3;

/**
 * Each save's outcome also goes to `status` (the page's storage status), so the page can
 * say that checkpoints are not being saved (a full disk or quota: QuotaExceededError)
 * while the search goes on, and that they are again.
 */
export function indexedDbCheckpointStore(db: LociDb, runId: string, keep = CHECKPOINTS_KEPT, status: StorageStatusStore = storageStatus): CheckpointStore {
  return {
    async save(text) {
      try {
        await saveInOneTransaction(db, runId, keep, text);
      } catch (error) {
        status.failed(saveFailureReason(error));
        throw error;
      }
      status.saved();
    },
    async load() {
      const records = await db.getAllFromIndex('checkpoints', 'byRun', runId);
      return records.sort((a, b) => b.seq - a.seq).map((r) => r.text);
    },
  };
}

/** Adds the checkpoint and drops the oldest beyond `keep`, all or nothing. */
async function saveInOneTransaction(db: LociDb, runId: string, keep: number, text: string): Promise<void> {
  const tx = db.transaction('checkpoints', 'readwrite');
  // Every request's failure is the transaction's: read it once, from `done`.
  const done = tx.done;
  done.catch(() => {});
  const index = tx.store.index('byRun');
  const keys = (await index.getAllKeys(runId)).sort((a, b) => a[1] - b[1]);
  const seq = keys.length === 0 ? 1 : keys[keys.length - 1][1] + 1;
  await tx.store.put({ runId, seq, text, savedAt: Date.now() });
  for (const key of keys.slice(0, Math.max(0, keys.length + 1 - keep))) await tx.store.delete(key);
  await done;
}

/**
 * A run id's scope: what comes before its first '-' (`run` for the path search,
 * `suspension` for the suspension search). Each search drops only its own scope's old
 * checkpoints, so one search starting never loses another's that may yet resume.
 */
export function checkpointScope(runId: string): string {
  const dash = runId.indexOf('-');
  return dash < 0 ? runId : runId.slice(0, dash);
}

/**
 * Removes every checkpoint of the runs not in `keepRunIds` within `scope` (by default the
 * scopes of the kept runs): an old run's are of no use once a new one of its kind starts.
 */
export async function dropCheckpointsExcept(db: LociDb, keepRunIds: readonly string[], scope?: string): Promise<void> {
  const scopes = scope === undefined ? keepRunIds.map(checkpointScope) : [scope];
  const tx = db.transaction('checkpoints', 'readwrite');
  const keys = await tx.store.getAllKeys();
  for (const key of keys) if (scopes.includes(checkpointScope(key[0])) && !keepRunIds.includes(key[0])) await tx.store.delete(key);
  await tx.done;
}
