/**
 * How the thread that started a worker (the engine worker for a search worker, the page
 * for the engine worker) learns at once that it has ended. A worker that closes itself,
 * or that the browser stops, sends no event: the calls in flight would wait for their
 * time limit (minutes) while the other workers idle. So each worker holds a Web Lock
 * named after it for its whole life; the browser releases a lock when its holder ends,
 * and the starter, queued for the same lock, is granted it then. The worker's name
 * carries the lock's name; it says when it holds it, so the starter queues only after
 * (never before, which would take the lock first). Web Locks are there in workers too.
 */

/** A worker's name starts with this when it is to hold a life lock. */
const LIFE_LOCK_PREFIX = 'loci-life-';
/** The key of the worker's "I hold it" message (comlink ignores messages without an id). */
const HELD_KEY = 'lociLifeLockHeld';

interface LockManagerLike {
  request(name: string, callback: () => Promise<unknown> | unknown): Promise<unknown>;
}

function lockManager(): LockManagerLike | undefined {
  return (navigator as { locks?: LockManagerLike }).locks;
}

/** A fresh name for a worker of `kind` that asks it to hold a life lock, or undefined where the browser has no Web Locks. */
export function lifeLockName(kind: 'search-worker' | 'engine-worker'): string | undefined {
  return lockManager() === undefined ? undefined : `${LIFE_LOCK_PREFIX}${kind}-${crypto.randomUUID()}`;
}

/**
 * The starter's side: once the worker says it holds its lock, queues for it; `onEnded` is
 * called when the lock is granted, that is when the worker has ended (closed itself,
 * was terminated, or crashed).
 */
export function watchLifeLock(worker: Worker, name: string, onEnded: () => void): void {
  const locks = lockManager();
  if (locks === undefined) return;
  const onMessage = (event: MessageEvent) => {
    const data = event.data as Record<string, unknown> | null;
    if (data === null || typeof data !== 'object' || data[HELD_KEY] !== name) return;
    worker.removeEventListener('message', onMessage);
    void locks.request(name, () => onEnded()).catch(() => {});
  };
  worker.addEventListener('message', onMessage);
}

/** The worker's side: holds the lock its name carries until the worker ends, and says so once held. */
export function holdLifeLock(): void {
  const scope = self as unknown as { readonly name: string; postMessage(message: unknown): void };
  const locks = lockManager();
  if (locks === undefined || !scope.name.startsWith(LIFE_LOCK_PREFIX)) return;
  const name = scope.name;
  void locks
    .request(name, () => {
      scope.postMessage({ [HELD_KEY]: name });
      // Never settles: the lock goes only with the worker.
      return new Promise<never>(() => {});
    })
    .catch(() => {});
}
