/**
 * A restart scheme around any other search, so a budget is spent to the end: when a run
 * converges (its stop reason), stagnates (its best unchanged for `stallShare` of its
 * budget) or spends its own budget, a fresh run starts with the evaluations left, on a
 * fresh generator, with a larger population, its start points redrawn away from the
 * basins found so far (the best point of each finished run, rejection sampling within
 * `avoidDistance`) and, with `penaliseBasins`, every point it tries within that distance
 * of one ranked infeasible. Increasing population restarts as in IPOP (Auger and Hansen,
 * 2005, "A restart CMA evolution strategy with increasing population size").
 *
 * A run's own budget: `runEvaluations` while more than that is left; then what is left,
 * split evenly into as many runs of at least `runEvaluationsPerVariable` × dim as fit.
 * With `growRuns`, `runEvaluations` is the first run's, each later run's is that times
 * its population's growth (a population g times larger gets g times the evaluations, so
 * every run lasts about as many generations), and a run takes all that is left when less
 * than itself would remain after it.
 * The first run is exactly the inner search as it would run alone with that budget (same
 * generator), so a budget too small for two runs gives the same bits with or without the
 * scheme while the run lasts.
 * Each later run's generator is seeded through SplitMix64 from 53 bits of the scheme's
 * own generator (a copy of the island's stream): a new jump stream clear of the other
 * islands' streams would cost 2^16 jumps per restart, and a nested `split` would land
 * on a sibling island's stream.
 */
import { encodeNumbers, encodeReal, fail, readInteger, readLength, readNumbers, readObject, readReal } from './codec';
import { maxPopulation, resolveConfig } from './config';
import { drawAwayInto } from './avoid';
import { checkImmigrants, IMMIGRATION_NEVER } from './immigration';
import { buildInner, restoreInner, type InnerOptimizer } from './inner';
import { PrefixViews } from './prefixViews';
import { Prng } from './prng';
import { BestTracker, precedes } from './ranking';
import { encodeBest, readBest, readHeader, writeHeader } from './state';
import type {
  BestPoint,
  Immigrant,
  Immigration,
  Optimizer,
  ResolvedInnerConfig,
  ResolvedInnerOptions,
  ResolvedRestart,
  RestartState,
  StopReason,
} from './types';

/** Restarts of one scheme at most; past this it stops 'converged' (a cap, never met by a sane budget). */
const MAX_RESTARTS = 1_000_000;
const TWO_POW_21 = 2097152;

/** Run r's population: `base` times growth^r, within the limits, never below `base`. */
function grownPopulation(base: number, growth: number, r: number, dim: number): number {
  const n = Math.round(base * growth ** r);
  return Math.max(base, n < maxPopulation(dim) ? n : maxPopulation(dim));
}

/** The first run's population (the global search's for a hybrid); null for Nelder–Mead, which has none. */
function firstPopulation(inner: ResolvedInnerOptions): number | null {
  switch (inner.kind) {
    case 'lshade':
      return inner.initialPopulation;
    case 'de-rand-1-bin':
      return inner.population;
    case 'hybrid':
      return inner.global.kind === 'lshade' ? inner.global.initialPopulation : inner.global.population;
    case 'nelder-mead':
      return null;
  }
}

/** The inner options of run `r`: populations times growth^r (within the limits), a free Nelder–Mead start. */
function grown(inner: ResolvedInnerOptions, growth: number, r: number, dim: number): Record<string, unknown> {
  switch (inner.kind) {
    case 'lshade':
      return { ...inner, initialPopulation: grownPopulation(inner.initialPopulation, growth, r, dim) };
    case 'de-rand-1-bin':
      return { ...inner, population: grownPopulation(inner.population, growth, r, dim) };
    case 'hybrid': {
      const g = inner.global;
      const global =
        g.kind === 'lshade'
          ? { ...g, initialPopulation: grownPopulation(g.initialPopulation, growth, r, dim) }
          : { ...g, population: grownPopulation(g.population, growth, r, dim) };
      return { ...inner, global };
    }
    case 'nelder-mead':
      return { ...inner, x0: null };
  }
}

