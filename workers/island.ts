/**
 * One island of the search: an optimizer, the objective it minimises, and an archive of
 * the best distinct candidates it has evaluated. Everything it holds comes back from
 * `exportState()` as JSON, and `Island.restore` continues from that exactly: the same
 * state and the same slices give the same evaluations, bit for bit.
 */
import {
  canonicalInto,
  createOptimizer,
  MAX_STREAM,
  packState,
  PrefixViews,
  Restart,
  restoreOptimizer,
  RUN_EVALUATIONS_PER_VARIABLE,
  unpackState,
  type Optimizer,
  type OptimizerConfig,
} from '../src/core/optimize';
import { CandidateArchive, MAX_ARCHIVE_CAPACITY } from '../src/core/synthesis';
import {
  ISLAND_STATE_FORMAT,
  ISLAND_STATE_VERSION,
  type DescribedCandidate,
  type Individual,
  type IslandConfig,
  type IslandInfo,
  type IslandOptimizerConfig,
  type IslandProgress,
  type IslandState,
  type IslandStopReason,
  type StepSlice,
} from './api';
import { describeWith, type DescribeOutcome } from './describeDesigns';
import { toUnitImmigrants } from './migration';
import { objectiveError } from './objectiveError';
import { buildObjective, type ObjectiveResult } from './objective';
import type { SearchObjective } from './searchObjective';

type Made = { readonly ok: true; readonly island: Island } | { readonly ok: false; readonly reason: string };

/** A step ends after at most this many ask/tell rounds, whatever its slice says. */
const MAX_BATCHES_PER_STEP = 1_000_000;

function isObject(v: unknown): v is Record<string, unknown> {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}

function isIntegerIn(v: unknown, min: number, max: number): v is number {
  return typeof v === 'number' && Number.isInteger(v) && v >= min && v <= max;
}

/** What is wrong with an island configuration, or null. Checks the island's own fields; the optimizer checks its own. */
function checkConfig(config: unknown): string | null {
  if (!isObject(config)) return 'island config is not an object';
  const c = config as Partial<Record<keyof IslandConfig, unknown>>;
  if (!(typeof c.islandId === 'string' && c.islandId.length > 0)) return `islandId is ${JSON.stringify(c.islandId)}; expected a non-empty string`;
  if (!isIntegerIn(c.seed, 0, Number.MAX_SAFE_INTEGER)) return `seed is ${JSON.stringify(c.seed)}; expected a safe integer ≥ 0`;
  if (!isIntegerIn(c.stream, 0, MAX_STREAM)) return `stream is ${JSON.stringify(c.stream)}; expected an integer in [0, ${MAX_STREAM}]`;
  if (!isIntegerIn(c.maxEvaluations, 1, Number.MAX_SAFE_INTEGER)) return `maxEvaluations is ${JSON.stringify(c.maxEvaluations)}; expected an integer ≥ 1`;
  if (!isIntegerIn(c.archiveCapacity, 1, MAX_ARCHIVE_CAPACITY)) return `archiveCapacity is ${JSON.stringify(c.archiveCapacity)}; expected an integer in [1, ${MAX_ARCHIVE_CAPACITY}]`;
  if (!(typeof c.archiveDistance === 'number' && c.archiveDistance >= 0 && c.archiveDistance <= 1)) {
    return `archiveDistance is ${JSON.stringify(c.archiveDistance)}; expected a number in [0, 1] (box units)`;
  }
  if (!isObject(c.optimizer)) return 'optimizer is not an object; expected an optimizer configuration such as { "kind": "lshade" }';
  if (!isObject(c.objective)) return 'objective is not an object';
  return null;
}

/** What an island's optimizer is given besides its search: the problem's size, the island's budget and stream. */
export interface IslandOptimizerCommon {
  readonly dim: number;
  readonly maxEvaluations: number;
  readonly seed: number;
  readonly stream: number;
  readonly targetValue?: number;
}

