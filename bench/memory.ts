/**
 * Memory over a long search: runs the engine as `loci fit --seconds` does (a time budget,
 * worker threads, a checkpoint file saved every few seconds) and prints the process's
 * resident set (main thread and workers), the main thread's heap and the workers' heaps
 * every few seconds, after a full garbage collection of each when node runs with
 * --expose-gc. Not a test and not
 * part of `npm run bench` (it takes minutes):
 *
 *   node --expose-gc --import tsx bench/memory.ts [--seconds 240] [--workers 2]
 *        [--every 10] [--step-ms 200] [--checkpoint-every 10] [--problem FILE]
 *
 * A shorter --step-ms runs many more rounds (and worker calls) in the same time, which
 * makes a per-round or per-call leak show sooner. A sample may catch a checkpoint being
 * written (its text is alive then), so the summary takes each minute's floor, the lowest
 * sample in it: a floor that keeps rising is a leak, a flat one means memory has levelled
 * off. The JSON line gives the first and last floors (from the second minute on, in a
 * run of 3 minutes or more) and the least-squares slope of the floors, MB per minute.
 * RSS also holds memory the allocator keeps after a peak, so it is noisier than the
 * heaps; judge a leak by the heaps' floors.
 */
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { performance } from 'node:perf_hooks';
import { pathToFileURL } from 'node:url';
import { MessageChannel, Worker, type MessagePort } from 'node:worker_threads';
import nodeEndpoint from 'comlink/dist/esm/node-adapter.mjs';
import type { FamilyId } from '../src/core/synthesis';
import { createRun, type RunInput, type WorkerHandle } from '../src/engine';
import { fileCheckpointStore, nodeEnvironment } from '../src/engine/node';

/**
 * By default the eighteen-point closed-curve problem of Cabrera, Simon and Prado (2002)
 * from the reference tests: its free crank angles keep the search from converging within
 * minutes, so the run lasts its whole time budget.
 */
const DEFAULT_PROBLEM = new URL('../tests/reference/problems/closed18-untimed.json', import.meta.url);
export const MB = 1024 * 1024;
/** A worker busy in a step answers between steps; one that does not within this is left out of a sample. */
const HEAP_ANSWER_MS = 5000;

const searchWorkerUrl = new URL('../workers/searchWorker.ts', import.meta.url);
const heapPorts: MessagePort[] = [];

/** A search worker as src/engine/node/environment.ts starts one, with a port that reports its heap. */
export function spawnMeasuredWorker(): WorkerHandle {
  const { port1, port2 } = new MessageChannel();
  const worker = new Worker(new URL('./memoryWorker.mjs', import.meta.url), {
    workerData: { entry: searchWorkerUrl.href, heapPort: port2 },
    transferList: [port2],
  });
  heapPorts.push(port1);
  port1.unref();
  const listeners: ((reason: string) => void)[] = [];
  let failed = false;
  const fail = (reason: string) => {
    if (failed) return;
    failed = true;
    for (const listener of listeners) listener(reason);
  };
  worker.on('error', (error: Error) => fail(`uncaught ${error.name}: ${error.message}`));
  worker.on('exit', (code: number) => fail(`exited with code ${code}`));
  return {
    endpoint: nodeEndpoint(worker),
    onFailure: (listener) => listeners.push(listener),
    async terminate() {
      heapPorts.splice(heapPorts.indexOf(port1), 1);
      port1.close();
      await worker.terminate();
    },
  };
}

/** The summed heap of the live workers, MB (null if one did not answer in time). */
export async function workersHeapMb(): Promise<number | null> {
  const answers = await Promise.all(
    heapPorts.map(
      (port) =>
        new Promise<number | null>((resolve) => {
          const timer = setTimeout(() => resolve(null), HEAP_ANSWER_MS);
          port.once('message', (bytes: number) => {
            clearTimeout(timer);
            resolve(bytes);
          });
          port.postMessage('heap');
        }),
    ),
  );
  return answers.includes(null) ? null : (answers as number[]).reduce((a, b) => a + b, 0) / MB;
}

function option(name: string, fallback: number): number {
  const at = process.argv.indexOf(`--${name}`);
  if (at < 0) return fallback;
  const value = Number(process.argv[at + 1]);
  if (!(Number.isFinite(value) && value > 0)) throw new Error(`--${name}: expected a number > 0, got ${process.argv[at + 1]}`);
  return value;
}

interface Sample {
  readonly s: number;
  readonly rounds: number;
  readonly rssMb: number;
  readonly heapMb: number;
  readonly workersHeapMb: number | null;
  readonly externalMb: number;
}

async function sample(startMs: number, rounds: number): Promise<Sample> {
  const workersHeap = await workersHeapMb();
  (globalThis as { gc?: () => void }).gc?.();
  const m = process.memoryUsage();
  return {
    s: (performance.now() - startMs) / 1000,
    rounds,
    rssMb: m.rss / MB,
    heapMb: m.heapUsed / MB,
    workersHeapMb: heapPorts.length === 0 ? null : workersHeap,
    externalMb: (m.external + m.arrayBuffers) / MB,
  };
}

/** Least-squares slope of y over x. */
export function slope(xs: readonly number[], ys: readonly number[]): number {
  const n = xs.length;
  const mx = xs.reduce((a, b) => a + b, 0) / n;
  const my = ys.reduce((a, b) => a + b, 0) / n;
  let sxy = 0;
  let sxx = 0;
  for (let k = 0; k < n; k++) {
    sxy += (xs[k] - mx) * (ys[k] - my);
    sxx += (xs[k] - mx) ** 2;
  }
  return sxx > 0 ? sxy / sxx : NaN;
}

