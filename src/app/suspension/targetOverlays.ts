/**
 * The search targets as the plots draw them: the leverage-ratio and axle-path targets as
 * grey dashed curves, the bands and limits as shaded ranges, for the gear shown. One
 * source for the workspace's plots and the compare view.
 */
import type { SuspensionProblemInput } from '../../core/synthesis';
import type { PlotBand, Series } from './CurvePlot';

export const TARGET_COLOUR = '#6b7280';
const TARGET_DASH = '4 3';
/** Samples of a leverage-ratio target given as a shape. */
const SHAPE_SAMPLES = 31;

export interface TargetOverlays {
  readonly leverage: Series | null;
  readonly axle: Series | null;
  readonly antiSquat: PlotBand[];
  readonly antiRise: PlotBand[];
  readonly chainGrowth: PlotBand[];
  readonly kickback: PlotBand[];
  /** The wheel-travel band in words, or '' without one. */
  readonly travelNote: string;
}

function cogApplies(cogs: readonly number[] | undefined, teeth: number | undefined): boolean {
  return cogs === undefined || (teeth !== undefined && cogs.includes(teeth));
}

/**
 * The targets of `problem` for the gear of `cogTeeth` teeth; `travelMm` is the travel a
 * leverage-ratio shape is drawn over (its u runs over a design's own travel).
 */
export function targetOverlays(problem: SuspensionProblemInput, cogTeeth: number | undefined, travelMm: number, travelWhose: string): TargetOverlays {
  const t = problem.targets;
  let leverage: Series | null = null;
  const lr = t.leverageRatio;
  if (lr !== undefined && 'points' in lr) {
    leverage = { label: 'target leverage ratio', travel: lr.points.map((p) => p[0]), values: lr.points.map((p) => p[1]), colour: TARGET_COLOUR, strong: false, target: true, dash: TARGET_DASH };
  } else if (lr !== undefined) {
    const exponent = lr.exponent ?? 1;
    const travel = Array.from({ length: SHAPE_SAMPLES }, (_, k) => (travelMm * k) / (SHAPE_SAMPLES - 1));
    const values = travel.map((_, k) => lr.start + (lr.end - lr.start) * (k / (SHAPE_SAMPLES - 1)) ** exponent);
    leverage = { label: `target leverage ratio ${lr.start} → ${lr.end} (over ${travelWhose} travel)`, travel, values, colour: TARGET_COLOUR, strong: false, target: true, dash: TARGET_DASH };
  }
  // The target is axle x over travel; rearward movement is the bicycle's axle x less it.
  const axle: Series | null = t.axlePath === undefined
    ? null
    : { label: 'target axle path', travel: t.axlePath.points.map((p) => p[0]), values: t.axlePath.points.map((p) => problem.bicycle.rearAxleMm.x - p[1]), colour: TARGET_COLOUR, strong: false, target: true, dash: TARGET_DASH };
  return {
    leverage,
    axle,
    antiSquat: t.antiSquatAtSag !== undefined && cogApplies(t.antiSquatAtSag.cogs, cogTeeth) ? [{ lo: t.antiSquatAtSag.minPct, hi: t.antiSquatAtSag.maxPct, label: `target at sag: ${t.antiSquatAtSag.minPct}–${t.antiSquatAtSag.maxPct} %` }] : [],
    antiRise: t.antiRiseAtSag === undefined ? [] : [{ lo: t.antiRiseAtSag.minPct, hi: t.antiRiseAtSag.maxPct, label: `target at sag: ${t.antiRiseAtSag.minPct}–${t.antiRiseAtSag.maxPct} %` }],
    chainGrowth: t.chainGrowthMm !== undefined && cogApplies(t.chainGrowthMm.cogs, cogTeeth) ? [{ lo: -t.chainGrowthMm.max, hi: t.chainGrowthMm.max, label: `limit: |growth| ≤ ${t.chainGrowthMm.max} mm` }] : [],
    kickback: t.kickbackDeg !== undefined && cogApplies(t.kickbackDeg.cogs, cogTeeth) ? [{ lo: -t.kickbackDeg.max, hi: t.kickbackDeg.max, label: `limit: |kickback| ≤ ${t.kickbackDeg.max}°` }] : [],
    travelNote: t.travelMm === undefined ? '' : `Target wheel travel ${t.travelMm.min}–${t.travelMm.max} mm.`,
  };
}
