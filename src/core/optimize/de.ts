/**
 * Differential evolution in the box [0, 1]^dim, in two strategies:
 * - 'de-rand-1-bin': DE/rand/1/bin with fixed F and CR (Storn and Price, 1997);
 * - 'lshade': current-to-pbest/1/bin with an external archive, success-history
 *   adaptation of F and CR and linear population size reduction (L-SHADE; Tanabe and
 *   Fukunaga, 2014, "Improving the search performance of SHADE using linear
 *   population size reduction").
 * A mutant coordinate outside the box is repaired to the midpoint between the bound and
 * the parent, (bound + parent) / 2, as in L-SHADE. Selection is one-to-one, a trial
 * replacing its parent when it ranks no worse (feasibility first, see ranking.ts).
 *
 * Buffers are allocated once, at the largest population: the population and its
 * spare (for the reduction), the trial batch, the archive and the success lists. One
 * generation is one batch; the last batch is cut short so the budget is met exactly.
 */
import { drawAwayInto, type Avoidance } from './avoid';
import { BatchOptimizerBase } from './base';
import { PointBatch } from './batch';
import { encodeNumbers, encodeReals, fail, readInteger, readLength, readLiteral, readNumbers, readReals, readViolations } from './codec';
import { checkImmigrants, IMMIGRATION_LATER, IMMIGRATION_NEVER, rankImmigrants, replaceWorst } from './immigration';
import type { Prng } from './prng';
import { BestTracker, canonicalInto, precedesAt, rankInto } from './ranking';
import { readHeader, targetOrBudget, writeHeader } from './state';
import type { DeState, Immigrant, Immigration, Optimizer, ResolvedDe, StopReason } from './types';

/** Cauchy scale of F and normal deviation of CR around a memory entry (Tanabe and Fukunaga, 2014). */
const F_SCALE = 0.1;
const CR_DEVIATION = 0.1;
/** The terminal value ⊥ of M_CR: CR is 0 from then on for that entry. */
const TERMINAL_CR = -1;
/** L-SHADE redraws F until it is positive; after this many draws it takes `FALLBACK_F`. */
const F_DRAW_CAP = 64;
const FALLBACK_F = 0.5;
/** Rejection draws for an index distinct from up to three others (each fails with p ≤ 3/4). */
const PICK_CAP = 64;

export class DifferentialEvolution extends BatchOptimizerBase implements Optimizer {
  readonly dim: number;
  private readonly config: ResolvedDe;
  private readonly rng: Prng;
  private readonly lshade: boolean;
  private populationSize: number;
  private population: Float64Array;
  private spare: Float64Array;
  private values: Float64Array;
  private spareValues: Float64Array;
  private violations: Float64Array;
  private spareViolations: Float64Array;
  private readonly trialF: Float64Array;
  /** The told batch's canonical values and violations, for `BestTracker.offerAt`. */
  private readonly toldValues: Float64Array;
  private readonly toldViolations: Float64Array;
  private readonly trialCR: Float64Array;
  /** One uniform per coordinate for the crossover of one trial, drawn as a block. */
  private readonly uniforms: Float64Array;
  /** A normal (for CR) and a Cauchy (for F) deviate per L-SHADE trial of a generation, drawn as blocks. */
  private readonly normals: Float64Array;
  private readonly cauchys: Float64Array;
  private readonly order: Int32Array;
  private readonly orderScratch: Int32Array;
  private readonly archive: Float64Array;
  private archiveSize = 0;
  private readonly memoryF: Float64Array;
  private readonly memoryCR: Float64Array;
  private memoryIndex = 0;
  private readonly successF: Float64Array;
  private readonly successCR: Float64Array;
  private readonly successGain: Float64Array;
  private phase: 'init' | 'evolve' = 'init';
  /** DE/rand/1/bin's F and CR, read by each trial (not passed: a double passed to a call not inlined is boxed). */
  private readonly differentialWeight: number;
  private readonly crossoverRate: number;

