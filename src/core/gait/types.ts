/** The gait figures' result types: plain data, so they cross a worker boundary or a file unchanged. */
import type { Leg } from './leg';

export interface GaitOptions {
  /** Samples over one turn (DEFAULT_GAIT_STEPS when omitted); the path holds steps + 1, the last the first again. */
  readonly steps?: number;
}

/** Crank angles (rad) from the reference pose in the crank's direction; `toRad` passes 2π when a range wraps past the reference pose. */
export interface TurnRange {
  readonly fromRad: number;
  readonly toRad: number;
}

/** The foot over the turn, at the samples; rates are per radian of crank (mm/rad at 1 rad/s). */
export interface FootPath {
  readonly turnRad: Float64Array;
  readonly xMm: Float64Array;
  readonly yMm: Float64Array;
  readonly vxMmPerRad: Float64Array;
  readonly vyMmPerRad: Float64Array;
  readonly heightMm: Float64Array;
  readonly heightRateMmPerRad: Float64Array;
  readonly alongMm: Float64Array;
  readonly alongRateMmPerRad: Float64Array;
}

export interface StanceFigures {
  readonly interval: TurnRange;
  readonly strideMm: number;
  readonly flatness: { readonly peakToPeakMm: number; readonly rmsMm: number };
  /** Backward speed of the foot relative to the body (mm per rad of crank); positive pushes the body forward. */
  readonly speed: {
    readonly minMmPerRad: number;
    readonly maxMmPerRad: number;
    readonly meanMmPerRad: number;
    /** (max − min) / mean; null when the mean is not backward (the leg would walk the other way). */
    readonly variation: number | null;
  };
}

export interface LoopTransmission {
  readonly jointIds: readonly string[];
  readonly bodyIds: readonly string[];
  /** Crank ranges within stance where μ is outside the guideline. */
  readonly outside: TurnRange[];
  /** The least of min(μ, 180° − μ) at the stance's samples and ends, degrees; null without stance. */
  readonly worstInStanceDeg: number | null;
}

export interface GaitFigures {
  readonly leg: Leg;
  readonly steps: number;
  /** The crank's absolute angle in the reference pose (rad): turn angle 0. */
  readonly referenceCrankRad: number;
  readonly path: FootPath;
  readonly stance: {
    readonly toleranceMm: number;
    readonly intervals: TurnRange[];
    /** Index into intervals of the longest; −1 without stance. */
    readonly longest: number;
  };
  readonly dutyFactor: { readonly value: number; readonly toleranceMm: number };
  readonly stepHeightMm: number;
  /** The least height over the turn (mm): below −tolerance the foot passes through the ground. */
  readonly lowestMm: number;
  /** Figures of the longest stance; null when the foot never comes within the tolerance. */
  readonly longestStance: StanceFigures | null;
  readonly transmission: { readonly guidelineDeg: { readonly min: number; readonly max: number }; readonly loops: LoopTransmission[] };
  readonly size: { readonly minXMm: number; readonly maxXMm: number; readonly minYMm: number; readonly maxYMm: number; readonly widthMm: number; readonly heightMm: number };
  readonly notes: string[];
  readonly caution: string;
}

export type GaitResult = { readonly ok: true; readonly figures: GaitFigures } | { readonly ok: false; readonly reason: string };
