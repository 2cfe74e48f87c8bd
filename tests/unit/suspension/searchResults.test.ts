/**
 * The ranked layouts table's figures against `loci analyze` of the same design's file:
 * a design the suspension objective describes (as the engine's workers do) becomes a
 * table row; the design is exported as a suspension design file and analysed by the
 * command line, a separate route through file writing, reading and the CLI's summary.
 */
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { parseSynthesisProblemFile } from '../../../src/core/io/problem';
import { toSuspensionFile } from '../../../src/core/io/suspensionFile';
import { SUSPENSION_CAUTION, demoAxleBody, type LayoutKind } from '../../../src/core/suspension';
import { createObjective, type SuspensionProblem, type SuspensionProblemInput } from '../../../src/core/synthesis';
import { compareCsv, comparedDesigns } from '../../../src/app/suspension/search/compare';
import { candidateOf, recordAfter, type SearchRun } from '../../../src/app/suspension/search/results';
import { searchRecordSchema } from '../../../src/app/suspension/search/resultsSchema';
import { demoSuspensionState } from '../../../src/app/suspension/state';
import { storedOf, storedSuspensionSchema } from '../../../src/app/suspension/stored';
import { tableRow, tableSections } from '../../../src/app/suspension/search/rows';
import { searchStartIssues, suspensionRunInput } from '../../../src/app/suspension/search/runInput';
import { loci } from '../../support/cli';

const EXAMPLE = resolve(import.meta.dirname, '../../../public/examples/trail-bike-suspension-problem.json');
const fileJson = JSON.parse(readFileSync(EXAMPLE, 'utf8')) as Record<string, unknown>;
const { format: _f, version: _v, description: _d, ...inputJson } = fileJson;
const input = inputJson as unknown as SuspensionProblemInput;
const parsed = parseSynthesisProblemFile(fileJson);
if (!parsed.ok || parsed.problem.kind !== 'suspension') throw new Error('the example problem does not read');
const problem: SuspensionProblem = parsed.problem;

