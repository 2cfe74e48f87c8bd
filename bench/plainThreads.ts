/**
 * The machine's own two-thread ratio: plain arithmetic in worker threads, with no
 * messages and no shared state, so a search's two-worker ratio can be read beside it.
 */
import { performance } from 'node:perf_hooks';
import { Worker } from 'node:worker_threads';

const SPIN_SOURCE = `const { parentPort, workerData } = require('node:worker_threads');
let acc = 0;
for (let i = 0; i < workerData; i++) acc += Math.sqrt(i);
parentPort.postMessage(acc);`;
const SPIN_ITERATIONS = 100_000_000;

/** Threads × runs per second of the fixed arithmetic, in `threads` threads at once. */
export function spin(threads: number): Promise<number> {
  const t0 = performance.now();
  const one = () =>
    new Promise<void>((resolve, reject) => {
      const worker = new Worker(SPIN_SOURCE, { eval: true, workerData: SPIN_ITERATIONS });
      worker.once('message', () => void worker.terminate().then(() => resolve()));
      worker.once('error', reject);
    });
  return Promise.all(Array.from({ length: threads }, one)).then(() => (threads * 1000) / (performance.now() - t0));
}
