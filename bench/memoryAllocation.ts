/**
 * Bytes allocated per evaluation, in steady state, on the three published four-bar
 * problems the scaling bench runs: of the objective's evaluate alone (the least of a few
 * windows), and of an island's whole step (optimizer ask/tell, evaluations, archive: the
 * mean over one window, restarts and recompilations included, and the least of a few
 * windows, the steady state) in this thread; then of every family's objective on the
 * family-rates bench's fixed designs (the demo target). Bytes, not time:
 * the figures do not depend on the machine's speed or load. Not part of `npm run bench`:
 *
 *   node --import tsx bench/memoryAllocation.ts [--evaluations 20000]
 *
 * Allocated bytes are the heap's used size after the window minus before, plus what each
 * garbage collection inside the window freed (v8.GCProfiler reports every collection with
 * the heap before and after), so a collection in the window neither hides nor adds bytes.
 */
import { readFileSync } from 'node:fs';
import v8 from 'node:v8';
import { parseSynthesisProblemFile } from '../src/core/io/problem';
import { Prng } from '../src/core/optimize';
import { FAMILY_IDS, createObjective, type Problem } from '../src/core/synthesis';
import { Island } from '../workers/island';
import { drawDesigns, type DesignSet } from './familyRates';

const CASES = ['line6-untimed', 'timed5', 'closed18-untimed'] as const;
const WARM_UP_EVALUATIONS = 5_000;
const OBJECTIVE_WINDOWS = 8;

function problem(caseId: string): unknown {
  return JSON.parse(readFileSync(new URL(`../tests/reference/problems/${caseId}.json`, import.meta.url), 'utf8'));
}

/** Heap bytes allocated while `work` runs, and the collections it caused. */
export function allocatedBytes(work: () => void): { bytes: number; collections: number } {
  const profiler = new v8.GCProfiler();
  profiler.start();
  const before = v8.getHeapStatistics().used_heap_size;
  work();
  const after = v8.getHeapStatistics().used_heap_size;
  const { statistics } = profiler.stop();
  let freed = 0;
  for (const gc of statistics) freed += gc.beforeGC.heapStatistics.usedHeapSize - gc.afterGC.heapStatistics.usedHeapSize;
  return { bytes: after - before + freed, collections: statistics.length };
}

function objectiveBytesPerEvaluation(caseId: string, evaluations: number): { bytes: number; collections: number } {
  const parsed = parseSynthesisProblemFile(problem(caseId));
  if (!parsed.ok) throw new Error(`${caseId}: ${JSON.stringify(parsed.issues)}`);
  const objective = createObjective(parsed.problem as Problem, 'fourbar-lengths');
  const dim = objective.dim;
  // Seeded designs across the box, as an early search samples them (the worst case for
  // branches that reject a design early is a converged search; both kinds are here).
  const designs = 1024;
  const xs = new Float64Array(designs * dim);
  const prng = Prng.fromSeed(7);
  const u = new Float64Array(dim);
  const x = new Float64Array(dim);
  for (let d = 0; d < designs; d++) {
    for (let j = 0; j < dim; j++) u[j] = prng.float();
    objective.fromSearchBoxInto(u, x);
    xs.set(x, d * dim);
  }
  const out = new Float64Array(2);
  // A checksum in an array: a double in a variable a closure writes is boxed at every write.
  const sink = new Float64Array(1);
  const run = (count: number) => {
    for (let e = 0; e < count; e++) {
      const d = e % designs;
      for (let j = 0; j < dim; j++) x[j] = xs[d * dim + j];
      objective.evaluate(x, out);
      sink[0] += out[0];
    }
  };
  run(WARM_UP_EVALUATIONS);
  // The quietest of a few windows: after another problem's evaluations the compiler may
  // still be re-optimising (deoptimised code boxes every double) when the first opens.
  const per = Math.max(1, Math.floor(evaluations / OBJECTIVE_WINDOWS));
  let least = Infinity;
  let collections = 0;
  for (let w = 0; w < OBJECTIVE_WINDOWS; w++) {
    const measured = allocatedBytes(() => run(per));
    least = Math.min(least, measured.bytes / per);
    collections += measured.collections;
  }
  if (Number.isNaN(sink[0])) console.log(`${caseId}: checksum NaN`);
  return { bytes: least, collections };
}

function islandBytesPerEvaluation(caseId: string, evaluations: number): { bytes: number; least: number; collections: number } {
  const made = Island.create({
    islandId: 'a',
    seed: 1,
    stream: 0,
    maxEvaluations: 10_000_000,
    archiveCapacity: 64,
    archiveDistance: 0.01,
    optimizer: { kind: 'hybrid' },
    objective: { kind: 'synthesis', problem: problem(caseId), family: 'fourbar-lengths' },
  } as never);
  if (!made.ok) throw new Error(made.reason);
  const island = made.island;
  const now = () => 0;
  island.step({ evaluations: WARM_UP_EVALUATIONS }, now);
  const start = island.info().evaluations;
  let end = start;
  const measured = allocatedBytes(() => {
    end = island.step({ evaluations }, now).evaluations;
  });
  const per = Math.max(1, Math.floor(evaluations / OBJECTIVE_WINDOWS));
  let least = Infinity;
  for (let w = 0; w < OBJECTIVE_WINDOWS; w++) {
    let told = 0;
    const window = allocatedBytes(() => {
      told = island.step({ evaluations: per }, now).stepEvaluations;
    });
    if (told > 0) least = Math.min(least, window.bytes / told);
  }
  return { bytes: measured.bytes / (end - start), least, collections: measured.collections };
}

/** Bytes per evaluation of a family's objective over its fixed designs: the least of a few windows, after a warm-up. */
function familyBytesPerEvaluation(set: DesignSet): number {
  const x = new Float64Array(set.dim);
  const out = new Float64Array(2);
  const pass = () => {
    for (let d = 0; d < set.count; d++) {
      for (let j = 0; j < set.dim; j++) x[j] = set.designs[d * set.dim + j];
      set.evaluate(x, out);
    }
  };
  for (let w = 0; w < 3; w++) pass();
  let least = Infinity;
  for (let w = 0; w < OBJECTIVE_WINDOWS; w++) least = Math.min(least, allocatedBytes(pass).bytes / set.count);
  return least;
}

function main(): void {
  const at = process.argv.indexOf('--evaluations');
  const evaluations = at > 0 ? Number(process.argv[at + 1]) : 20_000;
  const rows = CASES.map((caseId) => {
    const objective = objectiveBytesPerEvaluation(caseId, evaluations);
    const island = islandBytesPerEvaluation(caseId, evaluations);
    return {
      case: caseId,
      objectiveBytesPerEval: Number(objective.bytes.toFixed(2)),
      objectiveCollections: objective.collections,
      islandStepBytesPerEval: Number(island.bytes.toFixed(2)),
      islandStepLeastBytesPerEval: Number(island.least.toFixed(2)),
      islandStepCollections: island.collections,
    };
  });
  console.table(rows);
  const families = FAMILY_IDS.map((family) => ({ family, objectiveBytesPerEval: Math.round(familyBytesPerEvaluation(drawDesigns(family))) }));
  console.table(families);
  console.log(JSON.stringify({ evaluations, rows, families }));
}

main();
