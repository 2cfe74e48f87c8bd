/**
 * The ask/tell interface shared by every optimizer, its configuration and its JSON state.
 *
 * Frame: every optimizer searches the normalised box [0, 1]^dim. Points handed out by
 * `ask()` and taken by `tell()`, `best().x`, `x0` and every distance or tolerance on
 * points are in box units; the caller maps them to real bounds (`fromUnitBoxInto`).
 */
import type { JsonReal } from './codec';
import type { PrngState } from './prng';

export type StopReason =
  /** `maxEvaluations` points were asked and told. */
  | 'budget'
  /** A feasible point with value ≤ `targetValue` was found. */
  | 'target'
  /** The search cannot make progress: the population collapsed, or restarts stopped improving (a restart scheme turns this into a fresh run). */
  | 'converged';

export interface BestPoint {
  /** A copy, in box units. Before the first evaluation: the box centre. */
  readonly x: Float64Array;
  /** Ranked value: +Infinity for none yet or for a failed evaluation. */
  readonly value: number;
  /** 0 when feasible; +Infinity for none yet or a failed evaluation. */
  readonly violation: number;
}

export interface Optimizer {
  readonly dim: number;
  /**
   * The points to evaluate next, in box units: views of a buffer the optimizer reuses.
   * Read them, do not modify or keep them; they are valid until the next `tell()`.
   * Calling `ask()` again before `tell()` returns the same batch; after `done()`, none.
   */
  ask(): readonly Float64Array[];
  /**
   * The results for the batch of the last `ask()`, in its order. A value that is NaN or
   * ±Infinity marks a failed evaluation, which ranks worst. `violations` (≤ 0 feasible)
   * switches on feasibility-first ranking (Deb, 2000). Throws if `points` is not that batch.
   */
  tell(points: readonly Float64Array[], values: Float64Array, violations?: Float64Array): void;
  /**
   * For the batch of the last `ask()`: out[k] = 1 where point k, if it is infeasible, is
   * dropped whatever its value and violation (it must rank before a feasible point to be
   * kept, and nothing else this search keeps takes an infeasible point now), else 0. An
   * evaluation may then stop as soon as it knows point k infeasible and tell it with any
   * violation > 0: the search goes on as if it had been evaluated in full. This is the
   * early abandoning of a design that cannot beat the population (issue #13).
   */
  infeasibleDroppedInto(out: Uint8Array): void;
  best(): BestPoint;
  done(): boolean;
  /** Why the search stopped, or null while it runs. */
  stopReason(): StopReason | null;
  /** Points told so far; never more than `maxEvaluations`. */
  evaluations(): number;
  /** Plain JSON (no typed arrays, no Infinity): `JSON.parse(JSON.stringify(s))` restores exactly. */
  exportState(): OptimizerState;
  /**
   * Offers points evaluated elsewhere (migration between islands); see immigration.ts for
   * where each search takes them. They are copied, never kept. Call between a `tell()` and
   * the next `ask()`; the pending batch is unchanged. Throws if an immigrant is not a
   * point of the box with a finite value and violation (the caller checks what it receives).
   */
  takeImmigrants(immigrants: readonly Immigrant[]): Immigration;
}

/** A point evaluated elsewhere: box units, its ranked value and violation, both finite. */
export interface Immigrant {
  readonly u: ArrayLike<number>;
  readonly value: number;
  /** ≥ 0; 0 when feasible. */
  readonly violation: number;
}

export type Immigration =
  /** Placed now: `accepted` of them (0 or more) replaced members; the others are dropped. */
  | { readonly kind: 'placed'; readonly accepted: number }
  /** Not yet (the initial population is being evaluated): offer them again after a tell. */
  | { readonly kind: 'later' }
  /** Never: the search stopped, or is a local search an outside point would disturb. */
  | { readonly kind: 'never' };

// ---------------------------------------------------------------------------------------
// Configuration: what a caller writes (options may be left out) ...

