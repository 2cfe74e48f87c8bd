// The search worker of bench/memory.ts: src/engine/node/workerBootstrap.mjs, plus a port
// on which the bench asks for the worker's heap (after a full GC when node runs with
// --expose-gc, which worker threads share with the main thread).
import { fileURLToPath } from 'node:url';
import { getHeapStatistics } from 'node:v8';
import { workerData } from 'node:worker_threads';
import { register } from 'tsx/esm/api';

register({ tsconfig: fileURLToPath(new URL('../tsconfig.json', import.meta.url)) });
const { heapPort, entry } = workerData;
heapPort.on('message', () => {
  globalThis.gc?.();
  heapPort.postMessage(getHeapStatistics().used_heap_size);
});
heapPort.unref();
await import(entry);
