/**
 * The engine under faults it must survive without losing its results: a checkpoint store
 * that cannot save, an objective that throws, and how often it saves when told to.
 * The search is a real one: L-SHADE on Rosenbrock's function, Σ 100 (x_{i+1} − x_i²)² +
 * (x_i − 1)² on [−30, 30]^D (Jamil and Yang, 2013), in real Node worker threads unless
 * a test says otherwise. No check depends on the machine's speed: where time matters
 * the test drives the engine's clock itself.
 */
import { MessageChannel } from 'node:worker_threads';
import { expose } from 'comlink';
import nodeEndpoint from 'comlink/dist/esm/node-adapter.mjs';
import { describe, expect, it } from 'vitest';
import { createRun, decodeCheckpoint, memoryCheckpointStore, type CheckpointStore, type EngineEnvironment, type RunInput, type WorkerHandle } from '../../src/engine';
import { nodeEnvironment } from '../../src/engine/node';
import { MAX_LEAD } from '../../src/engine/pipeline';
import { Island } from '../../workers/island';
import { buildObjective } from '../../workers/objective';
import { isObjectiveError, objectiveError } from '../../workers/objectiveError';
import { createSearchWorkerApi } from '../../workers/searchWorkerApi';
import type { IslandConfig, SearchWorkerApi } from '../../workers/api';

const ISLANDS = 3;
const STEP = 1000;
const BUDGET = ISLANDS * 8 * STEP;

/** Three islands on two workers, eight rounds of 1000 evaluations per island. */
const SPEC: RunInput = {
  jobs: [{ id: 'rosenbrock', objective: { kind: 'test-function', name: 'rosenbrock', dim: 8 }, seed: 2013, islands: ISLANDS }],
  budget: { evaluations: BUDGET },
  deterministic: true,
  stepEvaluations: STEP,
  migration: { everyRounds: 1, count: 2 },
  archive: { capacity: 8, distance: 0.01 },
};

function roundsOf(texts: readonly string[]): number[] {
  return texts.map((text) => {
    const decoded = decodeCheckpoint(text);
    if (!decoded.ok) throw new Error(decoded.reason);
    return decoded.payload.rounds;
  });
}

describe('a checkpoint store that cannot save', () => {
  it('does not stop the run: each failure is told, the results are whole, and saving resumes when the store works again', async () => {
    const saved: string[] = [];
    let attempts = 0;
    // Saves 2 and 3 fail (as a full disk would), the others work.
    const flaky: CheckpointStore = {
      save(text) {
        attempts++;
        if (attempts === 2 || attempts === 3) return Promise.reject(new Error(`ENOSPC: no space left on device (save ${attempts})`));
        saved.push(text);
        return Promise.resolve();
      },
      load: () => Promise.resolve([...saved].reverse()),
    };
    const errors: string[] = [];
    const seen: (string | undefined)[] = [];
    const made = createRun(nodeEnvironment(), SPEC, { workers: 2, store: flaky, checkpointEveryMs: 1e-3, onSaveError: (reason) => errors.push(reason) });
    if (!made.ok) throw new Error(made.reason);
    made.run.onProgress((p) => seen.push(p.checkpointError));
    const result = await made.run.start();
    if (!result.ok) throw new Error(result.reason);
    expect(result.evaluations).toBe(BUDGET);
    expect(result.candidates.length).toBeGreaterThan(0);
    expect(errors).toEqual(['ENOSPC: no space left on device (save 2)', 'ENOSPC: no space left on device (save 3)']);
    // The progress says so while it lasts, and no more once a save works again.
    expect(seen).toContain('ENOSPC: no space left on device (save 3)');
    expect(made.run.progress().checkpointError).toBeUndefined();
    const last = decodeCheckpoint(saved.at(-1)!);
    expect(last.ok && last.payload.evaluations).toBe(BUDGET);
  });

  it('still gives its results when no save ever works, and its progress keeps the reason', async () => {
    const broken: CheckpointStore = { save: () => Promise.reject(new Error('EROFS: read-only file system')), load: () => Promise.resolve([]) };
    const errors: string[] = [];
    const made = createRun(nodeEnvironment(), SPEC, { workers: 2, store: broken, onSaveError: (reason) => errors.push(reason) });
    if (!made.ok) throw new Error(made.reason);
    const result = await made.run.start();
    if (!result.ok) throw new Error(result.reason);
    expect(result.evaluations).toBe(BUDGET);
    // The save at launch and the final one, at least.
    expect(errors.length).toBeGreaterThanOrEqual(2);
    expect(made.run.progress().checkpointError).toBe('EROFS: read-only file system');
  });
});

