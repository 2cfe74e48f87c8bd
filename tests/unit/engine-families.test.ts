/**
 * The best of every job (a job is one family): a run keeps each job's best distinct
 * candidates and, with `perJob`, describes them all, so one job that dominates the whole
 * ranking cannot hide the others.
 *
 * Two jobs on Rosenbrock's function, Σ 100 (x_{i+1} − x_i²)² + (x_i − 1)² on [−30, 30]^D
 * (Jamil and Yang, 2013, "A literature survey of benchmark functions for global
 * optimization problems"): in 2-d a small budget comes close to the minimum 0, in 12-d
 * it stays far from it, so the 2-d job takes the whole topK.
 *
 * The expected choice is computed here a second way: from the run's final checkpoint
 * (its per-job archives), ranked by the feasibility-first rule written out in this file.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { createRun, decodeCheckpoint, defineRun, type RunInput, type RunResult } from '../../src/engine';
import { DEFAULT_RESULTS_PER_FAMILY } from '../../src/engine/runSpec';
import { nodeEnvironment } from '../../src/engine/node';

const LOWER = -30;
const UPPER = 30;
const TOP_K = 10;
const PER_JOB = 50;
/** The archive's distinctness distance, box units (RMS share of each span). */
const DISTANCE = 0.01;

const INPUT: RunInput = {
  jobs: [
    { id: 'easy', objective: { kind: 'test-function', name: 'rosenbrock', dim: 2 }, seed: 7, islands: 1 },
    { id: 'hard', objective: { kind: 'test-function', name: 'rosenbrock', dim: 12 }, seed: 7, islands: 1 },
  ],
  budget: { evaluations: 2 * 6000 },
  deterministic: true,
  stepEvaluations: 500,
  archive: { distance: DISTANCE },
};

type Finished = Extract<RunResult, { ok: true }>;

async function runToEnd(input: RunInput, perJob: number): Promise<{ result: Finished; checkpoint: string }> {
  const made = createRun(nodeEnvironment(), input, { workers: 2, topK: TOP_K, perJob });
  if (!made.ok) throw new Error(made.reason);
  const result = await made.run.start();
  if (!result.ok) throw new Error(`run failed: ${result.reason}`);
  return { result, checkpoint: await made.run.exportCheckpoint() };
}

/** Deb's (2000) rule, written out: feasible before infeasible, then lower value, or lower violation. */
function before(a: { value: number; violation: number }, b: { value: number; violation: number }): number {
  const fa = a.violation <= 0;
  const fb = b.violation <= 0;
  if (fa !== fb) return fa ? -1 : 1;
  return fa ? a.value - b.value : a.violation - b.violation;
}

function rmsShare(a: readonly number[], b: readonly number[]): number {
  let sum = 0;
  for (let i = 0; i < a.length; i++) sum += ((a[i] - b[i]) / (UPPER - LOWER)) ** 2;
  return Math.sqrt(sum / a.length);
}

let run: Finished;
let checkpoint: string;

beforeAll(async () => {
  ({ result: run, checkpoint } = await runToEnd(INPUT, PER_JOB));
}, 120_000);

describe('per-family results', () => {
  it('keeps at least 50 distinct designs per job by default', () => {
    const defined = defineRun(INPUT);
    if (!defined.ok) throw new Error(defined.reason);
    expect(defined.spec.archive.capacity).toBeGreaterThanOrEqual(50);
    expect(DEFAULT_RESULTS_PER_FAMILY).toBeGreaterThanOrEqual(50);
  });

  it('one job takes the whole topK, yet the other job is there with its own best 50', () => {
    const top = run.candidates.slice(0, TOP_K);
    expect(top.every((c) => c.jobId === 'easy')).toBe(true);
    for (const id of ['easy', 'hard']) expect(run.candidates.filter((c) => c.jobId === id)).toHaveLength(PER_JOB);
  });

  it("gives each job exactly its archive's best, ranked in the whole pool", () => {
    const decoded = decodeCheckpoint(checkpoint);
    if (!decoded.ok) throw new Error(decoded.reason);
    const pool = decoded.payload.archive.flatMap((a) => a.entries.map((e) => ({ ...e, jobId: a.jobId })));
    pool.sort((a, b) => before(a, b) || (a.jobId < b.jobId ? -1 : a.jobId > b.jobId ? 1 : 0));
    const expected = pool
      .map((e, k) => ({ e, rank: k + 1 }))
      .filter(({ e, rank }) => rank <= TOP_K || pool.filter((o, j) => j < rank - 1 && o.jobId === e.jobId).length < PER_JOB);
    expect(run.candidates.map((c) => ({ jobId: c.jobId, x: c.x, rank: c.rank }))).toEqual(
      expected.map(({ e, rank }) => ({ jobId: e.jobId, x: e.x, rank })),
    );
  });

  it('keeps only distinct designs within a job', () => {
    for (const id of ['easy', 'hard']) {
      const xs = run.candidates.filter((c) => c.jobId === id).map((c) => c.x);
      for (let a = 0; a < xs.length; a++) for (let b = a + 1; b < xs.length; b++) expect(rmsShare(xs[a], xs[b])).toBeGreaterThan(DISTANCE);
    }
  });

  it('gives the same candidates when run again (deterministic)', async () => {
    const again = await runToEnd(INPUT, PER_JOB);
    expect(again.result.candidates.map((c) => [c.jobId, c.rank, c.x, c.value])).toEqual(run.candidates.map((c) => [c.jobId, c.rank, c.x, c.value]));
  }, 120_000);

  it('takes another count per job, and a larger archive', async () => {
    const five = await runToEnd(INPUT, 5);
    expect(five.result.candidates.filter((c) => c.jobId === 'hard')).toHaveLength(5);
    const wide = await runToEnd({ ...INPUT, archive: { capacity: 90, distance: DISTANCE } }, 70);
    expect(wide.result.candidates.filter((c) => c.jobId === 'hard')).toHaveLength(70);
  }, 120_000);

  it('refuses more per job than the archive holds, saying what to change', () => {
    const made = createRun(nodeEnvironment(), { ...INPUT, archive: { capacity: 20 } }, { perJob: 50 });
    expect(made.ok).toBe(false);
    if (!made.ok) expect(made.reason).toMatch(/perJob is 50; expected an integer in \[0, 20\].*archive\.capacity/);
  });
});
