/**
 * The detail view's d3 plots: the error at each target point (mm), and the transmission
 * angle over the input (deg) with the 40°–140° guideline band (common practice).
 * d3 makes the scales, ticks and line paths; React draws the SVG.
 */
import * as d3 from 'd3';
import { memo, useMemo, type ReactNode } from 'react';
import { TRANSMISSION_GUIDELINE_DEG } from '../../core/linkage/report';
import { formatMmValue } from './format';
import { driverDisplayValue, type CandidateMotion } from './motion';

const WIDTH = 420;
const HEIGHT = 210;
const MARGIN = { top: 12, right: 14, bottom: 40, left: 64 } as const;
const INNER_W = WIDTH - MARGIN.left - MARGIN.right;
const INNER_H = HEIGHT - MARGIN.top - MARGIN.bottom;
/** Axes whose largest value is below this are labelled in exponent form. */
const TINY_AXIS = 1e-3;
/** Colours of the transmission lines, one per four-bar loop (ours). */
const LOOP_COLOURS = ['#1f5fa8', '#c2410c', '#15803d'] as const;

function PlotFrame({
  title,
  xScale,
  yScale,
  xLabel,
  yLabel,
  xTickFormat,
  children,
  testId,
}: {
  title: string;
  xScale: d3.ScaleLinear<number, number> | d3.ScaleBand<string>;
  yScale: d3.ScaleLinear<number, number>;
  xLabel: string;
  yLabel: string;
  xTickFormat?: (v: number) => string;
  children: ReactNode;
  testId: string;
}) {
  const xTicks: { at: number; text: string }[] = 'bandwidth' in xScale
    ? thinBand(xScale.domain()).map((v) => ({ at: (xScale(v) ?? 0) + xScale.bandwidth() / 2, text: v }))
    : xScale.ticks(6).map((v) => ({ at: xScale(v), text: xTickFormat ? xTickFormat(v) : String(v) }));
  const yTicks = yScale.ticks(5);
  const yFormat = tickFormat(yScale);
  return (
    <figure className="results-plot" data-testid={testId}>
      <figcaption>{title}</figcaption>
      <svg width={WIDTH} height={HEIGHT} viewBox={`0 0 ${WIDTH} ${HEIGHT}`} role="img" aria-label={title}>
        <g transform={`translate(${MARGIN.left},${MARGIN.top})`}>
          {yTicks.map((v) => (
            <g key={`y${v}`} transform={`translate(0,${yScale(v)})`} className="results-axis">
              <line x2={INNER_W} className="results-grid" />
              <text x={-6} dy="0.32em" textAnchor="end">{yFormat(v)}</text>
            </g>
          ))}
          {children}
          <line y1={INNER_H} y2={INNER_H} x2={INNER_W} className="results-axis-line" />
          <line y2={INNER_H} className="results-axis-line" />
          {xTicks.map((t) => (
            <g key={`x${t.at}`} transform={`translate(${t.at},${INNER_H})`} className="results-axis">
              <line y2={4} className="results-axis-line" />
              <text y={16} textAnchor="middle">{t.text}</text>
            </g>
          ))}
          <text className="results-axis-label" x={INNER_W / 2} y={INNER_H + 34} textAnchor="middle">{xLabel}</text>
          <text className="results-axis-label" transform={`translate(${-MARGIN.left + 12},${INNER_H / 2}) rotate(-90)`} textAnchor="middle">{yLabel}</text>
        </g>
      </svg>
    </figure>
  );
}

/** Tick labels that stay short: exponent form for tiny errors (an exact fit's 1e-14 mm). */
function tickFormat(scale: d3.ScaleLinear<number, number>): (v: number) => string {
  const top = Math.max(...scale.domain().map(Math.abs));
  return top < TINY_AXIS ? d3.format('.1e') : scale.tickFormat(5);
}

/** At most about a dozen labels under a band axis. */
function thinBand(domain: readonly string[]): string[] {
  const every = Math.max(1, Math.ceil(domain.length / 12));
  return domain.filter((_, i) => i % every === 0);
}

