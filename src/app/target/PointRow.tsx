/**
 * One row of the point table: x, y (mm), the crank angle (prescribed timing) and the
 * weight (a weighted target), each checked as it is typed. A cell that holds what it
 * cannot take keeps the point as it was, shows why in a line under the row, and is listed
 * beside Start (the store's field issues), so an emptied cell never passes for its old
 * value. Only the table's active cell is a tab stop (roving tabindex, see PointTable).
 */
import { memo, useId } from 'react';
import { useDraft, useFieldIssue } from '../settings/NumberInput';
import type { Checked } from '../state/fields';
import type { TargetPoint } from '../state/project';
import type { Action } from '../state/reducer';
import type { PointField } from '../state/target';
import { checkCoordinate, checkCrankAngle, checkWeight } from './pointFields';

/** The table's columns in order, as the arrow keys walk them. */
export type PointColumn = PointField | 'delete';

export function pointColumns(withAngle: boolean, withWeight: boolean): PointColumn[] {
  return ['x', 'y', ...(withAngle ? (['driverDeg'] as const) : []), ...(withWeight ? (['weight'] as const) : []), 'delete'];
}

function shownValue(v: number | null | undefined): string {
  return v === null || v === undefined ? '' : String(v);
}

interface CellProps {
  readonly row: number;
  readonly column: PointColumn;
  readonly activeColumn: PointColumn | null;
  readonly text: string;
  readonly label: string;
  readonly message: string | null;
  readonly messageId: string;
  readonly onText: (text: string) => void;
  readonly onDone: () => void;
}

function Cell({ row, column, activeColumn, text, label, message, messageId, onText, onDone }: CellProps) {
  return (
    <td>
      <input
        className={message === null ? undefined : 'invalid'}
        aria-label={label}
        aria-invalid={message !== null}
        aria-describedby={message === null ? undefined : messageId}
        inputMode="decimal"
        tabIndex={activeColumn === column ? 0 : -1}
        data-row={row}
        data-col={column}
        value={text}
        onChange={(e) => onText(e.target.value)}
        onBlur={onDone}
        onKeyDown={(e) => {
          if (e.key === 'Enter') onDone();
        }}
      />
    </td>
  );
}

/** A cell's draft text, its check, and its message in the store's field issues (withdrawn while the column is hidden). */
function useCell<T>(key: string, shown: string, check: (text: string) => Checked<T>, visible: boolean) {
  const [text, setText] = useDraft(shown);
  const checked = check(text);
  const message = visible && !checked.ok ? checked.message : null;
  useFieldIssue(key, message);
  return { text, setText, checked, message };
}

export const PointRow = memo(function PointRow({
  point,
  index,
  selected,
  withAngle,
  withWeight,
  othersWeightless,
  activeColumn,
  dispatch,
}: {
  point: TargetPoint;
  index: number;
  selected: boolean;
  withAngle: boolean;
  withWeight: boolean;
  /** Every other point's weight is 0: this one must stay above 0. */
  othersWeightless: boolean;
  /** The row's cell that is the table's tab stop, or null when another row has it. */
  activeColumn: PointColumn | null;
  dispatch: (action: Action) => void;
}) {
  const n = index + 1;
  const messageId = `${useId()}-issues`;
  const x = useCell(`point:${index}:x`, shownValue(point.x), (t) => checkCoordinate('x', n, t), true);
  const y = useCell(`point:${index}:y`, shownValue(point.y), (t) => checkCoordinate('y', n, t), true);
  const angle = useCell(`point:${index}:angle`, shownValue(point.driverDeg), (t) => checkCrankAngle(n, t), withAngle);
  const weight = useCell(`point:${index}:weight`, shownValue(point.weight), (t) => checkWeight(n, t, othersWeightless), withWeight);
  const commit = (field: PointField, checked: Checked<number | null>, was: number | null | undefined) => {
    if (checked.ok && checked.value !== was) dispatch({ type: 'target/edit', index, field, value: checked.value });
  };
  const messages = [x.message, y.message, angle.message, weight.message].filter((m): m is string => m !== null);
  const cell = { row: index, activeColumn, messageId };
  const columns = pointColumns(withAngle, withWeight);
  return (
    <>
      <tr className={selected ? 'selected' : undefined} data-testid="point-row" onClick={() => dispatch({ type: 'ui/select', index })}>
        <th scope="row">{n}</th>
        <Cell {...cell} column="x" label={`x of point ${n} (mm)`} text={x.text} message={x.message} onText={x.setText} onDone={() => commit('x', x.checked, point.x)} />
        <Cell {...cell} column="y" label={`y of point ${n} (mm)`} text={y.text} message={y.message} onText={y.setText} onDone={() => commit('y', y.checked, point.y)} />
        {withAngle && (
          <Cell
            {...cell}
            column="driverDeg"
            label={`crank angle of point ${n} (degrees)`}
            text={angle.text}
            message={angle.message}
            onText={angle.setText}
            onDone={() => commit('driverDeg', angle.checked, point.driverDeg)}
          />
        )}
        {withWeight && (
          <Cell
            {...cell}
            column="weight"
            label={`weight of point ${n}`}
            text={weight.text}
            message={weight.message}
            onText={weight.setText}
            onDone={() => commit('weight', weight.checked, point.weight)}
          />
        )}
        <td>
          <button
            type="button"
            className="icon"
            aria-label={`Delete point ${n}`}
            tabIndex={activeColumn === 'delete' ? 0 : -1}
            data-row={index}
            data-col="delete"
            onClick={() => dispatch({ type: 'target/delete', index })}
          >
            ×
          </button>
        </td>
      </tr>
      {messages.length > 0 && (
        <tr className="point-row-issues">
          <td colSpan={columns.length + 1} className="field-error" id={messageId} data-testid="field-error">
            {messages.join(' ')}
          </td>
        </tr>
      )}
    </>
  );
});
