/**
 * The curves over vertical wheel travel, as d3 plots (d3 makes the scales, ticks and
 * paths; React draws the SVG): leverage ratio, anti-squat per cog, anti-rise, the axle's
 * rearward movement, chain growth and pedal kickback per cog, and the wheel rate when a
 * spring is given. The sag point is marked on each; the chosen cog is drawn heavier.
 */
import * as d3 from 'd3';
import { memo, useMemo } from 'react';
import type { SuspensionReport } from '../../core/suspension';
import { figure } from './labels';

const WIDTH = 400;
const HEIGHT = 230;
const MARGIN = { top: 14, right: 14, bottom: 40, left: 58 } as const;
const INNER_W = WIDTH - MARGIN.left - MARGIN.right;
const INNER_H = HEIGHT - MARGIN.top - MARGIN.bottom;

/** Our palette for per-cog lines, small cog to large. */
const cogColour = (i: number, n: number) => d3.interpolateViridis(n <= 1 ? 0.2 : 0.05 + (0.85 * i) / (n - 1));

interface Series {
  readonly label: string;
  readonly values: Float64Array;
  readonly colour: string;
  readonly strong: boolean;
}

function CurvePlot({ title, yLabel, travel, series, sagMm, sagPct, testId, note }: {
  title: string;
  yLabel: string;
  travel: Float64Array;
  series: readonly Series[];
  sagMm: number;
  sagPct: string;
  testId: string;
  note?: string;
}) {
  const { x, y, paths } = useMemo(() => {
    const xs = d3.scaleLinear().domain([travel[0], travel[travel.length - 1]]).range([0, INNER_W]);
    let lo = Infinity;
    let hi = -Infinity;
    for (const s of series) for (const v of s.values) if (Number.isFinite(v)) { lo = Math.min(lo, v); hi = Math.max(hi, v); }
    if (!(hi >= lo)) { lo = 0; hi = 1; }
    // A flat curve still gets a readable axis around its value.
    const span = hi - lo;
    const pad = span > 1e-9 * Math.max(1, Math.abs(hi)) ? 0.05 * span : Math.max(1e-3, 0.05 * Math.abs(hi));
    const ys = d3.scaleLinear().domain([lo - pad, hi + pad]).nice().range([INNER_H, 0]);
    const line = d3.line<number>().defined(Number.isFinite).x((_, k) => xs(travel[k])).y((v) => ys(v));
    return { x: xs, y: ys, paths: series.map((s) => ({ ...s, d: line(Array.from(s.values)) ?? '' })) };
  }, [travel, series]);
  const yFormat = y.tickFormat(5);
  const sagX = x(sagMm);
  return (
    <figure className="susp-plot" data-testid={testId}>
      <figcaption>{title}</figcaption>
      <svg viewBox={`0 0 ${WIDTH} ${HEIGHT}`} role="img" aria-label={title}>
        <g transform={`translate(${MARGIN.left},${MARGIN.top})`}>
          {y.ticks(5).map((v) => (
            <g key={`y${v}`} transform={`translate(0,${y(v)})`} className="susp-plot-axis">
              <line x2={INNER_W} className="susp-plot-grid" />
              <text x={-6} dy="0.32em" textAnchor="end">{yFormat(v)}</text>
            </g>
          ))}
          {paths.filter((p) => !p.strong).map((p) => <path key={p.label} d={p.d} className="susp-plot-line" style={{ stroke: p.colour }}><title>{p.label}</title></path>)}
          {paths.filter((p) => p.strong).map((p) => <path key={p.label} d={p.d} className="susp-plot-line susp-plot-line-strong" style={{ stroke: p.colour }}><title>{p.label}</title></path>)}
          {Number.isFinite(sagX) && (
            <g className="susp-plot-sag" data-testid="sag-marker">
              <line x1={sagX} x2={sagX} y2={INNER_H} />
              <text x={sagX + 4} y={10}>{`sag ${sagPct} %`}</text>
            </g>
          )}
          <line y1={INNER_H} y2={INNER_H} x2={INNER_W} className="susp-plot-axis-line" />
          <line y2={INNER_H} className="susp-plot-axis-line" />
          {x.ticks(6).map((v) => (
            <g key={`x${v}`} transform={`translate(${x(v)},${INNER_H})`} className="susp-plot-axis">
              <line y2={4} className="susp-plot-axis-line" />
              <text y={16} textAnchor="middle">{String(v)}</text>
            </g>
          ))}
          <text className="susp-plot-label" x={INNER_W / 2} y={INNER_H + 34} textAnchor="middle">vertical wheel travel (mm)</text>
          <text className="susp-plot-label" transform={`translate(${-MARGIN.left + 12},${INNER_H / 2}) rotate(-90)`} textAnchor="middle">{yLabel}</text>
        </g>
      </svg>
      {series.length > 1 && (
        <ul className="susp-legend">
          {series.map((s) => (
            <li key={s.label} className={s.strong ? 'susp-legend-strong' : undefined}>
              <span className="susp-swatch" style={{ background: s.colour }} />{s.label}
            </li>
          ))}
        </ul>
      )}
      {note !== undefined && <p className="susp-note">{note}</p>}
    </figure>
  );
}

