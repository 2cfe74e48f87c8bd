/**
 * The search engine with real Node worker_threads workers, the real L-SHADE optimizer and
 * a real objective: Rosenbrock's function, Σ 100 (x_{i+1} − x_i²)² + (x_i − 1)² on
 * [−30, 30]^D, minimum 0 at (1, …, 1) (Jamil and Yang, 2013, "A literature survey of
 * benchmark functions for global optimization problems").
 *
 * The reference for every "same result" check is an uninterrupted run of the same spec:
 * a deterministic run must end bit for bit the same however it was paused, exported,
 * restored on another number of workers, or had a worker killed under it.
 */
import fc from 'fast-check';
import { beforeAll, describe, expect, it } from 'vitest';
import {
  CHECKPOINT_VERSION,
  createRun,
  decodeCheckpoint,
  encodeCheckpoint,
  fnv1a64Hex,
  memoryCheckpointStore,
  restoreRun,
  restoreRunFromStore,
  type CheckpointPayload,
  type RunInput,
  type RunProgress,
  type RunResult,
} from '../../src/engine';
import { encodeCheckpointInSteps } from '../../src/engine/checkpoint';
import { Fnv1a64 } from '../../src/engine/checksum';
import { nodeEnvironment, spawnNodeSearchWorker, type NodeWorkerHandle } from '../../src/engine/node';
import { createSearchWorkerApi } from '../../workers/searchWorkerApi';
import type { IslandConfig, Individual } from '../../workers/api';

const DIM = 8;
const ISLANDS = 3;
const BUDGET = ISLANDS * 8000;

/** One job, three islands (a migration ring) on two workers, so one worker hosts two. */
const SPEC: RunInput = {
  jobs: [{ id: 'rosenbrock', objective: { kind: 'test-function', name: 'rosenbrock', dim: DIM }, seed: 2013, islands: ISLANDS }],
  budget: { evaluations: BUDGET },
  deterministic: true,
  stepEvaluations: 1000,
  migration: { everyRounds: 1, count: 2 },
  archive: { capacity: 8, distance: 0.01 },
};

type Finished = Extract<RunResult, { ok: true }>;

function finished(result: RunResult): Finished {
  if (!result.ok) throw new Error(`run failed: ${result.reason}`);
  return result;
}

/** What must match between two runs of one deterministic spec. */
function fingerprint(result: Finished) {
  return { evaluations: result.evaluations, candidates: result.candidates.map((c) => ({ x: c.x, value: c.value, violation: c.violation })) };
}

let reference: Finished;
let referenceEvents: RunProgress[];
let referenceCheckpoint: string;

beforeAll(async () => {
  const made = createRun(nodeEnvironment(), SPEC, { workers: 2 });
  if (!made.ok) throw new Error(made.reason);
  referenceEvents = [];
  made.run.onProgress((p) => referenceEvents.push(p));
  reference = finished(await made.run.start());
  referenceCheckpoint = await made.run.exportCheckpoint();
});

describe('a deterministic run', () => {
  it('spends exactly its evaluation budget and reports why it stopped', () => {
    // L-SHADE cuts its last generation short so its budget share is met exactly; 8 000
    // evaluations of an 8-d Rosenbrock are too few for it to converge first.
    expect(reference.stopReason).toBe('budget');
    expect(reference.evaluations).toBe(BUDGET);
    expect(referenceEvents.at(-1)?.status).toBe('finished');
    expect(referenceEvents.at(-1)?.evaluations).toBe(BUDGET);
  });

  it('reports progress that advances: evaluations and rounds grow, the best error never rises', () => {
    // A report after a checkpoint repeats the round it was taken at; every other report is of a new round.
    const running = referenceEvents.filter((p, k) => p.status === 'running' && p.rounds > 0 && p.rounds !== referenceEvents[k - 1]?.rounds);
    expect(running.length).toBeGreaterThanOrEqual(5);
    for (let k = 1; k < running.length; k++) {
      expect(running[k].rounds).toBeGreaterThan(running[k - 1].rounds);
      expect(running[k].evaluations).toBeGreaterThan(running[k - 1].evaluations);
      expect(running[k].best!.value).toBeLessThanOrEqual(running[k - 1].best!.value);
    }
    const last = running.at(-1)!;
    expect(last.evaluationsPerSecond).toBeGreaterThan(0);
    expect(last.remainingMs).not.toBeNull();
    expect(last.workers).toBe(2);
  });

  it('ranks distinct candidates best first, and the best is near Rosenbrock\'s minimum', () => {
    const values = reference.candidates.map((c) => c.value);
    expect(values).toEqual([...values].sort((a, b) => a - b));
    expect(reference.candidates[0].rank).toBe(1);
    const best = reference.candidates[0];
    // Started from errors of order 1e6 on [−30, 30]^8: the search has got into the valley.
    expect(best.value).toBeLessThan(10);
    expect(best.detail.kind).toBe('test-function');
    // describe() re-evaluates each design in a worker: the value must be the archived one.
    if (best.detail.kind === 'test-function') expect(best.detail.value).toBe(best.value);
  });

  it('gives the same result run again (same seed, same result)', async () => {
    const made = createRun(nodeEnvironment(), SPEC, { workers: 1 });
    if (!made.ok) throw new Error(made.reason);
    expect(fingerprint(finished(await made.run.start()))).toEqual(fingerprint(reference));
  });
});

