/**
 * The ranked legs of one search run: the best of each family first (always shown,
 * however the others rank), then every design in rank order, feasibility first. The
 * figures are the gait figures of each design's leg file (what `loci analyze` prints of
 * it); each cell keeps the exact number in `data-value`. A row can be opened and ticked
 * for the compare view.
 */
import { memo } from 'react';
import { FAMILY_NAMES } from '../../../core/synthesis/problem';
import { figure } from '../../suspension/labels';
import { bestOfEachFamily, type LegCandidate, type LegSearchRun } from './results';
import { metCount, targetJudges, targetMarksOf, type MarkedColumn, type TargetMark } from './targetMarks';

interface Column {
  readonly key: string;
  readonly head: string;
  readonly title: string;
  readonly unit: string;
  readonly value: (c: LegCandidate) => number | null;
  readonly digits?: number;
}

function columns(run: LegSearchRun): Column[] {
  const tol = run.problem.stanceToleranceMm;
  const cols: Column[] = [
    { key: 'strideMm', head: 'Stride', title: 'Stride: the extent along the ground of the longest stance', unit: 'mm', value: (c) => c.figures?.strideMm ?? null },
    { key: 'stepHeightMm', head: 'Step height', title: 'Step height: the greatest height of the foot above the ground line over the turn', unit: 'mm', value: (c) => c.figures?.stepHeightMm ?? null },
    { key: 'dutyFactor', head: `Duty factor (±${figure(tol)} mm)`, title: `Duty factor: the stance's share of the turn, with the foot within ${figure(tol)} mm of the ground line`, unit: '', value: (c) => c.figures?.dutyFactor ?? null },
    { key: 'flatnessPeakToPeakMm', head: 'Flatness', title: 'Stance flatness: peak-to-peak height over the longest stance', unit: 'mm', value: (c) => c.figures?.flatnessPeakToPeakMm ?? null },
    { key: 'speedVariation', head: 'Speed variation', title: 'Stance speed variation: (max − min) / mean of the foot\u2019s backward speed over the longest stance', unit: '', value: (c) => c.figures?.speedVariation ?? null },
    { key: 'worstTransmissionInStanceDeg', head: 'Worst transmission in stance', title: 'The least of min(μ, 180° − μ) of any four-bar loop over the stance', unit: '°', value: (c) => c.figures?.worstTransmissionInStanceDeg ?? null },
    { key: 'widthMm', head: 'Width', title: 'Leg size: width of the box holding every joint over the turn', unit: 'mm', value: (c) => c.figures?.widthMm ?? null },
    { key: 'heightMm', head: 'Height', title: 'Leg size: height of the box holding every joint over the turn', unit: 'mm', value: (c) => c.figures?.heightMm ?? null },
  ];
  if (run.problem.targets.footPath !== undefined) {
    cols.push({ key: 'trajectoryRmsMm', head: 'Trajectory RMS', title: 'RMS distance of the wanted trajectory\u2019s points from the foot\u2019s path (the search\u2019s samples)', unit: 'mm', value: (c) => c.trajectoryRmsMm });
  }
  cols.push({ key: 'value', head: 'Score', title: 'Score: the weighted, normalised sum of the target terms; lower is better', unit: '', value: (c) => c.value });
  return cols;
}

function Mark({ mark }: { mark: TargetMark }) {
  const said = `${mark.met ? 'met' : 'missed'}: wanted ${mark.wanted}`;
  return (
    <span className={mark.met ? 'legws-met' : 'legws-missed'} title={said} data-met={String(mark.met)}>
      <span aria-hidden="true">{mark.met ? ' ✓' : ' ✗'}</span>
      <span className="visually-hidden">{` (${said})`}</span>
    </span>
  );
}