  private constructor(config: ResolvedDe, rng: Prng, evaluations: number, stop: StopReason | null, best: BestTracker) {
    // One generation is one batch: room for the whole (initial) population.
    super(evaluations, stop, best, new PointBatch(config.dim, config.kind === 'lshade' ? config.initialPopulation : config.population));
    const d = config.dim;
    this.dim = d;
    this.config = config;
    this.rng = rng;
    this.lshade = config.kind === 'lshade';
    this.differentialWeight = config.kind === 'de-rand-1-bin' ? config.differentialWeight : 0;
    this.crossoverRate = config.kind === 'de-rand-1-bin' ? config.crossoverRate : 0;
    const capacity = config.kind === 'lshade' ? config.initialPopulation : config.population;
    this.populationSize = capacity;
    this.population = new Float64Array(capacity * d);
    this.spare = new Float64Array(capacity * d);
    this.values = new Float64Array(capacity).fill(Infinity);
    this.spareValues = new Float64Array(capacity);
    this.violations = new Float64Array(capacity).fill(Infinity);
    this.spareViolations = new Float64Array(capacity);
    this.trialF = new Float64Array(capacity);
    this.toldValues = new Float64Array(capacity);
    this.toldViolations = new Float64Array(capacity);
    this.trialCR = new Float64Array(capacity);
    this.uniforms = new Float64Array(d);
    this.normals = new Float64Array(config.kind === 'lshade' ? capacity : 0);
    this.cauchys = new Float64Array(config.kind === 'lshade' ? capacity : 0);
    this.order = new Int32Array(capacity);
    this.orderScratch = new Int32Array(capacity);
    const archiveCapacity = config.kind === 'lshade' ? Math.round(config.archiveRate * capacity) : 0;
    this.archive = new Float64Array(archiveCapacity * d);
    const memorySize = config.kind === 'lshade' ? config.memorySize : 0;
    this.memoryF = new Float64Array(memorySize).fill(0.5);
    this.memoryCR = new Float64Array(memorySize).fill(0.5);
    const successCapacity = this.lshade ? capacity : 0;
    this.successF = new Float64Array(successCapacity);
    this.successCR = new Float64Array(successCapacity);
    this.successGain = new Float64Array(successCapacity);
  }

  /**
   * A new search; `rng` is owned by it from now on. Draws the initial population
   * uniformly, each member away from the basins of `avoid` when it is given.
   */
  static create(config: ResolvedDe, rng: Prng, avoid?: Avoidance): DifferentialEvolution {
    const de = new DifferentialEvolution(config, rng, 0, null, new BestTracker(config.dim));
    const pop = de.population;
    if (avoid === undefined) for (let k = 0; k < pop.length; k++) pop[k] = rng.float();
    else for (let at = 0; at < pop.length; at += de.dim) drawAwayInto(rng, pop, at, de.dim, avoid);
    const count = Math.min(de.populationSize, config.maxEvaluations);
    de.batch.begin().set(pop.subarray(0, count * de.dim));
    de.batch.commit(count);
    return de;
  }

