/**
 * One plot over the crank's turn (0–360° from the reference pose), in the project's plot
 * style (d3 makes the scales, ticks and paths; React draws the SVG): any number of
 * series, each its colour and dash; stance shaded (the whole height for one leg, a strip
 * per leg under the curves for several); an optional band of values (the stance
 * tolerance); axes with their units.
 */
import * as d3 from 'd3';
import { useMemo } from 'react';
import type { DegRange } from './legGeometry';

const WIDTH = 420;
const HEIGHT = 240;
const MARGIN = { top: 14, right: 14, bottom: 42, left: 60 } as const;
const INNER_W = WIDTH - MARGIN.left - MARGIN.right;
const INNER_H = HEIGHT - MARGIN.top - MARGIN.bottom;
/** Height of each leg's stance strip when several share a plot, px. */
const STRIP_PX = 5;
const ANGLE_TICKS_DEG = [0, 45, 90, 135, 180, 225, 270, 315, 360];

export interface TurnSeries {
  readonly label: string;
  /** Crank angle of each sample, degrees. */
  readonly angleDeg: ArrayLike<number>;
  readonly values: ArrayLike<number>;
  readonly colour: string;
  /** SVG stroke-dasharray; none for a solid line. */
  readonly dash?: string;
  /** Where this series' leg is in stance, degrees within 0–360. */
  readonly stance: readonly DegRange[];
}

export interface TurnBand {
  readonly lo: number;
  readonly hi: number;
  readonly label: string;
}

function valueExtent(series: readonly TurnSeries[], bands: readonly TurnBand[]): [number, number] {
  let lo = Infinity;
  let hi = -Infinity;
  for (const s of series) {
    for (let k = 0; k < s.values.length; k++) {
      const v = s.values[k];
      if (Number.isFinite(v)) { lo = Math.min(lo, v); hi = Math.max(hi, v); }
    }
  }
  for (const b of bands) for (const v of [b.lo, b.hi]) if (Number.isFinite(v)) { lo = Math.min(lo, v); hi = Math.max(hi, v); }
  if (!(hi >= lo)) return [0, 1];
  // A flat curve still gets a readable axis around its value.
  const span = hi - lo;
  const pad = span > 1e-9 * Math.max(1, Math.abs(hi)) ? 0.05 * span : Math.max(1e-3, 0.05 * Math.abs(hi));
  return [lo - pad, hi + pad];
}

export function TurnPlot({ title, yLabel, series, bands = [], zeroLine = false, testId }: {
  title: string;
  /** The value axis' name with its unit. */
  yLabel: string;
  series: readonly TurnSeries[];
  bands?: readonly TurnBand[];
  /** A line at value 0 (the ground line, or no speed). */
  zeroLine?: boolean;
  testId: string;
}) {
  const { x, y, paths } = useMemo(() => {
    const xs = d3.scaleLinear().domain([0, 360]).range([0, INNER_W]);
    const ys = d3.scaleLinear().domain(valueExtent(series, bands)).nice().range([INNER_H, 0]);
    return {
      x: xs,
      y: ys,
      paths: series.map((s) => {
        const line = d3.line<number>().defined(Number.isFinite).x((_, k) => xs(s.angleDeg[k])).y((v) => ys(v));
        return { ...s, d: line(Array.from(s.values)) ?? '' };
      }),
    };
  }, [series, bands]);
  const yFormat = y.tickFormat(5);
  const [yBottom, yTop] = y.domain();
  const clampY = (v: number) => y(Math.max(yBottom, Math.min(yTop, v)));
  const several = series.length > 1;
  const stripTop = INNER_H - STRIP_PX * series.length;
  return (
    <figure className="leg-plot" data-testid={testId}>
      <figcaption>{title}</figcaption>
      <svg viewBox={`0 0 ${WIDTH} ${HEIGHT}`} role="img" aria-label={`${title}: ${yLabel} over the crank angle (°), stance shaded`}>
        <g transform={`translate(${MARGIN.left},${MARGIN.top})`}>
          {series.map((s, i) => s.stance.map((r, j) => (
            <rect
              key={`${i}-${j}`}
              className={several ? 'leg-plot-stance-strip' : 'leg-plot-stance'}
              data-testid="stance-shade"
              x={x(r.fromDeg)}
              width={Math.max(0, x(r.toDeg) - x(r.fromDeg))}
              y={several ? stripTop + STRIP_PX * i : 0}
              height={several ? STRIP_PX - 1 : INNER_H}
              style={several ? { fill: s.colour } : undefined}
            >
              <title>{`${several ? `${s.label}: ` : ''}stance ${r.fromDeg.toFixed(1)}°–${r.toDeg.toFixed(1)}°`}</title>
            </rect>
          )))}
          {bands.map((b) => (
            <rect key={b.label} className="leg-plot-band" data-testid="tolerance-band" x={0} width={INNER_W} y={clampY(b.hi)} height={Math.max(0, clampY(b.lo) - clampY(b.hi))}>
              <title>{b.label}</title>
            </rect>
          ))}
          {y.ticks(5).map((v) => (
            <g key={`y${v}`} transform={`translate(0,${y(v)})`} className="leg-plot-axis">
              <line x2={INNER_W} className="leg-plot-grid" />
              <text x={-6} dy="0.32em" textAnchor="end">{yFormat(v)}</text>
            </g>
          ))}
          {zeroLine && yBottom <= 0 && yTop >= 0 && <line className="leg-plot-zero" x2={INNER_W} y1={y(0)} y2={y(0)} />}
          {paths.map((p, i) => (
            <path key={i} d={p.d} className="leg-plot-line" style={{ stroke: p.colour, strokeDasharray: p.dash }} data-series={p.label}><title>{p.label}</title></path>
          ))}
          <line y1={INNER_H} y2={INNER_H} x2={INNER_W} className="leg-plot-axis-line" />
          <line y2={INNER_H} className="leg-plot-axis-line" />
          {ANGLE_TICKS_DEG.map((v) => (
            <g key={`x${v}`} transform={`translate(${x(v)},${INNER_H})`} className="leg-plot-axis">
              <line y2={4} className="leg-plot-axis-line" />
              <text y={16} textAnchor="middle">{`${v}°`}</text>
            </g>
          ))}
          <text className="leg-plot-label" x={INNER_W / 2} y={INNER_H + 36} textAnchor="middle">crank angle from the reference pose (°)</text>
          <text className="leg-plot-label" transform={`translate(${-MARGIN.left + 12},${INNER_H / 2}) rotate(-90)`} textAnchor="middle">{yLabel}</text>
        </g>
      </svg>
      <ul className="leg-legend">
        {several && series.map((s, i) => (
          <li key={i}>
            <svg className="leg-swatch" width={22} height={8} aria-hidden="true">
              <line x1={1} x2={21} y1={4} y2={4} style={{ stroke: s.colour, strokeDasharray: s.dash }} />
            </svg>
            {s.label}
          </li>
        ))}
        <li><span className={several ? 'leg-swatch leg-swatch-strip' : 'leg-swatch leg-swatch-stance'} />{several ? 'stance (a strip per leg, in its colour)' : 'stance'}</li>
        {bands.map((b) => <li key={b.label}><span className="leg-swatch leg-swatch-band" />{b.label}</li>)}
      </ul>
    </figure>
  );
}
