/**
 * What an unprescribed-timing evaluation costs beside its curve solve: the four-bar
 * (family `fourbar`) on the demo target (24 points, closed, matched timing, free
 * placement, 180 curve samples), searched by one island in this thread with the
 * `hybrid` optimizer, beside four-bar solves per second through the compiled plan in
 * the same run (runSized, the per-value entry the curve calls). The figure to watch is
 *
 *   evalPerSolveRatio = (evaluations/s × curve samples) / (plan solves/s),
 *
 * the share of an evaluation's time a bare sampling of its curve would take (1 would
 * be an evaluation as cheap as its samples). Also: the objective alone on a fixed set
 * of seeded designs (no optimizer), garbage collections during the timed objective
 * loop (counted through a `gc` PerformanceObserver, so no `--expose-gc` is needed),
 * and the best RMS each seed reaches at the search budget (quality, not speed).
 *
 * Seeded throughout; untimed warm-up; each rate the best of interleaved rounds.
 */
import { performance, PerformanceObserver } from 'node:perf_hooks';
import { compile, fourBar, type Plan } from '../src/core/linkage';
import { runSized as runSizedImport } from '../src/core/linkage/run';
import { Prng } from '../src/core/optimize/prng';
import { createObjective, createProblem } from '../src/core/synthesis';
import { DEFAULT_ARCHIVE } from '../src/engine/runSpec';
import { demoProblemFile } from './demoProblem';
import { Island } from '../workers/island';

const runSized = runSizedImport;

const SAMPLES = 180;
const FAMILY = 'fourbar';
const SEEDS = [1, 2, 3, 4, 5];
const SEARCH_BUDGET = 20_000;
const OBJECTIVE_DESIGNS = 1024;
const OBJECTIVE_EVALUATIONS = 20_000;
const PLAN_SOLVES = 4_000_000;
const ROUNDS = 3;
const INPUT_COUNT = 4096;

function planLoop(plan: Plan, angles: Float64Array, solves: number, pose: Float64Array, pSlot: number): number {
  let acc = 0;
  for (let i = 0; i < solves; i++) {
    runSized(plan, angles[i & (INPUT_COUNT - 1)], pose);
    acc += pose[pSlot] + pose[pSlot + 1];
  }
  return acc;
}

interface SearchRun {
  readonly best: number;
  readonly evaluations: number;
  readonly seconds: number;
}

function search(problemFile: unknown, seed: number, budget: number): SearchRun {
  const made = Island.create({
    islandId: 'bench-matching',
    objective: { kind: 'synthesis', problem: problemFile, family: FAMILY },
    seed,
    stream: 0,
    optimizer: { kind: 'hybrid' },
    maxEvaluations: budget,
    archiveCapacity: DEFAULT_ARCHIVE.capacity,
    archiveDistance: DEFAULT_ARCHIVE.distance,
  });
  if (!made.ok) throw new Error(`island: ${made.reason}`);
  const island = made.island;
  const now = () => performance.now();
  const t0 = now();
  let progress = island.step({ evaluations: budget }, now);
  for (let slice = 0; slice < budget && progress.stopReason === null; slice++) progress = island.step({ evaluations: budget }, now);
  const seconds = (now() - t0) / 1000;
  const feasible = progress.bestValue !== null && progress.bestViolation === 0;
  return { best: feasible ? (progress.bestValue as number) : Infinity, evaluations: progress.evaluations, seconds };
}

export async function benchMatching(): Promise<Record<string, number | null>> {
  const file = demoProblemFile(FAMILY, SAMPLES);
  const problem = createProblem({
    name: file.name,
    target: { points: file.target.points, closed: true },
    timing: { mode: 'unprescribed', samples: SAMPLES },
    placement: 'free',
    families: [FAMILY],
    measure: 'rms',
  });
  if (!problem.ok) throw new Error(`bench: ${problem.issues.map((i) => `${i.path}: ${i.message}`).join('; ')}`);
  const objective = createObjective(problem.problem, FAMILY);

  // The objective alone: seeded designs spread over the box through the search map.
  const prng = Prng.fromSeed(20261203);
  const designs = new Float64Array(OBJECTIVE_DESIGNS * objective.dim);
  const u = new Float64Array(objective.dim);
  const x = new Float64Array(objective.dim);
  for (let d = 0; d < OBJECTIVE_DESIGNS; d++) {
    prng.fillFloats(u, objective.dim);
    objective.fromSearchBoxInto(u, x);
    designs.set(x, d * objective.dim);
  }
  const out = new Float64Array(2);
  const xs = new Float64Array(objective.dim);
  const objectiveLoop = (count: number): number => {
    let acc = 0;
    for (let e = 0; e < count; e++) {
      const d = e % OBJECTIVE_DESIGNS;
      for (let q = 0; q < objective.dim; q++) xs[q] = designs[d * objective.dim + q];
      objective.evaluate(xs, out);
      if (Number.isFinite(out[0])) acc += out[0];
    }
    return acc;
  };

  const plan = compile(fourBar());
  if (!plan.ok) throw new Error('bench: the default four-bar does not compile');
  const pose = Float64Array.from(plan.plan.reference);
  const pSlot = 2 * (plan.plan.slotIndex.get('P') ?? -1);
  const angles = new Float64Array(INPUT_COUNT);
  prng.fillFloats(angles, INPUT_COUNT);
  for (let i = 0; i < INPUT_COUNT; i++) angles[i] *= 2 * Math.PI;

  // Warm-up.
  planLoop(plan.plan, angles, 200_000, pose, pSlot);
  objectiveLoop(OBJECTIVE_EVALUATIONS / 4);
  search(file, 99, 5_000);

  let gcCount = 0;
  const observer = new PerformanceObserver((list) => {
    gcCount += list.getEntries().length;
  });
  let planRate = 0;
  let objectiveRate = 0;
  let checksum = 0;
  let objectiveGcs = 0;
  for (let r = 0; r < ROUNDS; r++) {
    let t0 = performance.now();
    checksum += planLoop(plan.plan, angles, PLAN_SOLVES, pose, pSlot);
    planRate = Math.max(planRate, PLAN_SOLVES / ((performance.now() - t0) / 1000));
    observer.observe({ entryTypes: ['gc'] });
    gcCount = 0;
    t0 = performance.now();
    checksum += objectiveLoop(OBJECTIVE_EVALUATIONS);
    objectiveRate = Math.max(objectiveRate, OBJECTIVE_EVALUATIONS / ((performance.now() - t0) / 1000));
    // Entries are delivered asynchronously: let them arrive before stopping the count.
    await new Promise((resolve) => setTimeout(resolve, 0));
    observer.disconnect();
    objectiveGcs = r === 0 ? gcCount : Math.min(objectiveGcs, gcCount);
  }

  const runs = SEEDS.map((seed) => search(file, seed, SEARCH_BUDGET));
  const searchRate = runs.reduce((s, r) => s + r.evaluations, 0) / runs.reduce((s, r) => s + r.seconds, 0);
  const figures: Record<string, number | null> = {
    planSolvesPerS: planRate,
    objectiveEvalsPerS: objectiveRate,
    searchEvalsPerS: searchRate,
    evalPerSolveRatio: (searchRate * SAMPLES) / planRate,
    objectiveEvalPerSolveRatio: (objectiveRate * SAMPLES) / planRate,
    gcsPer20kObjectiveEvals: objectiveGcs,
  };
  for (const [i, r] of runs.entries()) figures[`seed${SEEDS[i]}BestRmsMm`] = Number.isFinite(r.best) ? r.best : null;
  figures.checksum = checksum;
  return figures;
}
