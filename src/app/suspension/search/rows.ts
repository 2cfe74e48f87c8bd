/**
 * The ranked layouts table's rows: one per design, the figures a frame designer reads
 * first, taken from the engine's report of the design (suspensionCurves, as `loci
 * analyze` runs it on the design's file). Figures that depend on the gear are read in
 * the chosen cog.
 */
import { LAYOUT_NAMES, type LayoutKind } from '../../../core/suspension';
import { bestOfEachLayout, pivotSpanMm, type SearchCandidate } from './results';

export interface TableRow {
  /** Unique within a run: the rank. */
  readonly key: string;
  readonly rank: number;
  readonly family: LayoutKind;
  readonly layoutName: string;
  readonly feasible: boolean;
  readonly violation: number;
  readonly value: number;
  readonly leverageRatioStart: number;
  readonly leverageRatioEnd: number;
  readonly progressionPct: number;
  readonly antiSquatAtSagPct: number;
  readonly antiRiseAtSagPct: number;
  readonly rearwardAtFullTravelMm: number;
  readonly travelMm: number;
  readonly kickbackAtFullTravelDeg: number;
  readonly chainGrowthAtFullTravelMm: number;
  readonly pivotSpanMm: number;
  /** Why there are no figures (the full analysis refuses the design), else null. */
  readonly failure: string | null;
  readonly candidate: SearchCandidate;
}

/** A row of the table for a design, its per-gear figures in cog `cogIndex` of the bicycle. */
export function tableRow(c: SearchCandidate, cogIndex: number): TableRow {
  const f = c.figures;
  const at = (values: readonly number[] | undefined) => (values === undefined || !(cogIndex >= 0 && cogIndex < values.length) ? NaN : values[cogIndex]);
  return {
    key: String(c.rank),
    rank: c.rank,
    family: c.family,
    layoutName: LAYOUT_NAMES[c.family],
    feasible: c.feasible,
    violation: c.violation,
    value: c.value,
    leverageRatioStart: f?.leverageRatioStart ?? NaN,
    leverageRatioEnd: f?.leverageRatioEnd ?? NaN,
    progressionPct: f?.progressionPct ?? NaN,
    antiSquatAtSagPct: at(f?.sagAntiSquatPct),
    antiRiseAtSagPct: f?.sagAntiRisePct ?? NaN,
    rearwardAtFullTravelMm: f?.endRearwardMm ?? NaN,
    travelMm: f?.totalTravelMm ?? NaN,
    kickbackAtFullTravelDeg: at(f?.endKickbackDeg),
    chainGrowthAtFullTravelMm: at(f?.endChainGrowthMm),
    pivotSpanMm: pivotSpanMm(c.pivots),
    failure: c.failure,
    candidate: c,
  };
}

/** The table: the best of each layout first (always shown), then every design in rank order. */
export function tableSections(candidates: readonly SearchCandidate[], cogIndex: number): { best: TableRow[]; all: TableRow[] } {
  const ranked = [...candidates].sort((a, b) => a.rank - b.rank);
  return { best: bestOfEachLayout(ranked).map((c) => tableRow(c, cogIndex)), all: ranked.map((c) => tableRow(c, cogIndex)) };
}
