/**
 * Reach: does the default search find the optimum, not a neighbourhood of it? On the reach
 * set (bench/reachCases.ts: targets sampled from known linkages, so the optimum is zero),
 * each case runs SEEDS seeds of the search a job gets by default (the island's: the app's
 * and the command line's `{ kind: 'hybrid' }` inside the restart scheme, with its default
 * runs: the first of 10 000 evaluations per variable, later ones growing with their
 * populations: islandOptimizerConfig), each up to BUDGET evaluations, stopped as soon as its best feasible
 * RMS is at most the case's reach error (REACH_SHARE × the target's size): a target-error
 * stop, so a seed that reaches ends early. Per case: the seeds that reach, the median
 * evaluations to reach (null when the median seed does not), the worst best RMS of the
 * seeds that do not, as a share of the size, and the seconds spent.
 *
 * The seeds run in worker threads, one per core (at most two), each the search alone in
 * its thread (an island without the engine's rounds); the figures other than seconds do
 * not depend on the machine: the same code and seeds give the same evaluations and RMS.
 * `npm run bench` alone runs the whole set (minutes on two idle cores, bench/README.md);
 * `reach-quick`, run only by name, REACH_QUICK_IDS with QUICK_SEEDS seeds at the same budget.
 *
 * To measure a change on part of the set: LOCI_REACH_CASES (case ids, comma-separated),
 * LOCI_REACH_SEEDS (seeds 1 … n) and LOCI_REACH_OPTIMIZER (a job's optimizer as JSON; a
 * restart scheme is taken as it is, anything else is run inside the island's) narrow or
 * change what `reach` runs; the rows then say so. LOCI_REACH_FREE_TIMING=matched poses each
 * free-timing case as an unprescribed one (the driver values taken from the in-order match
 * of the curve, refined, instead of searched; the problem's default samples), the
 * reformulation measured as the lead for free timing (bench/HISTORY.md, reach);
 * LOCI_REACH_FREE_TIMING=unrefined without `refine` (the driver values searched alone,
 * neither refined nor refitted: the set's free timing before 2026-12-06).
 * LOCI_REACH_PLACEMENT=free poses each fixed-placement case with a free placement (its
 * placement fitted, not searched): the measurement behind the search's fitBetter
 * (bench/README.md, Reach).
 *
 * Each design is evaluated as the island evaluates it: with a fixed placement, fitBetter
 * then scores the design moved onto its fitted placement too, and with refined free
 * timing the design with its driver values refitted where the match moves a point.
 */
import { availableParallelism, loadavg } from 'node:os';
import { performance } from 'node:perf_hooks';
import { isMainThread, parentPort, Worker, workerData } from 'node:worker_threads';
import { createOptimizer } from '../src/core/optimize';
import { createObjective, createProblem } from '../src/core/synthesis';
import type { IslandOptimizerConfig } from '../workers/api';
import { islandOptimizerConfig } from '../workers/island';
import { REACH_QUICK_IDS, REACH_SHARE, reachCases, type ReachCase } from './reachCases';

export const SEEDS = 10;
export const BUDGET = 200_000;
const QUICK_SEEDS = 3;
/** The full budget: L-SHADE sizes its schedule by the budget, so a smaller one would measure another search. */
const QUICK_BUDGET = BUDGET;
/** Most worker threads: the machine has two cores. */
const MAX_THREADS = 2;
/** Ask/tell rounds of one seed at most (every round spends at least one evaluation). */
const MAX_ROUNDS = 10_000_000;

/** The optimizer a job gets when it names none: what src/cli/fit.ts and the app pass. */
export const DEFAULT_JOB_OPTIMIZER: Record<string, unknown> = { kind: 'hybrid' };

export interface SeedRun {
  readonly caseId: string;
  readonly seed: number;
  readonly reached: boolean;
  /** Evaluations spent: to the reach error when reached, else the budget (or fewer if the search stopped). */
  readonly evaluations: number;
  /** Best feasible RMS, mm; null when no feasible design was seen. */
  readonly bestRmsMm: number | null;
  readonly seconds: number;
}

/**
 * One seed of one case: the island's optimizer (the job's optimizer inside the restart
 * scheme, as workers/island.ts builds it), stopped at the reach error or the budget.
 */
