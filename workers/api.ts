/**
 * The search worker's API: what crosses the boundary between the engine and a worker.
 * Everything here is plain data (structured-clone and JSON safe: no class instances, no
 * typed arrays, no Infinity in anything stored), so the same calls work across comlink
 * in a browser Worker, a Node worker_threads worker, or in the same thread.
 *
 * A worker hosts any number of islands, each named by its `islandId`. Expected failures
 * (bad input, an unknown island) come back as `{ ok: false, reason }`.
 */
import type { OptimizerConfig, PackedOptimizerState } from '../src/core/optimize';
import type { LayoutKind } from '../src/core/suspension';
import type { CandidateReport, FamilyId, LegCandidateReport, SuspensionCandidateReport } from '../src/core/synthesis';
import type { TestFunctionName } from './testFunctionNames';

export type Failure = { readonly ok: false; readonly reason: string };
export type Outcome<T> = ({ readonly ok: true } & T) | Failure;

/** What an island searches. */
export type ObjectiveSpec =
  /**
   * A synthesis problem: `problem` is the problem file's JSON, read by
   * parseSynthesisProblemFile in the worker; `family` is a family of a path problem or a
   * layout of a suspension problem.
   */
  | { readonly kind: 'synthesis'; readonly problem: unknown; readonly family: FamilyId | LayoutKind }
  /** A published test function (workers/testFunctions.ts), for tests and benchmarks of the search itself. */
  | { readonly kind: 'test-function'; readonly name: TestFunctionName; readonly dim: number };

/** The optimizer of an island, less what the island fills in (dim, budget, seed, stream). */
export type IslandOptimizerConfig = OptimizerConfig extends infer C
  ? C extends OptimizerConfig
    ? Omit<C, 'dim' | 'maxEvaluations' | 'seed' | 'stream'>
    : never
  : never;

export interface IslandConfig {
  readonly islandId: string;
  readonly objective: ObjectiveSpec;
  /** Non-negative safe integer; the island's stream of it is `stream`. */
  readonly seed: number;
  /** Independent PRNG stream of the seed (`Prng.fromSeed(seed).split(stream)`), 0 … 65535. */
  readonly stream: number;
  readonly optimizer: IslandOptimizerConfig;
  /** This island's share of the run's budget, in evaluations. */
  readonly maxEvaluations: number;
  /** Capacity of the island's archive of distinct good candidates. */
  readonly archiveCapacity: number;
  /** Two candidates are distinct when their RMS coordinate difference, in box units (share of each bound's span), exceeds this. */
  readonly archiveDistance: number;
}

/** One evaluated design, in real coordinates (the objective's own units). */
export interface Individual {
  readonly x: number[];
  readonly value: number;
  /** 0 when feasible. */
  readonly violation: number;
}

/** How much one `step` may run: about `ms` milliseconds, or, for a deterministic schedule, `evaluations`. */
export type StepSlice = { readonly ms: number } | { readonly evaluations: number };

export type IslandStopReason = 'budget' | 'target' | 'converged';

export interface IslandProgress {
  readonly islandId: string;
  /** Evaluations of this island since it was created. */
  readonly evaluations: number;
  /** Evaluations and milliseconds of this step. */
  readonly stepEvaluations: number;
  readonly stepMs: number;
  /** The best design so far (null before the first evaluation). */
  readonly bestValue: number | null;
  readonly bestViolation: number | null;
  readonly bestX: number[] | null;
  /** Set once the island has stopped; it then evaluates nothing more. */
  readonly stopReason: IslandStopReason | null;
  /** Fresh runs its optimizer started after the first because a run converged or stagnated. */
  readonly restarts: number;
}

/**
 * One island's part of an `advance` call: immigrants to place first (the ring
 * neighbour's emigrants of an earlier slice), then one step of `slice`, then, if the
 * slice publishes or the island stops in it, its `emigrants` best distinct candidates
 * to send on.
 */