/**
 * The island's optimizer: its configured search inside a restart scheme (restart.ts), so
 * a run that converges or stagnates starts afresh while the budget lasts. The first run
 * is 10,000 × D evaluations (the CEC scale of one search, RUN_EVALUATIONS_PER_VARIABLE)
 * and later runs grow with their populations, so a run that ends on time restarts as
 * often as one with an evaluation budget, and a night's later runs last as many
 * generations as its first. A configuration that is a restart scheme already is taken as
 * it is.
 */
export function islandOptimizerConfig(optimizer: IslandOptimizerConfig, common: IslandOptimizerCommon): OptimizerConfig {
  if (optimizer.kind === 'restart') return { ...optimizer, ...common } as OptimizerConfig;
  const runEvaluations = RUN_EVALUATIONS_PER_VARIABLE * common.dim;
  return { kind: 'restart', inner: optimizer, runEvaluations, growRuns: true, ...common } as OptimizerConfig;
}

/** A defensive, JSON-clean copy: what the island keeps of a configuration it is given. */
function copyConfig(config: IslandConfig): IslandConfig {
  return JSON.parse(JSON.stringify(config)) as IslandConfig;
}

export class Island {
  readonly config: IslandConfig;
  private readonly objective: SearchObjective;
  private optimizer: Optimizer;
  private readonly archive: CandidateArchive;
  private immigrants: Individual[];
  // Scratch, reused by every step.
  private readonly real: Float64Array;
  private readonly out = new Float64Array(2);
  /** `out[1]`, the violation the objective wrote, as `canonicalInto` reads it. */
  private readonly outViolation = this.out.subarray(1);
  /** A batch's values and violations, one view per batch size (a shrinking population changes it every generation). */
  private readonly values = new PrefixViews();
  private readonly violations = new PrefixViews();
  /** Per point of a batch, 1 where the search drops it if it is infeasible (evaluateInto); grown to the largest batch. */
  private dropped = new Uint8Array(0);

  private constructor(config: IslandConfig, objective: SearchObjective, optimizer: Optimizer, archive: CandidateArchive) {
    this.config = config;
    this.objective = objective;
    this.optimizer = optimizer;
    this.archive = archive;
    this.immigrants = [];
    this.real = new Float64Array(objective.dim);
  }

  /** `build` makes the objective from its spec; a test may pass one that wraps the real objective. */
  static create(input: IslandConfig, build: (spec: IslandConfig['objective']) => ObjectiveResult = buildObjective): Made {
    const problem = checkConfig(input);
    if (problem !== null) return { ok: false, reason: problem };
    const config = copyConfig(input);
    const built = build(config.objective);
    if (!built.ok) return { ok: false, reason: `objective: ${built.reason}` };
    const objective = built.objective;
    const made = createOptimizer(islandOptimizerConfig(config.optimizer, { dim: objective.dim, maxEvaluations: config.maxEvaluations, seed: config.seed, stream: config.stream }));
    if (!made.ok) return { ok: false, reason: `optimizer: ${made.reason}` };
    const archive = new CandidateArchive(config.archiveCapacity, config.archiveDistance, objective.lower, objective.upper);
    return { ok: true, island: new Island(config, objective, made.optimizer, archive) };
  }

