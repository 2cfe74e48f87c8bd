/**
 * A run's orchestration needs no timer to go on. Browsers hold back the timers of a
 * hidden tab: Chromium aligns chained zero-delay timers to one a second once a tab is
 * hidden, and to one a minute once it has been hidden for five minutes (measured here:
 * eight chained `setTimeout(…, 0)` took 55 s in a tab hidden for 5¾ minutes, eight
 * MessageChannel tasks 1 ms). A run that yielded to the page through timers would then
 * wait a minute at every checkpoint of an overnight search. Here every timer is frozen
 * (never fires) while a run with a checkpoint at every cut goes to its end: whatever the
 * run waits for between slices and while it encodes a checkpoint is not a timer.
 */
import { afterEach, describe, expect, it, vi } from 'vitest';
import { createRun, memoryCheckpointStore, type RunInput } from '../../src/engine';
import { nodeEnvironment } from '../../src/engine/node';

const SPEC: RunInput = {
  jobs: [{ id: 'rosenbrock', objective: { kind: 'test-function', name: 'rosenbrock', dim: 4 }, seed: 88, islands: 2 }],
  budget: { evaluations: 2 * 3000 },
  deterministic: true,
  stepEvaluations: 500,
  migration: { everyRounds: 1, count: 2 },
  archive: { capacity: 8, distance: 0.01 },
  // A checkpoint falls due at every cut: each is encoded in steps, each step a task of its own.
  checkpointEveryMs: 1e-3,
};

afterEach(() => {
  vi.useRealTimers();
});

describe('a run with every timer held back, as in a hidden tab', () => {
  it('goes to its end, checkpointing on the way', async () => {
    const store = memoryCheckpointStore(4);
    const made = createRun(nodeEnvironment(), SPEC, { workers: 2, store });
    if (!made.ok) throw new Error(made.reason);
    vi.useFakeTimers({ toFake: ['setTimeout', 'setInterval', 'setImmediate'] });
    // Held back for good: a run waiting on a timer never ends, and the test fails on its time limit.
    const result = await made.run.start();
    vi.useRealTimers();
    expect(result.ok).toBe(true);
    if (!result.ok) return;
    // common practice: a run under an evaluation budget spends exactly its budget (the engine's contract)
    expect(result.stopReason).toBe('budget');
    expect(result.evaluations).toBe(SPEC.budget.evaluations);
    // Checkpoints with evaluations in them were written on the way, not only the one before the first slice.
    expect(store.texts.length).toBeGreaterThanOrEqual(2);
  }, 60_000);
});
