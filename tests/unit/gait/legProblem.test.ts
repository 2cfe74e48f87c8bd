/**
 * The leg problem kind: createLegProblem checks every field; the problem file reader
 * dispatches on "kind": "leg"; the objective of every family builds and evaluates; the
 * search's sampled figures agree with gaitFigures within a sample step; the trajectory
 * term of a leg on its own foot path is zero; and a candidate's report gives exactly
 * what `loci analyze` prints of its exported leg file.
 */
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { loci } from '../../support/cli';
import { gaitFigures } from '../../../src/core/gait';
import { toLegFile } from '../../../src/core/io/legFile';
import { parseSynthesisProblemFile } from '../../../src/core/io/problem';
import { createLegProblem, createObjective, LEG_FAMILY_IDS, type LegProblem, type LegProblemInput } from '../../../src/core/synthesis';

const EXAMPLE = resolve(import.meta.dirname, '../../../public/examples/toy-walker-leg-problem.json');
const TAU = 2 * Math.PI;

// Chebyshev–Hoeken proportions (tests/reference/data/README.md; from memory, verify against a mechanism handbook).
const HOEKEN_X = [0, 0, -2, 0, 1, 0, -0.5, 2, -2, 4]; // A0, B0, A, B, P of the pose four-bar
/** The foot at crank angle theta in closed form (circle intersection), as tests/reference/gait.test.ts. */
function hoekenFoot(theta: number): [number, number] {
  const ax = Math.cos(theta);
  const ay = Math.sin(theta);
  const dx = -2 - ax;
  const dy = -ay;
  const d = Math.hypot(dx, dy);
  const h = Math.sqrt(2.5 * 2.5 - (d / 2) * (d / 2));
  const bx = ax + dx / 2 + (h * dy) / d;
  const by = ay + dy / 2 - (h * dx) / d;
  return [2 * bx - ax, 2 * by - ay];
}

const BASE: LegProblemInput = {
  kind: 'leg',
  name: 'hoeken',
  families: ['fourbar'],
  ground: { kind: 'level', yMm: 4 },
  stanceToleranceMm: 0.01,
  crankDirection: 1,
  walkingDirection: 1,
  targets: { strideMm: { value: 4 }, stepHeightMm: { value: 0.9 } },
};

function problem(input: LegProblemInput): LegProblem {
  const r = createLegProblem(input);
  if (!r.ok) throw new Error(JSON.stringify(r.issues));
  return r.problem;
}

let dir = '';
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'loci-leg-problem-'));
});
afterAll(() => {
  rmSync(dir, { recursive: true, force: true });
});

describe('createLegProblem', () => {
  it('names every field that is wrong', () => {
    const r = createLegProblem({
      ...BASE,
      families: ['fourbar', 'fourbar-lengths', 'fourbar'],
      stanceToleranceMm: -1,
      crankDirection: 0 as 1,
      steps: 10,
      targets: { strideMm: { value: -3, weight: -1 }, minDutyFactor: { min: 1.5 } },
      bounds: { fourbar: { 'Z.x': [0, 1], 'A.x': [2, 1] } },
    });
    expect(r.ok).toBe(false);
    if (r.ok) return;
    const paths = r.issues.map((i) => i.path);
    for (const p of ['families[1]', 'families[2]', 'stanceToleranceMm', 'crankDirection', 'steps', 'targets.strideMm.value', 'targets.strideMm.weight', 'targets.minDutyFactor.min', 'targets']) expect(paths).toContain(p);
    // Bounds are the path problem's checks, under the leg problem's own paths.
    const bounds = createLegProblem({ ...BASE, bounds: { fourbar: { 'Z.x': [0, 1], 'A.x': [2, 1] } } });
    expect(bounds.ok).toBe(false);
    if (!bounds.ok) expect(bounds.issues.map((i) => i.path).sort()).toEqual(['bounds.fourbar.A.x', 'bounds.fourbar.Z.x']);
  });

  it('needs a trajectory, or a stride and a step height to place the search', () => {
    const r = createLegProblem({ ...BASE, targets: { stepHeightMm: { value: 1 } } });
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.issues[0].message).toMatch(/no foot trajectory; expected footPath, or both strideMm and stepHeightMm/);
  });

  it('is read from a problem file of kind "leg", unknown fields refused by name', () => {
    const json = JSON.parse(readFileSync(EXAMPLE, 'utf8'));
    const read = parseSynthesisProblemFile(json);
    expect(read.ok).toBe(true);
    if (read.ok) expect(read.problem.kind).toBe('leg');
    const bad = parseSynthesisProblemFile({ ...json, targets: { ...json.targets, strideMM: 3 } });
    expect(bad.ok).toBe(false);
    if (!bad.ok) expect(bad.issues[0]).toMatchObject({ path: 'targets', message: expect.stringMatching(/unknown field "strideMM"/) });
  });
});