  /** Restores an exported state; throws InvalidInput with what is wrong. */
  static fromState(o: Record<string, unknown>, where: string): DifferentialEvolution {
    const h = readHeader(o, where, ['lshade', 'de-rand-1-bin'] as const);
    const config = h.config;
    const de = new DifferentialEvolution(config, h.rng, h.evaluations, h.stopReason, h.best);
    const d = config.dim;
    const capacity = de.populationSize;
    de.phase = readLiteral(o.phase, `${where}.phase`, ['init', 'evolve'] as const);
    const minSize = config.kind === 'lshade' ? config.minPopulation : capacity;
    const n = readInteger(o.populationSize, `${where}.populationSize`, minSize, capacity);
    de.populationSize = n;
    readNumbers(o.population, `${where}.population`, n * d, 0, 1, de.population);
    readReals(o.values, `${where}.values`, n, de.values);
    readViolations(o.violations, `${where}.violations`, n, de.violations);
    const pendingEntries = readLength(o.trials, `${where}.trials`, n * d);
    if (pendingEntries % d !== 0) fail(`${where}.trials`, o.trials, `a multiple of dim = ${d} entries`);
    const pending = pendingEntries / d;
    if (pending + h.evaluations > config.maxEvaluations) fail(`${where}.trials`, o.trials, 'no more points than the budget leaves');
    if ((pending === 0) !== (h.stopReason !== null)) fail(`${where}.trials`, o.trials, 'a pending batch exactly while the search runs');
    const buffer = de.batch.begin();
    readNumbers(o.trials, `${where}.trials`, pending * d, 0, 1, buffer);
    de.batch.commit(pending);
    if (config.kind === 'lshade') {
      readNumbers(o.trialF, `${where}.trialF`, pending, 0, 1, de.trialF);
      readNumbers(o.trialCR, `${where}.trialCR`, pending, 0, 1, de.trialCR);
      const cap = Math.round(config.archiveRate * n);
      const archiveEntries = readLength(o.archive, `${where}.archive`, cap * d);
      if (archiveEntries % d !== 0) fail(`${where}.archive`, o.archive, `a multiple of dim = ${d} entries`);
      de.archiveSize = archiveEntries / d;
      readNumbers(o.archive, `${where}.archive`, archiveEntries, 0, 1, de.archive);
      readNumbers(o.memoryF, `${where}.memoryF`, config.memorySize, 0, 1, de.memoryF);
      readNumbers(o.memoryCR, `${where}.memoryCR`, config.memorySize, TERMINAL_CR, 1, de.memoryCR);
      de.memoryIndex = readInteger(o.memoryIndex, `${where}.memoryIndex`, 0, config.memorySize - 1);
    }
    return de;
  }

  tell(points: readonly Float64Array[], values: Float64Array, violations?: Float64Array): void {
    const count = this.received(points, values, violations);
    if (count === 0) return;
    const batch = this.batch;
    const d = this.dim;
    const trials = batch.data;
    const pop = this.population;
    const fit = this.values;
    const viol = this.violations;
    const best = this.bestPoint;
    const toldValues = this.toldValues;
    const toldViolations = this.toldViolations;
    let successes = 0;
    for (let i = 0; i < count; i++) {
      canonicalInto(values, violations, i, toldValues, toldViolations, i);
      const v = toldValues[i];
      const c = toldViolations[i];
      best.offerAt(trials, i * d, toldValues, toldViolations, i);
      const parentValue = fit[i];
      const parentViolation = viol[i];
      if (this.phase === 'evolve') {
        if (precedesAt(fit, viol, i, toldValues, toldViolations, i)) continue;
        if (this.lshade && precedesAt(toldValues, toldViolations, i, fit, viol, i)) {
          this.archiveParent(i);
          this.successF[successes] = this.trialF[i];
          this.successCR[successes] = this.trialCR[i];
          this.successGain[successes] = parentViolation > c ? parentViolation - c : parentValue - v;
          successes++;
        }
        const row = i * d;
        for (let j = 0; j < d; j++) pop[row + j] = trials[row + j];
      }
      fit[i] = v;
      viol[i] = c;
    }
    this.evaluationsTold += count;
    let ranked = false;
    if (this.phase === 'evolve' && this.lshade) {
      this.updateMemory(successes);
      ranked = this.reducePopulation();
    }
    this.phase = 'evolve';
    const { targetValue, maxEvaluations, xTolerance } = this.config;
    this.stop = targetOrBudget(best, targetValue, this.evaluationsTold, maxEvaluations);
    if (this.stop === null && this.collapsed(xTolerance)) this.stop = 'converged';
    if (this.stop === null) this.prepareGeneration(ranked);
    else batch.clear();
  }

