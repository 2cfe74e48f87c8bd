/**
 * `loci analyze` of a leg file (format "loci-leg"), through the command table: the JSON
 * it prints is gaitFigures (and phasedLegs) of the file's linkage and leg called
 * directly, key by documented key; the Chebyshev–Hoeken leg's step height is the exact
 * 2√6 − 4 crank radii; bad files and flags are refused with the field named.
 */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { loci } from '../support/cli';
import { DEMO_TOY_LEG, DEMO_TOY_LEG_LINKAGE, GAIT_CAUTION, gaitFigures, phasedLegs, type LegSpec } from '../../src/core/gait';
import { toLegFile } from '../../src/core/io/legFile';
import { fourBar } from '../../src/core/linkage';

let dir = '';
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'loci-analyze-leg-'));
});
afterAll(() => {
  rmSync(dir, { recursive: true, force: true });
});

function write(name: string, json: unknown): string {
  const file = join(dir, name);
  writeFileSync(file, JSON.stringify(json));
  return file;
}

const DEG = 180 / Math.PI;

describe('loci analyze LEG.json', () => {
  it('prints gaitFigures and phasedLegs of the file, key by key, with the tolerance beside the duty factor and the caution', async () => {
    const phasesDeg = [0, 120, 240];
    const file = write('toy.json', toLegFile({ name: 'toy', linkage: DEMO_TOY_LEG_LINKAGE, leg: DEMO_TOY_LEG, phased: { legs: 3, phasesDeg } }));
    const r = await loci('analyze', file);
    expect(r.code, r.stderr).toBe(0);
    const out = JSON.parse(r.stdout);
    // Second route: the core called directly on the same linkage and leg.
    const g = gaitFigures(DEMO_TOY_LEG_LINKAGE, DEMO_TOY_LEG);
    if (!g.ok) throw new Error(g.reason);
    const f = g.figures;
    const s = f.longestStance;
    if (s === null) throw new Error('the demo leg has a stance');
    expect(out.name).toBe('toy');
    expect(out.steps).toBe(f.steps);
    expect(out.dutyFactor).toEqual({ value: f.dutyFactor.value, toleranceMm: DEMO_TOY_LEG.stanceToleranceMm });
    expect(out.stanceToleranceMm).toBe(DEMO_TOY_LEG.stanceToleranceMm);
    expect(out.strideMm).toBe(s.strideMm);
    expect(out.stepHeightMm).toBe(f.stepHeightMm);
    expect(out.lowestMm).toBe(f.lowestMm);
    expect(out.stanceIntervalsDeg).toEqual(f.stance.intervals.map((i) => ({ fromDeg: i.fromRad * DEG, toDeg: i.toRad * DEG })));
    expect(out.stanceFlatness).toEqual({ peakToPeakMm: s.flatness.peakToPeakMm, rmsMm: s.flatness.rmsMm });
    expect(out.stanceSpeed).toEqual({ minMmPerRad: s.speed.minMmPerRad, maxMmPerRad: s.speed.maxMmPerRad, meanMmPerRad: s.speed.meanMmPerRad, variation: s.speed.variation });
    expect(out.transmissionInStance.worstDeg).toBe(Math.min(...f.transmission.loops.map((l) => l.worstInStanceDeg as number)));
    expect(out.transmissionInStance.guidelineDeg).toEqual({ min: 40, max: 140 });
    expect(out.size).toEqual({ ...f.size });
    const p = phasedLegs(f, { legs: 3, phasesRad: phasesDeg.map((d) => d / DEG) });
    if (!p.ok) throw new Error(p.reason);
    expect(out.phased.legs).toBe(3);
    expect(out.phased.minFeetOnGround).toBe(p.figures.minFeet);
    expect(out.phased.maxFeetOnGround).toBe(p.figures.maxFeet);
    expect(out.phased.shareByFeet).toEqual(p.figures.shareByFeet);
    expect(out.phased.bodyHeightRippleMm).toBe(p.figures.bodyHeightRippleMm);
    expect(out.notes).toEqual(f.notes);
    expect(out.caution).toBe(GAIT_CAUTION);
  });

  it('gives the Chebyshev–Hoeken leg a step height of 2√6 − 4 crank radii', async () => {
    // Proportions from tests/reference/gait.test.ts and tests/reference/data/README.md (from memory,
    // verify against a mechanism handbook): crank 1, ground 2, rocker 2.5, coupler 2.5, tracing point at 5 from the crank pin.
    const hoeken = fourBar({ A0: { x: 0, y: 0 }, B0: { x: -2, y: 0 }, A: { x: 1, y: 0 }, B: { x: -0.5, y: 2 }, P: { x: -2, y: 4 } });
    const leg: LegSpec = { foot: 'P', ground: { kind: 'level', yMm: 4 }, stanceToleranceMm: 0.01, crankDirection: 1, walkingDirection: 1 };
    const r = await loci('analyze', write('hoeken.json', toLegFile({ linkage: hoeken, leg })));
    expect(r.code, r.stderr).toBe(0);
    const out = JSON.parse(r.stdout);
    // Source: theorem (from these proportions): the flat stretch lies on y = 4 and the arc's top at 180° is (−2, 2√6).
    expect(out.stepHeightMm).toBeCloseTo(2 * Math.sqrt(6) - 4, 9);
    // Source: theorem: at crank angle 0 the foot moves backwards at 4/3 crank radii per radian, inside the stance.
    expect(out.stanceSpeed.maxMmPerRad).toBeGreaterThanOrEqual(4 / 3 - 1e-9);
  });

  it('takes --steps and refuses --from, --to and --travel', async () => {
    const file = write('toy-steps.json', toLegFile({ linkage: DEMO_TOY_LEG_LINKAGE, leg: DEMO_TOY_LEG }));
    const r = await loci('analyze', file, '--steps', '360');
    expect(r.code, r.stderr).toBe(0);
    expect(JSON.parse(r.stdout).steps).toBe(360);
    for (const flag of ['--from', '--travel']) {
      const bad = await loci('analyze', file, flag, '10', ...(flag === '--from' ? ['--to', '20'] : []));
      expect(bad.code).toBe(2);
      expect(bad.stderr).toMatch(/one full crank turn/);
    }
  });

  it('names the field of a bad leg file', async () => {
    const good = toLegFile({ linkage: DEMO_TOY_LEG_LINKAGE, leg: DEMO_TOY_LEG });
    const cases: [unknown, RegExp][] = [
      [{ ...good, foot: 'Q' }, /foot: the foot 'Q' is not a joint or point of the linkage/],
      [{ ...good, foot: 'A0' }, /foot: .*ground pivot/],
      [{ ...good, crankDirection: 2 }, /crankDirection: expected 1 \(the crank turns counter-clockwise\) or -1/],
      [{ ...good, stanceToleranceMm: 0 }, /stanceToleranceMm: the stance tolerance is 0; expected a distance in mm greater than 0/],
      [{ ...good, ground: { kind: 'line', point: { x: 0, y: 0 }, direction: { x: 0, y: 1 } } }, /ground.direction: the ground line is vertical/],
      [{ ...good, linkage: { ...(good.linkage as object), joints: [] } }, /linkage\./],
      [{ ...good, extra: 1 }, /unknown field "extra"/],
      [{ ...good, version: 2 }, /version: this file is version 2/],
    ];
    for (const [i, [json, message]] of cases.entries()) {
      const r = await loci('analyze', write(`bad-${i}.json`, json));
      expect(r.code, `case ${i}`).toBe(2);
      expect(r.stderr, `case ${i}`).toMatch(message);
    }
  });
});
