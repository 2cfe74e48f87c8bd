/**
 * Every family as a user runs it: the app's demo target (24 points, closed, unprescribed
 * timing, free placement, 180 curve samples, RMS), one island on one core in this thread
 * with the app's optimizer, one row per family: evaluations per second, that rate as a
 * share of the four-bar's in the same run, the best RMS at the budget, and the seconds
 * and evaluations until the best feasible RMS first fell to REACH_RMS_MM (null: not
 * within the budget). The budget is an evaluation count or a time cap, whichever comes
 * first, so the slow families cannot hold the bench for long.
 *
 * Beside the four-bar's row, the peers the synthesis bench runs (bench/synthesis.ts:
 * random search and Powell of optimization-js, Nelder–Mead of fmin, restarted as there),
 * on the same objective and budget, each a row with its rate, best RMS at the budget and
 * the time to the stated error (read at every PEER_CHECKPOINT_EVALUATIONS evaluations).
 *
 * Seeded; untimed warm-up per family; the rate is the search's own (optimizer included).
 * Besides the wall-clock rate, the rate per second of this process's CPU time (the run
 * is one thread): on a machine shared with other work the wall clock counts the time
 * the process waited for a core, the CPU time does not.
 */
import { performance } from 'node:perf_hooks';
import { parseProblemFile } from '../src/core/io/problem';
import { FAMILY_IDS, createObjective, type FamilyId } from '../src/core/synthesis';
import { DEFAULT_ARCHIVE } from '../src/engine/runSpec';
import { Island } from '../workers/island';
import { demoProblemFile } from './demoProblem';
import { PEERS, loadOptimizationJs, runPeerTrace } from './synthesis';

const SAMPLES = 180;
const SEED = 1;
const BUDGET_EVALUATIONS = 30_000;
const CAP_SECONDS = 40;
const SLICE_EVALUATIONS = 250;
const WARM_UP_EVALUATIONS = 1_000;
/** The stated error: 0.25 mm RMS on a target about 100 mm across (the demo's own four-bar follows it to 0.071 mm). */
const REACH_RMS_MM = 0.25;
/** The family the peers search, and how often their best is read. */
const PEER_FAMILY: FamilyId = 'fourbar';
const PEER_CHECKPOINT_EVALUATIONS = 250;


interface FamilyRun {
  readonly evaluations: number;
  readonly seconds: number;
  readonly cpuSeconds: number;
  readonly best: number | null;
  readonly reachS: number | null;
  readonly reachEvaluations: number | null;
}

function search(family: FamilyId, budget: number, capSeconds: number): FamilyRun {
  const made = Island.create({
    islandId: `bench-${family}`,
    objective: { kind: 'synthesis', problem: demoProblemFile(family, SAMPLES), family },
    seed: SEED,
    stream: 0,
    optimizer: { kind: 'hybrid' },
    maxEvaluations: budget,
    archiveCapacity: DEFAULT_ARCHIVE.capacity,
    archiveDistance: DEFAULT_ARCHIVE.distance,
  });
  if (!made.ok) throw new Error(`island ${family}: ${made.reason}`);
  const island = made.island;
  const now = () => performance.now();
  const cpu = () => {
    const used = process.cpuUsage();
    return (used.user + used.system) / 1e6;
  };
  const t0 = now();
  const c0 = cpu();
  let reachS: number | null = null;
  let reachEvaluations: number | null = null;
  let progress = island.step({ evaluations: SLICE_EVALUATIONS }, now);
  for (let slice = 0; slice < budget; slice++) {
    const feasible = progress.bestValue !== null && progress.bestViolation === 0;
    if (reachS === null && feasible && (progress.bestValue as number) <= REACH_RMS_MM) {
      reachS = (now() - t0) / 1000;
      reachEvaluations = progress.evaluations;
    }
    if (progress.stopReason !== null || (now() - t0) / 1000 >= capSeconds) break;
    progress = island.step({ evaluations: SLICE_EVALUATIONS }, now);
  }
  const seconds = (now() - t0) / 1000;
  const cpuSeconds = cpu() - c0;
  const feasible = progress.bestValue !== null && progress.bestViolation === 0;
  return { evaluations: progress.evaluations, seconds, cpuSeconds, best: feasible ? progress.bestValue : null, reachS, reachEvaluations };
}

export function benchFamilies(): Promise<Record<string, number | string | null>[]> {
  const rows: Record<string, number | string | null>[] = [];
  let fourBarRate: number | null = null;
  let fourBarCpuRate: number | null = null;
  for (const family of FAMILY_IDS) {
    search(family, WARM_UP_EVALUATIONS, CAP_SECONDS);
    const r = search(family, BUDGET_EVALUATIONS, CAP_SECONDS);
    const rate = r.evaluations / r.seconds;
    const cpuRate = r.evaluations / r.cpuSeconds;
    if (family === 'fourbar') {
      fourBarRate = rate;
      fourBarCpuRate = cpuRate;
    }
    rows.push({
      family,
      evalsPerS: rate,
      evalsPerSOverFourbarRatio: fourBarRate === null ? null : rate / fourBarRate,
      evalsPerCpuS: cpuRate,
      evalsPerCpuSOverFourbarRatio: fourBarCpuRate === null ? null : cpuRate / fourBarCpuRate,
      evaluations: r.evaluations,
      bestRmsMm: r.best,
      reachRmsMm: REACH_RMS_MM,
      reachS: r.reachS,
      reachEvaluations: r.reachEvaluations,
    });
  }
  rows.push(...peerRows(fourBarRate));
  return Promise.resolve(rows);
}

/** The peers on the four-bar's objective: one row each (null figures when a peer is not installed). */
function peerRows(fourBarRate: number | null): Record<string, number | string | null>[] {
  const parsed = parseProblemFile(demoProblemFile(PEER_FAMILY, SAMPLES));
  if (!parsed.ok) throw new Error(`bench: the demo problem does not parse: ${parsed.issues.map((i) => `${i.path}: ${i.message}`).join('; ')}`);
  const objective = createObjective(parsed.problem, PEER_FAMILY);
  const lib = loadOptimizationJs();
  const checkpoints = Array.from({ length: BUDGET_EVALUATIONS / PEER_CHECKPOINT_EVALUATIONS }, (_, k) => (k + 1) * PEER_CHECKPOINT_EVALUATIONS);
  return PEERS.map((peer) => {
    runPeerTrace(peer, lib, objective, SEED + 1_000_000, [WARM_UP_EVALUATIONS]);
    const trace = runPeerTrace(peer, lib, objective, SEED, checkpoints);
    const last = checkpoints.length - 1;
    const reached = trace === null ? -1 : trace.best.findIndex((best) => best <= REACH_RMS_MM);
    const rate = trace === null ? null : BUDGET_EVALUATIONS / trace.seconds[last];
    return {
      family: `${PEER_FAMILY}, peer ${peer}`,
      evalsPerS: rate,
      evalsPerSOverFourbarRatio: rate === null || fourBarRate === null ? null : rate / fourBarRate,
      evaluations: trace === null ? null : BUDGET_EVALUATIONS,
      bestRmsMm: trace === null || !(trace.best[last] < Infinity) ? null : trace.best[last],
      reachRmsMm: REACH_RMS_MM,
      reachS: trace === null || reached < 0 ? null : trace.seconds[reached],
      reachEvaluations: reached < 0 ? null : checkpoints[reached],
    };
  });
}
