/**
 * Loci's IndexedDB database: the project, the run checkpoints, the background images,
 * the kept runs (run history), the shortlist of pinned designs and the batch queue.
 * Every write goes through a transaction (idb wraps each call in one, or we open one
 * across stores where two writes must land together).
 */
import { openDB, type DBSchema, type IDBPDatabase } from 'idb';

export const DB_NAME = 'loci';
/** 2 adds the kept runs and the pinned designs; 3 the batch queue. */
export const DB_VERSION = 3;
/** The key of the project the workspace opens. */
export const CURRENT_PROJECT_KEY = 'current';

export interface CheckpointRecord {
  readonly runId: string;
  /** Increases with every checkpoint of a run. */
  readonly seq: number;
  readonly text: string;
  /** Wall-clock time of the save, ms since 1970 (for the user; ordering uses seq). */
  readonly savedAt: number;
}

export interface LociSchema extends DBSchema {
  projects: { key: string; value: unknown };
  checkpoints: { key: [string, number]; value: CheckpointRecord; indexes: { byRun: string } };
  images: { key: string; value: { readonly imageId: string; readonly blob: Blob; readonly name: string } };
  /** One record per kept run (src/app/history/types.ts), by run id. */
  runs: { key: string; value: unknown };
  /** One record per pinned design, by pin key. */
  pins: { key: string; value: unknown };
  /** The batch queue (src/app/storage/queueStore.ts): its state, and its lease where the browser has no Web Locks. */
  queue: { key: string; value: unknown };
}

export type LociDb = IDBPDatabase<LociSchema>;

/** Opens (creating or upgrading) the database; rejects when the browser gives no IndexedDB. */
export function openLociDb(): Promise<LociDb> {
  return openDB<LociSchema>(DB_NAME, DB_VERSION, {
    upgrade(db, oldVersion) {
      if (oldVersion < 1) {
        db.createObjectStore('projects');
        const checkpoints = db.createObjectStore('checkpoints', { keyPath: ['runId', 'seq'] });
        checkpoints.createIndex('byRun', 'runId');
        db.createObjectStore('images', { keyPath: 'imageId' });
      }
      if (oldVersion < 2) {
        db.createObjectStore('runs');
        db.createObjectStore('pins');
      }
      // Adds a store and touches none of the others: every earlier record stays.
      if (oldVersion < 3) db.createObjectStore('queue');
    },
  });
}
