/**
 * 2–4 searched designs overlaid: their curves on shared axes (leverage ratio, anti-squat
 * and kickback and chain growth in the chosen cog, anti-rise, the axle's rearward
 * movement), each design its own colour and dash, its sag point marked, the problem's
 * targets and bands drawn under them; their side views overlaid in the sag pose; the
 * compared curves as CSV. The caution stays on the view and in the file.
 */
import * as d3 from 'd3';
import { memo, useMemo } from 'react';
import { SUSPENSION_CAUTION, sideView } from '../../../core/suspension';
import type { SuspensionProblemInput } from '../../../core/synthesis';
import { downloadText } from '../../results/download';
import { CurvePlot, type Series } from '../CurvePlot';
import { figure, fileStem } from '../labels';
import { targetOverlays } from '../targetOverlays';
import { compareCsv, type ComparedDesign } from './compare';

export const CompareView = memo(function CompareView({ designs, problem, cogIndex }: { designs: readonly ComparedDesign[]; problem: SuspensionProblemInput; cogIndex: number }) {
  const b = problem.bicycle;
  const teeth = b.cogTeeth[cogIndex];
  const gear = `${b.chainringTeeth} × ${teeth ?? '?'} T`;
  const shown = designs.filter((d) => d.report !== null);
  const per = (pick: (d: ComparedDesign) => ArrayLike<number> | undefined): Series[] =>
    shown.map((d) => ({ label: d.label, travel: d.report?.curves.travelMm ?? [], values: pick(d) ?? [], colour: d.colour, dash: d.dash, strong: true }));
  const sags = shown.map((d) => ({ travelMm: d.report?.sagPoint.travelMm ?? NaN, label: `sag ${d.label.split(' ')[0]}`, colour: d.colour }));
  const targets = targetOverlays(problem, teeth, shown[0]?.report?.totalTravelMm ?? 0, 'the first design\'s');
  const lr = per((d) => d.report?.curves.leverageRatio);
  if (targets.leverage !== null) lr.unshift(targets.leverage);
  const axle = per((d) => d.report?.curves.rearwardMm);
  if (targets.axle !== null) axle.unshift(targets.axle);
  const travelNote = targets.travelNote === '' ? '' : ` ${targets.travelNote}`;
  return (
    <section className="susp-compare" aria-labelledby="susp-compare-title" data-testid="compare-view">
      <h3 id="susp-compare-title">{`Compare ${designs.length} designs`}</h3>
      <p className="susp-caution" role="note"><strong>Caution.</strong> {SUSPENSION_CAUTION}</p>
      <ul className="susp-legend" data-testid="compare-legend">
        {designs.map((d) => (
          <li key={d.label}>
            <svg className="susp-swatch" width={28} height={8} aria-hidden="true"><line x1={1} x2={27} y1={4} y2={4} style={{ stroke: d.colour, strokeDasharray: d.dash }} /></svg>
            {`${d.label} (${d.dashName})`}{d.failure === null ? '' : `: no curves, ${d.failure}`}
          </li>
        ))}
      </ul>
      <p className="susp-note">{`Per-gear curves in the ${gear} cog. Grey dashed: targets; shaded: target bands.${travelNote}`}</p>
      <div className="susp-plots" data-testid="compare-plots">
        <CurvePlot title="Leverage ratio (wheel mm per shock mm)" yLabel="leverage ratio" series={lr} sags={sags} testId="compare-leverage" legend />
        <CurvePlot title={`Anti-squat, ${gear} (%)`} yLabel="anti-squat (%)" series={per((d) => d.report?.curves.antiSquatPct[cogIndex])} sags={sags} bands={targets.antiSquat} testId="compare-anti-squat" legend />
        <CurvePlot title="Anti-rise (%)" yLabel="anti-rise (%)" series={per((d) => d.report?.curves.antiRisePct)} sags={sags} bands={targets.antiRise} testId="compare-anti-rise" legend />
        <CurvePlot title="Axle path: rearward movement (mm)" yLabel="rearward axle movement (mm)" series={axle} sags={sags} testId="compare-axle-path" legend />
        <CurvePlot title={`Chain growth, ${gear} (mm)`} yLabel="chain growth (mm)" series={per((d) => d.report?.curves.chainGrowthMm[cogIndex])} sags={sags} bands={targets.chainGrowth} testId="compare-chain-growth" legend />
        <CurvePlot title={`Pedal kickback, ${gear} (deg)`} yLabel="kickback (deg)" series={per((d) => d.report?.curves.kickbackDeg[cogIndex])} sags={sags} bands={targets.kickback} testId="compare-kickback" legend />
      </div>
      <OverlaidSideViews designs={shown} problem={problem} cogIndex={cogIndex} />
      <button type="button" onClick={() => downloadText(compareCsv(problem.name, designs, cogIndex), `${fileStem(problem.name)}-compared-curves.csv`, 'text/csv')}>
        Download the compared curves (CSV)
      </button>
    </section>
  );
});