/**
 * The budget of run `r`, which starts after `past` evaluations. With growRuns (an
 * island's scheme): runEvaluations times run r's population over the first run's, or all
 * that is left when less than that would remain after it. Without: runEvaluations when
 * more than that is left; otherwise what is left, split evenly into as many runs of at
 * least runEvaluationsPerVariable × dim as fit (one run when fewer than two fit). Either
 * way no run is cut short.
 */
function runBudget(config: ResolvedRestart, r: number, past: number): number {
  const left = config.maxEvaluations - past;
  if (config.runEvaluations !== null && config.growRuns) {
    const first = firstPopulation(config.inner);
    const growth = first === null ? 1 : grownPopulation(first, config.populationGrowth, r, config.dim) / first;
    const size = Math.ceil(config.runEvaluations * growth);
    return left - size >= size ? size : left;
  }
  if (config.runEvaluations !== null && config.runEvaluations < left) return config.runEvaluations;
  const perVariable = config.runEvaluationsPerVariable;
  const runs = perVariable === null ? 1 : Math.floor(left / (perVariable * config.dim));
  return runs > 1 ? Math.ceil(left / runs) : left;
}

export class Restart implements Optimizer {
  readonly dim: number;
  private readonly config: ResolvedRestart;
  private readonly rng: Prng;
  private inner: InnerOptimizer;
  private restartCount = 0;
  private pastEvaluations = 0;
  private readonly pastBest: BestTracker;
  /** Basin points, oldest first: `basinCount` × dim of a buffer for `maxBasins`. */
  private readonly basins: Float64Array;
  private basinCount = 0;
  private runBestValue = Infinity;
  private runBestViolation = Infinity;
  private improvedAt = 0;
  private stop: StopReason | null = null;
  /** The violations a run is told with `penaliseBasins`, one view per batch size. */
  private readonly penalised = new PrefixViews();
  /** `stallEvaluations()` of run `stallRun`: it changes only when a run starts, and is asked after every batch. */
  private stallRun = -1;
  private stallCount = 1;

  private constructor(config: ResolvedRestart, rng: Prng, inner: InnerOptimizer) {
    this.dim = config.dim;
    this.config = config;
    this.rng = rng;
    this.inner = inner;
    this.pastBest = new BestTracker(config.dim);
    this.basins = new Float64Array(config.maxBasins * config.dim);
  }

  /** A new scheme on `rng` (the island's stream); its first run uses a copy of that stream. */
  static create(config: ResolvedRestart, rng: Prng): Restart {
    const first = buildInner(Restart.innerConfig(config, 0, runBudget(config, 0, 0)), rng.clone());
    return new Restart(config, rng, first);
  }

