/**
 * The curves over vertical wheel travel, as d3 plots (d3 makes the scales, ticks and
 * paths; React draws the SVG): leverage ratio, anti-squat per cog, anti-rise, the axle's
 * rearward movement, chain growth and pedal kickback per cog, and the wheel rate when a
 * spring is given. The sag point is marked on each; the chosen cog is drawn heavier;
 * the search set-up's targets and bands, when it reads, are drawn under the curves.
 * Each plot is a CurvePlot, which the compare view shares.
 */
import * as d3 from 'd3';
import { memo } from 'react';
import type { SuspensionReport } from '../../core/suspension';
import type { SuspensionProblemInput } from '../../core/synthesis';
import { CurvePlot, type Series } from './CurvePlot';
import { figure } from './labels';
import { targetOverlays } from './targetOverlays';

/** Our palette for per-cog lines, small cog to large. */
const cogColour = (i: number, n: number) => d3.interpolateViridis(n <= 1 ? 0.2 : 0.05 + (0.85 * i) / (n - 1));

export const SuspensionPlots = memo(function SuspensionPlots({ report, cogIndex, sagShare, targets: problem }: {
  report: SuspensionReport;
  cogIndex: number;
  sagShare: number;
  /** The search set-up as a problem, when it reads; null draws no targets. */
  targets: SuspensionProblemInput | null;
}) {
  const c = report.curves;
  const n = c.cogTeeth.length;
  const cog = Math.min(cogIndex, n - 1);
  const perCog = (arrays: readonly Float64Array[]): Series[] =>
    arrays.map((values, i) => ({ label: `${report.chainringTeeth}×${c.cogTeeth[i]} T`, travel: c.travelMm, values, colour: cogColour(i, n), strong: i === cog }));
  const sagMm = report.sagPoint.travelMm;
  const sagPct = figure(100 * sagShare, 4);
  const common = { sags: [{ travelMm: sagMm, label: `sag ${sagPct} %` }] };
  const one = (label: string, values: Float64Array, colour = '#1f5fa8'): Series[] => [{ label, travel: c.travelMm, values, colour, strong: true }];
  const antiRise: Series[] = one('brake on the axle-carrying body', c.antiRisePct);
  if (c.antiRiseFloatingPct !== null) antiRise.push({ label: 'floating brake', travel: c.travelMm, values: c.antiRiseFloatingPct, colour: '#c2410c', strong: true });
  const t = problem === null ? null : targetOverlays(problem, c.cogTeeth[cog], report.totalTravelMm, 'this design\'s');
  const leverage = one('leverage ratio', c.leverageRatio);
  if (t?.leverage) leverage.unshift(t.leverage);
  const axle = one('rearward movement', c.rearwardMm);
  if (t?.axle) axle.unshift(t.axle);
  return (
    <div className="susp-plots" data-testid="suspension-plots">
      <CurvePlot {...common} title="Leverage ratio (wheel mm per shock mm)" yLabel="leverage ratio" series={leverage} testId="plot-leverage" />
      <CurvePlot {...common} title="Anti-squat per gear (%)" yLabel="anti-squat (%)" series={perCog(c.antiSquatPct)} bands={t?.antiSquat} testId="plot-anti-squat"
        note={`Chosen gear drawn heavier.${t !== null && t.antiSquat.length > 0 ? ' Shaded: the target band at sag in this gear.' : ''}`} />
      <CurvePlot {...common} title="Anti-rise (%)" yLabel="anti-rise (%)" series={antiRise} bands={t?.antiRise} testId="plot-anti-rise" />
      <CurvePlot {...common} title="Axle path: rearward movement (mm)" yLabel="rearward axle movement (mm)" series={axle} testId="plot-axle-path"
        note="Positive: the axle has moved back, away from the bottom bracket, since full extension." />
      <CurvePlot {...common} title="Chain growth per gear (mm)" yLabel="chain growth (mm)" series={perCog(c.chainGrowthMm)} bands={t?.chainGrowth} testId="plot-chain-growth"
        note="Neither sprocket turning relative to the front frame." />
      <CurvePlot {...common} title="Pedal kickback per gear (deg)" yLabel="kickback (deg)" series={perCog(c.kickbackDeg)} bands={t?.kickback} testId="plot-kickback"
        note="Growth / chainring pitch radius; positive turns the cranks backwards." />
      {c.wheelRateNPerMm !== null && (
        <CurvePlot {...common} title="Wheel rate (N/mm)" yLabel="wheel rate (N/mm)" series={one('wheel rate', c.wheelRateNPerMm)} testId="plot-wheel-rate" />
      )}
    </div>
  );
});
