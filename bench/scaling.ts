/**
 * Engine scaling: evaluations per second of one search at 1 and at 2 workers, in one
 * process a moment apart, and their ratio (2 would be perfect scaling; the machine's
 * other load and the messages between rounds keep it lower).
 *
 * Both runs are the same deterministic search (same seed, islands and evaluation
 * budget), so they do exactly the same evaluations and must end on the same best
 * value: the checksum printed is that value, and the bench fails if the two differ.
 * Rates are over the search itself (`elapsedMs` leaves out worker start-up). There is no
 * separate warm-up run: every run starts fresh workers, so their JIT warm-up falls
 * inside both measurements alike, and a warm-up run would only add a worker start-up.
 */
import { readFileSync } from 'node:fs';
import { createRun, type RunInput } from '../src/engine';
import { nodeEnvironment } from '../src/engine/node';

/** Four islands: two per worker at 2 workers, all four on one worker at 1. */
const ISLANDS = 4;
/** Large enough that fresh workers' start-up and JIT warm-up are a small share of the run (at 30,000 they dominated). */
const EVALUATIONS = 1_500_000;

/**
 * A real synthesis workload: the five-point prescribed-timing four-bar problem of
 * Cabrera, Simon and Prado (2002), in the problem file the reference tests and the
 * synthesis bench read.
 */
const TIMED5: unknown = JSON.parse(readFileSync(new URL('../tests/reference/problems/timed5.json', import.meta.url), 'utf8'));

function spec(evaluations: number): RunInput {
  return {
    jobs: [{ id: 'timed5', objective: { kind: 'synthesis', problem: TIMED5, family: 'fourbar-lengths' }, seed: 1, islands: ISLANDS }],
    budget: { evaluations },
    deterministic: true,
  };
}

async function measure(workers: number, evaluations: number): Promise<{ evalsPerS: number; best: number }> {
  const made = createRun(nodeEnvironment(), spec(evaluations), { workers, topK: 1 });
  if (!made.ok) throw new Error(made.reason);
  const result = await made.run.start();
  if (!result.ok) throw new Error(result.reason);
  return { evalsPerS: (result.evaluations * 1000) / result.elapsedMs, best: result.candidates[0]?.value ?? NaN };
}

export async function benchScaling(): Promise<Record<string, number>> {
  const one = await measure(1, EVALUATIONS);
  const two = await measure(2, EVALUATIONS);
  if (!Object.is(one.best, two.best)) {
    throw new Error(`the 1- and 2-worker runs ended on different best values (${one.best} and ${two.best}); the schedule is not deterministic`);
  }
  return {
    evalsPerS1Worker: one.evalsPerS,
    evalsPerS2Workers: two.evalsPerS,
    twoOverOneWorkerRatio: two.evalsPerS / one.evalsPerS,
    bestValueChecksum: one.best,
  };
}
