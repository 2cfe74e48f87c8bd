/** The target's points as a table: type a value to change it, delete a row, add one at the end. */
import { memo, useState } from 'react';
import { useDispatch, useWorkspace } from '../state/store';

/** Reads what a user types into a number cell: a decimal point or comma; empty is null. */
function readNumber(text: string): number | null | 'bad' {
  const t = text.trim();
  if (t.length === 0) return null;
  const value = Number(t.replace(',', '.'));
  return Number.isFinite(value) ? value : 'bad';
}

function NumberCell({ value, label, onCommit }: { value: number | null; label: string; onCommit: (v: number | null) => void }) {
  const shown = value === null ? '' : String(value);
  const [text, setText] = useState(shown);
  const [was, setWas] = useState(shown);
  // A change from elsewhere (a drag on the drawing) replaces what the cell shows.
  if (was !== shown) {
    setWas(shown);
    setText(shown);
  }
  const parsed = readNumber(text);
  const commit = () => {
    if (parsed === 'bad') return;
    if (parsed !== value) onCommit(parsed);
  };
  return (
    <input
      className={parsed === 'bad' ? 'invalid' : undefined}
      aria-label={label}
      aria-invalid={parsed === 'bad'}
      title={parsed === 'bad' ? `"${text}" is not a number` : undefined}
      inputMode="decimal"
      value={text}
      onChange={(e) => setText(e.target.value)}
      onBlur={commit}
      onKeyDown={(e) => {
        if (e.key === 'Enter') commit();
      }}
    />
  );
}

/**
 * The table takes no part in locking: the panel's fieldset disables every control in
 * it, so starting or stopping a search does not re-render a row.
 */
export const PointTable = memo(function PointTable() {
  const dispatch = useDispatch();
  const points = useWorkspace((s) => s.project.target.points);
  const timing = useWorkspace((s) => s.project.target.timing);
  const selected = useWorkspace((s) => s.ui.selectedPoint);
  const withAngle = timing === 'prescribed';

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
        <table>
          <thead>
            <tr>
              <th scope="col">#</th>
              <th scope="col">x (mm)</th>
              <th scope="col">y (mm)</th>
              {withAngle && <th scope="col">crank (°)</th>}
              <th scope="col">
                <span className="visually-hidden">Delete</span>
              </th>
            </tr>
          </thead>
          <tbody>
            {points.map((p, i) => (
              <tr key={i} className={i === selected ? 'selected' : undefined} data-testid="point-row" onClick={() => dispatch({ type: 'ui/select', index: i })}>
                <th scope="row">{i + 1}</th>
                <td>
                  <NumberCell value={p.x} label={`x of point ${i + 1} (mm)`} onCommit={(v) => dispatch({ type: 'target/edit', index: i, field: 'x', value: v })} />
                </td>
                <td>
                  <NumberCell value={p.y} label={`y of point ${i + 1} (mm)`} onCommit={(v) => dispatch({ type: 'target/edit', index: i, field: 'y', value: v })} />
                </td>
                {withAngle && (
                  <td>
                    <NumberCell
                      value={p.driverDeg}
                      label={`crank angle of point ${i + 1} (degrees)`}
                      onCommit={(v) => dispatch({ type: 'target/edit', index: i, field: 'driverDeg', value: v })}
                    />
                  </td>
                )}
                <td>
                  <button type="button" className="icon" aria-label={`Delete point ${i + 1}`} onClick={() => dispatch({ type: 'target/delete', index: i })}>
                    ×
                  </button>
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <div className="row-actions">
        <button type="button" onClick={addRow}>
          Add point
        </button>
        {withAngle && (
          <button type="button" onClick={() => dispatch({ type: 'target/spread-angles' })}>
            Spread crank angles evenly
          </button>
        )}
        <button type="button" onClick={() => dispatch({ type: 'target/clear' })} disabled={points.length === 0}>
          Clear all
        </button>
      </div>
    </div>
  );
});