const dir = mkdtempSync(join(tmpdir(), 'loci-search-rows-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** The demo drawing of a layout, as the objective's design vector: the middle of each default box. */
function describeMiddle(kind: LayoutKind, rank: number) {
  const objective = createObjective(problem, kind);
  const x = Float64Array.from(objective.lower, (lo, j) => (lo + objective.upper[j]) / 2);
  return candidateOf(rank, objective.describe(x));
}

async function analyzeExported(kind: LayoutKind, pivots: Readonly<Record<string, { x: number; y: number }>>) {
  const six = kind === 'wattSixBar' || kind === 'stephensonSixBar';
  const file = toSuspensionFile({ name: `row check ${kind}`, bicycle: input.bicycle, layout: { kind, pivots, ...(six ? { axleBody: demoAxleBody(kind) } : {}) } });
  const path = join(dir, `${kind}.loci-suspension.json`);
  writeFileSync(path, JSON.stringify(file));
  const out = await loci('analyze', path, '--steps', String(problem.steps));
  expect(out.stderr).toBe('');
  expect(out.code).toBe(0);
  return JSON.parse(out.stdout) as { summary: Record<string, number & number[]> };
}

describe('ranked layouts table', () => {
  const cog24 = input.bicycle.cogTeeth.indexOf(24);

  for (const kind of problem.layouts) {
    it(`a ${kind} row shows the figures loci analyze gives for the design's exported file`, async () => {
      const candidate = describeMiddle(kind, 1);
      expect(candidate.figures).not.toBeNull();
      const row = tableRow(candidate, cog24);
      const s = (await analyzeExported(kind, candidate.pivots)).summary;
      // Source: `loci analyze` of the exported design file (src/cli/analyzeSuspension.ts), an independent route to the same analysis.
      expect(row.leverageRatioStart).toBe(s.leverageRatioStart);
      expect(row.leverageRatioEnd).toBe(s.leverageRatioEnd);
      expect(row.progressionPct).toBe(s.progressionPct);
      expect(row.travelMm).toBe(s.wheelTravelMm);
      expect(row.antiSquatAtSagPct).toBe(s.antiSquatAtSagPct[cog24]);
      expect(row.antiRiseAtSagPct).toBe(s.sagAntiRisePct);
      expect(row.rearwardAtFullTravelMm).toBe(s.axleRearwardAtFullTravelMm);
      expect(row.kickbackAtFullTravelDeg).toBe(s.kickbackAtFullTravelDeg[cog24]);
      expect(row.chainGrowthAtFullTravelMm).toBe(s.chainGrowthAtFullTravelMm[cog24]);
      // theorem: the span is the largest pairwise distance of the file's pivots (a second loop over the file, not the table's).
      const pts = Object.values(JSON.parse(readFileSync(join(dir, `${kind}.loci-suspension.json`), 'utf8')).layout.pivots) as { x: number; y: number }[];
      const span = Math.max(...pts.flatMap((a) => pts.map((b) => Math.hypot(a.x - b.x, a.y - b.y))));
      expect(row.pivotSpanMm).toBeCloseTo(span, 9);
    });
  }

  it('puts the best of each layout first and ranks the rest feasible first', () => {
    const a = describeMiddle('singlePivot', 2);
    const b = describeMiddle('fourBarSeatStayAxle', 1);
    const c = { ...describeMiddle('singlePivot', 3), rank: 3 };
    const { best, all } = tableSections([c, a, b], 0);
    expect(best.map((r) => r.rank)).toEqual([1, 2]);
    expect(all.map((r) => r.rank)).toEqual([1, 2, 3]);
  });
});

describe('search run and records', () => {
  it('makes one job per layout on the same problem file, and refuses a bad problem in words', () => {
    const run = suspensionRunInput(input, { seed: 7, budget: { evaluations: 900, seconds: null } }, 2);
    expect(run.jobs.map((j) => j.id)).toEqual(input.layouts);
    expect(new Set(run.jobs.map((j) => JSON.stringify(j.objective.kind === 'synthesis' ? j.objective.problem : null))).size).toBe(1);
    expect(searchStartIssues(input, { seed: 7, budget: { evaluations: 900, seconds: null } }, 2)).toEqual([]);
    const bad = { ...input, layouts: [] };
    expect(searchStartIssues(bad, { seed: 7, budget: { evaluations: 900, seconds: null } }, 2).join(' ')).toMatch(/layouts.*at least one layout/);
  });

  const runOf = (id: string): SearchRun => ({
    id,
    finishedAt: '2026-01-01T00:00:00.000Z',
    problem: input,
    seed: 1,
    budget: { evaluations: 900, seconds: null },
    evaluations: 900,
    stopReason: 'budget',
    candidates: [describeMiddle('singlePivot', 1), describeMiddle('wattSixBar', 2)],
  });

  it('keeps the run a new one replaces as the previous run, and reads back through its schema', () => {
    const first = recordAfter(undefined, runOf('a'));
    const second = recordAfter(first, runOf('b'));
    expect(second.current.id).toBe('b');
    expect(second.previous?.id).toBe('a');
    const read = searchRecordSchema.safeParse(structuredClone(second));
    expect(read.success).toBe(true);
    const broken = structuredClone(second) as unknown as { current: { candidates: { family: string }[] } };
    broken.current.candidates[0].family = 'not a layout';
    expect(searchRecordSchema.safeParse(broken).success).toBe(false);
    // A record that does not read is left out; the design the project keeps still reads.
    const stored = structuredClone({ ...storedOf(demoSuspensionState()), searchResults: broken });
    const kept = storedSuspensionSchema.safeParse(stored);
    expect(kept.success).toBe(true);
    expect(kept.data?.searchResults).toBeUndefined();
    const whole = storedSuspensionSchema.safeParse(structuredClone({ ...storedOf(demoSuspensionState()), searchResults: second }));
    expect(whole.data?.searchResults?.current.candidates.map((c) => c.x)).toEqual(second.current.candidates.map((c) => c.x));
  });

  it('writes the compared curves as CSV with the caution in its header, one row per design per sample', () => {
    const designs = comparedDesigns(input, runOf('c').candidates);
    const text = compareCsv(input.name, designs, 3);
    const lines = text.trimEnd().split('\r\n');
    expect(lines[1]).toBe(`# ${SUSPENSION_CAUTION}`);
    expect(lines.length).toBe(3 + 2 * problem.steps);
    const head = lines[2].split(',');
    const row = lines[3].split(',');
    // The first sample is full extension: zero travel (common practice: travel measured from full extension).
    expect(Number(row[head.indexOf('travel_mm')])).toBe(0);
    expect(Number(row[head.indexOf('leverage_ratio')])).toBe(designs[0].candidate.figures?.leverageRatioStart);
  });
});
