/**
 * The engine counts its islands' search restarts (fresh optimizer runs a restart scheme
 * starts when a run converges or stalls): the count a run reports, in its progress and
 * its result, is the one its islands' saved optimizer states hold, read from the last
 * checkpoint apart from the progress messages the engine counts from.
 */
import { describe, expect, it } from 'vitest';
import { createRun, decodeCheckpoint, memoryCheckpointStore, type RunInput } from '../../src/engine';
import { nodeEnvironment } from '../../src/engine/node';

/**
 * Rastrigin's function in two variables (Jamil and Yang, 2013): one run of the default
 * restart scheme converges long before a budget of many runs is spent, so every island
 * restarts.
 */
const SPEC: RunInput = {
  jobs: [{ id: 'rastrigin', objective: { kind: 'test-function', name: 'rastrigin', dim: 2 }, seed: 7, islands: 2 }],
  budget: { evaluations: 2 * 60_000 },
  deterministic: true,
  stepEvaluations: 2000,
  migration: { everyRounds: 1, count: 1 },
  archive: { capacity: 4, distance: 0.01 },
};

describe('search restarts', () => {
  it('are counted over every island, as their saved optimizer states hold them', async () => {
    const store = memoryCheckpointStore(3);
    const made = createRun(nodeEnvironment(), SPEC, { workers: 2, store });
    if (!made.ok) throw new Error(made.reason);
    const seen: number[] = [];
    made.run.onProgress((p) => seen.push(p.searchRestarts));
    const result = await made.run.start();
    if (!result.ok) throw new Error(result.reason);
    const [newest] = await store.load();
    const decoded = decodeCheckpoint(newest);
    if (!decoded.ok) throw new Error(decoded.reason);
    // Second route: the restart scheme's own state (`restarts`: runs started after the first), island by island.
    const saved = decoded.payload.islands.map((island) => (island.optimizer as { kind: string; restarts?: number }).restarts ?? 0);
    expect(saved.every((n) => n > 0)).toBe(true);
    expect(result.searchRestarts).toBe(saved.reduce((a, b) => a + b, 0));
    expect(seen.at(-1)).toBe(result.searchRestarts);
    // Never counted down along the run.
    expect(seen.every((n, k) => k === 0 || n >= seen[k - 1])).toBe(true);
  });
});
