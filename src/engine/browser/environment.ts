/** The engine's environment in a browser: search workers are module Workers, the clock is performance.now. */
import type { EngineEnvironment, WorkerHandle } from '../environment';

export function spawnBrowserSearchWorker(): WorkerHandle {
  // Written out in full so the bundler sees the worker entry and builds it.
  const worker = new Worker(new URL('../../../workers/searchWorker.ts', import.meta.url), { type: 'module' });
  const listeners: ((reason: string) => void)[] = [];
  let failed = false;
  const fail = (reason: string) => {
    if (failed) return;
    failed = true;
    for (const listener of listeners) listener(reason);
  };
  worker.addEventListener('error', (event) => fail(event.message || 'the worker could not start or threw'));
  worker.addEventListener('messageerror', () => fail('a message could not be read'));
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
    // One core stays with the page.
    defaultWorkerCount: () => Math.max(1, (navigator.hardwareConcurrency || 2) - 1),
  };
}