function Row({ c, cols, judges, section, compared, onToggleCompare, onOpen, compareFull, opened }: {
  c: LegCandidate;
  cols: readonly Column[];
  judges: ReturnType<typeof targetJudges>;
  section: 'best' | 'all';
  compared: boolean;
  onToggleCompare: (rank: number) => void;
  onOpen: (c: LegCandidate) => void;
  compareFull: boolean;
  opened: boolean;
}) {
  const label = `#${c.rank} ${FAMILY_NAMES[c.family]}`;
  const marks = targetMarksOf(judges, c);
  const { met, of } = metCount(marks);
  return (
    <tr data-rank={c.rank} data-family={c.family} data-section={section} aria-current={opened ? 'true' : undefined} className={c.feasible ? undefined : 'legws-infeasible'}>
      <th scope="row">{c.rank}</th>
      <td>{FAMILY_NAMES[c.family]}</td>
      <td title={c.defects.join('; ')}>{c.feasible ? 'feasible' : `violation ${figure(c.violation, 3)}`}</td>
      <td data-targets-met={met} data-targets-of={of} className={met < of ? 'legws-missed' : undefined}>{of === 0 ? '—' : `${met} of ${of}`}</td>
      {c.figures === null ? (
        <td colSpan={cols.length - 1} className="legws-failure">{`No gait figures: ${c.failure ?? 'the analysis refused the design'}`}</td>
      ) : null}
      {cols.filter((col) => c.figures !== null || col.key === 'value').map((col) => {
        const v = col.value(c);
        const mark = marks[col.key as MarkedColumn];
        return (
          <td key={col.key} data-column={col.key} data-value={v === null ? 'null' : String(v)}>
            {v === null ? '—' : figure(v, col.digits)}
            {mark === undefined ? null : <Mark mark={mark} />}
          </td>
        );
      })}
      <td>
        <button type="button" aria-label={`Open ${label}`} onClick={() => onOpen(c)}>Open</button>
        <label className="legws-compare-tick">
          <input type="checkbox" aria-label={`Compare ${label}${section === 'best' ? ' (best of its family)' : ''}`} checked={compared} disabled={!compared && compareFull} onChange={() => onToggleCompare(c.rank)} /> Compare
        </label>
      </td>
    </tr>
  );
}

export const LegResultsTable = memo(function LegResultsTable({ run, compared, onToggleCompare, onOpen, compareFull, opened }: {
  run: LegSearchRun;
  compared: readonly number[];
  onToggleCompare: (rank: number) => void;
  onOpen: (c: LegCandidate) => void;
  compareFull: boolean;
  opened: number | null;
}) {
  const cols = columns(run);
  const judges = targetJudges(run.problem);
  const best = bestOfEachFamily(run.candidates);
  const all = [...run.candidates].sort((a, b) => a.rank - b.rank);
  const head = (
    <tr>
      <th scope="col">Rank</th>
      <th scope="col">Family</th>
      <th scope="col">Feasibility</th>
      <th scope="col" title="Targets met: a value target within its tolerance, a limit on its side (its tolerance only scales the search's penalty); ✓ and ✗ beside each figure">Targets met</th>
      {cols.map((col) => <th key={col.key} scope="col" title={col.title}>{col.head}{col.unit === '' ? '' : ` (${col.unit})`}</th>)}
      <th scope="col"><span className="visually-hidden">Actions</span></th>
    </tr>
  );
  const rows = (list: readonly LegCandidate[], section: 'best' | 'all') => list.map((c) => (
    <Row key={`${section}-${c.rank}`} c={c} cols={cols} judges={judges} section={section} compared={compared.includes(c.rank)} onToggleCompare={onToggleCompare} onOpen={onOpen} compareFull={compareFull} opened={opened === c.rank} />
  ));
  return (
    <div className="legws-table-wrap">
      <table className="legws-results" data-testid="leg-results-best">
        <caption>The best of each family</caption>
        <thead>{head}</thead>
        <tbody>{rows(best, 'best')}</tbody>
      </table>
      <table className="legws-results" data-testid="leg-results-all">
        <caption>Every design found, ranked: feasible first, then by score</caption>
        <thead>{head}</thead>
        <tbody>{rows(all, 'all')}</tbody>
      </table>
    </div>
  );
});
