/**
 * The engine's environment in a browser: search workers are module Workers, the clock is
 * performance.now. The engine worker runs its runs on it (its search workers are nested
 * workers); the page uses it for the search worker that describes checkpoints.
 */
import type { EngineEnvironment, WorkerHandle } from '../environment';
import { lifeLockName, watchLifeLock } from './lifeLock';

export function spawnBrowserSearchWorker(): WorkerHandle {
  const name = lifeLockName('search-worker');
  // Written out in full so the bundler sees the worker entry and builds it.
  const worker = new Worker(new URL('./searchWorkerEntry.ts', import.meta.url), { type: 'module', name });
  const listeners: ((reason: string) => void)[] = [];
  let failed = false;
  const fail = (reason: string) => {
    if (failed) return;
    failed = true;
    for (const listener of listeners) listener(reason);
  };
  worker.addEventListener('error', (event) => fail(event.message || 'the worker could not start or threw'));
  worker.addEventListener('messageerror', () => fail('a message could not be read'));
  // A worker that closed itself or was stopped by the browser says nothing; its life lock does.
  if (name !== undefined) watchLifeLock(worker, name, () => fail('the worker ended (it closed, or the browser stopped it)'));
  return {
    endpoint: worker,
    onFailure(listener) {
      listeners.push(listener);
    },
    terminate() {
      worker.terminate();
      return Promise.resolve();
    },
  };
}

export function browserEnvironment(): EngineEnvironment {
  return {
    spawnWorker: spawnBrowserSearchWorker,
    now: () => performance.now(),
    // One core stays with the page (the engine worker itself only orchestrates).
    defaultWorkerCount: () => Math.max(1, (navigator.hardwareConcurrency || 2) - 1),
  };
}