export function runReachSeed(c: ReachCase, seed: number, budget: number, optimizer: Record<string, unknown> = DEFAULT_JOB_OPTIMIZER): SeedRun {
  const made = createProblem(c.problem);
  if (!made.ok) throw new Error(`reach ${c.id}: ${JSON.stringify(made.issues)}`);
  const objective = createObjective(made.problem, c.family);
  const common = { dim: objective.dim, maxEvaluations: budget, seed, stream: 0, targetValue: c.reachRmsMm };
  const built = createOptimizer(islandOptimizerConfig(optimizer as IslandOptimizerConfig, common));
  if (!built.ok) throw new Error(`reach ${c.id}: ${built.reason}`);
  const opt = built.optimizer;
  const x = new Float64Array(objective.dim);
  const out = new Float64Array(2);
  let values = new Float64Array(0);
  let violations = new Float64Array(0);
  let dropped = new Uint8Array(0);
  const t0 = performance.now();
  for (let round = 0; round < MAX_ROUNDS && !opt.done(); round++) {
    const points = opt.ask();
    const n = points.length;
    if (n === 0) break;
    if (values.length !== n) {
      values = new Float64Array(n);
      violations = new Float64Array(n);
      dropped = new Uint8Array(n);
    }
    opt.infeasibleDroppedInto(dropped);
    for (let k = 0; k < n; k++) {
      // As the island evaluates (workers/island.ts; it keeps no archive here): stopped early where
      // the search drops the design if infeasible, and a fixed placement's design moved onto its
      // fitted placement where that ranks better.
      objective.evaluate(objective.fromSearchBoxInto(points[k], x), out, dropped[k] === 1);
      objective.fitBetter?.(x, out);
      values[k] = out[0];
      violations[k] = out[1];
    }
    opt.tell(points, values, violations);
  }
  const best = opt.best();
  const feasible = opt.evaluations() > 0 && best.violation <= 0 && best.value < Infinity;
  return {
    caseId: c.id,
    seed,
    reached: opt.stopReason() === 'target',
    evaluations: opt.evaluations(),
    bestRmsMm: feasible ? best.value : null,
    seconds: (performance.now() - t0) / 1000,
  };
}

/**
 * How a free-timing case is searched: its driver values as variables, refined on each
 * design's curve (the problem as set); as variables alone, unrefined (as a problem file
 * without `refine` poses them); or matched as unprescribed timing matches them.
 */
type FreeTiming = 'searched' | 'unrefined' | 'matched';

/** How a fixed-placement case is searched: as set, or posed with a free placement (its placement fitted to the target, not searched). */
type PlacementPosing = 'as-set' | 'free';

interface Task {
  readonly caseId: string;
  readonly seed: number;
  readonly budget: number;
  readonly optimizer: Record<string, unknown>;
  readonly freeTiming: FreeTiming;
  readonly placement: PlacementPosing;
}

/** `c`, or for a free-timing case the same target and family posed as `freeTiming` says. */
function withFreeTiming(c: ReachCase, freeTiming: FreeTiming): ReachCase {
  if (freeTiming === 'searched' || c.timing !== 'free') return c;
  if (freeTiming === 'unrefined') {
    const problem = { ...c.problem, timing: { mode: 'free' as const, wrap: c.problem.timing.mode === 'free' && c.problem.timing.wrap } };
    return { ...c, problem, problemFile: { ...c.problemFile, timing: problem.timing } };
  }
  const mechanism = c.design.length - c.spec.driverValues.length;
  // The free timing's wrap (whether the values may pass through the turn's start) is kept: the same problem, the timing found another way.
  const wrap = c.problem.timing.mode === 'free' ? c.problem.timing.wrap : undefined;
  return {
    ...c,
    timing: 'unprescribed',
    problem: { ...c.problem, timing: { mode: 'unprescribed', wrap } },
    design: c.design.slice(0, mechanism),
    designNames: c.designNames.slice(0, mechanism),
  };
}

/** The literature four-bar's fixed-placement variables, in order: the free placement's five are r2 … rcy in units of r1. */
const LENGTHS_FIXED_SHAPE = ['r2', 'r3', 'r4', 'rcx', 'rcy'] as const;

