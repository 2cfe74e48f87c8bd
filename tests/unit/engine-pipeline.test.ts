/**
 * The engine's pipeline of slices (src/engine/pipeline.ts): no barrier between slices,
 * emigrants placed two slices after they are published, and results that do not depend
 * on timing. The search is a real one: L-SHADE on Rosenbrock's function, Σ 100 (x_{i+1}
 * − x_i²)² + (x_i − 1)² on [−30, 30]^D (Jamil and Yang, 2013), through the real search
 * API behind real comlink channels; the workers live in this thread so a test can hold
 * each call back by a random delay, as a loaded machine would, and read what crosses.
 *
 * The reference for every "same result" check is the same spec run with no delays on one
 * worker: a deterministic run's result depends only on its spec (seeds and budgets).
 */
import { MessageChannel } from 'node:worker_threads';
import { expose } from 'comlink';
import nodeEndpoint from 'comlink/dist/esm/node-adapter.mjs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Prng } from '../../src/core/optimize';
import { createRun, restoreRun, type RunInput, type RunResult, type WorkerHandle } from '../../src/engine';
import { nodeEnvironment } from '../../src/engine/node';
import { EmigrantLedger, MIGRATION_LAG } from '../../src/engine/pipeline';
import { createSearchWorkerApi } from '../../workers/searchWorkerApi';
import type { AdvanceRequest, AdvanceResult, Individual, SearchWorkerApi } from '../../workers/api';

const ISLANDS = 4;
const STEP = 500;

/** One job of four islands (a ring), eight slices each, migration after every second slice. */
const SPEC: RunInput = {
  jobs: [{ id: 'rosenbrock', objective: { kind: 'test-function', name: 'rosenbrock', dim: 6 }, seed: 1999, islands: ISLANDS }],
  budget: { evaluations: ISLANDS * 8 * STEP },
  deterministic: true,
  stepEvaluations: STEP,
  migration: { everyRounds: 2, count: 2 },
  archive: { capacity: 8, distance: 0.01 },
};

type Finished = Extract<RunResult, { ok: true }>;

function finished(result: RunResult): Finished {
  if (!result.ok) throw new Error(`run failed: ${result.reason}`);
  return result;
}

function fingerprint(result: Finished) {
  return { evaluations: result.evaluations, candidates: result.candidates.map((c) => ({ x: c.x, value: c.value, violation: c.violation })) };
}

interface Call {
  readonly worker: number;
  /** The worker's n-th advance call, from 1: its slice in a run started afresh. */
  readonly n: number;
  readonly requests: readonly AdvanceRequest[];
  readonly results: readonly AdvanceResult[];
}

const ports: { close(): void }[] = [];
afterAll(() => {
  for (const port of ports) port.close();
});

/**
 * Workers in this thread behind comlink channels. Each call to `advance` waits a random
 * 0–`maxDelayMs` ms (seeded) first, one call after another as a worker takes them, and
 * every call is recorded. The first worker is the slow one (the others wait a fifth as
 * long), so the others run ahead as far as the schedule lets them.
 */
function delayedWorkers(seed: number, maxDelayMs: number, calls: Call[] = []) {
  const prng = Prng.fromSeed(seed);
  let spawned = 0;
  const spawn = (): WorkerHandle => {
    const worker = spawned++;
    const real = createSearchWorkerApi(() => performance.now());
    let queue: Promise<unknown> = Promise.resolve();
    let n = 0;
    const api = {
      ...real,
      advance(requests: readonly AdvanceRequest[]) {
        const delay = prng.float() * maxDelayMs * (worker === 0 ? 1 : 0.2);
        const answer = queue.then(
          () =>
            new Promise<ReturnType<SearchWorkerApi['advance']>>((resolve) =>
              setTimeout(() => {
                const outcome = real.advance(requests);
                if (outcome.ok) calls.push({ worker, n: ++n, requests: structuredClone(requests), results: structuredClone(outcome.results) });
                resolve(outcome);
              }, delay),
            ),
        );
        queue = answer;
        return answer;
      },
    };
    const { port1, port2 } = new MessageChannel();
    expose(api, nodeEndpoint(port2));
    ports.push(port1, port2);
    return { endpoint: nodeEndpoint(port1), onFailure: () => {}, terminate: () => Promise.resolve(port1.close()) };
  };
  return nodeEnvironment(spawn);
}

let reference: Finished;

beforeAll(async () => {
  const made = createRun(delayedWorkers(0, 0), SPEC, { workers: 1 });
  if (!made.ok) throw new Error(made.reason);
  reference = finished(await made.run.start());
});

