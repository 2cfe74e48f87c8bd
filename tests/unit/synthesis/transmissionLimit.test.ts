/**
 * A least transmission angle (constraints.minTransmissionRad) reported as met is met along
 * the motion each candidate carries, including a full turn when its crank turns fully but
 * the problem does not require it: checked by `loci analyze` of the exported linkage file
 * over that motion (a route apart from the search's own samples).
 */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { loci } from '../../support/cli';

let dir = '';
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'loci-transmission-'));
});
afterAll(() => {
  rmSync(dir, { recursive: true, force: true });
});

// An open path of our own: a straight stroke of 60 mm and a rise at its end. The motion
// between its points is part of a turn; a crank that turns fully carries the whole turn.
const STROKE: number[][] = [[0, 0], [12, 0], [24, 0], [36, 0], [48, 0], [60, 0], [66, 6]];
const LIMIT_DEG = 50;

type FitCandidate = {
  feasible: boolean;
  defects: string[];
  motion: { fromDeg: number; toDeg: number; steps: number; fullTurn: boolean };
  transmissionDeg: { min: number; max: number } | null;
  linkage: unknown;
};

type Analysis = { fourBarLoops: { transmissionAngleDeg?: { min: number; max: number } }[] };

describe('the least transmission angle', () => {
  it('holds over each feasible candidate\'s own motion, a full turn included, by loci analyze of its file', async () => {
    const problem = {
      format: 'loci-problem',
      version: 1,
      name: 'stroke, least transmission angle',
      target: { points: STROKE, closed: false },
      timing: { mode: 'unprescribed' },
      placement: 'fixed',
      families: ['fourbar'],
      // No full turn required: a candidate whose crank turns fully is still judged over its full turn.
      constraints: { minTransmissionRad: (LIMIT_DEG * Math.PI) / 180 },
    };
    const file = join(dir, 'foot.json');
    writeFileSync(file, JSON.stringify(problem));
    const fit = await loci('fit', file, '--seed', '2', '--evals', '6000', '--islands', '1', '--workers', '1', '--top', '10');
    expect(fit.code).toBe(0);
    const candidates = (JSON.parse(fit.stdout) as { candidates: FitCandidate[] }).candidates;
    const feasible = candidates.filter((c) => c.feasible);
    expect(feasible.length).toBeGreaterThan(0);
    for (const [i, c] of candidates.entries()) {
      const linkageFile = join(dir, `candidate-${i}.json`);
      writeFileSync(linkageFile, JSON.stringify(c.linkage));
      const steps = String(Math.max(c.motion.steps, 720));
      const analysed = await loci('analyze', linkageFile, '--from', String(c.motion.fromDeg), '--to', String(c.motion.toDeg), '--steps', steps);
      expect(analysed.code).toBe(0);
      const loops = (JSON.parse(analysed.stdout) as Analysis).fourBarLoops;
      const ranges = loops.flatMap((l) => (l.transmissionAngleDeg === undefined ? [] : [l.transmissionAngleDeg]));
      const worst = Math.min(...ranges.map((r) => Math.min(r.min, 180 - r.max)));
      // The limit in both directions: μ in [limit, 180° − limit] (common practice: the angle and its supplement transmit alike).
      if (c.feasible) expect(worst, `candidate ${i}`).toBeGreaterThanOrEqual(LIMIT_DEG - 1e-9);
      else if (worst < LIMIT_DEG) expect(c.defects.join('; ')).toMatch(/transmission/);
    }
  }, 120_000);
});
