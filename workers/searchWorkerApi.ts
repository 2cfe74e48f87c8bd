/**
 * The search worker's API over a set of islands. Plain functions of plain data, so it
 * runs the same behind comlink in a worker and directly in one thread (tests, tools).
 */
import type { AdvanceResult, DescribedCandidate, Outcome, SearchWorkerApi, StepSlice } from './api';
import { createDesignDescriber } from './describeDesigns';
import { Island } from './island';

const MAX_COUNT = 10_000;

function countProblem(count: unknown): string | null {
  return typeof count === 'number' && Number.isInteger(count) && count >= 0 && count <= MAX_COUNT
    ? null
    : `count is ${JSON.stringify(count)}; expected an integer in [0, ${MAX_COUNT}]`;
}

function sliceProblem(slice: StepSlice): string | null {
  const ms = (slice as { ms?: unknown }).ms;
  const evaluations = (slice as { evaluations?: unknown }).evaluations;
  const timed = typeof ms === 'number' && ms >= 0;
  const counted = typeof evaluations === 'number' && Number.isInteger(evaluations) && evaluations >= 1;
  return timed === counted ? 'slice must be { ms: number ≥ 0 } or { evaluations: integer ≥ 1 }' : null;
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
    advance(requests) {
      if (!Array.isArray(requests)) return { ok: false, reason: 'requests is not an array' };
      // Names, slices and counts are checked before any island moves; each island checks its immigrants.
      for (const [k, request] of requests.entries()) {
        if (!islands.has(request.islandId)) return { ok: false, reason: `requests[${k}]: no island ${JSON.stringify(request.islandId)} in this worker` };
        const problem = sliceProblem(request.slice) ?? countProblem(request.emigrants);
        if (problem !== null) return { ok: false, reason: `requests[${k}]: ${problem}` };
        if (!Array.isArray(request.immigrants)) return { ok: false, reason: `requests[${k}]: immigrants is not an array` };
        if (typeof request.publish !== 'boolean') return { ok: false, reason: `requests[${k}]: publish is ${JSON.stringify(request.publish)}; expected true or false` };
      }
      const results: AdvanceResult[] = [];
      for (const [k, request] of requests.entries()) {
        const island = islands.get(request.islandId) as Island;
        if (request.immigrants.length > 0) {
          const placed = island.immigrate(request.immigrants);
          if ('reason' in placed) return { ok: false, reason: `requests[${k}]: ${placed.reason}` };
        }
        const progress = island.step(request.slice, nowMs);
        // Emigrants cross only when they are placed: at a publishing slice, or the island's last.
        const sends = request.publish || progress.stopReason !== null;
        results.push({ progress, emigrants: sends ? island.emigrants(request.emigrants) : [] });
      }
      return { ok: true, results };
    },
    emigrants(islandId, count) {
      const problem = countProblem(count);
      if (problem !== null) return { ok: false, reason: problem };
      return withIsland(islandId, (island) => ({ ok: true, individuals: island.emigrants(count) }));
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