  /** Restores an exported state; throws InvalidInput with what is wrong. */
  static fromState(o: Record<string, unknown>, where: string): Restart {
    const h = readHeader(o, where, ['restart'] as const);
    const config = h.config;
    const d = config.dim;
    const inner = restoreInner(readObject(o.inner, `${where}.inner`), `${where}.inner`);
    if (inner.dim !== d) fail(`${where}.inner.dim`, inner.dim, `the scheme's dim ${d}`);
    const innerKind = inner.exportState().kind;
    if (innerKind !== config.inner.kind) fail(`${where}.inner.kind`, innerKind, JSON.stringify(config.inner.kind));
    const scheme = new Restart(config, h.rng, inner);
    scheme.restartCount = readInteger(o.restarts, `${where}.restarts`, 0, MAX_RESTARTS);
    scheme.pastEvaluations = readInteger(o.pastEvaluations, `${where}.pastEvaluations`, 0, h.evaluations);
    if (scheme.pastEvaluations + inner.evaluations() !== h.evaluations) {
      fail(`${where}.pastEvaluations`, scheme.pastEvaluations, `evaluations − the current run's (${h.evaluations} − ${inner.evaluations()})`);
    }
    const past = readBest(o.pastBest, `${where}.pastBest`, d);
    if (past.seen) scheme.pastBest.offer(past.x, 0, past.value, past.violation);
    const basinEntries = readLength(o.basins, `${where}.basins`, config.maxBasins * d);
    if (basinEntries % d !== 0) fail(`${where}.basins`, o.basins, `a multiple of dim = ${d} entries`);
    readNumbers(o.basins, `${where}.basins`, basinEntries, 0, 1, scheme.basins);
    scheme.basinCount = basinEntries / d;
    scheme.runBestValue = readReal(o.runBestValue, `${where}.runBestValue`);
    scheme.runBestViolation = readReal(o.runBestViolation, `${where}.runBestViolation`);
    if (!(scheme.runBestViolation >= 0)) fail(`${where}.runBestViolation`, scheme.runBestViolation, 'a violation ≥ 0');
    scheme.improvedAt = readInteger(o.improvedAt, `${where}.improvedAt`, scheme.pastEvaluations, h.evaluations);
    scheme.stop = h.stopReason;
    if (h.stopReason === null && inner.done()) fail(`${where}.stopReason`, h.stopReason, "the scheme's stop reason, as its current run has stopped");
    return scheme;
  }

  /** Runs started after the first. */
  restarts(): number {
    return this.restartCount;
  }

  ask(): readonly Float64Array[] {
    return this.stop === null ? this.inner.ask() : [];
  }

  tell(points: readonly Float64Array[], values: Float64Array, violations?: Float64Array): void {
    if (this.stop !== null) throw new Error('tell after the restart scheme stopped');
    const inner = this.inner;
    inner.tell(points, values, this.config.penaliseBasins && this.basinCount > 0 ? this.penalise(points, violations) : violations);
    const total = this.pastEvaluations + inner.evaluations();
    const best = inner.bestSoFar();
    if (precedes(best.value, best.violation, this.runBestValue, this.runBestViolation)) {
      this.runBestValue = best.value;
      this.runBestViolation = best.violation;
      this.improvedAt = total;
    }
    const innerStop = inner.stopReason();
    if (innerStop === 'target') this.stop = 'target';
    else if (total >= this.config.maxEvaluations) this.stop = 'budget';
    else if (innerStop !== null || total - this.improvedAt >= this.stallEvaluations()) this.restart(best);
  }

  best(): BestPoint {
    const run = this.inner.best();
    const past = this.pastBest;
    if (!past.seen || !precedes(past.value, past.violation, run.value, run.violation)) return run;
    return { x: Float64Array.from(past.x), value: past.value, violation: past.violation };
  }

  done(): boolean {
    return this.stop !== null;
  }

  stopReason(): StopReason | null {
    return this.stop;
  }

  evaluations(): number {
    return this.pastEvaluations + this.inner.evaluations();
  }

  /** The current run's: the basins' penalty only adds to a violation, and every best kept is a run's. */
  infeasibleDroppedInto(out: Uint8Array): void {
    if (this.stop === null) this.inner.infeasibleDroppedInto(out);
  }

  /** Into the current run. The run's stagnation clock is left alone: it sees an immigrant as an improvement at the next tell, as it sees any. */
  takeImmigrants(immigrants: readonly Immigrant[]): Immigration {
    checkImmigrants(immigrants, this.dim);
    return this.stop === null ? this.inner.takeImmigrants(immigrants) : IMMIGRATION_NEVER;
  }

  exportState(): RestartState {
    // The header's best, for readers of the state; a restore takes it from the runs' bests.
    const overall = new BestTracker(this.dim);
    const best = this.best();
    if (this.evaluations() > 0) overall.offer(best.x, 0, best.value, best.violation);
    return {
      ...writeHeader(this.config, this.rng, this.evaluations(), this.stop, overall),
      kind: 'restart',
      restarts: this.restartCount,
      pastEvaluations: this.pastEvaluations,
      pastBest: encodeBest(this.pastBest),
      basins: encodeNumbers(this.basins, this.basinCount * this.dim),
      runBestValue: encodeReal(this.runBestValue),
      runBestViolation: encodeReal(this.runBestViolation),
      improvedAt: this.improvedAt,
      inner: this.inner.exportState(),
    };
  }