describe('checkpointEveryMs', () => {
  /** The rounds of every save when the engine's clock moves 1000 ms per round and saves come every `everyMs`. */
  async function savedRounds(everyMs: number | undefined): Promise<number[]> {
    let clock = 0;
    const env: EngineEnvironment = { ...nodeEnvironment(), now: () => clock };
    const store = memoryCheckpointStore(100);
    const made = createRun(env, SPEC, { workers: 2, store, ...(everyMs === undefined ? {} : { checkpointEveryMs: everyMs }) });
    if (!made.ok) throw new Error(made.reason);
    made.run.onProgress((p) => {
      if (p.status === 'running' && p.rounds > 0) clock += 1000;
    });
    const result = await made.run.start();
    if (!result.ok) throw new Error(result.reason);
    return roundsOf([...store.texts].reverse());
  }

  it('sets how often the run saves: at launch, every so many ms of its clock, and at the end', async () => {
    // The clock moves when a round is reported, after the round's checkpoint test: round
    // k is tested at (k − 1) s since launch (at 0 s). Saves every 3 s: at launch; due at
    // round 4 (at 3 s) and taken MAX_LEAD = 3 rounds on, at round 7, the first round every
    // island can stop at whatever the workers' timing (then reported, at 7 s); round 8 is
    // tested at 8 s, 1 s after it; then the final one after round 8.
    expect(MAX_LEAD).toBe(3);
    expect(await savedRounds(3000)).toEqual([0, 7, 8]);
    // The spec's default (30 s) is longer than the whole run: launch and end only.
    expect(await savedRounds(undefined)).toEqual([0, 8]);
  });

  it('is refused unless a finite number of ms > 0', () => {
    for (const bad of [0, -5, Number.NaN, Number.POSITIVE_INFINITY]) {
      const made = createRun(nodeEnvironment(), SPEC, { checkpointEveryMs: bad });
      expect(!made.ok && made.reason).toMatch(/^checkpointEveryMs is .*; expected a finite number of milliseconds > 0/);
    }
  });
});

describe('an objective that throws', () => {
  it('makes the island throw an ObjectiveError naming the island, the design and the error', () => {
    const config: IslandConfig = {
      islandId: 'r#0',
      objective: { kind: 'test-function', name: 'rosenbrock', dim: 4 },
      seed: 1,
      stream: 0,
      optimizer: { kind: 'lshade' },
      maxEvaluations: 10_000,
      archiveCapacity: 4,
      archiveDistance: 0.01,
    };
    let calls = 0;
    let thrownAt: number[] = [];
    const made = Island.create(config, (spec) => {
      const built = buildObjective(spec);
      if (!built.ok) return built;
      const real = built.objective;
      return {
        ok: true,
        objective: {
          ...real,
          evaluate(x, out) {
            if (++calls === 150) {
              thrownAt = Array.from(x);
              throw new RangeError('the solver met a NaN');
            }
            real.evaluate(x, out);
          },
        },
      };
    });
    if (!made.ok) throw new Error(made.reason);
    let caught: unknown = null;
    try {
      made.island.step({ evaluations: 1000 }, () => 0);
    } catch (error) {
      caught = error;
    }
    expect(isObjectiveError(caught)).toBe(true);
    const message = (caught as Error).message;
    expect(message).toMatch(/^the objective of island r#0 threw on the design \[.*\]: RangeError: the solver met a NaN$/);
    const shown = JSON.parse(message.slice(message.indexOf('['), message.indexOf(']') + 1)) as number[];
    // Six significant digits of each coordinate of the design it was evaluating.
    expect(shown).toEqual(thrownAt.map((v) => Number(v.toPrecision(6))));
  });

  it('ends the run with that message and the best candidates of the rounds before, never as a crash', async () => {
    // Workers in this thread behind a real comlink channel: the real search API, except
    // that island rosenbrock#1's fourth step throws what its island throws when its
    // objective does (the island test above shows that part).
    const ports: { close(): void }[] = [];
    let steps = 0;
    const spawn = (): WorkerHandle => {
      const real = createSearchWorkerApi(() => performance.now());
      const api: SearchWorkerApi = {
        ...real,
        advance(requests) {
          const islandId = 'rosenbrock#1';
          if (requests.some((r) => r.islandId === islandId) && ++steps === 4) throw objectiveError(islandId, [1, 2, 3], new TypeError('x.foo is not a function'));
          return real.advance(requests);
        },
      };
      const { port1, port2 } = new MessageChannel();
      expose(api, nodeEndpoint(port2));
      ports.push(port1, port2);
      return { endpoint: nodeEndpoint(port1), onFailure: () => {}, terminate: () => Promise.resolve(port1.close()) };
    };
    const store = memoryCheckpointStore(2);
    const made = createRun(nodeEnvironment(spawn), SPEC, { workers: 2, store, checkpointEveryMs: 1e-3 });
    if (!made.ok) throw new Error(made.reason);
    const result = await made.run.start();
    for (const port of ports) port.close();
    expect(result.ok).toBe(false);
    if (result.ok) return;
    expect(result.reason).toBe('the objective of island rosenbrock#1 threw on the design [1, 2, 3]: TypeError: x.foo is not a function');
    expect(result.rounds).toBe(3);
    // The best candidates of the three rounds before, ranked and described.
    const candidates = result.candidates ?? [];
    expect(candidates.length).toBeGreaterThan(0);
    expect(candidates.map((c) => c.rank)).toEqual(candidates.map((_, k) => k + 1));
    const values = candidates.map((c) => c.value);
    expect(values).toEqual([...values].sort((a, b) => a - b));
    if (candidates[0].detail.kind === 'test-function') expect(candidates[0].detail.value).toBe(candidates[0].value);
    // The store keeps the last checkpoint taken before the fault, whole: the one at launch,
    // since the one due after round 1 is taken MAX_LEAD = 3 rounds on, at round 4, the
    // round that fails.
    expect(roundsOf([store.texts[0]])).toEqual([0]);
  });
});