  /** A trial meets its parent one to one: an infeasible trial is dropped wherever its parent is feasible (the initial population keeps every point). */
  infeasibleDroppedInto(out: Uint8Array): void {
    const count = this.batch.count;
    const parents = this.violations;
    const evolving = this.phase === 'evolve';
    for (let k = 0; k < count; k++) out[k] = evolving && parents[k] <= 0 ? 1 : 0;
  }

  takeImmigrants(immigrants: readonly Immigrant[]): Immigration {
    checkImmigrants(immigrants, this.dim);
    if (this.stop !== null) return IMMIGRATION_NEVER;
    if (this.phase === 'init') return IMMIGRATION_LATER;
    return { kind: 'placed', accepted: this.placeRanked(rankImmigrants(immigrants)) };
  }

  /** Whether the pending batch is the initial population (which takes no immigrants yet). */
  initialising(): boolean {
    return this.phase === 'init';
  }

  /**
   * Places checked immigrants, best first, over the worst members (immigration.ts), and
   * makes the best placed one the best point if it ranks before it; returns how many it
   * placed. The pending trials stay as they are: each meets its new parent when told.
   */
  placeRanked(ranked: readonly Immigrant[]): number {
    const accepted = replaceWorst(ranked, this.population, this.values, this.violations, this.populationSize, this.dim);
    if (accepted > 0) {
      const first = ranked[0];
      this.bestPoint.offer(Float64Array.from(first.u), 0, first.value, first.violation);
    }
    return accepted;
  }

  exportState(): DeState {
    const d = this.dim;
    const n = this.populationSize;
    const pending = this.batch.count;
    return {
      ...writeHeader(this.config, this.rng, this.evaluationsTold, this.stop, this.bestPoint),
      kind: this.config.kind,
      phase: this.phase,
      populationSize: n,
      population: encodeNumbers(this.population, n * d),
      values: encodeReals(this.values, n),
      violations: encodeReals(this.violations, n),
      trials: encodeNumbers(this.batch.data, pending * d),
      trialF: this.lshade ? encodeNumbers(this.trialF, pending) : [],
      trialCR: this.lshade ? encodeNumbers(this.trialCR, pending) : [],
      archive: encodeNumbers(this.archive, this.archiveSize * d),
      memoryF: encodeNumbers(this.memoryF, this.memoryF.length),
      memoryCR: encodeNumbers(this.memoryCR, this.memoryCR.length),
      memoryIndex: this.memoryIndex,
    };
  }

  /**
   * Writes the next generation's trials, cut to the budget left, as the pending batch.
   * `ranked`: the population is in rank order already (just reduced), so `order` is the
   * identity, which is also what ranking it again would give.
   */
  private prepareGeneration(ranked: boolean): void {
    const n = this.populationSize;
    const count = Math.min(n, this.config.maxEvaluations - this.evaluationsTold);
    const trials = this.batch.begin();
    const config = this.config;
    if (config.kind === 'lshade') {
      if (!ranked) rankInto(this.order, this.orderScratch, n, this.values, this.violations);
      const pCount = Math.max(2, Math.round(config.pBest * n));
      this.rng.fillNormals(this.normals, count);
      this.rng.fillCauchy(this.cauchys, count);
      for (let i = 0; i < count; i++) this.currentToPBestTrial(trials, i, pCount);
    } else {
      for (let i = 0; i < count; i++) this.randOneBinTrial(trials, i);
    }
    this.batch.commit(count);
  }

