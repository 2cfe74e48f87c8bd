/**
 * The machine's own two-thread ratios, so a search's two-worker ratio can be read beside
 * them: plain arithmetic in worker threads, with no messages and no shared state; and a
 * problem's objective alone in worker threads (objectiveThread.ts), with no optimizer,
 * engine or messages, whose ratio is the most two workers of that problem can give on
 * this machine. The two differ where the cores do not serve memory alike: on a virtual
 * machine whose cores share their caches with other guests unevenly, arithmetic runs as
 * fast on either core and the objective, which reads and writes arrays, does not.
 */
import { performance } from 'node:perf_hooks';
import { Worker } from 'node:worker_threads';
import type { FamilyId } from '../src/core/synthesis';

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

const bootstrapUrl = new URL('../src/engine/node/workerBootstrap.mjs', import.meta.url);
const objectiveThreadUrl = new URL('./objectiveThread.ts', import.meta.url);
/** Designs each thread cycles through, drawn from one seed (the same in every thread). */
const OBJECTIVE_DESIGNS = 512;
const OBJECTIVE_SEED = 7;
/** Each thread's warm-up, long enough for the optimising compiler to have settled on the cheapest problems. */
const OBJECTIVE_WARM_UP_SECONDS = 1;
const OBJECTIVE_SECONDS = 3;

/**
 * Evaluations per second of `problem`'s objective in `threads` threads at once: each
 * thread warms up, then all start together on one message and evaluate for the same
 * time; the sum of what they did over that time. Every thread's own rate counts, so a
 * slower core lowers the sum by its own shortfall only, as under a time budget.
 */
export async function objectiveThreads(threads: number, problem: unknown, family: FamilyId): Promise<number> {
  const workers = Array.from(
    { length: threads },
    () =>
      new Worker(bootstrapUrl, {
        workerData: {
          entry: objectiveThreadUrl.href,
          problem,
          family,
          seed: OBJECTIVE_SEED,
          designs: OBJECTIVE_DESIGNS,
          warmUpSeconds: OBJECTIVE_WARM_UP_SECONDS,
          seconds: OBJECTIVE_SECONDS,
        },
      }),
  );
  const answer = (worker: Worker) =>
    new Promise<unknown>((resolve, reject) => {
      worker.once('message', resolve);
      worker.once('error', reject);
    });
  try {
    await Promise.all(workers.map(answer));
    const counts = workers.map(answer);
    for (const worker of workers) worker.postMessage('go');
    const done = (await Promise.all(counts)) as number[];
    return done.reduce((a, b) => a + b, 0) / OBJECTIVE_SECONDS;
  } finally {
    await Promise.all(workers.map((w) => w.terminate()));
  }
}
