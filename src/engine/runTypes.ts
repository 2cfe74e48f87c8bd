/**
 * What a run is to its callers: its status, progress, result, options and the `Run`
 * interface, shared by the engine (run.ts), the hosted run of a page (remoteRun.ts) and
 * the app.
 */
import type { DescribedCandidate } from '../../workers/api';
import type { CheckpointPayload } from './checkpoint';
import type { CheckpointStore } from './checkpointStore';
import type { RunSpec } from './runSpec';

export type RunStatus = 'idle' | 'running' | 'paused' | 'finished' | 'failed';

/** Why a run ended: its evaluation budget, its time budget, every island converged or hit its target, or a cancel. */
export type RunStopReason = 'budget' | 'time' | 'converged' | 'target' | 'cancelled';

export interface RunProgress {
  readonly status: RunStatus;
  /** Rounds (slices) every island has done. */
  readonly rounds: number;
  /** Evaluations of all islands so far (after a worker restart: since the checkpoint it went back to). */
  readonly evaluations: number;
  readonly budgetEvaluations: number | null;
  /** Active search milliseconds (worker start-up and paused time excluded), this session and those it resumes. */
  readonly elapsedMs: number;
  /** Evaluations per second of this session. */
  readonly evaluationsPerSecond: number;
  /** Estimated milliseconds left, from the budget and the rate; null when it cannot be told yet. */
  readonly remainingMs: number | null;
  /** The best candidate of the run so far (its job, value of the measure and violation). */
  readonly best: { readonly jobId: string; readonly value: number; readonly violation: number } | null;
  readonly islands: number;
  readonly islandsRunning: number;
  readonly workers: number;
  /** Workers replaced after one was lost (for a run hosted in an engine worker, that worker too). */
  readonly restarts: number;
  /** Fresh optimizer runs the islands' restart schemes have started (after a run converged or stalled), all islands, as of their last slice. */
  readonly searchRestarts: number;
  /** The round of the last checkpoint taken, or null. */
  readonly checkpointRound: number | null;
  /** Why the last save to the store failed; absent once a save succeeds (the run goes on either way). */
  readonly checkpointError?: string;
}

export interface RankedCandidate extends DescribedCandidate {
  /** 1 for the best. */
  readonly rank: number;
  readonly jobId: string;
}

export type RunResult =
  | {
      readonly ok: true;
      readonly stopReason: RunStopReason;
      readonly evaluations: number;
      readonly elapsedMs: number;
      readonly rounds: number;
      /** Workers replaced after one was lost (for a run hosted in an engine worker, that worker too). */
      readonly restarts: number;
      /** Fresh optimizer runs the islands' restart schemes started, all islands. */
      readonly searchRestarts: number;
      /** Evaluations of each job (all its islands). */
      readonly jobs: { readonly jobId: string; readonly evaluations: number }[];
      /** The best distinct candidates of all jobs, ranked feasibility first (Deb, 2000). */
      readonly candidates: RankedCandidate[];
    }
  | {
      readonly ok: false;
      readonly reason: string;
      readonly evaluations: number;
      readonly rounds: number;
      /**
       * When an objective threw (the workers still answer): the best candidates of the
       * rounds before, described and ranked as in a finished run. Absent otherwise.
       */
      readonly candidates?: RankedCandidate[];
    };

export interface RunOptions {
  /** Workers to start (never more than islands); default the environment's count. */
  readonly workers?: number;
  /** Where checkpoints go; without one the run keeps its last checkpoint in memory only. */
  readonly store?: CheckpointStore;
  /** Candidates described in the result; default 10. */
  readonly topK?: number;
  /** Also describe each job's best where it is not among the topK (a layout table shows every layout's best); default false. */
  readonly bestOfEachJob?: boolean;
  /**
   * Also describe each job's `perJob` best distinct candidates (a job is one family), so
   * the best of every family searched reaches the caller even when another family holds
   * the whole topK; default 0. At most the spec's archive capacity, which holds them.
   */
  readonly perJob?: number;
  /** A worker call that takes longer counts as a lost worker; default 120 000 ms. */
  readonly callTimeoutMs?: number;
  /** Restarts without a checkpoint in between before the run gives up; default 3. */
  readonly maxRestarts?: number;
  /**
   * Told of each checkpoint once it is saved, in a task of its own, with the payload the
   * text was made from (the app describes the best designs so far without parsing it back).
   */
  readonly onCheckpoint?: (payload: CheckpointPayload) => void;
  /**
   * Milliseconds of wall time between checkpoints; default the spec's `checkpointEveryMs`.
   * An option, not part of the spec, so a resumed run may save more or less often.
   */
  readonly checkpointEveryMs?: number;
  /**
   * Told when a save to the store fails, with why. The run goes on (it keeps its last
   * checkpoint in memory for its own recovery) and tries again at the next checkpoint.
   */
  readonly onSaveError?: (reason: string) => void;
}

export interface Run {
  readonly spec: RunSpec;
  status(): RunStatus;
  progress(): RunProgress;
  /** Called after every round, every checkpoint and every change of status; returns the unsubscribe function. */
  onProgress(listener: (progress: RunProgress) => void): () => void;
  /** Runs to the end (budget, convergence or cancel). Call once. */
  start(): Promise<RunResult>;
  /**
   * Stops at the next round every island can stop at (the rounds already sent to the
   * workers, at most a few), checkpoints, and waits; resolves once paused.
   */
  pause(): Promise<void>;
  resume(): void;
  /** Stops as `pause` does (at once if paused); `start()` then resolves with stopReason 'cancelled'. */
  cancel(): void;
  /** The whole run's checkpoint, taken at a round every island stops at. */
  exportCheckpoint(): Promise<string>;
}

export type MakeRunResult = { readonly ok: true; readonly run: Run } | { readonly ok: false; readonly reason: string };

export type RestoreFromStoreResult =
  | {
      readonly ok: true;
      readonly run: Run;
      /** Why each newer checkpoint was passed over, newest first. */
      readonly skipped: string[];
      /** Where the checkpoint used came from (a file name for a file store). */
      readonly source: string;
      /** Each newer checkpoint passed over, with where it came from and why. */
      readonly passedOver: readonly { readonly source: string; readonly reason: string }[];
      /** The store's notes: a newest checkpoint missing, leftovers of an interrupted save removed. */
      readonly notes: readonly string[];
    }
  | { readonly ok: false; readonly reason: string; readonly empty: boolean; readonly notes: readonly string[] };