describe('a deterministic run with no barrier between slices', () => {
  it('ends on the same result on 1 to 4 workers, whatever order their answers come in', async () => {
    // Source: the schedule's invariant (the result depends only on the spec), against the undelayed one-worker run.
    expect(reference.evaluations).toBe(ISLANDS * 8 * STEP);
    for (const [workers, seed] of [[1, 11], [2, 12], [3, 13], [4, 14], [2, 15]] as const) {
      const made = createRun(delayedWorkers(seed, 15), SPEC, { workers });
      if (!made.ok) throw new Error(made.reason);
      expect(fingerprint(finished(await made.run.start())), `${workers} workers, delays of seed ${seed}`).toEqual(fingerprint(reference));
    }
  });

  it('places each island its ring neighbour\'s emigrants two slices after they were published, and nothing else', async () => {
    const calls: Call[] = [];
    const made = createRun(delayedWorkers(21, 10, calls), SPEC, { workers: 2 });
    if (!made.ok) throw new Error(made.reason);
    expect(fingerprint(finished(await made.run.start()))).toEqual(fingerprint(reference));
    // What each island sent and received, by slice.
    const published = new Map<string, Individual[]>();
    const received: { islandId: string; slice: number; immigrants: readonly Individual[] }[] = [];
    for (const call of calls) {
      for (const [k, request] of call.requests.entries()) {
        published.set(`${request.islandId}@${call.n}`, call.results[k].emigrants);
        received.push({ islandId: request.islandId, slice: call.n, immigrants: request.immigrants });
      }
    }
    let placements = 0;
    for (const { islandId, slice, immigrants } of received) {
      const k = Number(islandId.split('#')[1]);
      const sender = `rosenbrock#${(k + ISLANDS - 1) % ISLANDS}`;
      const from = slice - 1 - MIGRATION_LAG;
      // Source: the spec's schedule — publications at the end of every second slice, placed at the start of the slice after next.
      const expected = from >= 1 && from % 2 === 0 ? published.get(`${sender}@${from}`) : [];
      expect(immigrants, `${islandId} at slice ${slice}`).toEqual(expected);
      if (immigrants.length > 0) placements++;
    }
    // At least the publications after slice 2 reached every island, at slice 4.
    expect(placements).toBeGreaterThanOrEqual(ISLANDS);
  });

  it('continues from a checkpoint exported mid-run under delays, on another number of workers, to the same result', async () => {
    const made = createRun(delayedWorkers(31, 10), SPEC, { workers: 3 });
    if (!made.ok) throw new Error(made.reason);
    let exported: Promise<string> | null = null;
    made.run.onProgress((p) => {
      if (p.status === 'running' && p.rounds >= 3 && exported === null) exported = made.run.exportCheckpoint();
    });
    const done = made.run.start();
    while (exported === null) await new Promise((resolve) => setTimeout(resolve, 5));
    const text = await (exported as Promise<string>);
    made.run.cancel();
    await done;
    // Taken at a slice that publishes or just after one, it holds emigrants not yet placed.
    expect(text).toMatch(/"emigrants":\[/);
    const restored = restoreRun(delayedWorkers(32, 10), text, { workers: 2 });
    if (!restored.ok) throw new Error(restored.reason);
    expect(fingerprint(finished(await restored.run.start()))).toEqual(fingerprint(reference));
  });
});

describe('the emigrant ledger', () => {
  const a: Individual[] = [{ x: [1, 2], value: 3, violation: 0 }];
  const b: Individual[] = [{ x: [4, 5], value: 6, violation: 0 }];

  it('gives what an island published at a slice, its last emigrants once stopped, and forgets what every island has placed', () => {
    const ledger = new EmigrantLedger(2);
    ledger.publish(0, 2, a);
    expect(ledger.take(0, 2)).toEqual(a);
    expect(ledger.take(0, 4)).toBeNull();
    ledger.stopped(0, b);
    expect(ledger.take(0, 4)).toEqual(b);
    expect(ledger.take(0, 2)).toEqual(a);
    // Published at the end of slice 2, placed at the start of slice 2 + 1 + MIGRATION_LAG.
    ledger.prune(2 + MIGRATION_LAG);
    expect(ledger.entries()).toEqual([{ island: 0, slice: 2, individuals: a }]);
    ledger.prune(2 + 1 + MIGRATION_LAG);
    expect(ledger.entries()).toEqual([]);
  });
});
