/**
 * One curve plot over vertical wheel travel, shared by the single-design plots and the
 * compare view (d3 makes the scales, ticks and paths; React draws the SVG): any number
 * of series, each over its own travel samples, with its colour and dash; sag markers;
 * target bands and target curves drawn under the series; a legend whose swatches show
 * the dash as well as the colour.
 */
import * as d3 from 'd3';
import { useMemo } from 'react';

const WIDTH = 400;
const HEIGHT = 230;
const MARGIN = { top: 14, right: 14, bottom: 40, left: 58 } as const;
const INNER_W = WIDTH - MARGIN.left - MARGIN.right;
const INNER_H = HEIGHT - MARGIN.top - MARGIN.bottom;

export interface Series {
  readonly label: string;
  /** Travel of each sample, mm. */
  readonly travel: ArrayLike<number>;
  readonly values: ArrayLike<number>;
  readonly colour: string;
  readonly strong: boolean;
  /** SVG stroke-dasharray; none for a solid line. */
  readonly dash?: string;
  /** A target curve: drawn thin and grey-dashed under the designs. */
  readonly target?: boolean;
}

export interface SagMark {
  readonly travelMm: number;
  readonly label: string;
  readonly colour?: string;
}

/** A target band: values from `lo` to `hi` are on target. */
export interface PlotBand {
  readonly lo: number;
  readonly hi: number;
  readonly label: string;
}

function extentOf(series: readonly Series[], bands: readonly PlotBand[]): { x: [number, number]; y: [number, number] } {
  let x0 = Infinity;
  let x1 = -Infinity;
  let lo = Infinity;
  let hi = -Infinity;
  for (const s of series) {
    for (let k = 0; k < s.values.length; k++) {
      const t = s.travel[k];
      const v = s.values[k];
      if (Number.isFinite(t)) { x0 = Math.min(x0, t); x1 = Math.max(x1, t); }
      if (Number.isFinite(v)) { lo = Math.min(lo, v); hi = Math.max(hi, v); }
    }
  }
  for (const b of bands) for (const v of [b.lo, b.hi]) if (Number.isFinite(v)) { lo = Math.min(lo, v); hi = Math.max(hi, v); }
  if (!(x1 > x0)) { x0 = 0; x1 = 1; }
  if (!(hi >= lo)) { lo = 0; hi = 1; }
  return { x: [x0, x1], y: [lo, hi] };
}

export function CurvePlot({ title, yLabel, series, sags, bands = [], testId, note, legend = series.length > 1 }: {
  title: string;
  yLabel: string;
  series: readonly Series[];
  sags: readonly SagMark[];
  bands?: readonly PlotBand[];
  testId: string;
  note?: string;
  legend?: boolean;
}) {
  const { x, y, paths } = useMemo(() => {
    const e = extentOf(series, bands);
    const xs = d3.scaleLinear().domain(e.x).range([0, INNER_W]);
    let [lo, hi] = e.y;
    // A flat curve still gets a readable axis around its value.
    const span = hi - lo;
    const pad = span > 1e-9 * Math.max(1, Math.abs(hi)) ? 0.05 * span : Math.max(1e-3, 0.05 * Math.abs(hi));
    lo -= pad;
    hi += pad;
    const ys = d3.scaleLinear().domain([lo, hi]).nice().range([INNER_H, 0]);
    return {
      x: xs,
      y: ys,
      paths: series.map((s) => {
        const line = d3.line<number>().defined(Number.isFinite).x((_, k) => xs(s.travel[k])).y((v) => ys(v));
        return { ...s, d: line(Array.from(s.values)) ?? '' };
      }),
    };
  }, [series, bands]);
  const yFormat = y.tickFormat(5);
  const [yTop, yBottom] = [y.domain()[1], y.domain()[0]];
  const clampY = (v: number) => y(Math.max(yBottom, Math.min(yTop, v)));
  const lineClass = (p: Series) => (p.target === true ? 'susp-plot-line susp-plot-target' : p.strong ? 'susp-plot-line susp-plot-line-strong' : 'susp-plot-line');
  const ordered = [...paths.filter((p) => p.target === true), ...paths.filter((p) => p.target !== true && !p.strong), ...paths.filter((p) => p.target !== true && p.strong)];
  return (
    <figure className="susp-plot" data-testid={testId}>
      <figcaption>{title}</figcaption>
      <svg viewBox={`0 0 ${WIDTH} ${HEIGHT}`} role="img" aria-label={title}>
        <g transform={`translate(${MARGIN.left},${MARGIN.top})`}>
          {bands.map((b) => (
            <rect key={b.label} className="susp-plot-band" data-testid="target-band" x={0} width={INNER_W} y={clampY(b.hi)} height={Math.max(0, clampY(b.lo) - clampY(b.hi))}>
              <title>{b.label}</title>
            </rect>
          ))}
          {y.ticks(5).map((v) => (
            <g key={`y${v}`} transform={`translate(0,${y(v)})`} className="susp-plot-axis">
              <line x2={INNER_W} className="susp-plot-grid" />
              <text x={-6} dy="0.32em" textAnchor="end">{yFormat(v)}</text>
            </g>
          ))}
          {ordered.map((p) => (
            <path key={p.label} d={p.d} className={lineClass(p)} style={{ stroke: p.colour, strokeDasharray: p.dash }} data-series={p.label}><title>{p.label}</title></path>
          ))}
          {sags.map((s, i) => {
            const sx = x(s.travelMm);
            if (!Number.isFinite(sx)) return null;
            return (
              <g key={`${s.label}${i}`} className="susp-plot-sag" data-testid="sag-marker">
                <line x1={sx} x2={sx} y2={INNER_H} style={s.colour === undefined ? undefined : { stroke: s.colour }} />
                <text x={sx + 4} y={10 + 12 * i} style={s.colour === undefined ? undefined : { fill: s.colour }}>{s.label}</text>
              </g>
            );
          })}
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
      {legend && (
        <ul className="susp-legend">
          {series.map((s) => (
            <li key={s.label} className={s.strong ? 'susp-legend-strong' : undefined}>
              <svg className="susp-swatch" width={22} height={8} aria-hidden="true">
                <line x1={1} x2={21} y1={4} y2={4} style={{ stroke: s.colour, strokeDasharray: s.dash }} />
              </svg>
              {s.label}
            </li>
          ))}
          {bands.map((b) => <li key={b.label}><span className="susp-swatch susp-swatch-band" />{b.label}</li>)}
        </ul>
      )}
      {note !== undefined && <p className="susp-note">{note}</p>}
    </figure>
  );
}