  /**
   * The batch's violations plus, for each point within avoidDistance of a basin, 1 − its
   * distance to the nearest basin over avoidDistance: derating near the optima found, as
   * in sequential niching (Beasley, Bull and Martin, 1993), ranked by feasibility first.
   */
  private penalise(points: readonly Float64Array[], violations: Float64Array | undefined): Float64Array {
    const n = points.length;
    const out = this.penalised.get(n);
    const d = this.dim;
    const basins = this.basins;
    const radius = this.config.avoidDistance;
    for (let k = 0; k < n; k++) {
      const p = points[k];
      let nearest = Infinity;
      for (let b = 0; b < this.basinCount; b++) {
        let sum = 0;
        for (let j = 0; j < d; j++) {
          const t = p[j] - basins[b * d + j];
          sum += t * t;
        }
        if (sum < nearest) nearest = sum;
      }
      const distance = Math.sqrt(nearest / d);
      const base = violations === undefined ? 0 : violations[k];
      // NaN distance (a NaN coordinate) takes no penalty: the point ranks as its value says.
      out[k] = distance < radius ? (base > 0 ? base : 0) + 1 - distance / radius : base;
    }
    return out;
  }

  /** Evaluations without improvement after which the current run has stagnated. */
  private stallEvaluations(): number {
    if (this.stallRun !== this.restartCount) {
      this.stallCount = Math.max(1, Math.ceil(this.config.stallShare * runBudget(this.config, this.restartCount, this.pastEvaluations)));
      this.stallRun = this.restartCount;
    }
    return this.stallCount;
  }

  private static innerConfig(config: ResolvedRestart, r: number, maxEvaluations: number): ResolvedInnerConfig {
    const { dim, seed, stream, targetValue } = config;
    const options = grown(config.inner, config.populationGrowth, r, dim);
    // Through resolveConfig, so the run's config has the field order a restored one has.
    return resolveConfig({ ...options, dim, maxEvaluations, seed, stream, targetValue }) as ResolvedInnerConfig;
  }

  /** Ends the current run (its best becomes a basin) and starts the next with the evaluations left. */
  private restart(runBest: Readonly<BestPoint>): void {
    if (this.restartCount >= MAX_RESTARTS) {
      this.stop = 'converged';
      return;
    }
    const d = this.dim;
    if (runBest.value < Infinity) {
      this.pastBest.offer(runBest.x, 0, runBest.value, runBest.violation);
      if (this.config.maxBasins > 0) {
        if (this.basinCount === this.config.maxBasins) {
          this.basins.copyWithin(0, d, this.basinCount * d);
          this.basinCount--;
        }
        this.basins.set(runBest.x, this.basinCount * d);
        this.basinCount++;
      }
    }
    this.pastEvaluations += this.inner.evaluations();
    this.restartCount++;
    const rng = Prng.fromSeed(this.rng.nextUint32() * TWO_POW_21 + (this.rng.nextUint32() >>> 11));
    const avoid = { points: this.basins, count: this.basinCount, radius: this.config.avoidDistance, attempts: this.config.avoidAttempts };
    let config = Restart.innerConfig(this.config, this.restartCount, runBudget(this.config, this.restartCount, this.pastEvaluations));
    if (config.kind === 'nelder-mead') {
      const x0 = new Float64Array(d);
      drawAwayInto(rng, x0, 0, d, avoid);
      config = { ...config, x0: Array.from(x0) };
    }
    this.inner = buildInner(config, rng, avoid);
    this.runBestValue = Infinity;
    this.runBestViolation = Infinity;
    this.improvedAt = this.pastEvaluations;
  }
}