  /** L-SHADE trial i: F and CR from a random memory entry, current-to-pbest/1 mutation, binomial crossover. */
  private currentToPBestTrial(trials: Float64Array, i: number, pCount: number): void {
    const rng = this.rng;
    const d = this.dim;
    const n = this.populationSize;
    const pop = this.population;
    const r = rng.int(this.memoryF.length);
    const memoryCR = this.memoryCR[r];
    let cr = 0;
    if (memoryCR >= 0) {
      cr = memoryCR + CR_DEVIATION * this.normals[i];
      cr = cr < 0 ? 0 : cr > 1 ? 1 : cr;
    }
    let f = this.memoryF[r] + F_SCALE * this.cauchys[i];
    if (!(f > 0)) {
      this.redrawF(i, r);
      f = this.trialF[i];
    }
    if (f > 1) f = 1;
    this.trialF[i] = f;
    this.trialCR[i] = cr;

    const pBest = this.order[rng.int(pCount)];
    const r1 = this.pick(n, i, -1, -1);
    const r2 = this.pick(n + this.archiveSize, i, r1, -1);
    const second = r2 < n ? pop : this.archive;
    const at2 = (r2 < n ? r2 : r2 - n) * d;
    const at = i * d;
    const atBest = pBest * d;
    const at1 = r1 * d;
    const jRand = rng.int(d);
    const u = this.uniforms;
    rng.fillFloats(u, d);
    for (let j = 0; j < d; j++) {
      const parent = pop[at + j];
      if (j === jRand || u[j] < cr) {
        let v = parent + f * (pop[atBest + j] - parent) + f * (pop[at1 + j] - second[at2 + j]);
        if (v < 0) v = parent * 0.5;
        else if (v > 1) v = (1 + parent) * 0.5;
        trials[at + j] = v;
      } else {
        trials[at + j] = parent;
      }
    }
  }

  /**
   * L-SHADE's redraws of a non-positive F for trial i from memory entry r, into
   * `trialF[i]` (not returned: a double returned from a call not inlined is boxed, and
   * this cold loop is kept out of the trial's code).
   */
  private redrawF(i: number, r: number): void {
    const memoryF = this.memoryF[r];
    let f = -1;
    for (let tries = 1; !(f > 0) && tries < F_DRAW_CAP; tries++) f = memoryF + F_SCALE * this.rng.cauchy();
    this.trialF[i] = f > 0 ? f : FALLBACK_F;
  }

  /** DE/rand/1/bin trial i: v = x_r1 + F (x_r2 − x_r3), binomial crossover with the parent. */
  private randOneBinTrial(trials: Float64Array, i: number): void {
    const f = this.differentialWeight;
    const cr = this.crossoverRate;
    const rng = this.rng;
    const d = this.dim;
    const n = this.populationSize;
    const pop = this.population;
    const r1 = this.pick(n, i, -1, -1);
    const r2 = this.pick(n, i, r1, -1);
    const r3 = this.pick(n, i, r1, r2);
    const at = i * d;
    const at1 = r1 * d;
    const at2 = r2 * d;
    const at3 = r3 * d;
    const jRand = rng.int(d);
    const u = this.uniforms;
    rng.fillFloats(u, d);
    for (let j = 0; j < d; j++) {
      const parent = pop[at + j];
      if (j === jRand || u[j] < cr) {
        let v = pop[at1 + j] + f * (pop[at2 + j] - pop[at3 + j]);
        if (v < 0) v = parent * 0.5;
        else if (v > 1) v = (1 + parent) * 0.5;
        trials[at + j] = v;
      } else {
        trials[at + j] = parent;
      }
    }
  }

  /** A uniform index in [0, range) other than a, b and c (−1 excludes nothing); range ≥ 4. */
  private pick(range: number, a: number, b: number, c: number): number {
    for (let tries = 0; tries < PICK_CAP; tries++) {
      const r = this.rng.int(range);
      if (r !== a && r !== b && r !== c) return r;
    }
    // Practically unreachable (p < (3/4)^64); at most three steps, as three indices are excluded.
    let r = 0;
    while (r === a || r === b || r === c) r++;
    return r;
  }

