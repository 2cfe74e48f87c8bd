/**
 * Where a run's checkpoints go. The engine hands a store the encoded text of each
 * checkpoint and, to resume, reads back what is stored, newest first, taking the first
 * that decodes: a store that keeps the previous checkpoint as well lets a run survive a
 * corrupt latest one. Node's store is a JSON file (node/fileCheckpointStore.ts); the
 * browser's keeps them in IndexedDB.
 */
export interface CheckpointStore {
  /** Stores one checkpoint (its full text) durably; resolves once it is safely written, rejects if it could not be. */
  save(text: string): Promise<void>;
  /** The stored checkpoints, newest first; an empty list when there is none. */
  load(): Promise<string[]>;
  /**
   * What `load` gives, with where each checkpoint came from (a file store names its
   * files) and notes on what it found amiss (a newest one missing, leftovers removed).
   * Optional: a store without it is read through `load`.
   */
  list?(): Promise<CheckpointListing>;
}

/** One stored checkpoint and where it came from ("ck.json", "ck.json.prev"). */
export interface StoredCheckpoint {
  readonly source: string;
  readonly text: string;
}

export interface CheckpointListing {
  /** Newest first. */
  readonly found: readonly StoredCheckpoint[];
  /** Things the user should be told, each a short clause. */
  readonly notes: readonly string[];
}

/** A store in memory, keeping the newest `keep` checkpoints (for tests, and runs that need no persistence). */
export function memoryCheckpointStore(keep = 2): CheckpointStore & { readonly texts: readonly string[] } {
  const texts: string[] = [];
  return {
    texts,
    save(text) {
      texts.unshift(text);
      texts.length = Math.min(texts.length, Math.max(1, keep));
      return Promise.resolve();
    },
    load() {
      return Promise.resolve([...texts]);
    },
  };
}