/** Each minute's lowest RSS and heaps; the first minute (workers starting, the JIT warming up) is left out of longer runs. */
interface Floor {
  minute: number;
  rssMb: number;
  heapMb: number;
  workersHeapMb: number;
}

function floorsPerMinute(samples: readonly Sample[]): Floor[] {
  const floors: Floor[] = [];
  const from = (samples.at(-1)?.s ?? 0) >= 180 ? 60 : 5;
  for (const x of samples.filter((v) => v.s >= from)) {
    const minute = Math.floor(x.s / 60);
    const workers = x.workersHeapMb ?? Infinity;
    const at = floors.find((f) => f.minute === minute);
    if (at === undefined) floors.push({ minute, rssMb: x.rssMb, heapMb: x.heapMb, workersHeapMb: workers });
    else {
      at.rssMb = Math.min(at.rssMb, x.rssMb);
      at.heapMb = Math.min(at.heapMb, x.heapMb);
      at.workersHeapMb = Math.min(at.workersHeapMb, workers);
    }
  }
  return floors;
}

async function main(): Promise<void> {
  const seconds = option('seconds', 240);
  const workers = option('workers', 2);
  const everyS = option('every', 10);
  const stepMs = option('step-ms', 200);
  const checkpointEveryS = option('checkpoint-every', 10);
  const at = process.argv.indexOf('--problem');
  const problem = JSON.parse(readFileSync(at < 0 ? DEFAULT_PROBLEM : process.argv[at + 1], 'utf8')) as { families: FamilyId[] };
  const dir = mkdtempSync(join(tmpdir(), 'loci-memory-'));
  const input: RunInput = {
    jobs: problem.families.map((family) => ({ id: family, objective: { kind: 'synthesis', problem, family }, seed: 1, islands: workers, optimizer: { kind: 'hybrid' } })),
    // A time budget alone: each island then has no cap on evaluations (DEFAULT_ISLAND_EVALUATIONS) and searches until the time is up.
    budget: { seconds },
    stepMs,
  };
  const made = createRun(nodeEnvironment(spawnMeasuredWorker), input, { workers, topK: 5, store: fileCheckpointStore(join(dir, 'ck.json')), checkpointEveryMs: checkpointEveryS * 1000 });
  if (!made.ok) throw new Error(made.reason);
  const gc = typeof (globalThis as { gc?: unknown }).gc === 'function';
  console.log(`memory: ${problem.families.join(', ')}, ${seconds} s, ${workers} workers, steps of ${stepMs} ms, checkpoint every ${checkpointEveryS} s${gc ? ', after a full GC of the main thread' : ' (run node with --expose-gc for heap figures after a GC)'}`);
  console.log('     s   rounds   rss MB  heap MB  workers heap MB  ext MB');
  const startMs = performance.now();
  let rounds = 0;
  made.run.onProgress((p) => {
    rounds = p.rounds;
  });
  const samples: Sample[] = [];
  const print = (x: Sample) => {
    samples.push(x);
    const workers = x.workersHeapMb === null ? '-' : x.workersHeapMb.toFixed(1);
    console.log(`${x.s.toFixed(0).padStart(6)} ${String(x.rounds).padStart(8)} ${x.rssMb.toFixed(1).padStart(8)} ${x.heapMb.toFixed(1).padStart(8)} ${workers.padStart(16)} ${x.externalMb.toFixed(1).padStart(7)}`);
  };
  print(await sample(startMs, 0));
  let sampling: Promise<void> = Promise.resolve();
  const timer = setInterval(() => {
    sampling = sampling.then(async () => print(await sample(startMs, rounds)));
  }, everyS * 1000);
  const result = await made.run.start();
  clearInterval(timer);
  await sampling;
  // Samples of the run itself: the first (before the workers) and any taken as it ended (workers closed) left out.
  const during = samples.filter((x) => x.workersHeapMb !== null);
  console.log('after the run (workers closed):');
  print(await sample(startMs, rounds));
  rmSync(dir, { recursive: true, force: true });
  if (!result.ok) throw new Error(result.reason);
  const floors = floorsPerMinute(during);
  console.log('floor of each minute (lowest sample):');
  for (const f of floors) console.log(`  minute ${f.minute + 1}: rss ${f.rssMb.toFixed(1)} MB, heap ${f.heapMb.toFixed(1)} MB, workers' heap ${f.workersHeapMb.toFixed(1)} MB`);
  const minutes = floors.map((f) => f.minute);
  const figures = {
    rssFloorMbFirst: floors[0]?.rssMb ?? NaN,
    rssFloorMbLast: floors.at(-1)?.rssMb ?? NaN,
    heapFloorMbFirst: floors[0]?.heapMb ?? NaN,
    heapFloorMbLast: floors.at(-1)?.heapMb ?? NaN,
    rssFloorMbPerMin: slope(minutes, floors.map((f) => f.rssMb)),
    heapFloorMbPerMin: slope(minutes, floors.map((f) => f.heapMb)),
    workersHeapFloorMbFirst: floors[0]?.workersHeapMb ?? NaN,
    workersHeapFloorMbLast: floors.at(-1)?.workersHeapMb ?? NaN,
    workersHeapFloorMbPerMin: slope(minutes, floors.map((f) => f.workersHeapMb)),
    rounds,
    evaluations: result.evaluations,
  };
  console.log(JSON.stringify({ ...figures, bench: 'memory' }));
}

// Run as a script; bench/soak.ts imports the helpers above.
if (process.argv[1] !== undefined && import.meta.url === pathToFileURL(process.argv[1]).href) await main();