const VIEW_W = 640;
const VIEW_H = 360;

/** The designs' side views in their sag poses, overlaid on one drawing: wheels and chain of the first, every design's links, shock and pivots in its style. */
function OverlaidSideViews({ designs, problem, cogIndex }: { designs: readonly ComparedDesign[]; problem: SuspensionProblemInput; cogIndex: number }) {
  const views = useMemo(
    () => designs.flatMap((d) => {
      if (d.report === null) return [];
      const v = sideView({ bicycle: problem.bicycle, linkage: d.linkage }, { shockLengthMm: d.report.sagPoint.shockLengthMm, cogIndex });
      return v.ok ? [{ design: d, primitives: v.primitives }] : [];
    }),
    [designs, problem, cogIndex],
  );
  if (views.length === 0) return null;
  let x0 = Infinity, x1 = -Infinity, y0 = Infinity, y1 = -Infinity;
  const take = (x: number, y: number) => { if (Number.isFinite(x) && Number.isFinite(y)) { x0 = Math.min(x0, x); x1 = Math.max(x1, x); y0 = Math.min(y0, y); y1 = Math.max(y1, y); } };
  for (const v of views) for (const p of v.primitives) {
    if (p.kind === 'circle') { take(p.cxMm - p.rMm, p.cyMm - p.rMm); take(p.cxMm + p.rMm, p.cyMm + p.rMm); }
    else if (p.kind === 'segment') { take(p.x1Mm, p.y1Mm); take(p.x2Mm, p.y2Mm); }
    else take(p.xMm, p.yMm);
  }
  const pad = 30;
  const scale = Math.min((VIEW_W - 2 * pad) / Math.max(1, x1 - x0), (VIEW_H - 2 * pad) / Math.max(1, y1 - y0));
  const x = d3.scaleLinear().domain([x0, x0 + 1]).range([pad, pad + scale]);
  const y = d3.scaleLinear().domain([y0, y0 + 1]).range([VIEW_H - pad, VIEW_H - pad - scale]);
  const shared = new Set(['rearWheel', 'frontWheel', 'chainring', 'bottomBracket', 'ground']);
  return (
    <figure className="susp-compare-side" data-testid="compare-side-views">
      <figcaption>Side views overlaid, each in its sag pose (wheels and chainring of the first design)</figcaption>
      <svg viewBox={`0 0 ${VIEW_W} ${VIEW_H}`} role="img" aria-label="Compared designs' side views overlaid">
        {views.map(({ design, primitives }, i) => (
          <g key={design.label} data-design={design.label} style={{ stroke: design.colour, strokeDasharray: design.dash }}>
            {primitives.filter((p) => i === 0 || !shared.has(p.role)).map((p, k) => {
              const own = !shared.has(p.role);
              const cls = own ? 'susp-compare-own' : 'susp-compare-shared';
              if (p.kind === 'circle') return <circle key={k} className={cls} cx={x(p.cxMm)} cy={y(p.cyMm)} r={p.rMm * scale} />;
              if (p.kind === 'segment') return <line key={k} className={cls} x1={x(p.x1Mm)} y1={y(p.y1Mm)} x2={x(p.x2Mm)} y2={y(p.y2Mm)} />;
              return <circle key={k} className="susp-compare-pivot" cx={x(p.xMm)} cy={y(p.yMm)} r={3} style={{ fill: design.colour }} />;
            })}
          </g>
        ))}
        <text x={8} y={VIEW_H - 8} className="susp-plot-label">{`1 px = ${figure(1 / scale, 3)} mm`}</text>
      </svg>
    </figure>
  );
}
