/**
 * The gait figures as the documented JSON of a leg (what `loci analyze` prints of a leg
 * file, and what a leg candidate's report holds): scalars with their units in the key
 * names, crank angles in degrees from the reference pose in the crank's direction. One
 * function, so the report of a candidate and the analysis of its exported leg file say
 * the same numbers.
 */
import { GAIT_CAUTION, GAIT_CONVENTIONS, type GaitFigures, type PhasedFigures, type TurnRange } from '../../gait';

const DEG_PER_RAD = 180 / Math.PI;

export interface TurnRangeDeg {
  readonly fromDeg: number;
  readonly toDeg: number;
}

export interface GaitFiguresJson {
  readonly steps: number;
  readonly footId: string;
  readonly stanceToleranceMm: number;
  /** The duty factor always with the tolerance it is taken at. */
  readonly dutyFactor: { readonly value: number; readonly toleranceMm: number };
  /** Extent along the ground of the longest stance; null without stance. */
  readonly strideMm: number | null;
  readonly stepHeightMm: number;
  readonly lowestMm: number;
  readonly stanceIntervalsDeg: TurnRangeDeg[];
  readonly stanceFlatness: { readonly peakToPeakMm: number; readonly rmsMm: number } | null;
  readonly stanceSpeed: { readonly minMmPerRad: number; readonly maxMmPerRad: number; readonly meanMmPerRad: number; readonly variation: number | null } | null;
  readonly transmissionInStance: {
    readonly guidelineDeg: { readonly min: number; readonly max: number };
    /** The least of min(μ, 180° − μ) over every loop in stance; null without stance or without a four-bar loop. */
    readonly worstDeg: number | null;
    readonly loops: { readonly jointIds: readonly string[]; readonly worstInStanceDeg: number | null; readonly outsideGuidelineDeg: TurnRangeDeg[] }[];
  };
  readonly size: { readonly widthMm: number; readonly heightMm: number; readonly minXMm: number; readonly maxXMm: number; readonly minYMm: number; readonly maxYMm: number };
  readonly phased?: {
    readonly legs: number;
    readonly phasesDeg: number[];
    readonly minFeetOnGround: number;
    readonly maxFeetOnGround: number;
    /** shareByFeet[n]: share of the shaft's turn with n feet in stance. */
    readonly shareByFeet: number[];
    readonly feetOnGroundDeg: (TurnRangeDeg & { readonly feet: number })[];
    readonly bodyHeightRippleMm: number;
    readonly model: string;
  };
  readonly notes: string[];
  readonly conventions: readonly string[];
  readonly caution: string;
}

const deg = (r: TurnRange): TurnRangeDeg => ({ fromDeg: r.fromRad * DEG_PER_RAD, toDeg: r.toRad * DEG_PER_RAD });

export function gaitFiguresJson(f: GaitFigures, phased?: PhasedFigures): GaitFiguresJson {
  const s = f.longestStance;
  const worsts = f.transmission.loops.map((l) => l.worstInStanceDeg).filter((v): v is number => v !== null);
  return {
    steps: f.steps,
    footId: f.leg.foot,
    stanceToleranceMm: f.stance.toleranceMm,
    dutyFactor: { value: f.dutyFactor.value, toleranceMm: f.dutyFactor.toleranceMm },
    strideMm: s === null ? null : s.strideMm,
    stepHeightMm: f.stepHeightMm,
    lowestMm: f.lowestMm,
    stanceIntervalsDeg: f.stance.intervals.map(deg),
    stanceFlatness: s === null ? null : { peakToPeakMm: s.flatness.peakToPeakMm, rmsMm: s.flatness.rmsMm },
    stanceSpeed: s === null ? null : { minMmPerRad: s.speed.minMmPerRad, maxMmPerRad: s.speed.maxMmPerRad, meanMmPerRad: s.speed.meanMmPerRad, variation: s.speed.variation },
    transmissionInStance: {
      guidelineDeg: { min: f.transmission.guidelineDeg.min, max: f.transmission.guidelineDeg.max },
      worstDeg: worsts.length === 0 ? null : Math.min(...worsts),
      loops: f.transmission.loops.map((l) => ({ jointIds: [...l.jointIds], worstInStanceDeg: l.worstInStanceDeg, outsideGuidelineDeg: l.outside.map(deg) })),
    },
    size: { ...f.size },
    ...(phased === undefined
      ? {}
      : {
          phased: {
            legs: phased.legs,
            phasesDeg: phased.phasesRad.map((p) => p * DEG_PER_RAD),
            minFeetOnGround: phased.minFeet,
            maxFeetOnGround: phased.maxFeet,
            shareByFeet: [...phased.shareByFeet],
            feetOnGroundDeg: phased.feetOnGround.map((g) => ({ ...deg(g), feet: g.feet })),
            bodyHeightRippleMm: phased.bodyHeightRippleMm,
            model: phased.model,
          },
        }),
    notes: [...f.notes],
    conventions: GAIT_CONVENTIONS,
    caution: GAIT_CAUTION,
  };
}
