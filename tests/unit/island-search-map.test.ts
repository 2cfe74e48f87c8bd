/**
 * An island searching through the 'fourbar-boundary' search map (src/core/synthesis/searchMap.ts)
 * on the published closed18 problem (tests/reference/problems/closed18-untimed.json;
 * Cabrera, Simon and Prado, 2002, attribution from memory): what it reports are designs
 * of the problem, its state resumes exactly through JSON (common practice: the project's
 * rule for every exported state), and an immigrant re-enters the search through the
 * map's inverse.
 */
import { readFileSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import type { IslandConfig } from '../../workers/api';
import { Island } from '../../workers/island';

const repoRoot = resolve(dirname(fileURLToPath(import.meta.url)), '../..');
const problem: unknown = JSON.parse(readFileSync(resolve(repoRoot, 'tests/reference/problems/closed18-untimed.json'), 'utf8'));

/** The island's objective on a problem file: the closed18 file unless given. */
function on(file: unknown): IslandConfig['objective'] {
  return { kind: 'synthesis', problem: file, family: 'fourbar-lengths' };
}

const CONFIG: IslandConfig = {
  islandId: 'a',
  // The problem file names the map: "searchMaps": { "fourbar-lengths": "fourbar-boundary" }.
  objective: on(problem),
  seed: 5,
  stream: 0,
  optimizer: { kind: 'hybrid' },
  maxEvaluations: 6000,
  archiveCapacity: 4,
  archiveDistance: 0.01,
};

const now = () => 0;

function made(config: IslandConfig): Island {
  const m = Island.create(config);
  if (!m.ok) throw new Error(m.reason);
  return m.island;
}

describe("an island with the 'fourbar-boundary' search map", () => {
  it('reports designs of the problem: in the box, crank angles increasing', () => {
    const island = made(CONFIG);
    const progress = island.step({ evaluations: 3000 }, now);
    expect(progress.bestX).not.toBeNull();
    const x = progress.bestX as number[];
    expect(x.slice(0, 4).every((r) => r >= 0 && r <= 50)).toBe(true);
    for (let i = 10; i < x.length; i++) expect(x[i]).toBeGreaterThanOrEqual(x[i - 1]);
    expect(x[x.length - 1]).toBeLessThanOrEqual(2 * Math.PI);
  });

  it('resumes from its exported state, through JSON, to the uninterrupted result', () => {
    const whole = made(CONFIG);
    const end = whole.step({ evaluations: CONFIG.maxEvaluations }, now);
    const first = made(CONFIG);
    first.step({ evaluations: 2500 }, now);
    const restored = Island.restore(JSON.parse(JSON.stringify(first.exportState())));
    if (!restored.ok) throw new Error(restored.reason);
    const resumed = restored.island.step({ evaluations: CONFIG.maxEvaluations }, now);
    expect(resumed.evaluations).toBe(end.evaluations);
    expect(resumed.bestValue).toBe(end.bestValue);
    expect(resumed.bestX).toEqual(end.bestX);
  });

  it('takes an immigrant through the inverse map: it becomes the best, with its value', () => {
    const donor = made({ ...CONFIG, islandId: 'donor', maxEvaluations: 40_000 });
    donor.step({ evaluations: 40_000 }, now);
    const sent = donor.emigrants(1);
    const taker = made({ ...CONFIG, islandId: 'taker', seed: 6 });
    const before = taker.step({ evaluations: 600 }, now);
    expect(sent[0].value).toBeLessThan(before.bestValue as number);
    expect(taker.immigrate(sent)).toEqual({ accepted: 1 });
    expect(taker.exportState().optimizer.best.value).toBe(sent[0].value);
    // The best's box point maps back to the immigrant's design (a step of no evaluations reports it).
    const now0 = taker.step({ evaluations: 0 }, now);
    const x = now0.bestX as number[];
    sent[0].x.forEach((v, j) => expect(Math.abs(x[j] - v)).toBeLessThanOrEqual(1e-9 * (1 + Math.abs(v))));
  });

  it('refuses an unknown map, and the map on a problem it does not fit, as a value naming why', () => {
    const file = problem as Record<string, unknown>;
    const unknown = Island.create({ ...CONFIG, objective: on({ ...file, searchMaps: { 'fourbar-lengths': 'spiral' } }) });
    expect(!unknown.ok && unknown.reason).toMatch(/searchMaps\.fourbar-lengths: .*one of "affine", "fourbar-boundary"/);
    const misfit = Island.create({ ...CONFIG, objective: on({ ...file, placement: 'free', bounds: {} }) });
    expect(!misfit.ok && misfit.reason).toMatch(/searchMaps\.fourbar-lengths: search map "fourbar-boundary" is for fourbar-lengths with a fixed placement/);
  });

  it('reads its map from the problem file, and the published problem without one searches the affine box', () => {
    const file = { ...(problem as Record<string, unknown>) };
    delete file.searchMaps;
    const plain = made({ ...CONFIG, objective: on(file) });
    const mapped = made(CONFIG);
    // Same seed, same problem, another map: the first design the search tries differs.
    expect(plain.step({ evaluations: 1 }, now).bestX).not.toEqual(mapped.step({ evaluations: 1 }, now).bestX);
  });
});
