/**
 * The foot trajectory wanted, as a table of points (mm) in the order the foot traces
 * them: add, edit, delete, or paste "x, y" rows (CSV). A paste replaces the points and
 * says what it did; columns it does not use (timing, weights) are named, not dropped
 * silently. Points can also be clicked on the drawing.
 */
import { useState } from 'react';
import { parsePointsCsv } from '../../../core/io/pointsCsv';
import { FieldIssue, SetupField, useFieldIssues } from '../../suspension/targets/SetupField';
import { useLeg } from '../store';
import { useSetupDispatch } from '../store';

function PointRow({ index, x, y }: { index: number; x: string; y: string }) {
  const dispatch = useSetupDispatch();
  const field = `targets.footPath.points[${index}]`;
  const bad = useFieldIssues(field).length > 0;
  return (
    <tr data-field={field}>
      <th scope="row">{index + 1}</th>
      <td><input type="text" inputMode="decimal" aria-label={`Point ${index + 1} x (mm)`} aria-invalid={bad} value={x} onChange={(e) => dispatch({ type: 'pointText', index, field: 'x', text: e.target.value })} /></td>
      <td><input type="text" inputMode="decimal" aria-label={`Point ${index + 1} y (mm)`} aria-invalid={bad} value={y} onChange={(e) => dispatch({ type: 'pointText', index, field: 'y', text: e.target.value })} /></td>
      <td>
        <button type="button" aria-label={`Delete point ${index + 1}`} onClick={() => dispatch({ type: 'pointDelete', index })}>Delete</button>
        <FieldIssue field={field} />
      </td>
    </tr>
  );
}

export function TrajectoryTable() {
  const dispatch = useSetupDispatch();
  const footPath = useLeg((s) => s.setup.footPath);
  const [csv, setCsv] = useState('');
  const [pasteNote, setPasteNote] = useState<string | null>(null);
  const paste = () => {
    const read = parsePointsCsv(csv);
    if (!read.ok) {
      setPasteNote(`Not pasted: ${read.issues.map((i) => (i.row > 0 ? `line ${i.row}: ${i.message}` : i.message)).join('; ')}`);
      return;
    }
    dispatch({ type: 'pointsReplace', points: read.points.map((p) => ({ x: String(p.x), y: String(p.y) })) });
    const unused = [read.driverDeg !== null ? 'crank angles' : null, read.weights !== null ? 'weights' : null].filter((w) => w !== null);
    setPasteNote(`${read.points.length} points pasted, replacing the table${read.closedByRepeat ? ' (the last row repeated the first and was dropped: the trajectory is a closed loop)' : ''}.${unused.length > 0 ? ` The ${unused.join(' and ')} column${unused.length > 1 ? 's are' : ' is'} not used by a leg search.` : ''}`);
    setCsv('');
  };
  return (
    <fieldset className="legws-group" data-testid="leg-trajectory">
      <legend>
        <label>
          <input type="checkbox" checked={footPath.on} onChange={(e) => dispatch({ type: 'footPathOn', on: e.target.checked })} /> Match a foot trajectory
        </label>
      </legend>
      <p className="susp-hint">A closed loop in the order the foot traces it, mm. Add rows, type them, paste x, y rows, or click on the drawing.</p>
      <table className="legws-points">
        <thead><tr><th scope="col">#</th><th scope="col">x (mm)</th><th scope="col">y (mm)</th><th scope="col"><span className="visually-hidden">Actions</span></th></tr></thead>
        <tbody>{footPath.points.map((p, i) => <PointRow key={i} index={i} x={p.x} y={p.y} />)}</tbody>
      </table>
      <FieldIssue field="targets.footPath.points" />
      <button type="button" onClick={() => dispatch({ type: 'pointAdd' })}>Add point</button>
      <div className="legws-paste">
        <label>
          Paste CSV (x, y in mm, one point a line)
          <textarea rows={3} value={csv} spellCheck={false} onChange={(e) => setCsv(e.target.value)} />
        </label>
        <button type="button" onClick={paste} disabled={csv.trim() === ''}>Replace points with the pasted rows</button>
        {pasteNote !== null && <p className="susp-note" role="status">{pasteNote}</p>}
      </div>
      {footPath.on && (
        <div className="legws-row">
          <SetupField field="targets.footPath.weight" label="Weight" value={footPath.weight} hint="empty: 1" onChange={(text) => dispatch({ type: 'footPathText', field: 'weight', text })} />
          <SetupField field="targets.footPath.toleranceMm" label="Tolerance" unit="mm" value={footPath.tolerance} hint="RMS distance that counts as 1; empty: the stance tolerance" onChange={(text) => dispatch({ type: 'footPathText', field: 'tolerance', text })} />
        </div>
      )}
    </fieldset>
  );
}
