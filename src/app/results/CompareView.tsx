/**
 * Two to four candidates side by side: their output and instant-centre paths overlaid in
 * one drawing over the target, and a table of their figures.
 */
import { useMemo, type Dispatch } from 'react';
import { pointsBox, unionBox, viewBoxAttr, viewOf } from './drawing';
import { defectsLabel, grashofLabel, sizeOverMotionMm, transmissionRangeDeg } from './figures';
import { familyName, formatDegRange, formatMm, formatMmValue, formatSize } from './format';
import { DETAIL_STEPS, type MotionResult } from './motion';
import { motionNow } from './motionStore';
import { CentrePathLayer, OutputPathLayer, TargetLayer } from './PathLayers';
import type { CandidateRow, ResultsAction } from './state';
import type { ResultsTarget } from './types';

/** One colour per compared candidate, ours; chosen to stay apart for common colour-vision deficiencies. */
export const COMPARE_COLOURS = ['#0b6e99', '#d55e00', '#6a3d9a', '#2e7d32'] as const;
/** Dash patterns (px) of the compared instant-centre paths: designs sharing a linkage share that path. */
const COMPARE_DASHES = ['7 4', '2 4', '10 3 2 3', '4 6'] as const;

export function CompareView({ rows, target, dispatch }: { rows: readonly CandidateRow[]; target: ResultsTarget; dispatch: Dispatch<ResultsAction> }) {
  const motions = useMemo(() => rows.map((row) => motionNow(row.candidate, DETAIL_STEPS)), [rows]);
  const view = useMemo(() => {
    const box = unionBox([pointsBox(target.points), ...motions.map((m) => (m.ok ? m.motion.bounds : null))]);
    return box ? viewOf(box) : null;
  }, [motions, target]);
  const size = view ? Math.max(view.width, view.height) : 0;
  const labelOf = (row: CandidateRow) => `Rank ${row.rank}, ${familyName(row.candidate.family)}`;
  return (
    <section className="results-compare" aria-label="Compare designs" data-testid="compare-view">
      <div className="results-compare-head">
        <h3 className="results-heading">Compare {rows.length} designs</h3>
        <button type="button" onClick={() => dispatch({ type: 'clear-compare' })}>Clear comparison</button>
      </div>
      <div className="results-compare-body">
        {view && (
          <svg className="results-stage results-compare-stage" viewBox={viewBoxAttr(view)} role="img" aria-label={`Output and instant-centre paths of ${rows.map(labelOf).join('; ')}`}>
            <TargetLayer view={view} target={target} radius={size * 0.006} />
            {motions.map((m, i) => m.ok && (
              <g key={rows[i].key} data-testid="compare-drawing" data-rank={rows[i].rank}>
                <CentrePathLayer view={view} motion={m.motion} markerSize={size * 0.02} colour={COMPARE_COLOURS[i]} dash={COMPARE_DASHES[i]} testId="compare-ic-path" />
                <OutputPathLayer view={view} motion={m.motion} colour={COMPARE_COLOURS[i]} testId="compare-output-path" />
              </g>
            ))}
          </svg>
        )}
        <ul className="results-legend results-compare-legend">
          <li><span className="results-swatch results-swatch-target" />target points</li>
          {rows.map((row, i) => (
            <li key={row.key}>
              <span className="results-swatch" style={{ background: COMPARE_COLOURS[i] }} />
              {labelOf(row)}: output path (solid), instant-centre path (dashed)
              {!motions[i].ok && ' (cannot be drawn)'}
            </li>
          ))}
        </ul>
      </div>
      <table className="results-table results-compare-table">
        <thead>
          <tr>
            <th scope="col">Figure</th>
            {rows.map((row, i) => (
              <th key={row.key} scope="col">
                <span className="results-swatch" style={{ background: COMPARE_COLOURS[i] }} />
                {labelOf(row)}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {FIGURE_ROWS.map(([label, value]) => (
            <tr key={label}>
              <th scope="row">{label}</th>
              {rows.map((row, i) => <td key={row.key} className="results-num">{value(row, motions[i])}</td>)}
            </tr>
          ))}
        </tbody>
      </table>
    </section>
  );
}

const FIGURE_ROWS: readonly (readonly [string, (row: CandidateRow, motion: MotionResult) => string])[] = [
  ['Family', (r) => familyName(r.candidate.family)],
  ['RMS error', (r) => formatMm(r.candidate.error.rmsMm)],
  ['Max. error', (r) => formatMm(r.candidate.error.maxMm)],
  ['Sum of squared errors', (r) => `${formatMmValue(r.candidate.error.sumSquares)} mm²`],
  ['Grashof class', (r, m) => grashofLabel(r.candidate, m)],
  ['Transmission angle', (r, m) => formatDegRange(transmissionRangeDeg(r.candidate, m))],
  ['Size over the motion', (r, m) => {
    const size = sizeOverMotionMm(r.candidate, m);
    return size === undefined ? '—' : formatSize(size);
  }],
  ['Constraints', (r) => (r.candidate.feasible ? 'all met' : `not met (violation ${r.candidate.violation.toPrecision(3)})`)],
  ['Defects', (r) => defectsLabel(r.candidate)],
];
