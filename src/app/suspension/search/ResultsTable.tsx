/**
 * The ranked layouts table of one search run: the best of each layout first (always
 * shown, however the others rank), then every design in rank order, feasibility first.
 * Per-gear figures are read in the chosen cog. Each row can be opened in the workspace
 * and ticked for the compare view.
 */
import { memo } from 'react';
import { figure } from '../labels';
import type { SearchRun } from './results';
import { tableSections, type TableRow } from './rows';

interface Column {
  readonly key: string;
  /** Short heading; `title` says it in full. */
  readonly head: string;
  readonly title: string;
  readonly unit: string;
  readonly value: (r: TableRow) => number;
  readonly digits?: number;
}

/** The figures columns, in the order a frame designer reads them. */
function columns(cogName: string): Column[] {
  return [
    { key: 'leverageRatioStart', head: 'LR start', title: 'Leverage ratio at full extension', unit: '', value: (r) => r.leverageRatioStart },
    { key: 'leverageRatioEnd', head: 'LR end', title: 'Leverage ratio at the end of travel', unit: '', value: (r) => r.leverageRatioEnd },
    { key: 'progressionPct', head: 'Progression', title: 'Progression: (LR start − LR end) / LR start; positive is progressive', unit: '%', value: (r) => r.progressionPct, digits: 3 },
    { key: 'antiSquatAtSagPct', head: 'Anti-squat at sag*', title: `Anti-squat at the sag point, ${cogName}`, unit: '%', value: (r) => r.antiSquatAtSagPct, digits: 3 },
    { key: 'antiRiseAtSagPct', head: 'Anti-rise at sag', title: 'Anti-rise at the sag point, brake on the axle-carrying body', unit: '%', value: (r) => r.antiRiseAtSagPct, digits: 3 },
    { key: 'rearwardAtFullTravelMm', head: 'Axle rearward, full travel', title: 'Rearward axle movement at full travel, from full extension', unit: 'mm', value: (r) => r.rearwardAtFullTravelMm, digits: 3 },
    { key: 'travelMm', head: 'Travel', title: 'Vertical wheel travel the stroke gives', unit: 'mm', value: (r) => r.travelMm },
    { key: 'kickbackAtFullTravelDeg', head: 'Kickback, full travel*', title: `Pedal kickback at full travel, ${cogName}`, unit: 'deg', value: (r) => r.kickbackAtFullTravelDeg, digits: 3 },
    { key: 'chainGrowthAtFullTravelMm', head: 'Chain growth, full travel*', title: `Chain growth at full travel, ${cogName}`, unit: 'mm', value: (r) => r.chainGrowthAtFullTravelMm, digits: 3 },
    { key: 'pivotSpanMm', head: 'Pivot span', title: 'Size: the largest distance between two pivots (the shock\u2019s frame eye included, the rear axle not)', unit: 'mm', value: (r) => r.pivotSpanMm },
    { key: 'value', head: 'Score', title: 'Score: the weighted, normalised sum of the target terms; lower is better', unit: '', value: (r) => r.value },
  ];
}

function feasibility(r: TableRow): string {
  return r.feasible ? 'feasible' : `violation ${figure(r.violation, 3)}`;
}

export const ResultsTable = memo(function ResultsTable({ run, cogIndex, compared, onToggleCompare, onOpen, compareFull, caption, opened }: {
  run: SearchRun;
  cogIndex: number;
  /** Ranks ticked for the compare view. */
  compared: readonly number[];
  onToggleCompare: (rank: number) => void;
  onOpen: (row: TableRow) => void;
  /** No more can be ticked. */
  compareFull: boolean;
  /** Which run, in a few words ("Latest run"); the run's summary is the element #susp-results-summary beside the table. */
  caption: string;
  /** The rank last opened in the workspace, or null. */
  opened: number | null;
}) {
  const { best, all } = tableSections(run.candidates, cogIndex);
  const b = run.problem.bicycle;
  const teeth = b.cogTeeth[cogIndex];
  const cogName = `${b.chainringTeeth} × ${teeth ?? '?'} T`;
  const cols = columns(cogName);
  const row = (r: TableRow, section: string) => {
    const ticked = compared.includes(r.rank);
    return (
      <tr key={`${section}-${r.key}`} data-rank={r.rank} data-layout={r.family} className={`${r.feasible ? '' : 'susp-row-infeasible'}${opened === r.rank ? ' susp-row-open' : ''}`}>
        <td>
          <input
            type="checkbox"
            checked={ticked}
            disabled={!ticked && compareFull}
            aria-label={`Compare #${r.rank} ${r.layoutName}`}
            title={!ticked && compareFull ? 'At most 4 designs are compared at once' : undefined}
            onChange={() => onToggleCompare(r.rank)}
          />
        </td>
        <td>
          <button type="button" onClick={() => onOpen(r)} title={r.failure ?? 'Opens this design in the side view and plots above (the layout\u2019s pivots are replaced; the pivots of another kind are kept)'}>
            {`Open #${r.rank}`}
          </button>
        </td>
        <td data-col="rank">{r.rank}</td>
        <th scope="row" data-col="layout">{r.layoutName}</th>
        <td data-col="feasible" title={r.candidate.defects.join('; ') || undefined}>{feasibility(r)}</td>
        {cols.map((c) => <td key={c.key} data-col={c.key} data-value={String(c.value(r))}>{figure(c.value(r), c.digits ?? 4)}</td>)}
      </tr>
    );
  };
  const head = (
    <tr>
      <th scope="col">Compare</th>
      <th scope="col">Open</th>
      <th scope="col" title="Rank over every design the search kept, all layouts together: feasible first, then by score">Rank</th>
      <th scope="col">Layout</th>
      <th scope="col">Feasible</th>
      {cols.map((c) => <th key={c.key} scope="col" title={c.title}>{c.head}{c.unit === '' ? '' : ` (${c.unit})`}</th>)}
    </tr>
  );
  const n = cols.length + 5;
  return (
    <div className="susp-results-scroll">
      <table className="susp-results" data-testid="search-results" aria-describedby="susp-results-summary">
        <caption>{caption} <span className="susp-results-gear">{`(* in the ${cogName} gear)`}</span></caption>
        <thead>{head}</thead>
        <tbody data-testid="best-per-layout">
          <tr className="susp-results-section"><th colSpan={n} scope="colgroup">Best of each layout</th></tr>
          {best.map((r) => row(r, 'best'))}
        </tbody>
        <tbody data-testid="all-ranked">
          <tr className="susp-results-section"><th colSpan={n} scope="colgroup">{`All ${all.length} designs, feasible first`}</th></tr>
          {all.map((r) => row(r, 'all'))}
        </tbody>
      </table>
    </div>
  );
});