describe('pause, resume, checkpoint export and import, cancel', () => {
  let exported = '';
  let pausedCheckpoint = '';
  let ended: Finished;
  const store = memoryCheckpointStore(2);
  const saved: string[] = [];
  const told: CheckpointPayload[] = [];

  beforeAll(async () => {
    const made = createRun(nodeEnvironment(), SPEC, {
      workers: 2,
      store: { save: (text) => (saved.push(text), store.save(text)), load: () => store.load() },
      onCheckpoint: (payload) => told.push(payload),
    });
    if (!made.ok) throw new Error(made.reason);
    const run = made.run;
    let pausedAt: Promise<void> | null = null;
    let exportedAt: Promise<string> | null = null;
    run.onProgress((p) => {
      if (p.status === 'running' && p.rounds >= 3 && pausedAt === null) pausedAt = run.pause();
      if (p.status === 'running' && p.rounds >= 5 && exportedAt === null) exportedAt = run.exportCheckpoint();
    });
    const done = run.start();
    await waitFor(() => pausedAt !== null);
    await pausedAt;
    expect(run.status()).toBe('paused');
    const before = run.progress().evaluations;
    await new Promise((resolve) => setTimeout(resolve, 300));
    expect(run.progress().evaluations).toBe(before);
    pausedCheckpoint = await run.exportCheckpoint();
    run.resume();
    await waitFor(() => exportedAt !== null);
    exported = await exportedAt!;
    ended = finished(await done);
  });

  it('pauses between rounds: no evaluations while paused, and a checkpoint is saved on pause', () => {
    const decoded = decodeCheckpoint(store.texts.at(-1) ?? '');
    expect(decoded.ok).toBe(true);
    const paused = decodeCheckpoint(pausedCheckpoint);
    expect(paused.ok && paused.payload.rounds).toBeGreaterThanOrEqual(3);
  });

  it('tells of each checkpoint after it is saved, with the payload its text was made from', async () => {
    await new Promise((resolve) => setTimeout(resolve, 0));
    // At least the one at launch, the one on pause and the final one; one call per save, in order.
    expect(told.length).toBeGreaterThanOrEqual(3);
    expect(told.length).toBe(saved.length);
    for (const [k, payload] of told.entries()) {
      const decoded = decodeCheckpoint(saved[k]);
      if (!decoded.ok) throw new Error(decoded.reason);
      expect({ ...decoded.payload, spec: null }).toEqual({ ...payload, spec: null });
    }
  });

  it('stops on cancel, before its budget, saying so', async () => {
    // Paused, resumed and exported from, the run still ends as the uninterrupted one.
    expect(fingerprint(ended)).toEqual(fingerprint(reference));
    // A cancel after the first round: the rounds already sent to the workers (at most
    // MAX_LEAD = 3 past it, ~1 150 evaluations each per island) end well before the budget.
    const made = createRun(nodeEnvironment(), SPEC, { workers: 2 });
    if (!made.ok) throw new Error(made.reason);
    made.run.onProgress((p) => {
      if (p.status === 'running' && p.rounds >= 1) made.run.cancel();
    });
    const cancelled = finished(await made.run.start());
    expect(cancelled.stopReason).toBe('cancelled');
    expect(cancelled.evaluations).toBeLessThan(BUDGET);
  });

  it('continues from an exported checkpoint, on another number of workers, to the uninterrupted result', async () => {
    const decoded = decodeCheckpoint(exported);
    expect(decoded.ok && decoded.payload.rounds).toBeGreaterThanOrEqual(5);
    const made = restoreRun(nodeEnvironment(), exported, { workers: 1 });
    if (!made.ok) throw new Error(made.reason);
    expect(fingerprint(finished(await made.run.start()))).toEqual(fingerprint(reference));
  });

  it('rejects a corrupt checkpoint with a message, and falls back to the previous one in a store', async () => {
    const flipped = exported.replace(/"rounds":(\d+)/, (_, n: string) => `"rounds":${Number(n) + 1}`);
    expect(flipped).not.toBe(exported);
    const corrupt = restoreRun(nodeEnvironment(), flipped);
    expect(corrupt.ok).toBe(false);
    if (!corrupt.ok) expect(corrupt.reason).toMatch(/corrupt.*checksum/);
    const truncated = restoreRun(nodeEnvironment(), exported.slice(0, exported.length - 100));
    expect(truncated.ok).toBe(false);
    if (!truncated.ok) expect(truncated.reason).toMatch(/not valid JSON/);

    const twoDeep = memoryCheckpointStore(2);
    await twoDeep.save(exported);
    await twoDeep.save(flipped);
    const restored = await restoreRunFromStore(nodeEnvironment(), twoDeep);
    expect(restored.ok).toBe(true);
    if (restored.ok) expect(restored.skipped[0]).toMatch(/corrupt/);
  });
});