export const SuspensionPlots = memo(function SuspensionPlots({ report, cogIndex, sagShare }: { report: SuspensionReport; cogIndex: number; sagShare: number }) {
  const c = report.curves;
  const n = c.cogTeeth.length;
  const cog = Math.min(cogIndex, n - 1);
  const perCog = (arrays: readonly Float64Array[]): Series[] =>
    arrays.map((values, i) => ({ label: `${report.chainringTeeth}×${c.cogTeeth[i]} T`, values, colour: cogColour(i, n), strong: i === cog }));
  const sagMm = report.sagPoint.travelMm;
  const sagPct = figure(100 * sagShare, 4);
  const common = { travel: c.travelMm, sagMm, sagPct };
  const one = (label: string, values: Float64Array, colour = '#1f5fa8'): Series[] => [{ label, values, colour, strong: true }];
  const antiRise: Series[] = one('brake on the axle-carrying body', c.antiRisePct);
  if (c.antiRiseFloatingPct !== null) antiRise.push({ label: 'floating brake', values: c.antiRiseFloatingPct, colour: '#c2410c', strong: true });
  return (
    <div className="susp-plots" data-testid="suspension-plots">
      <CurvePlot {...common} title="Leverage ratio (wheel mm per shock mm)" yLabel="leverage ratio" series={one('leverage ratio', c.leverageRatio)} testId="plot-leverage" />
      <CurvePlot {...common} title="Anti-squat per gear (%)" yLabel="anti-squat (%)" series={perCog(c.antiSquatPct)} testId="plot-anti-squat" note="Chosen gear drawn heavier." />
      <CurvePlot {...common} title="Anti-rise (%)" yLabel="anti-rise (%)" series={antiRise} testId="plot-anti-rise" />
      <CurvePlot {...common} title="Axle path: rearward movement (mm)" yLabel="rearward axle movement (mm)" series={one('rearward movement', c.rearwardMm)} testId="plot-axle-path"
        note="Positive: the axle has moved back, away from the bottom bracket, since full extension." />
      <CurvePlot {...common} title="Chain growth per gear (mm)" yLabel="chain growth (mm)" series={perCog(c.chainGrowthMm)} testId="plot-chain-growth"
        note="Neither sprocket turning relative to the front frame." />
      <CurvePlot {...common} title="Pedal kickback per gear (deg)" yLabel="kickback (deg)" series={perCog(c.kickbackDeg)} testId="plot-kickback"
        note="Growth / chainring pitch radius; positive turns the cranks backwards." />
      {c.wheelRateNPerMm !== null && (
        <CurvePlot {...common} title="Wheel rate (N/mm)" yLabel="wheel rate (N/mm)" series={one('wheel rate', c.wheelRateNPerMm)} testId="plot-wheel-rate" />
      )}
    </div>
  );
});