  static restore(input: IslandState): Made {
    if (!isObject(input)) return { ok: false, reason: 'island state is not an object' };
    if (input.format !== ISLAND_STATE_FORMAT) return { ok: false, reason: `island state format is ${JSON.stringify(input.format)}; expected "${ISLAND_STATE_FORMAT}"` };
    // Version 1 differs from 2 only in entry counters this version ignores; 3 packs the optimizer state, which 1 and 2 hold plain.
    const version = input.version as number;
    if (!(version === 1 || version === 2 || version === ISLAND_STATE_VERSION)) {
      return { ok: false, reason: `island state version is ${JSON.stringify(input.version)}; expected 1, 2 or ${ISLAND_STATE_VERSION}` };
    }
    const made = Island.create(input.config);
    if (!made.ok) return made;
    const island = made.island;
    const unpacked = unpackState(input.optimizer);
    if (!unpacked.ok) return { ok: false, reason: `optimizer state: ${unpacked.reason}` };
    const restored = restoreOptimizer(unpacked.state);
    if (!restored.ok) return { ok: false, reason: `optimizer state: ${restored.reason}` };
    if (restored.optimizer.dim !== island.objective.dim) {
      return { ok: false, reason: `optimizer state has dim ${restored.optimizer.dim}; the objective has ${island.objective.dim}` };
    }
    island.optimizer = restored.optimizer;
    if (!(Array.isArray(input.archive) && input.archive.length <= island.archive.capacity)) {
      return { ok: false, reason: `archive is not an array of at most ${island.archive.capacity} entries` };
    }
    for (const [k, entry] of input.archive.entries()) {
      const problem = island.checkIndividual(entry);
      if (problem !== null) return { ok: false, reason: `archive[${k}]: ${problem}` };
      island.archive.offer(entry.x, entry.value, entry.violation);
    }
    if (!(Array.isArray(input.immigrants) && input.immigrants.length <= island.archive.capacity)) {
      return { ok: false, reason: `immigrants is not an array of at most ${island.archive.capacity} entries` };
    }
    for (const [k, immigrant] of input.immigrants.entries()) {
      const problem = island.checkIndividual(immigrant);
      if (problem !== null) return { ok: false, reason: `immigrants[${k}]: ${problem}` };
    }
    island.immigrants = input.immigrants.map(copyIndividual);
    return { ok: true, island };
  }

  info(): IslandInfo {
    const o = this.objective;
    return {
      islandId: this.config.islandId,
      dim: o.dim,
      variableNames: [...o.variableNames],
      lower: Array.from(o.lower),
      upper: Array.from(o.upper),
      evaluations: this.optimizer.evaluations(),
      stopReason: this.stopReason(),
    };
  }

  stopReason(): IslandStopReason | null {
    return this.optimizer.stopReason();
  }

  /** Runs whole ask/evaluate/tell batches until the slice is used up or the search stops. */
  step(slice: StepSlice, nowMs: () => number): IslandProgress {
    const startMs = nowMs();
    const maxEvaluations = 'evaluations' in slice ? slice.evaluations : Infinity;
    const maxMs = 'ms' in slice ? slice.ms : Infinity;
    const startEvaluations = this.optimizer.evaluations();
    let stepEvaluations = 0;
    const opt = this.optimizer;
    for (let batch = 0; batch < MAX_BATCHES_PER_STEP; batch++) {
      if (opt.done() || !(stepEvaluations < maxEvaluations)) break;
      if (batch > 0 && !(nowMs() - startMs < maxMs)) break;
      const points = opt.ask();
      const n = points.length;
      if (n === 0) break;
      const values = this.values.get(n);
      const violations = this.violations.get(n);
      const dropped = this.droppedFor(n);
      try {
        // The archive, offered each design as it is evaluated, must refuse an infeasible one too.
        for (let k = 0; k < n; k++) this.evaluateInto(points[k], k, values, violations, dropped[k] === 1 && !this.archive.takesInfeasible());
      } catch (error) {
        // this.real holds the design being evaluated when it threw.
        throw objectiveError(this.config.islandId, this.real, error);
      }
      opt.tell(points, values, violations);
      stepEvaluations += n;
      if (this.immigrants.length > 0) this.placeImmigrants();
    }
    const best = opt.best();
    const seen = opt.evaluations() > 0 && best.value < Infinity;
    let bestX: number[] | null = null;
    if (seen) bestX = Array.from(this.objective.fromSearchBoxInto(best.x, this.real));
    return {
      islandId: this.config.islandId,
      evaluations: opt.evaluations(),
      stepEvaluations: opt.evaluations() - startEvaluations,
      stepMs: nowMs() - startMs,
      bestValue: seen ? best.value : null,
      bestViolation: seen && best.violation < Infinity ? best.violation : null,
      bestX,
      stopReason: this.stopReason(),
      restarts: opt instanceof Restart ? opt.restarts() : 0,
    };
  }