describe('the leg objective', () => {
  it('builds and evaluates for every family without throwing, and describes a design with the caution', () => {
    const p = problem({ ...BASE, families: [...LEG_FAMILY_IDS] });
    for (const family of LEG_FAMILY_IDS) {
      const o = createObjective(p, family);
      const x = new Float64Array(o.dim);
      const out = new Float64Array(2);
      o.fromSearchBoxInto(new Float64Array(o.dim).fill(0.5), x);
      o.evaluate(x, out);
      expect(Number.isNaN(out[0]) || Number.isNaN(out[1])).toBe(false);
      const d = o.describe(x);
      expect(d.family).toBe(family);
      expect(d.caution).toMatch(/qualified engineer/);
    }
  });

  it('scores figures that agree with gaitFigures within one sample step', () => {
    const p = problem({ ...BASE, steps: 360 });
    const o = createObjective(p, 'fourbar');
    const d = o.describe(Float64Array.from(HOEKEN_X));
    expect(d.feasible).toBe(true);
    const g = d.gait;
    if (g === null || g.strideMm === null || g.stanceSpeed === null) throw new Error('the Hoeken leg has a stance');
    const step = TAU / 360;
    // Source: theorem (sampling): a stance end is missed by at most a step, at most the foot's speed × step along the ground.
    expect(Math.abs(d.searchFigures.strideMm - g.strideMm)).toBeLessThanOrEqual(g.stanceSpeed.maxMmPerRad * step * 2);
    // Source: theorem: the duty factor's edges are located within one step each (the height linear between samples).
    expect(Math.abs(d.searchFigures.dutyFactor - g.dutyFactor.value)).toBeLessThanOrEqual(2 / 360);
    // Source: theorem (from these proportions): the top at 180° is a sample of a 360-step turn, 2√6 − 4 above the ground.
    expect(d.searchFigures.stepHeightMm).toBeCloseTo(2 * Math.sqrt(6) - 4, 9);
  });

  it('gives the trajectory term 0 for a leg on its own foot path, clockwise crank too', () => {
    // Second route: the foot's path from the closed form, 24 points in the order the crank traces them.
    for (const crankDirection of [1, -1] as const) {
      const points = Array.from({ length: 24 }, (_, i) => hoekenFoot((crankDirection * TAU * i) / 24));
      const p = problem({ ...BASE, crankDirection, walkingDirection: crankDirection, targets: { footPath: { points, toleranceMm: 0.01 } } });
      const o = createObjective(p, 'fourbar');
      const d = o.describe(Float64Array.from(HOEKEN_X));
      expect(d.feasible).toBe(true);
      expect(d.searchFigures.trajectoryRmsMm).toBeLessThan(1e-6);
      expect(d.value).toBeLessThan(1e-6);
    }
  });

  it('describes a candidate whose gait figures are exactly loci analyze of its exported leg file', async () => {
    const p = problem({ ...BASE, targets: { strideMm: { value: 4 }, stepHeightMm: { value: 0.9 }, sizeBoxMm: { widthMm: 5, heightMm: 5 } } });
    const o = createObjective(p, 'fourbar');
    const d = o.describe(Float64Array.from(HOEKEN_X));
    const file = join(dir, 'candidate.json');
    writeFileSync(file, JSON.stringify(toLegFile({ linkage: d.linkage, leg: d.leg })));
    const r = await loci('analyze', file);
    expect(r.code, r.stderr).toBe(0);
    // Source: theorem (the same analysis of the same numbers; JSON keeps every double).
    expect(JSON.parse(r.stdout)).toEqual(JSON.parse(JSON.stringify(d.gait)));
    // And the core called on the linkage as drawn gives the same stride.
    const again = gaitFigures(d.linkage, d.leg);
    expect(again.ok && again.figures.longestStance?.strideMm).toBe(d.gait?.strideMm);
  });

  it('makes a leg that cannot turn fully, or never reaches the ground, infeasible', () => {
    const p = problem(BASE);
    const o = createObjective(p, 'fourbar');
    const out = new Float64Array(2);
    // A rocker shorter than the crank's swing needs: a crank-rocker no more (Grashof fails).
    const locked = Float64Array.from([0, 0, -2, 0, 3, 0, -0.5, 2, -2, 4]);
    o.evaluate(locked, out);
    expect(out[1]).toBeGreaterThan(0);
    expect(o.describe(locked).defects.join('; ')).toMatch(/crank cannot turn fully/);
    // The Hoeken leg lifted 1 crank radius off a ground line it never reaches.
    const lifted = Float64Array.from(HOEKEN_X.map((v, i) => (i % 2 === 1 ? v + 1 : v)));
    o.evaluate(lifted, out);
    expect(out[1]).toBeGreaterThan(0);
    expect(o.describe(lifted).defects.join('; ')).toMatch(/not within the stance tolerance/);
  });

  it('makes a leg that walks the other way infeasible', () => {
    // Source: theorem (from these proportions): with the crank counter-clockwise the foot runs along the flat part towards −x, so the body walks towards +x.
    const o = createObjective(problem({ ...BASE, walkingDirection: -1 }), 'fourbar');
    const d = o.describe(Float64Array.from(HOEKEN_X));
    expect(d.feasible).toBe(false);
    expect(d.defects.join('; ')).toMatch(/walks the other way/);
  });
});