export interface CommonConfig {
  /** Number of variables. */
  readonly dim: number;
  /** Budget: the optimizer asks for exactly this many evaluations, unless it stops earlier. */
  readonly maxEvaluations: number;
  /** Non-negative safe integer. */
  readonly seed: number;
  /** Independent stream of the seed (an island index): `Prng.fromSeed(seed).split(stream)`. */
  readonly stream?: number | null;
  /** Stop as soon as a feasible point has a value ≤ this. */
  readonly targetValue?: number | null;
}

export interface LshadeOptions {
  /** N_init; default round(18 · dim) (Tanabe and Fukunaga, 2014). */
  readonly initialPopulation: number;
  /** N_min reached at the end of the budget; default 4. */
  readonly minPopulation: number;
  /** H, entries of the success-history memory; default 6. */
  readonly memorySize: number;
  /** p of current-to-pbest: the best max(2, round(p · N)) are candidates; default 0.11. */
  readonly pBest: number;
  /** Archive size = round(archiveRate · N); default 2.6. */
  readonly archiveRate: number;
  /** Converged when every coordinate's range over the population is below this (box units); default 1e-12. */
  readonly xTolerance: number;
}

export interface RandOneBinOptions {
  /** NP; default 10 · dim, as Storn and Price (1997) advise; at least 4. */
  readonly population: number;
  /** F, the weight of the difference vector; default 0.8, within their advised [0.5, 1]. */
  readonly differentialWeight: number;
  /** CR, the binomial crossover probability; default 0.9. */
  readonly crossoverRate: number;
  /** As for L-SHADE; default 1e-12. */
  readonly xTolerance: number;
}

export interface NelderMeadOptions {
  /** Start point in box units; null: a uniform random point of the seed. */
  readonly x0: readonly number[] | null;
  /** Edge of the first simplex along each axis, box units, in (0, 0.5]; default 0.1. */
  readonly initialStep: number;
  /** Restart when every vertex is within this of the best one (∞-norm, box units); default 1e-10. */
  readonly simplexTolerance: number;
  /** Restart when worst − best ≤ this · max(|best|, |worst|) (relative); default 1e-12. */
  readonly valueTolerance: number;
  /** Each restart's simplex edge is the previous one times this; default 0.5. */
  readonly restartStepFactor: number;
  /** Below this edge the restart edge returns to `initialStep`; default 1e-6. */
  readonly minRestartStep: number;
  /** Converged after this many restarts in a row that did not improve the best; default 3. */
  readonly maxStaleRestarts: number;
}

export type GlobalOptions = ({ readonly kind: 'lshade' } & LshadeOptions) | ({ readonly kind: 'de-rand-1-bin' } & RandOneBinOptions);

export interface HybridOptions {
  /** Share of the budget for the global search; default DEFAULT_GLOBAL_SHARE (config.ts). */
  readonly globalShare: number;
  /** Number of distinct candidates polished; default 3. */
  readonly polishCount: number;
  /** Candidates are distinct when their RMS coordinate difference (box units) exceeds this; default 0.05. */
  readonly distinctDistance: number;
  /** Default L-SHADE with its defaults. */
  readonly global: GlobalOptions;
  /** Nelder–Mead options of each polish (`x0` is the candidate); default initialStep 0.02. */
  readonly polish: Omit<NelderMeadOptions, 'x0'>;
}

export type LshadeConfig = CommonConfig & { readonly kind: 'lshade' } & Partial<LshadeOptions>;
export type RandOneBinConfig = CommonConfig & { readonly kind: 'de-rand-1-bin' } & Partial<RandOneBinOptions>;
export type NelderMeadConfig = CommonConfig & { readonly kind: 'nelder-mead' } & Partial<NelderMeadOptions>;
export type HybridConfig = CommonConfig & {
  readonly kind: 'hybrid';
  readonly globalShare?: number;
  readonly polishCount?: number;
  readonly distinctDistance?: number;
  readonly global?:
    | ({ readonly kind: 'lshade' } & Partial<LshadeOptions>)
    | ({ readonly kind: 'de-rand-1-bin' } & Partial<RandOneBinOptions>);
  readonly polish?: Partial<Omit<NelderMeadOptions, 'x0'>>;
};
/**
 * A search that is not itself a restart scheme, less the fields the scheme fills in per
 * run; a target it carries is the scheme's when the scheme names none.
 */
