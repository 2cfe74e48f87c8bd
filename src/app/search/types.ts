/**
 * The shapes of a workspace's search as the project keeps it, apart from the controller
 * that runs it: the kept runs are read by the project's schema, which must not import
 * the controller's engine and storage.
 */
import type { RunStopReason } from '../../engine';

export type SearchStatus = 'idle' | 'running' | 'stopping' | 'finished' | 'failed';

/** The seed and budget of a search. */
export interface SearchSettings {
  readonly seed: number;
  /** Evaluations and seconds of the whole search (all jobs); null: not limited by it; at least one is given. */
  readonly budget: { readonly evaluations: number | null; readonly seconds: number | null };
}

/**
 * A search running now, as the project keeps it until the search ends: what a reload
 * needs to resume it from its checkpoints (kept under `runId`) and to keep its designs.
 */
export interface RunningSearchOf<P> {
  readonly runId: string;
  /** When it started, ISO 8601. */
  readonly startedAt: string;
  readonly problem: P;
  readonly settings: SearchSettings;
}

/** A finished (or stopped) run as the project keeps it: the problem it ran, its seed and budget, and its designs ranked. */
export interface SearchRunOf<P, C> {
  readonly id: string;
  /** When it ended, ISO 8601. */
  readonly finishedAt: string;
  readonly problem: P;
  readonly seed: number;
  /** The budget asked: evaluations and seconds of the whole search (null: not limited by it). */
  readonly budget: { readonly evaluations: number | null; readonly seconds: number | null };
  /** Evaluations made. */
  readonly evaluations: number;
  readonly stopReason: RunStopReason;
  /** Ranked best first (the engine's ranking: feasibility first, then value). */
  readonly candidates: readonly C[];
}

/** What the run list needs of a kept design: its job (family or layout) and its score. */
export interface RankedDesign {
  readonly family: string;
  readonly value: number;
  readonly violation: number;
}
