/**
 * Two to four legs compared: their foot trajectories overlaid on one ground view (each
 * its colour and dash, stance thick), the height and speed plots on shared axes, their
 * figures side by side, a CSV of every curve, and the caution.
 */
import { memo, useMemo } from 'react';
import { gaitFigures, type GaitFigures } from '../../../core/gait';
import type { LegDesign } from '../../../core/io/legFile';
import { downloadText } from '../../results/download';
import { unionBox, viewBoxAttr, viewOf } from '../../results/drawing';
import { FrameLayer } from '../../results/PathLayers';
import { figure } from '../../suspension/labels';
import { gaitFigureRows } from './figureRows';
import { GaitPlotsOf, type PlottedLeg } from './GaitPlots';
import { LegCaution } from './LegCaution';
import { legCompareCsv } from './legCsv';
import { legStatic } from './legDrawing';
import { legBox, legPoser } from './legGeometry';
import { GaitConventions } from './LegFigures';

/** Each compared leg's colour and dash, in order (legViews.css has no say: they are data). */
export const COMPARE_STYLES: readonly { readonly colour: string; readonly dash?: string }[] = [
  { colour: '#1f5fa8' },
  { colour: '#b4232a', dash: '7 3' },
  { colour: '#2f6b3a', dash: '2 3' },
  { colour: '#7a4fb0', dash: '9 3 2 3' },
];
export const MIN_COMPARED_LEGS = 2;
export const MAX_COMPARED_LEGS = COMPARE_STYLES.length;

/** Two legs share a ground line when their origins and directions agree to this (mm, and a share for the unit vectors). */
const SAME_GROUND_TOL = 1e-9;

interface Compared {
  readonly label: string;
  readonly design: LegDesign;
  readonly result: { readonly ok: true; readonly figures: GaitFigures } | { readonly ok: false; readonly reason: string };
  readonly colour: string;
  readonly dash?: string;
}

function sameGround(a: GaitFigures, b: GaitFigures): boolean {
  const close = (u: number, v: number) => Math.abs(u - v) <= SAME_GROUND_TOL * Math.max(1, Math.abs(u), Math.abs(v));
  const ga = a.leg;
  const gb = b.leg;
  // The same line: b's origin on a's line, the same direction, and the same tolerance.
  const offset = (gb.originMm.x - ga.originMm.x) * ga.up.x + (gb.originMm.y - ga.originMm.y) * ga.up.y;
  return close(offset, 0) && close(ga.along.x, gb.along.x) && close(ga.along.y, gb.along.y) && close(a.stance.toleranceMm, b.stance.toleranceMm);
}

const OverlayView = memo(function OverlayView({ legs }: { legs: readonly (Compared & { figures: GaitFigures })[] }) {
  const view = useMemo(() => viewOf(unionBox(legs.map((l) => legBox(l.figures, true))) ?? legBox(legs[0].figures, true)), [legs]);
  const drawings = useMemo(() => legs.map((l) => legStatic(view, l.figures, legPoser(l.design.linkage, l.figures))), [legs, view]);
  const shared = legs.every((l) => sameGround(legs[0].figures, l.figures));
  const size = Math.max(view.width, view.height);
  return (
    <figure className="leg-walk" data-testid="leg-compare-overlay">
      <svg className="leg-stage" viewBox={viewBoxAttr(view)} role="img" aria-label={`Foot trajectories of ${legs.length} legs overlaid over the ground line, stance marked`}>
        <FrameLayer view={view} />
        {(shared ? drawings.slice(0, 1) : drawings).map((d, i) => (
          <g key={`g${i}`}>
            <path d={d.bandD} className="leg-band" style={shared ? undefined : { fill: legs[i].colour }} data-testid="leg-tolerance-band" />
            <path d={d.groundD} className="leg-ground" style={shared ? undefined : { stroke: legs[i].colour }} vectorEffect="non-scaling-stroke" data-testid="leg-ground-line" />
          </g>
        ))}
        {drawings.map((d, i) => (
          <g key={i} data-leg={legs[i].label}>
            <path d={d.pathD} className="leg-compare-path" style={{ stroke: legs[i].colour, strokeDasharray: legs[i].dash }} vectorEffect="non-scaling-stroke"><title>{`${legs[i].label}: foot trajectory`}</title></path>
            <path d={d.stanceD} className="leg-compare-stance" style={{ stroke: legs[i].colour }} vectorEffect="non-scaling-stroke"><title>{`${legs[i].label}: stance`}</title></path>
            {d.stanceEnds.map((e, j) => <circle key={j} cx={e.x} cy={e.y} r={size * 0.006} style={{ fill: legs[i].colour }} />)}
          </g>
        ))}
      </svg>
      <ul className="leg-legend">
        {legs.map((l, i) => (
          <li key={i}>
            <svg className="leg-swatch" width={22} height={8} aria-hidden="true">
              <line x1={1} x2={21} y1={4} y2={4} style={{ stroke: l.colour, strokeDasharray: l.dash }} />
            </svg>
            {l.label}
          </li>
        ))}
        <li>thick: stance</li>
      </ul>
      <figcaption className="leg-note">
        {shared
          ? `Each foot over one crank turn, in the legs’ common frame (mm, y up), over the shared ground line and its stance tolerance band (±${figure(legs[0].figures.stance.toleranceMm)} mm).`
          : 'Each foot over one crank turn, in the legs’ common frame (mm, y up); the legs have different ground lines or stance tolerances, so each is drawn in its leg’s colour.'}
      </figcaption>
    </figure>
  );
});

