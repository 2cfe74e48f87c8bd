/**
 * Synthesis quality on the three published four-bar path-synthesis problems
 * (tests/reference/problems), on the objective the tests use: createObjective of the
 * problem file, family `fourbar-lengths`, value = sum of squared distances.
 *
 * Loci's search is one engine island (workers/island.ts, the loop every worker runs)
 * with the optimizer the CLI and the app give a job, `{ kind: 'hybrid' }`: L-SHADE for
 * 80 % of the budget, then Nelder–Mead polish. Its figures: the median and worst
 * best feasible value over the seeds at 1e4 and 1e5 evaluations (one run per budget,
 * since L-SHADE's population schedule depends on it); the evaluations and seconds one
 * run with a 2e5 budget needs to come within 1 % of the reference value (median over
 * the seeds; null if the median seed does not get there); evaluations per second in
 * this thread, and through the engine (4 islands, fresh workers) at 1 and 2 workers,
 * beside a control: how much faster two threads of plain arithmetic run than one on
 * this machine at this moment.
 *
 * Peers get the same objective and the same budgets, counted by a wrapper that throws a
 * sentinel once the budget is spent: `rs_minimize` and `minimize_Powell` of
 * optimization-js (bench/peers) and `nelderMead` of fmin. They search our unit box
 * [0, 1]^dim through the map to designs the islands use (the problem file's search map,
 * affine unless it names one) and minimise
 * value + PENALTY_WEIGHT × violation; points outside the box count as infeasible through
 * the objective's own bounds violation. Every optimizer is scored alike: the value of
 * the best feasible design it evaluated.
 *
 * An evaluation is one call of the objective on one design, whatever it computes inside
 * (the timing solve, every constraint, both branches where asked). Seeded throughout
 * (the peers' Math.random is replaced by the seeded generator while they run); an
 * untimed warm-up per case; every figure is printed after the timed regions, with a
 * checksum of the best values (the same for the same code and seeds).
 */
