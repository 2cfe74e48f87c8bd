/**
 * The contact diagram of identical legs on one shaft: a row per leg over the shaft's
 * turn with its stance as bars, the number of feet on the ground below, and the body
 * height ripple, from the core's phasedLegs.
 */
import * as d3 from 'd3';
import { memo, useMemo } from 'react';
import type { GaitFigures } from '../../../core/gait';
import type { LegPhasing } from '../../../core/io/legFile';
import { figure } from '../../suspension/labels';
import { contactDiagramData } from './contactData';
import { LegCaution } from './LegCaution';

const WIDTH = 640;
const ROW_PX = 22;
const COUNT_PX = 30;
const MARGIN = { top: 8, right: 14, bottom: 42, left: 110 } as const;
const INNER_W = WIDTH - MARGIN.left - MARGIN.right;
const ANGLE_TICKS_DEG = [0, 45, 90, 135, 180, 225, 270, 315, 360];

function percent(share: number): string {
  return `${figure(100 * share, 3)} %`;
}

/** `caution`: show the walking-leg caution under the diagram (a page that shows it once for all its views passes false). */
export const ContactDiagram = memo(function ContactDiagram({ figures, phasing, caution = true }: { figures: GaitFigures; phasing: LegPhasing; caution?: boolean }) {
  const result = useMemo(() => contactDiagramData(figures, phasing), [figures, phasing]);
  if (!result.ok) {
    return (
      <section className="leg-contact" data-testid="leg-contact-diagram">
        <h3>Feet on the ground</h3>
        <p className="leg-problem" role="alert">The contact diagram cannot be drawn: {result.reason}.</p>
        {caution && <LegCaution />}
      </section>
    );
  }
  const { rows, counts, phased } = result.data;
  const x = d3.scaleLinear().domain([0, 360]).range([0, INNER_W]);
  const rowsH = rows.length * ROW_PX;
  const innerH = rowsH + 8 + COUNT_PX;
  const height = MARGIN.top + innerH + MARGIN.bottom;
  const shade = d3.scaleLinear<string>().domain([0, Math.max(1, phased.legs)]).range(['#fdeaea', '#1d4a2e']);
  const noFoot = phased.shareByFeet[0] ?? 0;
  const label = `Contact diagram: stance of each of ${phased.legs} legs over the shaft angle (°), and the feet on the ground, from ${phased.minFeet} to ${phased.maxFeet}`;
  return (
    <section className="leg-contact" data-testid="leg-contact-diagram">
      <h3>Feet on the ground ({phased.legs} legs on one shaft)</h3>
      <svg viewBox={`0 0 ${WIDTH} ${height}`} role="img" aria-label={label}>
        <g transform={`translate(${MARGIN.left},${MARGIN.top})`}>
          {ANGLE_TICKS_DEG.map((v) => <line key={`g${v}`} className="leg-plot-grid" x1={x(v)} x2={x(v)} y2={innerH} />)}
          {rows.map((row, i) => (
            <g key={row.leg} transform={`translate(0,${i * ROW_PX})`} data-testid="contact-row">
              <text className="leg-plot-label" x={-8} y={ROW_PX / 2} dy="0.32em" textAnchor="end">{`leg ${row.leg} (${figure(row.phaseDeg)}°)`}</text>
              <rect className="leg-contact-track" width={INNER_W} y={3} height={ROW_PX - 6} />
              {row.bars.map((b, j) => (
                <rect key={j} className="leg-contact-bar" data-testid="stance-bar" x={x(b.fromDeg)} width={Math.max(0, x(b.toDeg) - x(b.fromDeg))} y={3} height={ROW_PX - 6}>
                  <title>{`leg ${row.leg} in stance from ${b.fromDeg.toFixed(1)}° to ${b.toDeg.toFixed(1)}° of the shaft`}</title>
                </rect>
              ))}
            </g>
          ))}
          <g transform={`translate(0,${rowsH + 8})`}>
            <text className="leg-plot-label" x={-8} y={COUNT_PX / 2} dy="0.32em" textAnchor="end">feet on ground</text>
            {counts.map((c, j) => {
              const w = x(c.toDeg) - x(c.fromDeg);
              return (
                <g key={j} data-testid="feet-count" data-feet={c.feet}>
                  <rect className={c.feet === 0 ? 'leg-contact-count leg-contact-none' : 'leg-contact-count'} x={x(c.fromDeg)} width={Math.max(0, w)} height={COUNT_PX} style={{ fill: shade(c.feet) }}>
                    <title>{`${c.feet} ${c.feet === 1 ? 'foot' : 'feet'} on the ground from ${c.fromDeg.toFixed(1)}° to ${c.toDeg.toFixed(1)}°`}</title>
                  </rect>
                  {w > 12 && <text className={c.feet / phased.legs > 0.5 ? 'leg-contact-count-text leg-contact-count-light' : 'leg-contact-count-text'} x={x(c.fromDeg) + w / 2} y={COUNT_PX / 2} dy="0.32em" textAnchor="middle">{c.feet}</text>}
                </g>
              );
            })}
          </g>
          <line y1={innerH} y2={innerH} x2={INNER_W} className="leg-plot-axis-line" />
          {ANGLE_TICKS_DEG.map((v) => (
            <g key={`x${v}`} transform={`translate(${x(v)},${innerH})`} className="leg-plot-axis">
              <line y2={4} className="leg-plot-axis-line" />
              <text y={16} textAnchor="middle">{`${v}°`}</text>
            </g>
          ))}
          <text className="leg-plot-label" x={INNER_W / 2} y={innerH + 36} textAnchor="middle">shaft angle from the reference pose (°)</text>
        </g>
      </svg>
      <ul className="leg-contact-figures" data-testid="leg-contact-figures">
        <li>Feet on the ground: {phased.minFeet === phased.maxFeet ? `${phased.minFeet} throughout the turn` : `${phased.minFeet} to ${phased.maxFeet}`}; {phased.shareByFeet.map((s, n) => (s > 0 ? `${n}: ${percent(s)} of the turn` : null)).filter((s) => s !== null).join(', ')}.</li>
        <li data-testid="leg-body-ripple">Body height ripple: {figure(phased.bodyHeightRippleMm)} mm (the lowest foot between {figure(phased.lowestFootMinMm)} mm and {figure(phased.lowestFootMaxMm)} mm of the ground line).</li>
      </ul>
      {noFoot > 0 && <p className="leg-problem" role="note">For {percent(noFoot)} of the turn no foot is within the stance tolerance of the ground: the body is not carried then.</p>}
      <p className="leg-note">{phased.model} Stance at a tolerance of ±{figure(phased.toleranceMm)} mm; each leg’s phase is its crank’s lead on the shaft, in the crank’s direction.</p>
      {caution && <LegCaution />}
    </section>
  );
});
