/**
 * `loci check` and `loci fit` on a leg problem, through the command table, with small
 * seeded budgets in real worker threads: the example is accepted and searched family by
 * family, the best of each family beside the top K; every candidate's gait figures are
 * what `loci analyze` prints of its exported leg file; and a generated problem whose
 * targets are a known four-bar leg's own gait figures is fitted to near zero.
 */
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { loci } from '../support/cli';
import { DEMO_TOY_LEG, DEMO_TOY_LEG_LINKAGE, GAIT_CAUTION, gaitFigures } from '../../src/core/gait';

const EXAMPLE = resolve(import.meta.dirname, '../../public/examples/toy-walker-leg-problem.json');

let dir = '';
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'loci-fit-leg-'));
});
afterAll(() => {
  rmSync(dir, { recursive: true, force: true });
});

interface LegCandidateJson {
  rank: number;
  family: string;
  value: number;
  feasible: boolean;
  terms: { name: string; deviation: number }[];
  gait: Record<string, unknown> | null;
  legFile: unknown;
}

/** Each candidate's leg file, analysed by `loci analyze`, gives the candidate's gait figures exactly. */
async function expectGaitIsAnalysisOfLegFile(candidates: LegCandidateJson[]): Promise<void> {
  for (const c of candidates) {
    if (c.gait === null) continue;
    const file = join(dir, `candidate-${c.family}-${c.rank}.json`);
    writeFileSync(file, JSON.stringify(c.legFile));
    const r = await loci('analyze', file);
    expect(r.code, r.stderr).toBe(0);
    const { name: _name, ...figures } = JSON.parse(r.stdout);
    // Source: theorem (the same analysis of the same numbers; JSON keeps every double).
    expect(figures).toEqual(c.gait);
  }
}

describe('loci check and fit, leg problem', () => {
  it('check accepts the example and lists each family with its variables, and the caution', async () => {
    const r = await loci('check', EXAMPLE);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stdout).toMatch(/valid leg problem "Toy walker leg"/);
    expect(r.stdout).toMatch(/stance within 0.8 mm/);
    expect(r.stdout).toMatch(/battery box \(-20, 8\) r 7 mm/);
    for (const family of ['fourbar', 'watt-i', 'stephenson-i']) expect(r.stdout).toContain(`  ${family} (`);
    expect(r.stdout).toContain(GAIT_CAUTION);
    const json = await loci('check', EXAMPLE, '--json');
    expect(JSON.parse(json.stdout)).toMatchObject({ valid: true, kind: 'leg', caution: GAIT_CAUTION });
  });

  it('fit searches every family and writes candidates whose gait figures are loci analyze of their leg files', async () => {
    const out = join(dir, 'fit.json');
    const r = await loci('fit', EXAMPLE, '--seed', '3', '--evals', '1500', '--workers', '2', '--islands', '1', '--top', '2', '--out', out);
    expect(r.code, r.stderr).toBe(0);
    const result = JSON.parse(readFileSync(out, 'utf8'));
    expect(result.problem.kind).toBe('leg');
    expect(result.caution).toBe(GAIT_CAUTION);
    expect(result.search.families).toEqual(['fourbar', 'watt-i', 'stephenson-i']);
    const candidates = result.candidates as LegCandidateJson[];
    // The best of each family is shown beside the overall top.
    expect(new Set(candidates.map((c) => c.family))).toEqual(new Set(['fourbar', 'watt-i', 'stephenson-i']));
    for (const family of ['fourbar', 'watt-i', 'stephenson-i']) expect(result.bestRankOfEachFamily[family]).toBeGreaterThan(0);
    expect(candidates.some((c) => c.gait !== null)).toBe(true);
    await expectGaitIsAnalysisOfLegFile(candidates);
  }, 120_000);

  it('fits a known four-bar leg\'s own gait figures to near zero', async () => {
    // The targets: the demo toy leg's exact figures (gaitFigures), searched in a box about that leg.
    const g = gaitFigures(DEMO_TOY_LEG_LINKAGE, DEMO_TOY_LEG);
    if (!g.ok || g.figures.longestStance === null) throw new Error('the demo leg has a stance');
    const f = g.figures;
    const stance = g.figures.longestStance;
    const ground = DEMO_TOY_LEG.ground;
    const problem = {
      format: 'loci-problem',
      version: 1,
      kind: 'leg',
      name: 'known leg',
      families: ['fourbar'],
      ground,
      stanceToleranceMm: DEMO_TOY_LEG.stanceToleranceMm,
      crankDirection: DEMO_TOY_LEG.crankDirection,
      walkingDirection: DEMO_TOY_LEG.walkingDirection,
      targets: {
        strideMm: { value: stance.strideMm, toleranceMm: 0.5 },
        stepHeightMm: { value: f.stepHeightMm, toleranceMm: 0.5 },
        minDutyFactor: { min: f.dutyFactor.value, tolerance: 0.02 },
      },
      bounds: {
        fourbar: { 'A0.x': [-2, 2], 'A0.y': [-2, 2], 'B0.x': [20, 28], 'B0.y': [-12, -4], 'A.x': [6, 10], 'A.y': [-2, 2], 'B.x': [29, 37], 'B.y': [4, 12], 'P.x': [16, 24], 'P.y': [-34, -26] },
      },
    };
    const file = join(dir, 'known-leg.json');
    writeFileSync(file, JSON.stringify(problem));
    const out = join(dir, 'known-fit.json');
    const r = await loci('fit', file, '--seed', '1', '--evals', '6000', '--workers', '2', '--islands', '2', '--top', '1', '--out', out);
    expect(r.code, r.stderr).toBe(0);
    const best = (JSON.parse(readFileSync(out, 'utf8')).candidates as LegCandidateJson[])[0];
    expect(best.feasible).toBe(true);
    // Near zero: at most 1e-3, every term within about 3 % of its tolerance (0.016 mm of stride or step
    // height). The known leg lies in the box, and its sampled figures differ from its exact ones by the
    // second-order sampling error of 180 samples (a few µm), so a design this good exists.
    expect(best.value).toBeLessThan(1e-3);
    // Second route: the exact figures of the fitted leg file, by loci analyze, near the targets: within a tenth
    // of the 0.5 mm tolerance (the search's sampled figures against the exact ones, common practice for a sampled objective).
    const legFile = join(dir, 'known-best.json');
    writeFileSync(legFile, JSON.stringify(best.legFile));
    const a = JSON.parse((await loci('analyze', legFile)).stdout);
    expect(Math.abs(a.strideMm - stance.strideMm)).toBeLessThan(0.05);
    expect(Math.abs(a.stepHeightMm - f.stepHeightMm)).toBeLessThan(0.05);
    expect(a.dutyFactor.value).toBeGreaterThan(f.dutyFactor.value - 0.01);
  }, 120_000);
});
