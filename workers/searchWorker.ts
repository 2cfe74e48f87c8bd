/**
 * The search worker entry point: the API of searchWorkerApi.ts, exposed with comlink.
 * The same module runs as a browser module Worker (comlink's default endpoint, `self`)
 * and as a Node worker_threads worker (its parent port through comlink's Node adapter).
 * The Node modules are imported by a computed name so a browser bundle leaves them out.
 */
import './browserPolicy';
import { expose } from 'comlink';
import { createSearchWorkerApi } from './searchWorkerApi';

const api = createSearchWorkerApi(() => performance.now());

const inBrowserWorker = typeof (globalThis as { WorkerGlobalScope?: unknown }).WorkerGlobalScope === 'function';

if (inBrowserWorker) {
  expose(api);
} else {
  const threadsModule = 'node:worker_threads';
  const adapterModule = 'comlink/dist/esm/node-adapter.mjs';
  const { parentPort } = (await import(/* @vite-ignore */ threadsModule)) as typeof import('node:worker_threads');
  const nodeEndpoint = ((await import(/* @vite-ignore */ adapterModule)) as typeof import('comlink/dist/esm/node-adapter.mjs')).default;
  if (parentPort === null) throw new Error('workers/searchWorker.ts runs as a worker (browser Worker or Node worker_threads), not as a main script');
  expose(api, nodeEndpoint(parentPort));
}
