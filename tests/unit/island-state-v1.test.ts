/**
 * Island states of version 1 (checkpoints saved before the run merged its islands'
 * archives at cuts) still restore: version 1 had, beside what version 2 keeps, an entry
 * counter on each archive entry and two counters of the archive (`entered`, `reported`),
 * which version 2 no longer needs. A version 1 state built from a version 2 one by adding
 * them (the layout of workers/api.ts before this change) must continue the search
 * exactly as the version 2 state does.
 */
import { describe, expect, it } from 'vitest';
import { unpackState } from '../../src/core/optimize';
import { ISLAND_STATE_VERSION, type IslandConfig, type IslandState } from '../../workers/api';
import { Island } from '../../workers/island';

const CONFIG: IslandConfig = {
  islandId: 'v1',
  // Rosenbrock's function on [−30, 30]^4 (Jamil and Yang, 2013).
  objective: { kind: 'test-function', name: 'rosenbrock', dim: 4 },
  seed: 5,
  stream: 2,
  optimizer: { kind: 'lshade' },
  maxEvaluations: 20_000,
  archiveCapacity: 8,
  archiveDistance: 0.01,
};
const noClock = (): number => 0;

function restored(state: unknown): Island {
  const made = Island.restore(state as IslandState);
  if (!made.ok) throw new Error(made.reason);
  return made.island;
}

describe('an island state of version 1', () => {
  it('restores and continues to the same evaluations as the version 2 state it was made from', () => {
    const made = Island.create(CONFIG);
    if (!made.ok) throw new Error(made.reason);
    made.island.step({ evaluations: 3000 }, noClock);
    const v2 = made.island.exportState();
    expect(v2.archive.length).toBeGreaterThan(0);
    const n = v2.archive.length;
    // Version 1 held the optimizer state plain (as exportState() writes it), as version 2 did.
    const plain = unpackState(v2.optimizer);
    if (!plain.ok) throw new Error(plain.reason);
    const v1 = { ...v2, version: 1, optimizer: plain.state, archive: v2.archive.map((entry, k) => ({ ...entry, entered: n - k })), entered: n + 40, reported: n + 40 };
    const a = restored(v2);
    const b = restored(v1);
    for (let k = 0; k < 3; k++) expect(b.step({ evaluations: 1000 }, noClock)).toEqual(a.step({ evaluations: 1000 }, noClock));
    expect(b.exportState()).toEqual(a.exportState());
    expect(b.exportState().version).toBe(ISLAND_STATE_VERSION);
  });

  it('is refused with a message when its version is not one this Loci reads (1, 2 or 3)', () => {
    const made = Island.create(CONFIG);
    if (!made.ok) throw new Error(made.reason);
    const state = { ...made.island.exportState(), version: 4 };
    expect(Island.restore(state as unknown as IslandState)).toEqual({ ok: false, reason: 'island state version is 4; expected 1, 2 or 3' });
  });
});
