/**
 * The project: what the user is working on, as plain JSON (it is saved in IndexedDB as
 * it changes). The target, the search settings, the state of the search and the ranked
 * candidates. Lengths are mm, angles degrees (the app's units; the problem built for the
 * engine converts to radians).
 */
import type { CandidateReport } from '../../core/synthesis';
import type { FamilyId } from './families';
import type { StoredSuspension } from '../suspension/stored';
import type { StoredLeg } from '../leg/stored';

export const PROJECT_FORMAT = 'loci-workspace-project';
/**
 * 2: target points may carry weights (a version 1 project has none and is read as unweighted).
 * 3: the project may keep a rear-suspension design (an older project has none).
 */
export const PROJECT_VERSION = 3;

export type TimingMode = 'prescribed' | 'free' | 'unprescribed';

export interface TargetPoint {
  /** mm */
  readonly x: number;
  readonly y: number;
  /** Prescribed crank angle at this point, degrees; null when not given. */
  readonly driverDeg: number | null;
  /**
   * Relative weight of this point in the error (0 … MAX_WEIGHT of the problem). Every
   * point of a weighted target has one and no point of an unweighted target has one:
   * absent, every point counts the same.
   */
  readonly weight?: number;
}

/** A picture under the drawing (a side view, a sketch, a photo), placed and scaled in mm. */
export interface BackgroundImage {
  /** Key of the image's bytes in the image store. */
  readonly imageId: string;
  readonly name: string;
  readonly widthPx: number;
  readonly heightPx: number;
  /** Where the image's top-left corner is, mm. */
  readonly leftMm: number;
  readonly topMm: number;
  /** Size of one image pixel, mm. */
  readonly mmPerPx: number;
  /** 0 … 1 */
  readonly opacity: number;
  /** Whether a two-point calibration has set the scale. */
  readonly calibrated: boolean;
}

export interface TargetState {
  readonly points: readonly TargetPoint[];
  readonly closed: boolean;
  readonly timing: TimingMode;
  readonly background: BackgroundImage | null;
}

/** A circle no ground pivot may lie in, mm. */
export interface KeepOutRegion {
  readonly x: number;
  readonly y: number;
  readonly r: number;
}

export type Measure = 'rms' | 'sum-of-squares' | 'max';
export type Placement = 'free' | 'fixed';

export interface SearchSettings {
  readonly families: readonly FamilyId[];
  readonly placement: Placement;
  readonly measure: Measure;
  /** Overrides of the default variable bounds, per family and variable name: [lower, upper]. */
  readonly bounds: Readonly<Partial<Record<FamilyId, Readonly<Record<string, readonly [number, number]>>>>>;
  readonly constraints: {
    readonly fullTurnCrank: boolean;
    /** Minimum transmission angle, degrees; null for none. */
    readonly minTransmissionDeg: number | null;
    /** Link length limits, mm; null for none. */
    readonly linkLengthMm: readonly [number, number] | null;
    readonly keepOut: readonly KeepOutRegion[];
    /** Largest side of the motion's bounding box, as a multiple of the target's span; null for no limit. */
    readonly maxSizeSpans: number | null;
  };
  /** Objective terms added to the measure (core ObjectiveTerms); a weight of 0 is no term. */
  readonly terms: {
    readonly sizeWeight: number;
    readonly transmissionWeight: number;
    /** Transmission angles within [guideline, 180° − guideline] cost nothing, degrees. */
    readonly transmissionGuidelineDeg: number;
  };
  /** Designs each family keeps and the results table can show (at most the run archive's capacity). */
  readonly resultsPerFamily: number;
  readonly budget: { readonly mode: 'evaluations' | 'time'; readonly evaluations: number; readonly seconds: number };
  readonly seed: number;
  /** Search workers; null for the machine's default (cores − 1, at least 1). */
  readonly workers: number | null;
  /** A running search saves a checkpoint this often (wall time), seconds: a reload or a lost worker costs at most this much search. */
  readonly checkpointEverySeconds: number;
}

export type RunStatus = 'idle' | 'starting' | 'running' | 'pausing' | 'paused' | 'stopping' | 'finished' | 'failed';

