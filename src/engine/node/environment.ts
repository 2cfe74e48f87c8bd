/** The engine's environment on Node: search workers are worker_threads, the clock is performance.now. */
import { availableParallelism } from 'node:os';
import { performance } from 'node:perf_hooks';
import { Worker } from 'node:worker_threads';
import nodeEndpoint from 'comlink/dist/esm/node-adapter.mjs';
import type { EngineEnvironment, WorkerHandle } from '../environment';

const bootstrapUrl = new URL('./workerBootstrap.mjs', import.meta.url);
const searchWorkerUrl = new URL('../../../workers/searchWorker.ts', import.meta.url);

/** A started Node worker and its handle; `worker` is there for tools that need it (tests stop one this way). */
export interface NodeWorkerHandle extends WorkerHandle {
  readonly worker: Worker;
}

export function spawnNodeSearchWorker(): NodeWorkerHandle {
  const worker = new Worker(bootstrapUrl, { workerData: { entry: searchWorkerUrl.href } });
  const listeners: ((reason: string) => void)[] = [];
  let failed = false;
  const fail = (reason: string) => {
    if (failed) return;
    failed = true;
    for (const listener of listeners) listener(reason);
  };
  worker.on('error', (error: Error) => fail(`uncaught ${error.name}: ${error.message}`));
  worker.on('messageerror', (error: Error) => fail(`a message could not be read: ${error.message}`));
  worker.on('exit', (code: number) => fail(`exited with code ${code}`));
  return {
    worker,
    endpoint: nodeEndpoint(worker),
    onFailure(listener) {
      listeners.push(listener);
    },
    async terminate() {
      await worker.terminate();
    },
  };
}

/**
 * Node's environment. `spawn` may be replaced (a test wraps it to reach the workers);
 * by default it starts workers/searchWorker.ts in a worker thread.
 */
export function nodeEnvironment(spawn: () => WorkerHandle = spawnNodeSearchWorker): EngineEnvironment {
  return {
    spawnWorker: spawn,
    now: () => performance.now(),
    defaultWorkerCount: () => Math.max(1, availableParallelism()),
  };
}