import { existsSync, readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { availableParallelism, loadavg } from 'node:os';
import { performance } from 'node:perf_hooks';
import { parseProblemFile } from '../src/core/io/problem';
import { Prng } from '../src/core/optimize';
import { createObjective, type Objective } from '../src/core/synthesis';
import { createRun } from '../src/engine';
import { nodeEnvironment } from '../src/engine/node';
import { DEFAULT_ARCHIVE } from '../src/engine/runSpec';
import { fmin } from '../tests/support/fmin';
import { Island } from '../workers/island';
import { spin } from './plainThreads';

/**
 * The cases of tests/reference/data/path-synthesis.json with its `reference_best`.
 * That file says what each is: line6 and closed18 the best an independent implementation
 * reached (not literature values), timed5 the floor the 3-decimal rounding of the
 * published points sets (Cabrera, Simon and Prado, 2002).
 */
const CASES: readonly { readonly id: string; readonly referenceBest: number }[] = [
  { id: 'line6-untimed', referenceBest: 6.6541334879459245e-9 },
  { id: 'timed5', referenceBest: 2.711e-7 },
  { id: 'closed18-untimed', referenceBest: 0.003156453671418713 },
];

const FAMILY = 'fourbar-lengths';
/** "Within 1 %" of the reference: value ≤ reference × (1 + this). */
const REFERENCE_SHARE = 0.01;
/** Peers minimise value + this × violation (violation: the objective's sum of normalised shares). */
const PENALTY_WEIGHT = 1e6;
/** What a peer sees for a design whose value is not finite. */
const FAILED_PENALISED_VALUE = 1e300;

export interface SynthesisBenchSettings {
  readonly seeds: number;
  /** Budgets of the quality figures, ascending; the peers run once to the last and are read at each. */
  readonly budgets: readonly number[];
  /** Budget of the run that looks for the reference. */
  readonly reachBudget: number;
  readonly warmupEvaluations: number;
  /** Engine rate runs: islands, evaluations and interleaved rounds (each worker count keeps its best). */
  readonly engineIslands: number;
  readonly engineEvaluations: number;
  readonly engineRounds: number;
  readonly cases: readonly string[];
}

export const DEFAULT_SYNTHESIS_SETTINGS: SynthesisBenchSettings = {
  seeds: 10,
  budgets: [10_000, 100_000],
  reachBudget: 200_000,
  warmupEvaluations: 5_000,
  engineIslands: 4,
  engineEvaluations: 400_000,
  engineRounds: 2,
  cases: CASES.map((c) => c.id),
};

/** One JSON line of the output. */
export type SynthesisRow = Record<string, string | number | null>;

// ---------------------------------------------------------------------------------------
// The peers (untyped JavaScript; only what is used here).

interface OptimizationJs {
  Real(low: number, high: number): unknown;
  OMGOptimizer(dimensions: unknown[], nRandomStarts?: number, mutationRate?: number): OmgOptimizer;
  rs_minimize(f: (x: number[]) => number, dimensions: unknown[], nCalls: number): { best_x: number[]; best_y: number };
  minimize_Powell(f: (x: number[]) => number, x0: number[]): unknown;
}

interface OmgOptimizer {
  X: number[][];
  Y: number[];
  best_x: number[];
  best_y: number;
  ask(): number[];
  tell(x: number[][], y: number[]): void;
}

const PEERS_DIR = new URL('./peers/', import.meta.url);

export function loadOptimizationJs(): OptimizationJs | null {
  if (!existsSync(new URL('node_modules/optimization-js/package.json', PEERS_DIR))) return null;
  return createRequire(new URL('package.json', PEERS_DIR))('optimization-js') as OptimizationJs;
}

export type PeerName = 'optimization-js rs_minimize' | 'optimization-js minimize_Powell' | 'fmin nelderMead';

/** Thrown by the counting wrapper once the budget is spent: how a peer with no cap of its own is stopped. */
class BudgetSpent extends Error {}

/**
 * A peer's view of the objective: unit-box coordinates in, penalised value out. Counts
 * evaluations, throws BudgetSpent past the budget, and records the best feasible value
 * at each checkpoint budget and the best penalised point (where a restart begins).
 */
class CountedObjective {
  count = 0;
  bestFeasible = Infinity;
  bestPenalised = Infinity;
  bestPoint: number[] = [];
  readonly atBudget: number[];
  /** Wall-clock seconds from the first evaluation's start to each checkpoint. */
  readonly secondsAt: number[];
  private startedAt = 0;
  private readonly unit: Float64Array;
  private readonly real: Float64Array;
  private readonly out = new Float64Array(2);
  private nextCheckpoint = 0;

  constructor(
    private readonly objective: Objective,
    private readonly checkpoints: readonly number[],
  ) {
    this.unit = new Float64Array(objective.dim);
    this.real = new Float64Array(objective.dim);
    this.atBudget = checkpoints.map(() => Infinity);
    this.secondsAt = checkpoints.map(() => Infinity);
  }

  readonly f = (x: number[]): number => {
    if (!(this.count < this.checkpoints[this.checkpoints.length - 1])) throw new BudgetSpent();
    if (this.count === 0) this.startedAt = performance.now();
    this.count++;
    const { objective, unit, real, out } = this;
    for (let j = 0; j < objective.dim; j++) unit[j] = x[j];
    objective.evaluate(objective.fromSearchBoxInto(unit, real), out);
    const value = out[0];
    const violation = out[1] > 0 ? out[1] : 0;
    if (violation <= 0 && value < this.bestFeasible) this.bestFeasible = value;
    const raw = value + PENALTY_WEIGHT * violation;
    const penalised = raw < Infinity ? raw : FAILED_PENALISED_VALUE;
    if (penalised < this.bestPenalised) {
      this.bestPenalised = penalised;
      this.bestPoint = x.slice();
    }
    while (this.nextCheckpoint < this.checkpoints.length && this.count === this.checkpoints[this.nextCheckpoint]) {
      this.secondsAt[this.nextCheckpoint] = (performance.now() - this.startedAt) / 1000;
      this.atBudget[this.nextCheckpoint++] = this.bestFeasible;
    }
    return penalised;
  };
}

/** Runs `body` with Math.random drawing from `rng`: the peers call Math.random and take no seed. */
function withSeededRandom<T>(rng: Prng, body: () => T): T {
  const original = Math.random;
  Math.random = () => rng.float();
  try {
    return body();
  } finally {
    Math.random = original;
  }
}

function uniformPoint(rng: Prng, dim: number): number[] {
  return Array.from({ length: dim }, () => rng.float());
}

/**
 * rs_minimize's loop, with the history it keeps cut to its best point after each tell.
 * Its ask reads only the first best of that history, so the points and values are the
 * same (checked by `checkRsDriver`); uncut, the history is concatenated on every tell and
 * scanned on every ask, which makes 1e5 calls quadratic in time.
 */
function rsDriver(lib: OptimizationJs, f: (x: number[]) => number, dim: number, calls: number): { best_x: number[]; best_y: number } {
  const dimensions = Array.from({ length: dim }, () => lib.Real(0, 1));
  const opt = lib.OMGOptimizer(dimensions);
  for (let call = 0; call < calls; call++) {
    const x = opt.ask();
    opt.tell([x], [f(x)]);
    opt.X = [opt.best_x];
    opt.Y = [opt.best_y];
  }
  return { best_x: opt.best_x, best_y: opt.best_y };
}

/** The cut-history driver must see exactly what rs_minimize itself does, for the same random stream. */
function checkRsDriver(lib: OptimizationJs, objective: Objective, calls: number): void {
  const plain = new CountedObjective(objective, [calls + 1]);
  const cut = new CountedObjective(objective, [calls + 1]);
  const a = withSeededRandom(Prng.fromSeed(99), () => lib.rs_minimize(plain.f, Array.from({ length: objective.dim }, () => lib.Real(0, 1)), calls));
  const b = withSeededRandom(Prng.fromSeed(99), () => rsDriver(lib, cut.f, objective.dim, calls));
  if (!Object.is(a.best_y, b.best_y) || a.best_x.some((v, j) => !Object.is(v, b.best_x[j]))) {
    throw new Error(`the rs_minimize driver differs from rs_minimize itself (${a.best_y} vs ${b.best_y})`);
  }
}

/** One peer run: the best feasible value at each checkpoint, and the seconds to each. */
export interface PeerTrace {
  readonly best: readonly number[];
  readonly seconds: readonly number[];
}

/**
 * One peer run to the last checkpoint; the best feasible value at each. Powell and
 * Nelder–Mead stop on their own convergence tests long before such budgets, so they are
 * restarted: from their best point when the last start improved it, else from a new
 * seeded uniform point. fmin's nelderMead runs with sigma = 1: its shrink step assigns
 * an undeclared variable and throws in strict mode (fmin 0.0.4), and sigma = 1 is its own
 * option to stop where it would shrink, which the restart then follows.
 */
function runPeer(peer: PeerName, lib: OptimizationJs | null, objective: Objective, seed: number, checkpoints: readonly number[]): readonly number[] | null {
  return runPeerTrace(peer, lib, objective, seed, checkpoints)?.best ?? null;
}

/** runPeer with the seconds to each checkpoint; null when the peer is not installed. */
export function runPeerTrace(peer: PeerName, lib: OptimizationJs | null, objective: Objective, seed: number, checkpoints: readonly number[]): PeerTrace | null {
  if (peer !== 'fmin nelderMead' && lib === null) return null;
  const counted = new CountedObjective(objective, checkpoints);
  const budget = checkpoints[checkpoints.length - 1];
  const rng = Prng.fromSeed(seed);
  const dim = objective.dim;
  try {
    withSeededRandom(rng, () => {
      if (peer === 'optimization-js rs_minimize') {
        rsDriver(lib as OptimizationJs, counted.f, dim, budget);
        return;
      }
      let start = uniformPoint(rng, dim);
      // Every start spends at least one evaluation, so this cap is never the one that stops.
      for (let restart = 0; restart <= budget; restart++) {
        const before = counted.bestPenalised;
        if (peer === 'optimization-js minimize_Powell') (lib as OptimizationJs).minimize_Powell(counted.f, start);
        else fmin.nelderMead(counted.f, start, { maxIterations: budget, minErrorDelta: 1e-15, sigma: 1 });
        start = counted.bestPenalised < before ? counted.bestPoint.slice() : uniformPoint(rng, dim);
      }
    });
  } catch (error) {
    if (!(error instanceof BudgetSpent)) throw error;
  }
  return { best: counted.atBudget, seconds: counted.secondsAt };
}

// ---------------------------------------------------------------------------------------
// Loci's search.

interface OurRun {
  readonly best: number;
  readonly evaluations: number;
  readonly seconds: number;
  readonly reachedTarget: boolean;
}

function runOurs(problemFile: unknown, seed: number, budget: number, targetValue: number | null): OurRun {
  const made = Island.create({
    islandId: 'bench',
    objective: { kind: 'synthesis', problem: problemFile, family: FAMILY },
    seed,
    stream: 0,
    optimizer: targetValue === null ? { kind: 'hybrid' } : { kind: 'hybrid', targetValue },
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
  return {
    best: feasible ? (progress.bestValue as number) : Infinity,
    evaluations: progress.evaluations,
    seconds,
    reachedTarget: progress.stopReason === 'target',
  };
}

/**
 * Evaluations per second of one engine run (fresh workers), in its steady state: from
 * the end of its first round to the end of its last, so the workers' JIT warm-up and
 * the final collection and description of candidates fall outside. Between those, the
 * rounds' messages, migration and archive merges are in.
 */
async function engineRate(problemFile: unknown, workers: number, s: SynthesisBenchSettings): Promise<{ evalsPerS: number; best: number }> {
  const made = createRun(
    nodeEnvironment(),
    {
      jobs: [{ id: 'bench', objective: { kind: 'synthesis', problem: problemFile, family: FAMILY }, seed: 1, islands: s.engineIslands, optimizer: { kind: 'hybrid' } }],
      budget: { evaluations: s.engineEvaluations },
      deterministic: true,
    },
    { workers, topK: 1 },
  );
  if (!made.ok) throw new Error(made.reason);
  const marks: { evaluations: number; ms: number }[] = [];
  made.run.onProgress((p) => {
    if (p.status === 'running' && p.rounds >= 1) marks.push({ evaluations: p.evaluations, ms: performance.now() });
  });
  const result = await made.run.start();
  if (!result.ok) throw new Error(result.reason);
  if (marks.length < 3) throw new Error(`bench: the engine run took ${marks.length} rounds; give it more evaluations to measure a steady rate`);
  const first = marks[0];
  const last = marks[marks.length - 1];
  return { evalsPerS: ((last.evaluations - first.evaluations) * 1000) / (last.ms - first.ms), best: result.candidates[0]?.value ?? NaN };
}

// ---------------------------------------------------------------------------------------
// Figures.

/** Median (mean of the two middle values for an even count); +Infinity stands for "not reached". */
function median(values: readonly number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  const mid = sorted.length >> 1;
  return sorted.length % 2 === 1 ? sorted[mid] : (sorted[mid - 1] + sorted[mid]) / 2;
}

/** A budget as the figure names carry it: 1e4, 1e5 (a power of ten), else the number. */
function budgetLabel(budget: number): string {
  const exponent = Math.round(Math.log10(budget));
  return 10 ** exponent === budget ? `1e${exponent}` : String(budget);
}

function finiteOrNull(value: number): number | null {
  return Number.isFinite(value) ? value : null;
}

function fmt(value: number | null): string {
  if (value === null || !Number.isFinite(value)) return 'null';
  if (Number.isInteger(value) && Math.abs(value) >= 1000) return Math.round(value).toLocaleString('en-GB');
  return Number(value.toPrecision(4)).toString();
}

export const PEERS: readonly PeerName[] = ['optimization-js rs_minimize', 'optimization-js minimize_Powell', 'fmin nelderMead'];

async function benchCase(caseId: string, referenceBest: number, lib: OptimizationJs | null, s: SynthesisBenchSettings): Promise<{ row: SynthesisRow; lines: string[]; checksum: number }> {
  const problemFile: unknown = JSON.parse(readFileSync(new URL(`../tests/reference/problems/${caseId}.json`, import.meta.url), 'utf8'));
  const parsed = parseProblemFile(problemFile);
  if (!parsed.ok) throw new Error(`${caseId}: ${parsed.issues.map((i) => `${i.path}: ${i.message}`).join('; ')}`);
  const objective = createObjective(parsed.problem, FAMILY);
  const seeds = Array.from({ length: s.seeds }, (_, k) => k + 1);
  const target = referenceBest * (1 + REFERENCE_SHARE);

  // Untimed warm-up: the search, the peers and the driver check, so the JIT has compiled the hot code.
  runOurs(problemFile, 1_000_001, s.warmupEvaluations, null);
  for (const peer of PEERS) runPeer(peer, lib, objective, 1_000_001, [s.warmupEvaluations]);
  if (lib !== null) checkRsDriver(lib, objective, 2_000);

  // Timed: each run measures itself; nothing is printed until all are done.
  const ours = s.budgets.map((budget) => seeds.map((seed) => runOurs(problemFile, seed, budget, null)));
  const reach = seeds.map((seed) => runOurs(problemFile, seed, s.reachBudget, target));
  const peers = PEERS.map((peer) => seeds.map((seed) => runPeer(peer, lib, objective, seed, s.budgets)));
  const rates = { one: 0, two: 0 };
  let engineBest: number | null = null;
  for (let round = 0; round < s.engineRounds; round++) {
    for (const workers of [1, 2] as const) {
      const r = await engineRate(problemFile, workers, s);
      if (engineBest !== null && !Object.is(engineBest, r.best)) {
        throw new Error(`${caseId}: the engine runs at 1 and 2 workers ended on different best values (${engineBest}, ${r.best}); the schedule is not deterministic`);
      }
      engineBest = r.best;
      if (workers === 1) rates.one = Math.max(rates.one, r.evalsPerS);
      else rates.two = Math.max(rates.two, r.evalsPerS);
    }
  }

  // Figures, after the timed regions.
  const oursMedian = ours.map((runs) => median(runs.map((r) => r.best)));
  const oursWorst = ours.map((runs) => Math.max(...runs.map((r) => r.best)));
  const evalsToReference = median(reach.map((r) => (r.reachedTarget ? r.evaluations : Infinity)));
  const secondsToReference = median(reach.map((r) => (r.reachedTarget ? r.seconds : Infinity)));
  const reached = reach.filter((r) => r.reachedTarget).length;
  const last = ours[ours.length - 1];
  const inThreadRate = last.reduce((sum, r) => sum + r.evaluations, 0) / last.reduce((sum, r) => sum + r.seconds, 0);
  const peerMedians = peers.map((runs) => (runs.some((r) => r === null) ? null : s.budgets.map((_, b) => median(runs.map((r) => (r as number[])[b])))));
  const ran = peerMedians.filter((m): m is number[] => m !== null);
  const peerBest = s.budgets.map((_, b) => (ran.length === 0 ? null : Math.min(...ran.map((m) => m[b]))));

  let checksum = 0;
  for (const runs of ours) for (const r of runs) if (Number.isFinite(r.best)) checksum += r.best;
  for (const runs of peers) for (const r of runs) for (const v of r ?? []) if (Number.isFinite(v)) checksum += v;

  const lines: string[] = [`${caseId}: dim ${objective.dim}, reference ${fmt(referenceBest)}, target ≤ ${fmt(target)}`];
  s.budgets.forEach((budget, b) => {
    lines.push(`  Loci hybrid at ${fmt(budget)}: median ${fmt(oursMedian[b])}, worst ${fmt(oursWorst[b])}`);
    PEERS.forEach((peer, p) => {
      const m = peerMedians[p];
      lines.push(`    ${peer.padEnd(32)} median ${m === null ? 'null (not installed)' : fmt(m[b])}`);
    });
  });
  const reachedEvaluations = reach.filter((r) => r.reachedTarget).map((r) => r.evaluations);
  const spread = reached === 0 ? '' : ` (those that did: ${fmt(Math.min(...reachedEvaluations))} to ${fmt(Math.max(...reachedEvaluations))} evaluations)`;
  lines.push(`  reference within ${REFERENCE_SHARE * 100} % reached by ${reached}/${s.seeds} seeds within ${fmt(s.reachBudget)}${spread}; median ${fmt(evalsToReference)} evaluations, ${fmt(secondsToReference)} s`);
  lines.push(`  evaluations/s: ${fmt(inThreadRate)} in this thread; engine ${fmt(rates.one)} at 1 worker, ${fmt(rates.two)} at 2 (ratio ${fmt(rates.two / rates.one)})`);

  const row: SynthesisRow = {
    case: caseId,
    reference_best: referenceBest,
    evals_to_reference: finiteOrNull(evalsToReference),
    seconds_to_reference: finiteOrNull(secondsToReference),
  };
  s.budgets.forEach((budget, b) => {
    row[`median_at_${budgetLabel(budget)}`] = finiteOrNull(oursMedian[b]);
  });
  s.budgets.forEach((budget, b) => {
    row[`peer_best_median_at_${budgetLabel(budget)}`] = finiteOrNull(peerBest[b] ?? Infinity);
  });
  row.evals_per_s_1_worker = finiteOrNull(rates.one);
  row.evals_per_s_2_workers = finiteOrNull(rates.two);
  return { row, lines, checksum };
}

/**
 * The control for the 2-worker target: the same fixed arithmetic in one thread and in two
 * at once (interleaved rounds, best of each). On an idle 2-core machine about 2; what
 * the rest of the machine's load leaves for a second thread otherwise.
 */
async function machineTwoThreadRatio(rounds: number): Promise<number> {
  let one = 0;
  let two = 0;
  for (let round = 0; round < rounds; round++) {
    one = Math.max(one, await spin(1));
    two = Math.max(two, await spin(2));
  }
  return two / one;
}

/** Whether each case met the targets, in words. */
function targetLines(rows: readonly SynthesisRow[], s: SynthesisBenchSettings): string[] {
  const lines = ['Targets:'];
  for (const row of rows) {
    const n = (key: string) => row[key] as number | null;
    const reach = n('evals_to_reference');
    lines.push(`  ${row.case}: reference within ${fmt(s.reachBudget)} evaluations (median seed): ${reach === null ? 'MISSED' : `met (${fmt(reach)})`}`);
    for (const budget of s.budgets) {
      const label = budgetLabel(budget);
      const ours = n(`median_at_${label}`);
      const peer = n(`peer_best_median_at_${label}`);
      let verdict: string;
      if (ours === null) verdict = 'MISSED (Loci found no feasible design at the median)';
      else if (peer === null) verdict = 'met (no peer found a feasible design at the median)';
      else {
        const reference = row.reference_best as number;
        const excess = `${fmt((ours - reference) / (peer - reference))} of the excess over the reference`;
        verdict = `${ours <= 0.1 * peer ? 'met' : 'MISSED'} (Loci/peer = ${fmt(ours / peer)} of the value, ${excess}; target ≤ 0.1 of the value)`;
      }
      lines.push(`  ${row.case}: median error at ${label} ≤ a tenth of the best peer's: ${verdict}`);
    }
    const one = n('evals_per_s_1_worker');
    const two = n('evals_per_s_2_workers');
    const ratio = one !== null && two !== null ? two / one : NaN;
    lines.push(`  ${row.case}: 2 workers ≥ 1.8 × 1 worker: ${ratio >= 1.8 ? 'met' : 'MISSED'} (${fmt(ratio)}×)`);
  }
  return lines;
}

export async function benchSynthesisWith(s: SynthesisBenchSettings): Promise<SynthesisRow[]> {
  if (s.budgets.length === 0 || s.seeds < 1) throw new Error('bench: expected at least one budget and one seed');
  const lib = loadOptimizationJs();
  if (lib === null) {
    console.log('optimization-js is not installed: install the peers with `npm --prefix bench/peers ci`; its figures are reported as null.');
  }
  const rows: SynthesisRow[] = [];
  // Rates depend on what else the machine runs: the load is part of the result.
  const report: string[] = [`${availableParallelism()} cores; 1-minute load average ${loadavg()[0].toFixed(2)} at the start`];
  let checksum = 0;
  for (const c of CASES.filter((k) => s.cases.includes(k.id))) {
    const { row, lines, checksum: sum } = await benchCase(c.id, c.referenceBest, lib, s);
    rows.push(row);
    report.push(...lines);
    checksum += sum;
  }
  const machineRatio = await machineTwoThreadRatio(s.engineRounds);
  report.push(`1-minute load average ${loadavg()[0].toFixed(2)} at the end`);
  report.push(`machine control: two threads of plain arithmetic run ${fmt(machineRatio)}× as fast as one (an idle 2-core machine: about 2)`);
  report.push(...targetLines(rows, s));
  report.push(`Peers search the unit box, minimising value + ${PENALTY_WEIGHT} × violation; all are scored by the best feasible value.`);
  report.push(`checksum of all best values: ${checksum}`);
  console.log(report.join('\n'));
  return rows;
}

export function benchSynthesis(): Promise<SynthesisRow[]> {
  return benchSynthesisWith(DEFAULT_SYNTHESIS_SETTINGS);
}