/**
 * `c`, or for a fixed-placement case with `placement` 'free', the same target and family
 * posed with a free placement: the similarity that places the curve is then fitted to
 * the target (closed form), not searched. The optimum stays RMS 0 (the generating design
 * placed by the identity). The pose families search the same variables either way; the
 * literature four-bar's free placement has its shape alone, in ground-link units.
 */
function withPlacement(c: ReachCase, placement: PlacementPosing): ReachCase {
  if (placement === 'as-set' || c.placement === 'free') return c;
  let design = c.design;
  let designNames = c.designNames;
  if (c.family === 'fourbar-lengths') {
    const r1 = c.design[c.designNames.indexOf('r1')];
    const shape = LENGTHS_FIXED_SHAPE.map((name) => c.design[c.designNames.indexOf(name)] / r1);
    // Free timing's driver values (θ2 from the ground line) follow the mechanism's nine variables unchanged.
    design = [...shape, ...c.design.slice(9)];
    designNames = [...LENGTHS_FIXED_SHAPE, ...c.designNames.slice(9)];
  }
  return { ...c, placement: 'free', problem: { ...c.problem, placement: 'free' }, design, designNames };
}

/** The case as the task poses it. */
function posed(c: ReachCase, freeTiming: FreeTiming, placement: PlacementPosing): ReachCase {
  return withPlacement(withFreeTiming(c, freeTiming), placement);
}

// A worker thread of this bench: started through the engine's bootstrap (which registers
// tsx in the thread), it runs the tasks it is sent, one at a time.
if (!isMainThread && parentPort !== null && (workerData as { reachWorker?: boolean } | null)?.reachWorker === true) {
  const port = parentPort;
  const cache = new Map<string, ReachCase>();
  port.on('message', (task: Task) => {
    let c = cache.get(task.caseId);
    if (c === undefined) {
      c = reachCases([task.caseId])[0];
      cache.set(task.caseId, c);
    }
    port.postMessage(runReachSeed(posed(c, task.freeTiming, task.placement), task.seed, task.budget, task.optimizer));
  });
}

/** Runs the tasks on `threads` worker threads, each thread taking the next task when it is free; results in task order. */
export async function runTasks(tasks: readonly Task[], threads: number, onRun?: (run: SeedRun) => void): Promise<SeedRun[]> {
  const bootstrap = new URL('../src/engine/node/workerBootstrap.mjs', import.meta.url);
  const entry = new URL('./reach.ts', import.meta.url).href;
  const results: SeedRun[] = new Array<SeedRun>(tasks.length);
  let next = 0;
  const workers = Array.from({ length: Math.max(1, Math.min(threads, tasks.length)) }, () => new Worker(bootstrap, { workerData: { entry, reachWorker: true } }));
  try {
    await Promise.all(
      workers.map(
        (worker) =>
          new Promise<void>((resolve, reject) => {
            let current = -1;
            const give = () => {
              if (next >= tasks.length) {
                resolve();
                return;
              }
              current = next++;
              worker.postMessage(tasks[current]);
            };
            worker.on('message', (run: SeedRun) => {
              results[current] = run;
              onRun?.(run);
              give();
            });
            worker.on('error', reject);
            worker.on('exit', (code) => {
              if (next < tasks.length || current >= 0 && results[current] === undefined) reject(new Error(`reach: a worker exited with code ${code}`));
            });
            give();
          }),
      ),
    );
  } finally {
    await Promise.all(workers.map((w) => w.terminate()));
  }
  return results;
}

function median(values: readonly number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  const mid = sorted.length >> 1;
  return sorted.length % 2 === 1 ? sorted[mid] : (sorted[mid - 1] + sorted[mid]) / 2;
}

export type ReachRow = Record<string, string | number | null>;

/** One row per case from its seeds' runs. */
export function reachRow(c: ReachCase, runs: readonly SeedRun[], budget: number): ReachRow {
  const reached = runs.filter((r) => r.reached);
  const missed = runs.filter((r) => !r.reached);
  const medianEvaluations = median(runs.map((r) => (r.reached ? r.evaluations : Infinity)));
  const worstMiss = missed.reduce((worst, r) => Math.max(worst, r.bestRmsMm ?? Infinity), -Infinity);
  return {
    case: c.id,
    family: c.family,
    timing: c.timing,
    path: c.shape,
    placement: c.placement,
    dim: c.design.length,
    seedsReached: reached.length,
    seeds: runs.length,
    budget,
    medianEvaluations: Number.isFinite(medianEvaluations) ? medianEvaluations : null,
    worstMissRmsOverSize: missed.length === 0 ? null : Number.isFinite(worstMiss) ? worstMiss / c.sizeMm : null,
    reachRmsOverSize: REACH_SHARE,
    seconds: runs.reduce((s, r) => s + r.seconds, 0),
  };
}