  /** Puts parent i into the archive; when it is full, over a random member. */
  private archiveParent(i: number): void {
    const config = this.config;
    if (config.kind !== 'lshade') return;
    const cap = Math.round(config.archiveRate * this.populationSize);
    if (cap < 1) return;
    const d = this.dim;
    const slot = this.archiveSize < cap ? this.archiveSize++ : this.rng.int(this.archiveSize);
    const archive = this.archive;
    const pop = this.population;
    for (let j = 0; j < d; j++) archive[slot * d + j] = pop[i * d + j];
  }

  /** L-SHADE memory update: weighted Lehmer means of the successful F and CR, weights = improvement. */
  private updateMemory(successes: number): void {
    if (successes === 0) return;
    const gain = this.successGain;
    let total = 0;
    for (let k = 0; k < successes; k++) total += gain[k];
    // An infinite or overflowing improvement (a failed parent) would make the weights NaN: weigh equally.
    const equal = !(total > 0 && total < Infinity);
    let sumF = 0;
    let sumF2 = 0;
    let sumCR = 0;
    let sumCR2 = 0;
    let maxCR = 0;
    for (let k = 0; k < successes; k++) {
      const w = equal ? 1 : gain[k];
      const f = this.successF[k];
      const cr = this.successCR[k];
      sumF += w * f;
      sumF2 += w * f * f;
      sumCR += w * cr;
      sumCR2 += w * cr * cr;
      if (cr > maxCR) maxCR = cr;
    }
    const h = this.memoryIndex;
    this.memoryF[h] = sumF2 / sumF;
    this.memoryCR[h] = this.memoryCR[h] < 0 || !(maxCR > 0) ? TERMINAL_CR : sumCR2 / sumCR;
    this.memoryIndex = (h + 1) % this.memoryF.length;
  }

  /**
   * Linear population size reduction: N = round(N_init + (N_min − N_init) · evaluations / budget),
   * dropping the worst. Returns whether it reduced (the population is then in rank order).
   */
  private reducePopulation(): boolean {
    const config = this.config;
    if (config.kind !== 'lshade') return false;
    const n = this.populationSize;
    const planned = Math.max(
      config.minPopulation,
      Math.round(config.initialPopulation + ((config.minPopulation - config.initialPopulation) * this.evaluationsTold) / config.maxEvaluations),
    );
    if (planned >= n) return false;
    const d = this.dim;
    rankInto(this.order, this.orderScratch, n, this.values, this.violations);
    const pop = this.population;
    const into = this.spare;
    for (let k = 0; k < planned; k++) {
      const src = this.order[k];
      for (let j = 0; j < d; j++) into[k * d + j] = pop[src * d + j];
      this.spareValues[k] = this.values[src];
      this.spareViolations[k] = this.violations[src];
      this.order[k] = k;
    }
    this.spare = pop;
    this.population = into;
    const values = this.values;
    this.values = this.spareValues;
    this.spareValues = values;
    const violations = this.violations;
    this.violations = this.spareViolations;
    this.spareViolations = violations;
    this.populationSize = planned;
    const cap = Math.round(config.archiveRate * planned);
    while (this.archiveSize > cap) {
      const victim = this.rng.int(this.archiveSize);
      const last = --this.archiveSize;
      this.archive.copyWithin(victim * d, last * d, (last + 1) * d);
    }
    return true;
  }

  /** Whether every coordinate's range over the population is below `tolerance` (box units). */
  private collapsed(tolerance: number): boolean {
    const n = this.populationSize;
    const d = this.dim;
    const pop = this.population;
    for (let j = 0; j < d; j++) {
      let lo = pop[j];
      let hi = lo;
      for (let i = 1; i < n; i++) {
        const x = pop[i * d + j];
        if (x < lo) lo = x;
        else if (x > hi) hi = x;
      }
      if (!(hi - lo < tolerance)) return false;
    }
    return true;
  }
}
