/**
 * The target's points as a table: type a value to change it, delete a row, add one at the
 * end. The table is one tab stop (roving tabindex): Tab enters it at the cell last used
 * and leaves it for what follows; the arrow keys move between cells (↑ ↓ between points,
 * ← → between columns once the caret is at the end of the text), Home and End with Ctrl
 * go to the first and the last point of the rows shown. A long target is shown
 * PAGE_ROWS rows at a time: thousands of rows of fields take seconds to lay out.
 */
import { memo, useId, useState } from 'react';
import { useDispatch, useWorkspace } from '../state/store';
import { hasWeights } from '../state/target';
import { PointRow, pointColumns, type PointColumn } from './PointRow';

/** Rows the table shows at a time. */
export const PAGE_ROWS = 100;

interface Active {
  readonly row: number;
  readonly column: PointColumn;
}

/** The cell an arrow key moves to from `from`, or null when the key is not a move here. */
function moveOf(event: React.KeyboardEvent, from: Active, columns: readonly PointColumn[], rows: number): Active | null {
  const el = event.target as HTMLElement;
  const input = el instanceof HTMLInputElement ? el : null;
  const caretAtStart = input === null || (input.selectionStart === 0 && input.selectionEnd === 0);
  const caretAtEnd = input === null || (input.selectionStart === input.value.length && input.selectionEnd === input.value.length);
  const k = Math.max(0, columns.indexOf(from.column));
  switch (event.key) {
    case 'ArrowUp':
      return from.row > 0 ? { ...from, row: from.row - 1 } : null;
    case 'ArrowDown':
      return from.row < rows - 1 ? { ...from, row: from.row + 1 } : null;
    case 'ArrowLeft':
      return caretAtStart && k > 0 ? { ...from, column: columns[k - 1] } : null;
    case 'ArrowRight':
      return caretAtEnd && k < columns.length - 1 ? { ...from, column: columns[k + 1] } : null;
    case 'Home':
      return event.ctrlKey ? { ...from, row: 0 } : null;
    case 'End':
      return event.ctrlKey ? { ...from, row: rows - 1 } : null;
    default:
      return null;
  }
}

function cellOf(el: EventTarget): Active | null {
  if (!(el instanceof HTMLElement) || el.dataset.row === undefined || el.dataset.col === undefined) return null;
  return { row: Number(el.dataset.row), column: el.dataset.col as PointColumn };
}

/**
 * The table takes no part in locking: the panel's fieldset disables every control in
 * it, so starting or stopping a search does not re-render a row.
 */
export const PointTable = memo(function PointTable() {
  const dispatch = useDispatch();
  const target = useWorkspace((s) => s.project.target);
  const selected = useWorkspace((s) => s.ui.selectedPoint);
  const points = target.points;
  const withAngle = target.timing === 'prescribed';
  const withWeight = hasWeights(target);
  const columns = pointColumns(withAngle, withWeight);
  const keysId = `${useId()}-keys`;
  const [active, setActive] = useState<Active>({ row: 0, column: 'x' });
  const [pageWanted, setPage] = useState(0);
  const pages = Math.max(1, Math.ceil(points.length / PAGE_ROWS));
  const page = Math.min(pageWanted, pages - 1);
  const first = page * PAGE_ROWS;
  const shown = points.slice(first, first + PAGE_ROWS);
  // The tab stop stays on a cell that exists (on this page) when rows, columns or pages go.
  const activeRow = Math.min(Math.max(active.row, first), first + shown.length - 1);
  const activeColumn = columns.includes(active.column) ? active.column : 'x';
  const positive = points.reduce((count, p) => count + ((p.weight ?? 0) > 0 ? 1 : 0), 0);

  const onKeyDown = (event: React.KeyboardEvent<HTMLTableSectionElement>) => {
    const from = cellOf(event.target);
    if (from === null) return;
    const to = moveOf(event, { ...from, row: from.row - first }, columns, shown.length);
    if (to === null) return;
    event.preventDefault();
    const el = event.currentTarget.querySelector<HTMLElement>(`[data-row="${to.row + first}"][data-col="${to.column}"]`);
    el?.focus();
  };

  const addRow = () => {
    const last = points[points.length - 1];
    const before = points[points.length - 2];
    // A new row continues the path by the last step, or starts at the origin.
    const x = last === undefined ? 0 : before === undefined ? last.x + 10 : 2 * last.x - before.x;
    const y = last === undefined ? 0 : before === undefined ? last.y : 2 * last.y - before.y;
    dispatch({ type: 'target/add', x, y });
  };

  return (
    <div className="point-table">
      <div className="point-table-scroll">
        <table aria-describedby={keysId}>
          <thead>
            <tr>
              <th scope="col">#</th>
              <th scope="col">x (mm)</th>
              <th scope="col">y (mm)</th>
              {withAngle && <th scope="col">crank (°)</th>}
              {withWeight && <th scope="col">weight</th>}
              <th scope="col">
                <span className="visually-hidden">Delete</span>
              </th>
            </tr>
          </thead>
          <tbody
            onKeyDown={onKeyDown}
            onFocus={(event) => {
              const cell = cellOf(event.target);
              if (cell !== null && (cell.row !== active.row || cell.column !== active.column)) setActive(cell);
            }}
          >
            {shown.map((p, k) => {
              const i = first + k;
              return (
              <PointRow
                key={i}
                point={p}
                index={i}
                selected={i === selected}
                withAngle={withAngle}
                withWeight={withWeight}
                othersWeightless={positive - ((p.weight ?? 0) > 0 ? 1 : 0) === 0}
                activeColumn={i === activeRow ? activeColumn : null}
                dispatch={dispatch}
              />
              );
            })}
          </tbody>
        </table>
      </div>
      {pages > 1 && (
        <div className="row-actions" role="group" aria-label="Rows of the point table">
          <button type="button" disabled={page === 0} onClick={() => setPage(page - 1)}>
            Previous {PAGE_ROWS}
          </button>
          <span data-testid="point-table-page">
            Points {first + 1}–{first + shown.length} of {points.length}
          </span>
          <button type="button" disabled={page === pages - 1} onClick={() => setPage(page + 1)}>
            Next {PAGE_ROWS}
          </button>
        </div>
      )}
      <p className="panel-note" id={keysId}>
        The table is one Tab stop: ↑ ↓ move between points, ← → between cells (from the ends of the text), Ctrl+Home and Ctrl+End to the first and last point.
      </p>
      <div className="row-actions">
        <button type="button" onClick={addRow}>
          Add point
        </button>
        {withAngle && (
          <button type="button" onClick={() => dispatch({ type: 'target/spread-angles' })}>
            Spread crank angles evenly
          </button>
        )}
        <button
          type="button"
          disabled={points.length === 0}
          onClick={() => dispatch({ type: 'target/weighted', on: !withWeight })}
          title={withWeight ? 'Drop the weights: every point counts the same in the error' : 'Give every point a weight of 1, to edit in the table'}
        >
          {withWeight ? 'Weight points equally' : 'Weight points'}
        </button>
        <button type="button" onClick={() => dispatch({ type: 'target/clear' })} disabled={points.length === 0}>
          Clear all
        </button>
      </div>
    </div>
  );
});
