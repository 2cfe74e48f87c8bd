/**
 * What the page knows of the browser's storage for Loci: how much it uses of its quota
 * (`navigator.storage.estimate()`), whether the browser agreed to keep it
 * (`navigator.storage.persist()`), and whether the last checkpoint write failed (a full
 * disk or quota gives QuotaExceededError). One store for the page, since the storage is
 * the origin's, whichever workspace searches; the search panels show it.
 */

export type Persistence =
  /** Not asked yet, or the answer is on its way. */
  | 'unknown'
  /** The browser keeps Loci's storage until the user clears it. */
  | 'persistent'
  /** The browser may clear Loci's storage when space runs low. */
  | 'best-effort'
  /** Asked, and the browser said no. */
  | 'declined'
  /** The browser has no `navigator.storage.persist`. */
  | 'unsupported';

export interface StorageStatus {
  /** Bytes used and allowed for this site; null until estimated, or where the browser gives no estimate. */
  readonly usageBytes: number | null;
  readonly quotaBytes: number | null;
  readonly persistence: Persistence;
  /** Why the last checkpoint write failed; null while writes succeed. */
  readonly saveFailure: string | null;
  /** A write failed earlier in this page and a later one succeeded. */
  readonly savedAgain: boolean;
}

export const INITIAL_STORAGE_STATUS: StorageStatus = { usageBytes: null, quotaBytes: null, persistence: 'unknown', saveFailure: null, savedAgain: false };

/** The part of `navigator.storage` used here (absent in old browsers and some private windows). */
export interface StorageManagerLike {
  readonly estimate?: () => Promise<{ usage?: number; quota?: number }>;
  readonly persist?: () => Promise<boolean>;
  readonly persisted?: () => Promise<boolean>;
}

/** An estimate is read again at most this often while checkpoints are written, ms. */
const ESTIMATE_EVERY_MS = 5_000;

export interface StorageStatusStore {
  getSnapshot(): StorageStatus;
  subscribe(listener: () => void): () => void;
  /** Reads usage and quota again (at most every few seconds unless `force`). */
  refresh(force?: boolean): Promise<void>;
  /** Asks the browser to keep Loci's storage; resolves with the answer, also kept in the snapshot. */
  askPersistence(): Promise<Persistence>;
  /** A checkpoint was written. */
  saved(): void;
  /** A checkpoint write failed, with why. */
  failed(reason: string): void;
}

/** The reason of a failed write in words, the error's name first ("QuotaExceededError: …"), without a closing full stop (it is quoted in a sentence). */
export function saveFailureReason(error: unknown): string {
  const words = error instanceof Error || error instanceof DOMException ? (error.message === '' ? error.name : `${error.name}: ${error.message}`) : String(error);
  return words.replace(/\.$/, '');
}

export function createStorageStatus(storage: StorageManagerLike | undefined, now: () => number): StorageStatusStore {
  let status = INITIAL_STORAGE_STATUS;
  let estimatedAtMs = -Infinity;
  const listeners = new Set<() => void>();
  const set = (patch: Partial<StorageStatus>) => {
    status = { ...status, ...patch };
    for (const listener of listeners) listener();
  };
  const store: StorageStatusStore = {
    getSnapshot: () => status,
    subscribe(listener) {
      listeners.add(listener);
      return () => listeners.delete(listener);
    },
    async refresh(force = false) {
      if (storage?.estimate === undefined || (!force && now() - estimatedAtMs < ESTIMATE_EVERY_MS)) return;
      estimatedAtMs = now();
      const estimate = await storage.estimate().catch(() => null);
      if (estimate !== null) set({ usageBytes: estimate.usage ?? null, quotaBytes: estimate.quota ?? null });
      if (status.persistence === 'unknown' && storage.persisted !== undefined) {
        const kept = await storage.persisted().catch(() => null);
        if (kept !== null && status.persistence === 'unknown') set({ persistence: kept ? 'persistent' : 'best-effort' });
      }
    },
    async askPersistence() {
      if (storage?.persist === undefined) {
        set({ persistence: 'unsupported' });
        return 'unsupported';
      }
      const granted = await storage.persist().catch(() => false);
      const persistence: Persistence = granted ? 'persistent' : 'declined';
      set({ persistence });
      return persistence;
    },
    saved() {
      if (status.saveFailure !== null) set({ saveFailure: null, savedAgain: true });
      void store.refresh();
    },
    failed(reason) {
      set({ saveFailure: reason });
      void store.refresh(true);
    },
  };
  return store;
}

/** The page's storage status (one per page: the storage is the origin's). */
export const storageStatus: StorageStatusStore = createStorageStatus(
  typeof navigator === 'undefined' ? undefined : (navigator.storage as StorageManagerLike | undefined),
  () => performance.now(),
);

/** "12.3 MB": bytes in megabytes (10⁶ bytes), one decimal below 100 MB. */
export function formatMegabytes(bytes: number): string {
  const mb = bytes / 1e6;
  return `${mb < 100 ? mb.toFixed(1) : Math.round(mb).toLocaleString('en-GB')} MB`;
}
