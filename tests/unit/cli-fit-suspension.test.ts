/**
 * `loci check` and `loci fit` on a suspension problem (public/examples), through the
 * command table, with a small seeded budget in real worker threads: the file is
 * accepted, every layout is searched, and each candidate's figures are those
 * `suspensionCurves` gives of its exported linkage on the bicycle.
 */
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { loci } from '../support/cli';
import { parseLinkageFile } from '../../src/core/io/linkageFile';
import { suspensionCurves } from '../../src/core/suspension';

const EXAMPLE = resolve(import.meta.dirname, '../../public/examples/trail-bike-suspension-problem.json');

let dir = '';
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'loci-fit-suspension-'));
});
afterAll(() => {
  rmSync(dir, { recursive: true, force: true });
});

describe('loci check and fit, suspension problem', () => {
  it('check accepts the example and lists each layout with its variables, and the caution', async () => {
    const r = await loci('check', EXAMPLE);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/valid suspension problem/);
    for (const layout of ['singlePivot', 'fourBarSeatStayAxle', 'wattSixBar']) expect(r.stdout).toContain(`  ${layout} (`);
    expect(r.stdout).toMatch(/ISO 4210/);
  });

  it('fit searches every layout and writes candidates whose figures are the analysis of their linkage', async () => {
    const out = join(dir, 'fit.json');
    const r = await loci('fit', EXAMPLE, '--evals', '3000', '--workers', '2', '--islands', '1', '--top', '4', '--out', out);
    expect(r.code, r.stderr).toBe(0);
    const result = JSON.parse(readFileSync(out, 'utf8'));
    expect(result.problem.kind).toBe('suspension');
    expect(result.search.families).toEqual(['singlePivot', 'fourBarSeatStayAxle', 'wattSixBar']);
    expect(Object.keys(result.evaluationsByFamily).sort()).toEqual(['fourBarSeatStayAxle', 'singlePivot', 'wattSixBar']);
    expect(result.candidates.length).toBeGreaterThan(0);
    // The best of each layout is shown beside the overall top.
    expect(new Set(result.candidates.map((c: { family: string }) => c.family))).toEqual(new Set(['singlePivot', 'fourBarSeatStayAxle', 'wattSixBar']));
    const bicycle = JSON.parse(readFileSync(EXAMPLE, 'utf8')).bicycle;
    for (const c of result.candidates) {
      const linkage = parseLinkageFile(c.linkage);
      expect(linkage.ok).toBe(true);
      if (!linkage.ok || c.figures === null) continue;
      const again = suspensionCurves(linkage.linkage, bicycle, { steps: 31 });
      expect(again.ok).toBe(true);
      // Source: theorem (the same analysis of the same linkage; the file rounds nothing it needs).
      if (again.ok) expect(again.report.totalTravelMm).toBeCloseTo(c.figures.totalTravelMm, 6);
    }
  }, 60_000);
});
