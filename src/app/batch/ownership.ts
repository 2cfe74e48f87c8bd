/**
 * One tab owns the queue at a time. With the Web Locks API the owner holds a lock for as
 * long as it is open (the browser lets go when the tab closes or crashes); another tab is
 * told, and waits in line to take over. Without it, the owner renews a lease in
 * IndexedDB, and another tab takes over once it lapses.
 */
import { LEASE_MS, LEASE_RENEW_MS, leaseHolder } from '../../engine/queue';
import type { LociDb } from '../storage';
import { claimLease, releaseLease } from '../storage/queueStore';

const QUEUE_LOCK = 'loci-batch-queue';

/** Told true when this tab owns the queue, false when another does (and again whenever that changes). */
export type OwnershipListener = (owned: boolean) => void;

export function claimQueue(db: LociDb, me: string, onChange: OwnershipListener): void {
  const locks = (navigator as Partial<Navigator>).locks;
  if (locks !== undefined) {
    // Held until the page goes: the lock's callback never settles.
    const hold = () => new Promise<void>(() => {});
    void locks.request(QUEUE_LOCK, { ifAvailable: true }, (lock) => {
      if (lock !== null) {
        onChange(true);
        return hold();
      }
      onChange(false);
      // In line behind the owner: this tab takes the queue over when that one closes.
      void locks.request(QUEUE_LOCK, () => {
        onChange(true);
        return hold();
      });
      return undefined;
    });
    return;
  }
  let owned: boolean | null = null;
  const renew = () =>
    claimLease(db, me, Date.now() + LEASE_MS, (lease) => leaseHolder(lease, me, Date.now()) !== 'other').then(
      (now) => {
        if (now !== owned) onChange(now);
        owned = now;
      },
      () => {
        if (owned !== false) onChange(false);
        owned = false;
      },
    );
  void renew();
  setInterval(() => void renew(), LEASE_RENEW_MS);
  window.addEventListener('pagehide', () => void releaseLease(db, me));
}

/**
 * Holds the lock a search takes (src/app/boot.ts), so a job and a workspace search never
 * share the workers: resolves once held (at once without Web Locks), rejects if `signal`
 * aborts first. The lock is let go when `released` settles.
 */
export function holdSearchLock(name: string, released: Promise<void>, signal: AbortSignal): Promise<void> {
  const locks = (navigator as Partial<Navigator>).locks;
  if (locks === undefined) return Promise.resolve();
  return new Promise((resolve, reject) => {
    locks.request(name, { signal }, () => {
      resolve();
      return released;
    }).catch(reject);
  });
}