export type InnerConfig = (LshadeConfig | RandOneBinConfig | NelderMeadConfig | HybridConfig) extends infer C
  ? C extends CommonConfig
    ? Omit<C, Exclude<keyof CommonConfig, 'targetValue'>>
    : never
  : never;

export interface RestartOptions {
  /** Each run's population is the previous run's times this (IPOP); default 2, in [1, 10]. */
  readonly populationGrowth: number;
  /** A run has stagnated when its best has not improved for this share of its budget; default 0.25. */
  readonly stallShare: number;
  /** A fresh run's start points are redrawn when within this RMS distance of a basin found (box units); default 0.05. */
  readonly avoidDistance: number;
  /** Draws per start point before the last one is taken near a basin anyway; default 32. */
  readonly avoidAttempts: number;
  /** Basins remembered (the best point of each finished run, oldest forgotten first); default 64. */
  readonly maxBasins: number;
  /** Budget of one run (the last gets what is left); null, the default: each run gets all that is left. */
  readonly runEvaluations: number | null;
  /**
   * Whether runEvaluations is the first run's budget only, each later run's being that
   * times its population's growth over the first's (IPOP's larger populations get as many
   * generations), a run taking all that is left when less than itself would remain after
   * it; default false (states written before it existed read as false: runs as they were).
   */
  readonly growRuns: boolean;
  /**
   * Shortest run per variable: once at most runEvaluations are left, they are split evenly
   * into as many runs of at least this × dim as fit, so a budget of several such runs is
   * spent in several searches rather than one; default 10 000; null: no split.
   */
  readonly runEvaluationsPerVariable: number | null;
  /**
   * Whether a run ranks a point within `avoidDistance` of a basin found by an earlier run
   * as infeasible (sequential niching), so the whole run, not only its start, keeps out
   * of the basins found; default true.
   */
  readonly penaliseBasins: boolean;
}

export type RestartConfig = CommonConfig & {
  readonly kind: 'restart';
  /** The search of each run; default L-SHADE with its defaults. */
  readonly inner?: InnerConfig;
} & Partial<RestartOptions>;
export type OptimizerConfig = LshadeConfig | RandOneBinConfig | NelderMeadConfig | HybridConfig | RestartConfig;

// ... and the same with every option filled in, as the state carries it.

export interface ResolvedCommon {
  readonly dim: number;
  readonly maxEvaluations: number;
  readonly seed: number;
  readonly stream: number | null;
  readonly targetValue: number | null;
}
export type ResolvedLshade = ResolvedCommon & { readonly kind: 'lshade' } & LshadeOptions;
export type ResolvedRandOneBin = ResolvedCommon & { readonly kind: 'de-rand-1-bin' } & RandOneBinOptions;
export type ResolvedDe = ResolvedLshade | ResolvedRandOneBin;
export type ResolvedNelderMead = ResolvedCommon & { readonly kind: 'nelder-mead' } & NelderMeadOptions;
export type ResolvedHybrid = ResolvedCommon & { readonly kind: 'hybrid' } & HybridOptions;
export type ResolvedInnerConfig = ResolvedDe | ResolvedNelderMead | ResolvedHybrid;
/** The inner search's options as the state carries them: resolved, less the per-run common fields. */
export type ResolvedInnerOptions = ResolvedInnerConfig extends infer C ? (C extends ResolvedCommon ? Omit<C, keyof ResolvedCommon> : never) : never;
export type ResolvedRestart = ResolvedCommon & { readonly kind: 'restart'; readonly inner: ResolvedInnerOptions } & RestartOptions;
export type ResolvedConfig = ResolvedInnerConfig | ResolvedRestart;

// ---------------------------------------------------------------------------------------
// State: plain JSON. Points are row-major number[]; ranked values and violations are
// JsonReal (null = +Infinity).

export const STATE_FORMAT = 'loci-optimizer-state';
export const STATE_VERSION = 1;

