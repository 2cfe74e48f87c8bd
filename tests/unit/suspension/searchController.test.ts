/**
 * The app's suspension search controller on the engine in Node worker threads: one job
 * per layout, the same designs for the same seed and budget, Stop keeping what was
 * found, and a problem it cannot search refused in words before any worker starts.
 */
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { createObjective, createSuspensionProblem, type SuspensionProblemInput } from '../../../src/core/synthesis';
import { nodeEnvironment } from '../../../src/engine/node';
import { SuspensionSearchController } from '../../../src/app/suspension/search/controller';
import { figuresOf, type SearchRun } from '../../../src/app/suspension/search/results';

const EXAMPLE = resolve(import.meta.dirname, '../../../public/examples/trail-bike-suspension-problem.json');
const { format: _f, version: _v, description: _d, ...inputJson } = JSON.parse(readFileSync(EXAMPLE, 'utf8')) as Record<string, unknown>;
const input = inputJson as unknown as SuspensionProblemInput;

/** One worker: the machine's cores are shared. */
const env = { ...nodeEnvironment(), defaultWorkerCount: () => 1 };

function controller(): { c: SuspensionSearchController; runs: SearchRun[] } {
  const runs: SearchRun[] = [];
  let n = 0;
  const c = new SuspensionSearchController({ env, wallNow: () => 0, newRunId: () => `run-${n++}`, onFinished: (run) => runs.push(run) });
  return { c, runs };
}

describe('suspension search controller', () => {
  it('searches every layout and gives the same ranked designs for the same seed and budget', async () => {
    const settings = { seed: 3, budget: { evaluations: 600, seconds: null } };
    const a = controller();
    await a.c.start(input, settings);
    const b = controller();
    await b.c.start(input, settings);
    expect(a.runs).toHaveLength(1);
    const run = a.runs[0];
    expect(a.c.session.getState().status).toBe('finished');
    expect(run.stopReason).toBe('budget');
    expect(new Set(run.candidates.map((c) => c.family))).toEqual(new Set(input.layouts));
    // Source: Deb, "An efficient constraint handling method for genetic algorithms", 2000: feasible before infeasible.
    // Ranks over every design of the run: the first is 1 and they increase (each layout's best keeps its overall rank).
    expect(run.candidates[0].rank).toBe(1);
    for (let i = 1; i < run.candidates.length; i++) expect(run.candidates[i].rank).toBeGreaterThan(run.candidates[i - 1].rank);
    const firstInfeasible = run.candidates.findIndex((c) => !c.feasible);
    if (firstInfeasible >= 0) expect(run.candidates.slice(firstInfeasible).every((c) => !c.feasible)).toBe(true);
    // A deterministic run: the same seed and evaluation budget give the same designs.
    expect(b.runs[0].candidates.map((c) => c.x)).toEqual(run.candidates.map((c) => c.x));
    // The figures kept are what the objective, built here in this thread, says of the same design.
    const created = createSuspensionProblem(input);
    if (!created.ok) throw new Error('the example does not read');
    for (const c of run.candidates.slice(0, 3)) {
      const here = createObjective(created.problem, c.family).describe(Float64Array.from(c.x));
      expect(c.figures).toEqual(here.suspension === null ? null : figuresOf(here.suspension));
    }
  }, 120_000);

  it('stops on Stop and keeps the designs found so far', async () => {
    const { c, runs } = controller();
    const unsubscribe = c.session.subscribe(() => {
      if (c.session.getState().status === 'running' && c.session.getState().evaluations > 0) c.stop();
    });
    await c.start(input, { seed: 1, budget: { evaluations: 5_000_000, seconds: null } });
    unsubscribe();
    expect(runs).toHaveLength(1);
    expect(runs[0].stopReason).toBe('cancelled');
    expect(runs[0].evaluations).toBeLessThan(5_000_000);
    expect(c.session.getState().message).toMatch(/^Stopped/);
  }, 120_000);

  it('refuses a problem it cannot search, in words, and runs nothing', async () => {
    const { c, runs } = controller();
    await c.start({ ...input, layouts: ['singlePivot', 'noSuchLayout'] }, { seed: 1, budget: { evaluations: 100, seconds: null } });
    expect(runs).toHaveLength(0);
    expect(c.session.getState().status).toBe('failed');
    expect(c.session.getState().message).toMatch(/^Cannot start: layouts\[1\]: "noSuchLayout" is not a layout/);
  });
});