function CompareTable({ legs }: { legs: readonly Compared[] }) {
  const columns = legs.map((l) => (l.result.ok ? new Map(gaitFigureRows(l.result.figures).map((r) => [r.key, r])) : null));
  const keys: { key: string; label: string }[] = [];
  for (const c of columns) {
    if (c === null) continue;
    for (const r of c.values()) if (!keys.some((k) => k.key === r.key)) keys.push({ key: r.key, label: r.label });
  }
  return (
    <div className="leg-table-wrap">
      <table className="leg-compare-table" data-testid="leg-compare-table">
        <caption>Gait figures side by side (each over one crank turn)</caption>
        <thead>
          <tr>
            <th scope="col">Figure</th>
            {legs.map((l, i) => <th key={i} scope="col" style={{ borderBottomColor: l.colour }}>{l.label}</th>)}
          </tr>
        </thead>
        <tbody>
          {legs.some((l) => !l.result.ok) && (
            <tr>
              <th scope="row">Problem</th>
              {legs.map((l, i) => <td key={i}>{l.result.ok ? '' : `The gait figures cannot be taken: ${l.result.reason}.`}</td>)}
            </tr>
          )}
          {keys.map((k) => (
            <tr key={k.key}>
              <th scope="row">{k.label}</th>
              {columns.map((c, i) => <td key={i}>{c?.get(k.key)?.value ?? '—'}</td>)}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

export const LegCompareView = memo(function LegCompareView({ legs }: { legs: readonly { label: string; design: LegDesign }[] }) {
  const compared = useMemo(
    () => legs.slice(0, MAX_COMPARED_LEGS).map((l, i): Compared => ({
      label: l.label,
      design: l.design,
      result: gaitFigures(l.design.linkage, l.design.leg),
      ...COMPARE_STYLES[i],
    })),
    [legs],
  );
  const ok = useMemo(() => compared.flatMap((c) => (c.result.ok ? [{ ...c, figures: c.result.figures }] : [])), [compared]);
  const plotted = useMemo(() => ok.map((c): PlottedLeg => ({ label: c.label, figures: c.figures, colour: c.colour, ...(c.dash === undefined ? {} : { dash: c.dash }) })), [ok]);
  const labels = new Set(legs.map((l) => l.label));
  const countProblem = legs.length < MIN_COMPARED_LEGS || legs.length > MAX_COMPARED_LEGS
    ? `${legs.length} legs were chosen; a comparison takes ${MIN_COMPARED_LEGS} to ${MAX_COMPARED_LEGS}${legs.length > MAX_COMPARED_LEGS ? `, so only the first ${MAX_COMPARED_LEGS} are shown` : ''}.`
    : null;
  return (
    <section className="leg-views" aria-label="Legs compared" data-testid="leg-compare-view">
      <LegCaution />
      {countProblem !== null && <p className="leg-problem" role="note">{countProblem}</p>}
      {labels.size !== legs.length && <p className="leg-problem" role="note">Two legs share a label; give each its own to tell them apart.</p>}
      {ok.length > 0 && <OverlayView legs={ok} />}
      {plotted.length > 0 && <GaitPlotsOf legs={plotted} caution={false} />}
      <CompareTable legs={compared} />
      <GaitConventions />
      <div className="leg-exports" role="group" aria-label="Export the comparison">
        <button type="button" disabled={ok.length === 0} onClick={() => downloadText(legCompareCsv(ok), 'legs-compared-curves.csv', 'text/csv')}>
          Curves of all legs (CSV)
        </button>
      </div>
    </section>
  );
});
