/**
 * The ranked table: one row per candidate with its figures and a small drawing. Rows
 * are memoised per candidate and their drawings swept lazily, so a table that the
 * search refreshes every second stays cheap.
 */
import { memo, type Dispatch, type ReactNode } from 'react';
import { GUIDELINE_HIGH_DEG, GUIDELINE_LOW_DEG, defectsLabel, grashofLabel, outsideGuidelineLabel, sizeOverMotionMm, transmissionRangeDeg } from './figures';
import { familyName, formatDegRange, formatMmValue, formatSize } from './format';
import { TABLE_STEPS } from './motion';
import { useLazyMotion } from './motionStore';
import { PathThumbnail } from './PathThumbnail';
import { MAX_COMPARE, type CandidateRow, type ResultsAction, type ResultsState, type SortKey } from './state';
import { sameTarget, type ResultsTarget } from './types';

interface Column {
  readonly key: SortKey | null;
  readonly label: ReactNode;
  readonly title?: string;
}

const COLUMNS: readonly Column[] = [
  { key: 'rank', label: 'Rank' },
  { key: null, label: 'Design', title: 'Output path (solid) over the target (red), instant-centre path (dashed)' },
  { key: 'family', label: 'Family' },
  { key: 'rms', label: 'RMS error (mm)' },
  { key: 'max', label: 'Max. error (mm)' },
  { key: 'grashof', label: 'Grashof class' },
  {
    key: 'transmission',
    label: 'Transmission angle (deg)',
    title: `Least and greatest over the motion; sorted by the worse distance from 90°. Rows outside ${GUIDELINE_LOW_DEG}°–${GUIDELINE_HIGH_DEG}° (common practice) are marked.`,
  },
  { key: 'size', label: 'Size (mm)', title: 'Bounding box of the linkage over its motion, width × height' },
  { key: 'defects', label: 'Defects' },
  { key: null, label: 'Compare' },
];

const PIN_COLUMN: Column = { key: null, label: 'Pin', title: 'Keep the design in the shortlist, across runs and reloads' };

export interface CandidateTableProps {
  readonly rows: readonly CandidateRow[];
  readonly totalRows: number;
  readonly target: ResultsTarget;
  readonly state: ResultsState;
  readonly dispatch: Dispatch<ResultsAction>;
  /** Keys of the rows pinned to the shortlist; without it (no storage) there is no Pin column. */
  readonly pinned?: ReadonlySet<string>;
  /** Pins or unpins a row; stable across renders. */
  readonly onPin?: (row: CandidateRow, pin: boolean) => void;
}

export function CandidateTable({ rows, totalRows, target, state, dispatch, pinned, onPin }: CandidateTableProps) {
  const compareFull = state.compare.length >= MAX_COMPARE;
  const columns = onPin === undefined ? COLUMNS : [...COLUMNS, PIN_COLUMN];
  return (
    <div className="results-table-wrap">
      <table className="results-table">
        <thead>
          <tr>
            {columns.map((column, i) => {
              const sorted = column.key !== null && state.sort.key === column.key;
              return (
                <th
                  key={i}
                  scope="col"
                  title={column.title}
                  aria-sort={sorted ? (state.sort.direction === 'asc' ? 'ascending' : 'descending') : undefined}
                >
                  {column.key === null ? column.label : (
                    <button type="button" className="results-sort" onClick={() => dispatch({ type: 'sort', key: column.key as SortKey })}>
                      {column.label}
                      <span className="results-sort-mark" aria-hidden="true">{sorted ? (state.sort.direction === 'asc' ? ' ▲' : ' ▼') : ''}</span>
                    </button>
                  )}
                </th>
              );
            })}
          </tr>
        </thead>
        <tbody>
          {rows.map((row) => (
            <CandidateRowView
              key={row.key}
              row={row}
              target={target}
              selected={state.selected === row.key}
              compared={state.compare.includes(row.key)}
              compareFull={compareFull}
              dispatch={dispatch}
              pinned={pinned?.has(row.key) ?? false}
              onPin={onPin}
            />
          ))}
        </tbody>
      </table>
      {rows.length < totalRows && (
        <button type="button" className="results-more" onClick={() => dispatch({ type: 'show-more' })}>
          Show more ({totalRows - rows.length} not shown)
        </button>
      )}
    </div>
  );
}