export interface RunState {
  readonly status: RunStatus;
  /** The run's id, which names its checkpoints in IndexedDB; null before the first run. */
  readonly runId: string | null;
  readonly evaluations: number;
  readonly budgetEvaluations: number | null;
  readonly budgetSeconds: number | null;
  readonly elapsedMs: number;
  readonly evaluationsPerSecond: number;
  readonly remainingMs: number | null;
  /** Fresh optimizer runs the islands started after a run converged or stalled, so the search uses its whole budget. */
  readonly searchRestarts: number;
  /** Best error so far in mm (RMS, or maximum when the search minimises the maximum); null before any. */
  readonly bestErrorMm: number | null;
  readonly bestFeasible: boolean | null;
  /** The last checkpoint: its round and the evaluations it holds. */
  readonly checkpoint: { readonly round: number; readonly evaluations: number; readonly savedAtMs: number } | null;
  /** Set when this session continued a run from a checkpoint after a reload. */
  readonly resumedFrom: { readonly round: number; readonly evaluations: number } | null;
  readonly stopReason: string | null;
  /** A message about the run for the user (why it failed, what was skipped). */
  readonly message: string | null;
  /** The technical reason behind `message` (what the engine said), shown apart under Details; null for none. */
  readonly messageDetail: string | null;
  /** Number of target points the run was started with (to turn a sum of squares into RMS). */
  readonly targetPointCount: number;
  /** The search weighs size or transmission on top of the error: its best value is then the error plus those terms. */
  readonly withTerms: boolean;
  readonly measure: Measure;
}

export interface Project {
  readonly format: typeof PROJECT_FORMAT;
  readonly version: typeof PROJECT_VERSION;
  readonly name: string;
  readonly target: TargetState;
  readonly settings: SearchSettings;
  readonly run: RunState;
  /** Ranked best first. */
  readonly candidates: readonly CandidateReport[];
  /** The target the candidates were found for (the target may have changed since). */
  readonly candidatesTarget: TargetSnapshot | null;
  /** The rear-suspension workspace's design (the bicycle's fields and the layout); absent until one is opened. */
  readonly suspension?: StoredSuspension;
  /** The walking-leg workspace's set-up and search results; absent until one is opened (and in projects kept before it). */
  readonly leg?: StoredLeg;
}

/** A target as the results views take it: points [x, y] in mm, open or closed. */
export interface TargetSnapshot {
  readonly points: readonly (readonly [number, number])[];
  readonly closed: boolean;
}

export function snapshotTarget(target: TargetState): TargetSnapshot {
  return { points: target.points.map((p) => [p.x, p.y] as const), closed: target.closed };
}

export function sameTarget(a: TargetSnapshot, b: TargetSnapshot): boolean {
  return a.closed === b.closed && a.points.length === b.points.length && a.points.every((p, i) => p[0] === b.points[i][0] && p[1] === b.points[i][1]);
}

/**
 * The target the results on screen were found for, when it is not the target now being
 * edited (a new one was pasted, points were moved): null when the results are this
 * target's, or there are none.
 */
export function previousResultsTarget(project: Project): TargetSnapshot | null {
  const was = project.candidatesTarget;
  if (was === null || (project.candidates.length === 0 && !(project.run.evaluations > 0))) return null;
  return sameTarget(was, snapshotTarget(project.target)) ? null : was;
}

export const IDLE_RUN: RunState = {
  status: 'idle',
  runId: null,
  evaluations: 0,
  budgetEvaluations: null,
  budgetSeconds: null,
  elapsedMs: 0,
  evaluationsPerSecond: 0,
  remainingMs: null,
  searchRestarts: 0,
  bestErrorMm: null,
  bestFeasible: null,
  checkpoint: null,
  resumedFrom: null,
  stopReason: null,
  message: null,
  messageDetail: null,
  targetPointCount: 0,
  withTerms: false,
  measure: 'rms',
};

/** Target and settings stay as they are while a search runs on them or is paused. */
export function isLocked(status: RunStatus): boolean {
  return isActive(status) || status === 'paused';
}

/** A run in one of these states has workers or will have them after a reload. */
export function isActive(status: RunStatus): boolean {
  return status === 'starting' || status === 'running' || status === 'pausing' || status === 'stopping';
}