export interface BestPointState {
  readonly x: number[];
  readonly value: JsonReal;
  readonly violation: JsonReal;
  readonly seen: boolean;
}

export interface CandidateState {
  readonly x: number[];
  readonly value: JsonReal;
  readonly violation: JsonReal;
}

interface StateHeader<C> {
  readonly format: typeof STATE_FORMAT;
  readonly version: typeof STATE_VERSION;
  readonly config: C;
  readonly rng: PrngState;
  readonly evaluations: number;
  readonly stopReason: StopReason | null;
  readonly best: BestPointState;
}

export interface DeState extends StateHeader<ResolvedDe> {
  readonly kind: 'lshade' | 'de-rand-1-bin';
  /** 'init': the pending batch is the initial population. */
  readonly phase: 'init' | 'evolve';
  readonly populationSize: number;
  /** populationSize × dim. */
  readonly population: number[];
  readonly values: JsonReal[];
  readonly violations: JsonReal[];
  /** The batch asked and not yet told: pending × dim; ask() after a restore returns it. */
  readonly trials: number[];
  /** F and CR of each pending trial (L-SHADE; empty otherwise). */
  readonly trialF: number[];
  readonly trialCR: number[];
  /** L-SHADE external archive, archiveSize × dim. */
  readonly archive: number[];
  /** Success-history memories M_F and M_CR (−1 is the terminal value ⊥ of M_CR). */
  readonly memoryF: number[];
  readonly memoryCR: number[];
  readonly memoryIndex: number;
}

export type NelderMeadPhase = 'simplex' | 'reflect' | 'expand' | 'contract-outside' | 'contract-inside' | 'shrink';

export interface NelderMeadState extends StateHeader<ResolvedNelderMead> {
  readonly kind: 'nelder-mead';
  /** What the pending batch is: 'simplex' (new simplex) and 'shrink' refill vertices `pendingSlots`. */
  readonly phase: NelderMeadPhase;
  /** (dim + 1) × dim. */
  readonly vertices: number[];
  readonly values: JsonReal[];
  readonly violations: JsonReal[];
  /** Vertex indices, best first. */
  readonly order: number[];
  readonly centroid: number[];
  readonly reflected: number[];
  readonly reflectedValue: JsonReal;
  readonly reflectedViolation: JsonReal;
  /** The pending batch, rows × dim. */
  readonly pending: number[];
  readonly pendingSlots: number[];
  readonly restarts: number;
  readonly staleRestarts: number;
  /** Edge of the next restart's simplex, box units. */
  readonly restartStep: number;
  /** The best when the current simplex was built: a restart that does not beat it is stale. */
  readonly restartBaseValue: JsonReal;
  readonly restartBaseViolation: JsonReal;
}

export interface HybridState extends StateHeader<ResolvedHybrid> {
  readonly kind: 'hybrid';
  readonly phase: 'global' | 'polish';
  /** The global search while it runs, then null. */
  readonly global: DeState | null;
  /** The best distinct points of the global phase (see DistinctElite), best first: polished in this order. */
  readonly candidates: CandidateState[];
  /** Index of the candidate being polished. */
  readonly polishIndex: number;
  readonly polish: NelderMeadState | null;
}

export type InnerState = DeState | NelderMeadState | HybridState;

export interface RestartState extends StateHeader<ResolvedRestart> {
  readonly kind: 'restart';
  /** Runs started after the first. */
  readonly restarts: number;
  /** Evaluations of the finished runs; `evaluations` less the current run's. */
  readonly pastEvaluations: number;
  /** The best point of the finished runs. */
  readonly pastBest: BestPointState;
  /** Best points of finished runs, oldest first, count × dim (box units): fresh runs start away from them. */
  readonly basins: number[];
  /** The current run's best when it last improved, and the scheme's evaluations then (for stagnation). */
  readonly runBestValue: JsonReal;
  readonly runBestViolation: JsonReal;
  readonly improvedAt: number;
  readonly inner: InnerState;
}

export type OptimizerState = InnerState | RestartState;

export type OptimizerResult = { readonly ok: true; readonly optimizer: Optimizer } | { readonly ok: false; readonly reason: string };