describe('a killed worker', () => {
  it('is replaced and the run resumes from the last checkpoint, to the uninterrupted result', async () => {
    const handles: NodeWorkerHandle[] = [];
    const env = nodeEnvironment(() => {
      const handle = spawnNodeSearchWorker();
      handles.push(handle);
      return handle;
    });
    const made = createRun(env, SPEC, { workers: 2 });
    if (!made.ok) throw new Error(made.reason);
    let killed = false;
    const seen: number[] = [];
    made.run.onProgress((p) => {
      seen.push(p.evaluations);
      if (!killed && p.rounds >= 4) {
        killed = true;
        void handles[1].worker.terminate();
      }
    });
    const result = finished(await made.run.start());
    expect(killed).toBe(true);
    expect(result.restarts).toBe(1);
    expect(handles.length).toBe(3);
    // Back to the last checkpoint: the evaluation count went down once before going on.
    expect(seen.some((n, k) => k > 0 && n < seen[k - 1])).toBe(true);
    expect(fingerprint(result)).toEqual(fingerprint(reference));
  });
});

describe('a time budget', () => {
  it('stops when its seconds are spent, on the clock it is given', async () => {
    // The engine reads time only from its environment's clock. This one moves 10 ms per
    // reading, whatever the machine's speed or load, and the islands step by evaluation
    // counts (deterministic), so the run is the same on any machine: the clock stops it
    // after a fixed number of rounds, long before 8-d Rosenbrock could converge.
    let readings = 0;
    const env = { ...nodeEnvironment(), now: () => 10 * readings++ };
    const made = createRun(env, { ...SPEC, budget: { seconds: 0.8 } }, { workers: 2 });
    if (!made.ok) throw new Error(made.reason);
    const result = finished(await made.run.start());
    expect(result.stopReason).toBe('time');
    expect(result.elapsedMs).toBeGreaterThanOrEqual(800);
    expect(result.evaluations).toBeGreaterThan(0);
    // The same spec on the same clock ends the same way: nothing here depends on the machine.
    readings = 0;
    const again = createRun(env, { ...SPEC, budget: { seconds: 0.8 } }, { workers: 2 });
    if (!again.ok) throw new Error(again.reason);
    expect(fingerprint(finished(await again.run.start()))).toEqual(fingerprint(result));
  });
});

/** An L-SHADE island on the 4-d Rosenbrock function, with the fields a test sets. */
function rosenbrockIsland(fields: Pick<IslandConfig, 'seed' | 'maxEvaluations'>): IslandConfig {
  return {
    islandId: 'a',
    objective: { kind: 'test-function', name: 'rosenbrock', dim: 4 },
    stream: 0,
    optimizer: { kind: 'lshade' },
    archiveCapacity: 4,
    archiveDistance: 0.01,
    ...fields,
  };
}