/** The rows of `cases` at `seeds` seeds (1 … seeds) and `budget` evaluations, run on both cores. */
export async function reachRows(
  cases: readonly ReachCase[],
  seeds: number,
  budget: number,
  optimizer: Record<string, unknown> = DEFAULT_JOB_OPTIMIZER,
  freeTiming: FreeTiming = 'searched',
  placement: PlacementPosing = 'as-set',
): Promise<ReachRow[]> {
  // Seed-major order: every case's first seeds run before any case's last, so a long case does not come last alone.
  const tasks: Task[] = [];
  for (let seed = 1; seed <= seeds; seed++) for (const c of cases) tasks.push({ caseId: c.id, seed, budget, optimizer, freeTiming, placement });
  const threads = Math.min(MAX_THREADS, availableParallelism());
  const runs = await runTasks(tasks, threads);
  const rows = cases.map((c) => reachRow(posed(c, freeTiming, placement), runs.filter((r) => r.caseId === c.id), budget));
  const load = loadavg()[0];
  return rows.map((row) => ({ ...row, threads, loadAverage: load }));
}

/** The `reach` run the environment asks for (see the header); the whole set, SEEDS seeds and the default optimizer when it asks for nothing. */
export async function benchReach(): Promise<ReachRow[]> {
  const ids = process.env.LOCI_REACH_CASES?.split(',').map((id) => id.trim()).filter((id) => id.length > 0);
  const seedsText = process.env.LOCI_REACH_SEEDS;
  const seeds = seedsText === undefined ? SEEDS : Number(seedsText);
  if (!(Number.isInteger(seeds) && seeds >= 1)) throw new Error(`LOCI_REACH_SEEDS is ${JSON.stringify(seedsText)}; expected an integer ≥ 1`);
  const optimizerText = process.env.LOCI_REACH_OPTIMIZER;
  let optimizer = DEFAULT_JOB_OPTIMIZER;
  if (optimizerText !== undefined) {
    const parsed: unknown = JSON.parse(optimizerText);
    if (typeof parsed !== 'object' || parsed === null || Array.isArray(parsed)) throw new Error(`LOCI_REACH_OPTIMIZER is ${optimizerText}; expected a JSON object such as {"kind":"hybrid"}`);
    optimizer = parsed as Record<string, unknown>;
  }
  const freeTimingText = process.env.LOCI_REACH_FREE_TIMING ?? 'searched';
  if (freeTimingText !== 'searched' && freeTimingText !== 'unrefined' && freeTimingText !== 'matched') {
    throw new Error(`LOCI_REACH_FREE_TIMING is ${JSON.stringify(freeTimingText)}; expected searched, unrefined or matched`);
  }
  const placementText = process.env.LOCI_REACH_PLACEMENT ?? 'as-set';
  if (placementText !== 'as-set' && placementText !== 'free') throw new Error(`LOCI_REACH_PLACEMENT is ${JSON.stringify(placementText)}; expected as-set or free`);
  const rows = await reachRows(reachCases(ids === undefined || ids.length === 0 ? undefined : ids), seeds, BUDGET, optimizer, freeTimingText, placementText);
  return rows.map((row) => ({
    ...row,
    ...(optimizerText === undefined ? {} : { optimizer: optimizerText }),
    ...(freeTimingText === 'matched' ? { freeTiming: 'matched as unprescribed' } : freeTimingText === 'unrefined' ? { freeTiming: 'searched, unrefined' } : {}),
    ...(placementText === 'free' ? { placementRun: 'fixed posed as free' } : {}),
  }));
}

export function benchReachQuick(): Promise<ReachRow[]> {
  return reachRows(reachCases(REACH_QUICK_IDS), QUICK_SEEDS, QUICK_BUDGET);
}
