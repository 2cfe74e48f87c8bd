/**
 * `loci analyze` prints what a user needs to rebuild each figure: every number in full,
 * so a linkage far from the origin keeps its link lengths in print.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, beforeAll, expect, it } from 'vitest';

const ROOT = resolve(import.meta.dirname, '../..');
const BIN = join(ROOT, 'bin/loci.js');
const CRANK_ROCKER = join(ROOT, 'public/examples/crank-rocker.json');

let dir = '';
beforeAll(() => { dir = mkdtempSync(join(tmpdir(), 'loci-precision-')); });
afterAll(() => { rmSync(dir, { recursive: true, force: true }); });

type Xy = [number, number] | null;

it('a crank-rocker moved 5e5 mm from the origin keeps every link length in the printed poses', () => {
  const design = JSON.parse(readFileSync(CRANK_ROCKER, 'utf8')) as {
    joints: { id: string; x: number; y: number }[];
    points: { x: number; y: number }[];
    bodies: { joints: string[] }[];
  };
  const [dx, dy] = [4e5, -3e5];
  for (const j of design.joints) { j.x += dx; j.y += dy; }
  for (const p of design.points) { p.x += dx; p.y += dy; }
  const file = join(dir, 'far.json');
  writeFileSync(file, JSON.stringify(design));

  const r = spawnSync(process.execPath, [BIN, 'analyze', file], { cwd: dir, encoding: 'utf8', timeout: 60_000 });
  expect(r.stderr).toBe('');
  expect(r.status).toBe(0);
  const report = JSON.parse(r.stdout) as { joints: { id: string; path: Xy[] }[]; closureResidualMm: { max: number } };
  const at = (id: string) => report.joints.find((j) => j.id === id)!.path;
  const reference = new Map(design.joints.map((j) => [j.id, j]));

  // Theorem: a rigid link keeps its length in every pose. The solver's own closure residual
  // bounds the solved poses; the print must add no more than rounding of the last digit
  // (≈ 1e-10 mm at 5e5 mm). Nine significant digits would add up to 5e-4 mm here.
  let worstMm = 0;
  for (const body of design.bodies) {
    const [a, b] = body.joints;
    const lengthMm = Math.hypot(reference.get(a)!.x - reference.get(b)!.x, reference.get(a)!.y - reference.get(b)!.y);
    const pa = at(a);
    const pb = at(b);
    for (let k = 0; k < pa.length; k++) {
      const u = pa[k];
      const v = pb[k];
      if (u === null || v === null) continue;
      worstMm = Math.max(worstMm, Math.abs(Math.hypot(u[0] - v[0], u[1] - v[1]) - lengthMm));
    }
  }
  expect(report.closureResidualMm.max).toBeLessThan(1e-6);
  expect(worstMm).toBeLessThan(1e-6);
});