describe('run input and the island API', () => {
  it('rejects bad input with the field named', () => {
    const env = nodeEnvironment();
    const noBudget = createRun(env, { ...SPEC, budget: {} });
    expect(!noBudget.ok && noBudget.reason).toMatch(/^budget is .*expected an evaluation budget, a time budget, or both/);
    const badSeed = createRun(env, { ...SPEC, jobs: [{ ...SPEC.jobs[0], seed: -1 }] });
    expect(!badSeed.ok && badSeed.reason).toMatch(/^jobs\[0\]\.seed is -1; expected a safe integer ≥ 0/);
  });

  it('an island refuses a bad configuration as a value, naming the field', () => {
    const api = createSearchWorkerApi(() => performance.now());
    const config = rosenbrockIsland({ seed: 1, maxEvaluations: 1000 });
    expect(api.init({ ...config, maxEvaluations: 0 })).toEqual({ ok: false, reason: 'maxEvaluations is 0; expected an integer ≥ 1' });
    const badDim = api.init({ ...config, objective: { kind: 'test-function', name: 'rosenbrock', dim: 1 } });
    expect(!badDim.ok && badDim.reason).toMatch(/dim of rosenbrock is 1/);
    expect(api.advance([{ islandId: 'nobody', slice: { evaluations: 10 }, immigrants: [], emigrants: 0, publish: false }])).toEqual({ ok: false, reason: 'requests[0]: no island "nobody" in this worker' });
  });

  it('an island takes an immigrant better than its worst member into its population, and it becomes its best', () => {
    const api = createSearchWorkerApi(() => performance.now());
    const base = rosenbrockIsland({ seed: 7, maxEvaluations: 50_000 });
    expect(api.init(base).ok).toBe(true);
    expect(api.init({ ...base, islandId: 'b', stream: 1 }).ok).toBe(true);
    const step = (islandId: string, evaluations: number, immigrants: readonly Individual[] = []) => {
      const r = api.advance([{ islandId, slice: { evaluations }, immigrants, emigrants: 1, publish: true }]);
      if (!r.ok) throw new Error(r.reason);
      return r.results[0];
    };
    const sent = step('a', 20_000).emigrants;
    const beforeB = step('b', 200);
    expect(sent[0].value).toBeLessThan(beforeB.progress.bestValue!);
    // Placed before a slice of one evaluation, which cannot come near a design 100 times better searched.
    step('b', 1, sent);
    const after = api.exportState('b');
    if (!after.ok) throw new Error(after.reason);
    expect(after.state.optimizer.best.value).toBe(sent[0].value);
  });
});

describe('checkpoint checksum', () => {
  it('is FNV-1a 64 (test vectors of Fowler, Noll and Vo, IETF draft-eastlake-fnv)', () => {
    // "" and "a" and "foobar": from memory, checked against an independent Python implementation.
    expect(fnv1a64Hex('')).toBe('cbf29ce484222325');
    expect(fnv1a64Hex('a')).toBe('af63dc4c8601ec8c');
    expect(fnv1a64Hex('foobar')).toBe('85944171f73967e8');
  });

  it('hashed a piece at a time gives the hash of the whole, surrogate pairs and lone surrogates included', () => {
    const hash = new Fnv1a64();
    for (let from = 0; from < 6; ) from = hash.updateText('foobar', from, from + 4);
    expect(hash.hex()).toBe('85944171f73967e8');
    // Against the UTF-8 bytes TextEncoder gives (a lone surrogate becomes U+FFFD), pieces of 1 to 5 code units.
    const encoder = new TextEncoder();
    const inPieces = (text: string, size: number) => {
      const pieces = new Fnv1a64();
      for (let from = 0; from < text.length; ) from = pieces.updateText(text, from, from + size);
      return pieces.hex();
    };
    // A pair split by a piece's end, a lone high and a lone low surrogate: stated, not left to chance.
    const edgy = 'a\ud83d\ude00b\ud800c\udc00';
    const edgyBytes = encoder.encode(edgy);
    const edgyWhole = new Fnv1a64();
    edgyWhole.update(edgyBytes, 0, edgyBytes.length);
    for (const size of [1, 2, 3]) expect(inPieces(edgy, size)).toBe(edgyWhole.hex());
    fc.assert(
      fc.property(fc.string({ unit: 'binary', maxLength: 40 }), fc.integer({ min: 1, max: 5 }), (text, size) => {
        const whole = new Fnv1a64();
        const bytes = encoder.encode(text);
        whole.update(bytes, 0, bytes.length);
        return inPieces(text, size) === whole.hex() && fnv1a64Hex(text) === whole.hex();
      }),
    );
  });

  it('is taken over JSON.stringify(payload), whether the text is encoded at once or in steps', async () => {
    const decoded = decodeCheckpoint(referenceCheckpoint);
    if (!decoded.ok) throw new Error(decoded.reason);
    const payload = decoded.payload;
    const body = JSON.stringify(payload);
    const whole = `{"format":"loci-run-checkpoint","version":${CHECKPOINT_VERSION},"checksum":"fnv1a64:${fnv1a64Hex(body)}","payload":${body}}`;
    expect(encodeCheckpoint(payload)).toBe(whole);
    let pauses = 0;
    const stepped = await encodeCheckpointInSteps(payload, () => {
      pauses++;
      return Promise.resolve();
    });
    expect(stepped).toBe(whole);
    // One pause before each island, one before the archives, one before each slice of the hash.
    expect(pauses).toBeGreaterThanOrEqual(payload.islands.length + 2);
  });
});

async function waitFor(ready: () => boolean, timeoutMs = 30_000): Promise<void> {
  const start = performance.now();
  while (!ready()) {
    if (performance.now() - start > timeoutMs) throw new Error('timed out waiting');
    await new Promise((resolve) => setTimeout(resolve, 10));
  }
}

