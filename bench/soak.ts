/**
 * Soak: the rounds and checkpoints of an 8-hour search in minutes. The engine runs as
 * `loci fit --seconds 28800` does (a time budget, worker threads, a checkpoint file saved
 * every 30 s of its clock), on a clock that reads the time the real run would show at
 * each round: 200 ms per round (the default step, one island per worker), so a
 * checkpoint falls due every 150 rounds and the budget ends at round 144,000, while the
 * workers' steps last a few real milliseconds. Prints the orchestrating thread's heap
 * (the page's side in the app) and the workers' heaps, each after a full garbage
 * collection, after warm-up (the first simulated half hour) and then every simulated
 * hour to the end (a sixteenth and an eighth of a shorter run), with the checkpoint's size at each; then the growth from warm-up to
 * the end. Figures only: nothing is asserted, and nothing depends on the machine's speed
 * but the wall time.
 *
 *   npm run bench -- soak          (about 15–30 minutes; not in the default run)
 *
 * LOCI_SOAK_HOURS (default 8; 0.25 for a short look), LOCI_SOAK_STEP_MS (default 4)
 * and LOCI_SOAK_PROBLEM (a problem of tests/reference/problems, default closed18-untimed)
 * change the run; LOCI_SOAK_KEEP names a file to keep the last checkpoint in. Each
 * checkpoint's save is timed too (wall ms: it waits for the disk and for the machine).
 * After the run the last checkpoint is decoded, encoded again and its islands restored and
 * exported, each timed (median of a few, wall ms): the orchestrating thread's part of a
 * checkpoint, and the workers' part.
 */
import { mkdtempSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { loadavg, tmpdir } from 'node:os';
import { join } from 'node:path';
import { performance } from 'node:perf_hooks';
import { setFlagsFromString } from 'node:v8';
import { runInNewContext } from 'node:vm';
import { createRun, type CheckpointStore, type RunInput } from '../src/engine';
import { decodeCheckpoint, encodeCheckpoint } from '../src/engine/checkpoint';
import { fileCheckpointStore } from '../src/engine/node';
import { Island } from '../workers/island';
import { MB, spawnMeasuredWorker, workersHeapMb } from './memory';

/** A real run's round: the default step (DEFAULT_STEP_MS of src/engine/runSpec.ts), one island per worker. */
const ROUND_MS = 200;
const CHECKPOINT_EVERY_MS = 30_000;
/** Warm-up is the run's first sixteenth (half an hour of eight), then a sample every eighth. */
const WARM_UP_SHARE = 1 / 16;
const SAMPLE_SHARE = 1 / 8;
const WORKERS = 2;
const DEFAULT_PROBLEM = 'closed18-untimed';
/** Repeats of each timing of the last checkpoint; the median is reported. */
const CODEC_REPEATS = 5;

function envNumber(name: string, fallback: number): number {
  const raw = process.env[name];
  if (raw === undefined || raw === '') return fallback;
  const value = Number(raw);
  if (!(Number.isFinite(value) && value > 0)) throw new Error(`${name} is ${raw}; expected a number > 0`);
  return value;
}

/** A full GC of this thread; --expose-gc set at run time reaches the workers started after it too. */
function exposeGc(): () => void {
  setFlagsFromString('--expose-gc');
  return runInNewContext('gc') as () => void;
}

function median(xs: readonly number[]): number {
  const sorted = [...xs].sort((a, b) => a - b);
  return sorted.length === 0 ? NaN : (sorted[(sorted.length - 1) >> 1] + sorted[sorted.length >> 1]) / 2;
}

function medianMs(task: () => void): number {
  const times: number[] = [];
  for (let k = 0; k < CODEC_REPEATS; k++) {
    const t0 = performance.now();
    task();
    times.push(performance.now() - t0);
  }
  return median(times);
}

/** Wall ms to decode the checkpoint text, to encode its payload again, and to restore and to export its islands (all of them, one after another). */
function codecTimes(text: string): { decodeMs: number; encodeMs: number; islandsRestoreMs: number; islandsExportMs: number } {
  const decoded = decodeCheckpoint(text);
  if (!decoded.ok) throw new Error(`soak: the last checkpoint does not decode: ${decoded.reason}`);
  const payload = decoded.payload;
  const islands = payload.islands.map((state) => {
    const made = Island.restore(state);
    if (!made.ok) throw new Error(`soak: an island of the last checkpoint does not restore: ${made.reason}`);
    return made.island;
  });
  let length = 0;
  const decodeMs = medianMs(() => void decodeCheckpoint(text));
  const encodeMs = medianMs(() => (length = encodeCheckpoint(payload).length));
  if (length !== text.length) throw new Error(`soak: the last checkpoint encodes to ${length} characters again, not ${text.length}`);
  const islandsRestoreMs = medianMs(() => payload.islands.forEach((state) => Island.restore(state)));
  const islandsExportMs = medianMs(() => islands.forEach((island) => island.exportState()));
  return { decodeMs, encodeMs, islandsRestoreMs, islandsExportMs };
}

interface Sample {
  readonly simulatedH: number;
  readonly rounds: number;
  readonly wallS: number;
  readonly heapMb: number;
  readonly workersHeapMb: number | null;
  readonly checkpointKb: number | null;
}

export async function benchSoak(): Promise<Record<string, number | null>> {
  const hours = envNumber('LOCI_SOAK_HOURS', 8);
  const stepMs = envNumber('LOCI_SOAK_STEP_MS', 4);
  const gc = exposeGc();
  const dir = mkdtempSync(join(tmpdir(), 'loci-soak-'));
  const file = join(dir, 'ck.json');
  const fileStore = fileCheckpointStore(file);
  const sizes: number[] = [];
  const saveMs: number[] = [];
  const store: CheckpointStore = {
    async save(text) {
      const t0 = performance.now();
      await fileStore.save(text);
      saveMs.push(performance.now() - t0);
      sizes.push(statSync(file).size);
    },
    load: () => fileStore.load(),
  };
  // The clock a real run would read at each round: it moves by a round's time as each round is done.
  let clockMs = 0;
  const env = { spawnWorker: spawnMeasuredWorker, now: () => clockMs, defaultWorkerCount: () => WORKERS };
  // By default the eighteen-point closed curve of Cabrera, Simon and Prado (2002), as bench/memory.ts runs: it does not converge within hours.
  const problemName = process.env.LOCI_SOAK_PROBLEM ?? DEFAULT_PROBLEM;
  const problem: unknown = JSON.parse(readFileSync(new URL(`../tests/reference/problems/${problemName}.json`, import.meta.url), 'utf8'));
  const input: RunInput = {
    jobs: [{ id: problemName, objective: { kind: 'synthesis', problem, family: 'fourbar-lengths' }, seed: 1, islands: WORKERS, optimizer: { kind: 'hybrid' } }],
    budget: { seconds: hours * 3600 },
    stepMs,
    checkpointEveryMs: CHECKPOINT_EVERY_MS,
  };
  const made = createRun(env, input, { workers: WORKERS, topK: 5, store });
  if (!made.ok) throw new Error(made.reason);

  const startMs = performance.now();
  const samples: Sample[] = [];
  const runMs = hours * 3_600_000;
  let nextSampleMs = runMs * WARM_UP_SHARE;
  let sampling: Promise<void> = Promise.resolve();
  const take = async (rounds: number, simulatedMs: number) => {
    const workers = await workersHeapMb();
    gc();
    const sample: Sample = {
      simulatedH: simulatedMs / 3_600_000,
      rounds,
      wallS: (performance.now() - startMs) / 1000,
      heapMb: process.memoryUsage().heapUsed / MB,
      workersHeapMb: workers,
      checkpointKb: sizes.length === 0 ? null : (sizes[sizes.length - 1] as number) / 1024,
    };
    samples.push(sample);
    const w = sample.workersHeapMb === null ? '-' : sample.workersHeapMb.toFixed(1);
    const ck = sample.checkpointKb === null ? '-' : sample.checkpointKb.toFixed(1);
    console.log(`${sample.simulatedH.toFixed(2).padStart(6)} ${String(rounds).padStart(8)} ${sample.wallS.toFixed(0).padStart(7)} ${sample.heapMb.toFixed(1).padStart(8)} ${w.padStart(16)} ${ck.padStart(14)}`);
  };
  let lastRounds = 0;
  made.run.onProgress((p) => {
    if (p.rounds > lastRounds) {
      clockMs += (p.rounds - lastRounds) * ROUND_MS;
      lastRounds = p.rounds;
    }
    // The last hour's sample is taken just before the budget ends, while the workers still run.
    const endMs = runMs - 2 * CHECKPOINT_EVERY_MS;
    if (p.status === 'running' && (clockMs >= nextSampleMs || (clockMs >= endMs && nextSampleMs > endMs && nextSampleMs < Infinity))) {
      nextSampleMs = clockMs >= endMs ? Infinity : nextSampleMs + runMs * SAMPLE_SHARE;
      const rounds = p.rounds;
      const at = clockMs;
      sampling = sampling.then(() => take(rounds, at));
    }
  });
  console.log(`soak: ${hours} h of a 2-worker search (${problemName}) in steps of ${stepMs} ms real, ${ROUND_MS} ms per round on the run's clock, checkpoint every ${CHECKPOINT_EVERY_MS / 1000} s of it`);
  console.log(' sim h   rounds  wall s  heap MB  workers heap MB  checkpoint KB');
  const result = await made.run.start();
  await sampling;
  // Read back from the file, not kept in memory during the run: the heap measured is the engine's alone.
  const [lastText = ''] = await fileStore.load();
  rmSync(dir, { recursive: true, force: true });
  if (!result.ok) throw new Error(result.reason);
  const warm = samples[0];
  const end = samples[samples.length - 1];
  if (warm === undefined || end === undefined || samples.length < 2) throw new Error(`soak: ${samples.length} memory sample(s); the run ended before its warm-up was over`);
  const keep = process.env.LOCI_SOAK_KEEP;
  if (keep !== undefined && keep !== '') writeFileSync(keep, lastText);
  const codec = codecTimes(lastText);
  return {
    simulatedHours: clockMs / 3_600_000,
    rounds: result.rounds,
    roundsOfRealRun: (hours * 3_600_000) / ROUND_MS,
    checkpoints: sizes.length,
    evaluations: result.evaluations,
    heapMbAfterWarmUp: warm.heapMb,
    heapMbAtEnd: end.heapMb,
    heapGrowthMb: end.heapMb - warm.heapMb,
    workersHeapMbAfterWarmUp: warm.workersHeapMb,
    workersHeapMbAtEnd: end.workersHeapMb,
    workersHeapGrowthMb: warm.workersHeapMb === null || end.workersHeapMb === null ? null : end.workersHeapMb - warm.workersHeapMb,
    checkpointKbFirst: (sizes[0] ?? NaN) / 1024,
    checkpointKbAfterWarmUp: warm.checkpointKb,
    checkpointKbMax: Math.max(...sizes) / 1024,
    checkpointKbLast: (sizes[sizes.length - 1] ?? NaN) / 1024,
    checkpointSaveMsMedian: median(saveMs),
    checkpointSaveMsMax: Math.max(...saveMs),
    lastCheckpointKb: lastText.length / 1024,
    lastCheckpointDecodeMs: codec.decodeMs,
    lastCheckpointEncodeMs: codec.encodeMs,
    lastCheckpointIslandsRestoreMs: codec.islandsRestoreMs,
    lastCheckpointIslandsExportMs: codec.islandsExportMs,
    loadAverage1MinEnd: loadavg()[0],
  };
}