interface RowProps {
  readonly row: CandidateRow;
  readonly target: ResultsTarget;
  readonly selected: boolean;
  readonly compared: boolean;
  readonly compareFull: boolean;
  readonly dispatch: Dispatch<ResultsAction>;
  readonly pinned: boolean;
  readonly onPin: ((row: CandidateRow, pin: boolean) => void) | undefined;
}

/**
 * Each refresh of a running search brings new report objects for the same designs; a
 * row re-renders only when its design, its rank, its state or the target changes.
 */
function sameRow(a: RowProps, b: RowProps): boolean {
  return a.row.key === b.row.key && a.row.rank === b.row.rank && a.selected === b.selected && a.compared === b.compared &&
    a.compareFull === b.compareFull && a.dispatch === b.dispatch && a.pinned === b.pinned && a.onPin === b.onPin && sameTarget(a.target, b.target);
}

const CandidateRowView = memo(function CandidateRowView({ row, target, selected, compared, compareFull, dispatch, pinned, onPin }: RowProps) {
  const { candidate, rank, key } = row;
  const motion = useLazyMotion(candidate, TABLE_STEPS);
  const family = familyName(candidate.family);
  const select = () => dispatch({ type: 'select', key: selected ? null : key });
  return (
    <tr
      data-testid="candidate-row"
      data-rank={rank}
      className={`results-row${selected ? ' results-row-selected' : ''}${candidate.feasible ? '' : ' results-row-infeasible'}`}
      aria-selected={selected}
      onClick={select}
    >
      <td className="results-num">
        <button
          type="button"
          className="results-select"
          aria-pressed={selected}
          aria-label={`Show the design ranked ${rank}`}
          onClick={(event) => {
            event.stopPropagation();
            select();
          }}
        >
          {rank}
        </button>
      </td>
      <td className="results-thumb-cell">
        <PathThumbnail motion={motion} target={target} label={`Rank ${rank}, ${family}: output path over the target and instant-centre path`} />
      </td>
      <td className="results-family">
        {family}
        {!candidate.feasible && <span className="results-badge" title={`constraint violation ${candidate.violation.toPrecision(3)}`}>infeasible</span>}
      </td>
      <td className="results-num">{formatMmValue(candidate.error.rmsMm)}</td>
      <td className="results-num">{formatMmValue(candidate.error.maxMm)}</td>
      <td>{grashofLabel(candidate, motion)}</td>
      <td className="results-num">{motion === undefined ? '…' : <TransmissionCell range={transmissionRangeDeg(candidate, motion)} />}</td>
      <td className="results-num">{motion === undefined ? '…' : sizeCell(sizeOverMotionMm(candidate, motion))}</td>
      <td className="results-defects">{defectsLabel(candidate)}</td>
      <td onClick={(event) => event.stopPropagation()}>
        <input
          type="checkbox"
          aria-label={`Compare the design ranked ${rank}`}
          checked={compared}
          disabled={!compared && compareFull}
          onChange={() => dispatch({ type: 'toggle-compare', key })}
        />
      </td>
      {onPin && (
        <td onClick={(event) => event.stopPropagation()}>
          <button type="button" className="results-pin" aria-pressed={pinned} aria-label={`${pinned ? 'Unpin' : 'Pin'} the design ranked ${rank}`} onClick={() => onPin(row, !pinned)}>
            {pinned ? 'Pinned' : 'Pin'}
          </button>
        </td>
      )}
    </tr>
  );
}, sameRow);

/** The range, and in words where it leaves the common guideline (never colour alone). */
function TransmissionCell({ range }: { range: { min: number; max: number } | undefined }) {
  const outside = outsideGuidelineLabel(range);
  return (
    <>
      {formatDegRange(range)}
      {outside !== null && (
        <span className="results-badge results-badge-guideline" data-testid="transmission-outside">
          {outside}
        </span>
      )}
    </>
  );
}

function sizeCell(size: { widthMm: number; heightMm: number } | undefined): string {
  return size === undefined ? '—' : formatSize(size, false);
}