  /** The `count` best distinct candidates of the archive. */
  emigrants(count: number): Individual[] {
    return this.archive.entries(count).map(toIndividual);
  }

  /** Places immigrants in the population now, or keeps them for when it can; returns how many were taken. */
  immigrate(individuals: readonly Individual[]): { accepted: number } | { reason: string } {
    if (!Array.isArray(individuals)) return { reason: 'immigrants is not an array' };
    for (const [k, individual] of individuals.entries()) {
      const problem = this.checkIndividual(individual);
      if (problem !== null) return { reason: `immigrants[${k}]: ${problem}` };
    }
    const capacity = this.archive.capacity;
    this.immigrants = [...individuals.map(copyIndividual), ...this.immigrants].slice(0, capacity);
    return { accepted: this.placeImmigrants() };
  }

  describe(designs: readonly (readonly number[])[]): DescribeOutcome {
    return describeWith(this.objective, designs);
  }

  topCandidates(count: number): DescribedCandidate[] {
    return this.archive.entries(count).map((entry) => ({ ...toIndividual(entry), detail: this.objective.describe(entry.x) }));
  }

  exportState(): IslandState {
    return {
      format: ISLAND_STATE_FORMAT,
      version: ISLAND_STATE_VERSION,
      config: copyConfig(this.config),
      optimizer: packState(this.optimizer.exportState()),
      archive: this.archive.entries().map(toIndividual),
      immigrants: this.immigrants.map(copyIndividual),
    };
  }

  /** For the batch just asked: 1 where the search drops point k if it is infeasible (Optimizer.infeasibleDroppedInto). */
  private droppedFor(n: number): Uint8Array {
    if (this.dropped.length < n) this.dropped = new Uint8Array(n);
    this.optimizer.infeasibleDroppedInto(this.dropped);
    return this.dropped;
  }

  private evaluateInto(u: Float64Array, k: number, values: Float64Array, violations: Float64Array, droppedIfInfeasible: boolean): void {
    const o = this.objective;
    const x = o.fromSearchBoxInto(u, this.real);
    o.evaluate(x, this.out, droppedIfInfeasible);
    // A fixed placement's design moved onto the placement that fits it (a refined free timing's
    // retimed too), where that ranks better.
    o.fitBetter?.(x, this.out);
    canonicalInto(this.out, this.outViolation, 0, values, violations, k);
    // The archive keeps x as evaluated: a repair the objective wrote back is part of the design.
    this.archive.offerAt(x, values, violations, k);
  }

  /** Moves waiting immigrants into the optimizer if it takes them now; drops them if it never will. */
  private placeImmigrants(): number {
    if (this.immigrants.length === 0) return 0;
    const placed = this.optimizer.takeImmigrants(toUnitImmigrants(this.objective, this.immigrants));
    if (placed.kind === 'later') return 0;
    this.immigrants = [];
    return placed.kind === 'placed' ? placed.accepted : 0;
  }

  private checkIndividual(v: unknown): string | null {
    if (!isObject(v)) return 'not an object { x, value, violation }';
    const dim = this.objective.dim;
    if (!(Array.isArray(v.x) && v.x.length === dim && v.x.every((c) => Number.isFinite(c)))) return `x is not an array of ${dim} finite numbers`;
    if (!this.archive.fits(v.x as number[])) return 'x lies outside the objective bounds';
    if (!(typeof v.value === 'number' && Number.isFinite(v.value))) return `value is ${JSON.stringify(v.value)}; expected a finite number`;
    if (!(typeof v.violation === 'number' && v.violation >= 0 && Number.isFinite(v.violation))) {
      return `violation is ${JSON.stringify(v.violation)}; expected a finite number ≥ 0`;
    }
    return null;
  }
}

function toIndividual(entry: { readonly x: ArrayLike<number>; readonly value: number; readonly violation: number }): Individual {
  return { x: Array.from(entry.x), value: entry.value, violation: entry.violation };
}

function copyIndividual(individual: Individual): Individual {
  return { x: [...individual.x], value: individual.value, violation: individual.violation };
}
