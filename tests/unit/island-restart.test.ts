import { describe, expect, it } from 'vitest';
import type { IslandConfig, IslandProgress, IslandState } from '../../workers/api';
import { Island } from '../../workers/island';

const DIM = 5;
/** DE/rand/1/bin with a coarse collapse tolerance: it converges fast, often in a local basin of Rastrigin. */
const OPTIMIZER = { kind: 'de-rand-1-bin', population: 20, xTolerance: 1e-6 } as const;
const SLICE = { evaluations: 1500 } as const;
const noClock = (): number => 0;

function config(maxEvaluations: number, optimizer: IslandConfig['optimizer'] = OPTIMIZER): IslandConfig {
  return {
    islandId: 'r',
    // Rastrigin, 10 d + Σ (x_i² − 10 cos 2π x_i) on [−5.12, 5.12]^d, minimum 0 at 0: Jamil and Yang (2013).
    objective: { kind: 'test-function', name: 'rastrigin', dim: DIM },
    seed: 21,
    stream: 3,
    optimizer,
    maxEvaluations,
    archiveCapacity: 16,
    archiveDistance: 0.01,
  };
}

function make(c: IslandConfig): Island {
  const made = Island.create(c);
  if (!made.ok) throw new Error(made.reason);
  return made.island;
}

function runToEnd(island: Island, until = Infinity): IslandProgress {
  let last: IslandProgress | null = null;
  for (let k = 0; k < 100_000 && island.stopReason() === null; k++) {
    last = island.step(SLICE, noClock);
    if (last.evaluations >= until) break;
  }
  if (last === null) throw new Error('no step ran');
  return last;
}

describe('an island under a budget larger than one search needs (restart scheme)', () => {
  // One search alone: the scheme with runEvaluations = its budget, which a converging run never reaches,
  // is a single run until it converges; its evaluations then are what one search needs.
  const alone = make(config(1_000_000));
  let single: IslandProgress | null = null;
  for (let k = 0; k < 10_000; k++) {
    const p = alone.step({ evaluations: 20 }, noClock);
    if (p.restarts > 0) break;
    single = p;
  }
  if (single === null) throw new Error('no single run');
  const needed = single.evaluations;
  const budget = 20 * needed;

  it('restarts instead of stopping, spends the whole budget and ends on it', () => {
    expect(needed).toBeLessThan(50_000);
    const last = runToEnd(make(config(budget)));
    expect(last.restarts).toBeGreaterThan(0);
    expect(last.evaluations).toBe(budget);
    expect(last.stopReason).toBe('budget');
    expect(last.bestValue!).toBeLessThanOrEqual(single!.bestValue!);
  });

  it('is deterministic: the same seed and budget give the same bits, also across export and restore mid-restart', () => {
    const straight = make(config(budget));
    runToEnd(straight);
    const reference = JSON.stringify(straight.exportState());
    expect(JSON.stringify((() => { const again = make(config(budget)); runToEnd(again); return again.exportState(); })())).toBe(reference);

    const first = make(config(budget));
    const cut = runToEnd(first, Math.floor(budget / 2));
    expect(cut.restarts).toBeGreaterThan(0);
    const saved = JSON.parse(JSON.stringify(first.exportState())) as IslandState;
    const restored = Island.restore(saved);
    if (!restored.ok) throw new Error(restored.reason);
    runToEnd(restored.island);
    expect(JSON.stringify(restored.island.exportState())).toBe(reference);
  });

  it('keeps the distinct good designs of every run in its archive', () => {
    const island = make(config(budget));
    runToEnd(island);
    const top = island.topCandidates(16);
    expect(top.length).toBeGreaterThan(1);
    for (let i = 1; i < top.length; i++) expect(top[i].value).toBeGreaterThanOrEqual(top[i - 1].value);
  });

  it('takes a configured restart scheme as it is', () => {
    const last = runToEnd(make(config(30_000, { kind: 'restart', inner: { kind: 'lshade' }, runEvaluations: 5000 })));
    expect(last.evaluations).toBe(30_000);
    expect(last.restarts).toBeGreaterThanOrEqual(5);
  });
});

describe('an island with no evaluation cap (a run with a time budget only)', () => {
  // The engine gives a time-only island Number.MAX_SAFE_INTEGER evaluations (DEFAULT_ISLAND_EVALUATIONS).
  const uncapped = config(Number.MAX_SAFE_INTEGER, { kind: 'lshade' });

  it('restarts as soon as a search of 10,000 × D evaluations would, not after a million', () => {
    // L-SHADE sizes its population reduction by its run's budget (Tanabe and Fukunaga, 2014),
    // so its first run ends by 10,000 × 5 = 50,000 evaluations at the latest: the CEC scale of
    // one search per variable (common practice, CEC 2005 real-parameter benchmark).
    const island = make(uncapped);
    const at = runToEnd(island, 50_000 + SLICE.evaluations);
    expect(at.restarts).toBeGreaterThanOrEqual(1);
    expect(at.stopReason).toBeNull();
  });

  it("gives a later run as many evaluations per member as the first (IPOP's doubled population, twice the budget)", () => {
    const island = make(uncapped);
    let progress = runToEnd(island, 1);
    for (let k = 0; k < 1000 && progress.restarts < 1; k++) progress = island.step(SLICE, noClock);
    const state = JSON.parse(JSON.stringify(island.exportState())) as { optimizer: { inner: { config: { maxEvaluations: number; initialPopulation: number } } } };
    const run = state.optimizer.inner.config;
    // Run 1 of the scheme: population 2 × 18 × 5 = 180 (L-SHADE's default 18 × D, doubled), 2 × 50,000 evaluations.
    expect(run.initialPopulation).toBe(180);
    expect(run.maxEvaluations).toBe(100_000);
  });
});