export interface AdvanceRequest {
  readonly islandId: string;
  readonly slice: StepSlice;
  readonly immigrants: readonly Individual[];
  readonly emigrants: number;
  /** Whether this slice publishes emigrants; the other slices answer with none (unless the island stops: its last). */
  readonly publish: boolean;
}

export interface AdvanceResult {
  readonly progress: IslandProgress;
  /**
   * The island's best distinct candidates after the step (as many as asked, or fewer)
   * when the slice publishes or the island stopped in it; empty otherwise.
   */
  readonly emigrants: Individual[];
}

export interface IslandInfo {
  readonly islandId: string;
  readonly dim: number;
  readonly variableNames: string[];
  readonly lower: number[];
  readonly upper: number[];
  readonly evaluations: number;
  readonly stopReason: IslandStopReason | null;
}

/** What `describe` says of one design, by the kind of objective. */
export type CandidateDetail =
  | { readonly kind: 'synthesis'; readonly candidate: CandidateReport }
  | { readonly kind: 'suspension'; readonly candidate: SuspensionCandidateReport }
  | { readonly kind: 'leg'; readonly candidate: LegCandidateReport }
  | {
      readonly kind: 'test-function';
      readonly name: TestFunctionName;
      readonly value: number;
      readonly minimum: number;
      readonly distanceToOptimum: number;
    };

export interface DescribedCandidate extends Individual {
  readonly detail: CandidateDetail;
}

export const ISLAND_STATE_FORMAT = 'loci-island-state';
/**
 * Version 2: the island no longer reports each new archive entry (the run merges the
 * islands' archives at its cuts), so the state drops version 1's entry counters;
 * a version 1 state is still read, its counters ignored.
 * Version 3: the optimizer state is packed (src/core/optimize/packedState.ts: long arrays
 * of numbers as base64 of their doubles, a differential evolution's trials as what
 * differs from their parents), exactly; versions 1 and 2, unpacked, are still read.
 */
export const ISLAND_STATE_VERSION = 3;

/** Everything an island is, as JSON: `importState(exportState())` continues it exactly. */
export interface IslandState {
  readonly format: typeof ISLAND_STATE_FORMAT;
  readonly version: typeof ISLAND_STATE_VERSION;
  readonly config: IslandConfig;
  /** Packed in version 3; plain (`exportState()`'s form) in versions 1 and 2. */
  readonly optimizer: PackedOptimizerState;
  /** The island's archive of distinct designs, best first. */
  readonly archive: Individual[];
  /** Immigrants waiting for the optimizer to reach a state that takes them. */
  readonly immigrants: Individual[];
}

export interface SearchWorkerApi {
  /** Creates (or replaces) the island `config.islandId`. */
  init(config: IslandConfig): Outcome<{ readonly island: IslandInfo }>;
  /** Creates (or replaces) an island from an exported state. */
  importState(state: IslandState): Outcome<{ readonly island: IslandInfo }>;
  exportState(islandId: string): Outcome<{ readonly state: IslandState }>;
  /**
   * Immigrate, step and emigrate each island named, in order: one message per worker for
   * a whole slice of the run, however many islands the worker hosts.
   */
  advance(requests: readonly AdvanceRequest[]): Outcome<{ readonly results: AdvanceResult[] }>;
  /** The island's `count` best distinct candidates, to send to its neighbour. */
  emigrants(islandId: string, count: number): Outcome<{ readonly individuals: Individual[] }>;
  /** The island's `count` best distinct candidates, described. */
  topCandidates(islandId: string, count: number): Outcome<{ readonly candidates: DescribedCandidate[] }>;
  /** Describes given designs with the island's objective (real coordinates). */
  describe(islandId: string, designs: readonly (readonly number[])[]): Outcome<{ readonly candidates: DescribedCandidate[] }>;
  /** Describes given designs (real coordinates) with the objective `objective` names, no island needed. */
  describeDesigns(objective: ObjectiveSpec, designs: readonly (readonly number[])[]): Outcome<{ readonly candidates: DescribedCandidate[] }>;
  /** Forgets an island. */
  drop(islandId: string): Outcome<object>;
}
