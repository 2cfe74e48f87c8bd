/**
 * The engine's environment for a page: runs are hosted by one engine worker
 * (engineWorkerEntry.ts), started with the first run and started again for the next run
 * if it ends; the page keeps a `Run` of each that mirrors it (remoteRun.ts). A search
 * worker started from the page itself (the one that describes checkpoints) is as before.
 */
import { wrap } from 'comlink';
import { remoteRunHost, type ServiceConnection } from '../remoteRun';
import type { HostingEnvironment } from '../runHost';
import type { RunServiceApi } from '../runService';
import { browserEnvironment } from './environment';
import { lifeLockName, watchLifeLock } from './lifeLock';

function startEngineWorker(): ServiceConnection {
  const name = lifeLockName('engine-worker');
  // Written out in full so the bundler sees the worker entry and builds it.
  const worker = new Worker(new URL('./engineWorkerEntry.ts', import.meta.url), { type: 'module', name });
  const listeners = new Set<(reason: string) => void>();
  let lost: string | null = null;
  const end = (reason: string) => {
    if (lost !== null) return;
    lost = reason;
    worker.terminate();
    for (const listener of [...listeners]) listener(reason);
    listeners.clear();
  };
  worker.addEventListener('error', (event) => end(event.message || 'it could not start or threw'));
  worker.addEventListener('messageerror', () => end('a message from it could not be read'));
  if (name !== undefined) watchLifeLock(worker, name, () => end('it closed, or the browser stopped it'));
  return {
    api: wrap<RunServiceApi>(worker),
    lostReason: () => lost,
    onLost(listener) {
      if (lost !== null) {
        listener(lost);
        return () => {};
      }
      listeners.add(listener);
      return () => listeners.delete(listener);
    },
  };
}

let engine: ServiceConnection | null = null;

/** The page's engine worker, started on first use and again after it ended. */
function engineWorker(): ServiceConnection {
  if (engine === null || engine.lostReason() !== null) engine = startEngineWorker();
  return engine;
}

/** The page's environment: runs go to the engine worker; the page's own search workers are started here. */
export function pageEnvironment(): HostingEnvironment {
  const local = browserEnvironment();
  return { ...local, runHost: remoteRunHost(local, engineWorker) };
}
