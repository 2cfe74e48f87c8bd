/**
 * The search worker's API over a set of islands. Plain functions of plain data, so it
 * runs the same behind comlink in a worker and directly in one thread (tests, tools).
 */
import type { DescribedCandidate, IslandProgress, Outcome, SearchWorkerApi } from './api';
import { createDesignDescriber } from './describeDesigns';
import { Island } from './island';

const MAX_COUNT = 10_000;

function countProblem(count: unknown): string | null {
  return typeof count === 'number' && Number.isInteger(count) && count >= 0 && count <= MAX_COUNT
    ? null
    : `count is ${JSON.stringify(count)}; expected an integer in [0, ${MAX_COUNT}]`;
}

/** A fresh API with no islands; `nowMs` is the clock `step` slices time with. */
export function createSearchWorkerApi(nowMs: () => number): SearchWorkerApi {
  const islands = new Map<string, Island>();
  const describeDesigns = createDesignDescriber();

  function withIsland<T>(islandId: string, run: (island: Island) => Outcome<T>): Outcome<T> {
    const island = islands.get(islandId);
    if (island === undefined) return { ok: false, reason: `no island ${JSON.stringify(islandId)} in this worker` };
    return run(island);
  }

  return {
    init(config) {
      const made = Island.create(config);
      if (!made.ok) return made;
      islands.set(made.island.config.islandId, made.island);
      return { ok: true, island: made.island.info() };
    },
    importState(state) {
      const made = Island.restore(state);
      if (!made.ok) return made;
      islands.set(made.island.config.islandId, made.island);
      return { ok: true, island: made.island.info() };
    },
    exportState(islandId) {
      return withIsland(islandId, (island) => ({ ok: true, state: island.exportState() }));
    },
    step(islandId, slice) {
      return withIsland<{ progress: IslandProgress }>(islandId, (island) => {
        const ms = (slice as { ms?: unknown }).ms;
        const evaluations = (slice as { evaluations?: unknown }).evaluations;
        const timed = typeof ms === 'number' && ms >= 0;
        const counted = typeof evaluations === 'number' && Number.isInteger(evaluations) && evaluations >= 1;
        if (timed === counted) return { ok: false, reason: 'slice must be { ms: number ≥ 0 } or { evaluations: integer ≥ 1 }' };
        return { ok: true, progress: island.step(slice, nowMs) };
      });
    },
    emigrants(islandId, count) {
      const problem = countProblem(count);
      if (problem !== null) return { ok: false, reason: problem };
      return withIsland(islandId, (island) => ({ ok: true, individuals: island.emigrants(count) }));
    },
    immigrate(islandId, individuals) {
      return withIsland<{ accepted: number }>(islandId, (island) => {
        const placed = island.immigrate(individuals);
        return 'reason' in placed ? { ok: false, reason: placed.reason } : { ok: true, accepted: placed.accepted };
      });
    },
    topCandidates(islandId, count) {
      const problem = countProblem(count);
      if (problem !== null) return { ok: false, reason: problem };
      return withIsland(islandId, (island) => ({ ok: true, candidates: island.topCandidates(count) }));
    },
    describe(islandId, designs) {
      return withIsland<{ candidates: DescribedCandidate[] }>(islandId, (island) => island.describe(designs));
    },
    describeDesigns(objective, designs) {
      return describeDesigns(objective, designs);
    },
    drop(islandId) {
      return islands.delete(islandId) ? { ok: true } : { ok: false, reason: `no island ${JSON.stringify(islandId)} in this worker` };
    },
  };
}