/** Error at each target point, mm: bars, with the RMS as a dashed line. */
export const ErrorPlot = memo(function ErrorPlot({ perPointMm, rmsMm }: { perPointMm: readonly number[]; rmsMm: number }) {
  const { x, y, bars } = useMemo(() => {
    const labels = perPointMm.map((_, i) => String(i + 1));
    const xs = d3.scaleBand<string>().domain(labels).range([0, INNER_W]).padding(0.2);
    const top = d3.max(perPointMm.filter(Number.isFinite)) ?? 0;
    const ys = d3.scaleLinear().domain([0, top > 0 ? top : 1]).nice().range([INNER_H, 0]);
    return { x: xs, y: ys, bars: labels.map((label, i) => ({ label, value: perPointMm[i] })) };
  }, [perPointMm]);
  return (
    <PlotFrame title="Error along the path (mm per target point)" xScale={x} yScale={y} xLabel="target point" yLabel="error (mm)" testId="error-plot">
      {bars.map((b) => Number.isFinite(b.value) && (
        <rect key={b.label} className="results-bar" x={x(b.label)} width={x.bandwidth()} y={y(b.value)} height={INNER_H - y(b.value)}>
          <title>{`point ${b.label}: ${formatMmValue(b.value)} mm`}</title>
        </rect>
      ))}
      {Number.isFinite(rmsMm) && <line className="results-rms-line" x2={INNER_W} y1={y(rmsMm)} y2={y(rmsMm)}><title>{`RMS ${formatMmValue(rmsMm)} mm`}</title></line>}
    </PlotFrame>
  );
});

/** Transmission angle of each four-bar loop over the driver value, deg, with the guideline band. */
export const TransmissionPlot = memo(function TransmissionPlot({ motion, cursor }: { motion: CandidateMotion; cursor: number }) {
  const unit = motion.driver.unit;
  const { x, y, lines } = useMemo(() => {
    const shown = Array.from(motion.values, (v) => driverDisplayValue(motion, v));
    const extent = d3.extent(shown) as [number, number];
    const xs = d3.scaleLinear().domain(extent).range([0, INNER_W]);
    const ys = d3.scaleLinear().domain([0, 180]).range([INNER_H, 0]);
    const line = d3.line<number>().defined((mu) => Number.isFinite(mu)).x((_, k) => xs(shown[k])).y((mu) => ys(mu));
    return { x: xs, y: ys, lines: motion.loops.map((loop) => ({ label: loop.bodyIds.join(' · '), d: line(Array.from(loop.muDeg)) ?? '' })) };
  }, [motion]);
  const band = TRANSMISSION_GUIDELINE_DEG;
  const cursorX = x(driverDisplayValue(motion, cursor));
  return (
    <div className="results-plot-wrap">
      <PlotFrame
        title="Transmission angle over the input (deg)"
        xScale={x}
        yScale={y}
        xLabel={unit === 'deg' ? 'driver angle (deg)' : 'driver length (mm)'}
        yLabel="transmission angle (deg)"
        testId="transmission-plot"
      >
        <rect className="results-guideline" x={0} width={INNER_W} y={y(band.max)} height={y(band.min) - y(band.max)} data-testid="transmission-guideline">
          <title>{`${band.min}°–${band.max}° guideline (common practice)`}</title>
        </rect>
        <text className="results-guideline-label" x={INNER_W - 4} y={y(band.max) + 12} textAnchor="end">
          {`${band.min}°–${band.max}° guideline (common practice)`}
        </text>
        {lines.map((l, i) => <path key={i} d={l.d} className="results-mu-line" style={{ stroke: LOOP_COLOURS[i % LOOP_COLOURS.length] }} />)}
        {Number.isFinite(cursorX) && <line className="results-cursor" x1={cursorX} x2={cursorX} y2={INNER_H} />}
      </PlotFrame>
      {lines.length > 1 && (
        <ul className="results-legend">
          {lines.map((l, i) => (
            <li key={i}><span className="results-swatch" style={{ background: LOOP_COLOURS[i % LOOP_COLOURS.length] }} />loop {l.label}</li>
          ))}
        </ul>
      )}
      {lines.length === 0 && <p className="results-note">This linkage has no four-bar loop of pin joints, so no transmission angle is measured.</p>}
    </div>
  );
});
