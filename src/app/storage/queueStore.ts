/**
 * The batch queue in IndexedDB: one record for the queue's state (src/engine/queue.ts),
 * read back checked whole, and the lease a tab holds on the queue where the browser has
 * no Web Locks API. The queue's jobs keep their checkpoints in the checkpoint store
 * under run ids of the `queue` scope, apart from the workspace searches' own.
 */
import { emptyQueue, readQueueState, type QueueLease, type QueueState } from '../../engine/queue';
import type { LociDb } from './db';

const QUEUE_KEY = 'current';
const LEASE_KEY = 'lease';
/** The run ids of queued jobs start with this (checkpointScope gives it back). */
export const QUEUE_RUN_SCOPE = 'queue';

export type QueueRead<P> = { readonly ok: true; readonly state: QueueState<P> } | { readonly ok: false; readonly reason: string };

/** The stored queue, an empty one when none was ever saved, or why the stored one cannot be read (it is left as it is). */
export async function loadQueue<P>(db: LociDb, isProblem: (p: unknown) => boolean): Promise<QueueRead<P>> {
  const value = await db.get('queue', QUEUE_KEY);
  if (value === undefined) return { ok: true, state: emptyQueue<P>() };
  return readQueueState<P>(value, isProblem);
}

export async function saveQueue<P>(db: LociDb, state: QueueState<P>): Promise<void> {
  await db.put('queue', state, QUEUE_KEY);
}

function isLease(v: unknown): v is QueueLease {
  return typeof v === 'object' && v !== null && typeof (v as QueueLease).owner === 'string' && typeof (v as QueueLease).expiresAt === 'number';
}

/**
 * Takes or renews the lease for `owner` in one transaction (two tabs reading a lapsed
 * lease at once cannot both take it), if `mayTake` allows it given the lease stored.
 * Resolves to whether `owner` holds it now.
 */
export async function claimLease(db: LociDb, owner: string, expiresAt: number, mayTake: (lease: QueueLease | null) => boolean): Promise<boolean> {
  const tx = db.transaction('queue', 'readwrite');
  const stored = await tx.store.get(LEASE_KEY);
  const lease = isLease(stored) ? stored : null;
  const take = mayTake(lease);
  if (take) await tx.store.put({ owner, expiresAt } satisfies QueueLease, LEASE_KEY);
  await tx.done;
  return take;
}

/** Gives the lease up (a tab closing), if `owner` holds it. */
export async function releaseLease(db: LociDb, owner: string): Promise<void> {
  const tx = db.transaction('queue', 'readwrite');
  const stored = await tx.store.get(LEASE_KEY);
  if (isLease(stored) && stored.owner === owner) await tx.store.delete(LEASE_KEY);
  await tx.done;
}

const NOTIFY_KEY = 'notify';

/** Whether the user asked to be told when the queue is done. */
export async function loadNotifyWish(db: LociDb): Promise<boolean> {
  return (await db.get('queue', NOTIFY_KEY)) === true;
}

export async function saveNotifyWish(db: LociDb, wish: boolean): Promise<void> {
  await db.put('queue', wish, NOTIFY_KEY);
}
