/**
 * The families to search (every family Loci has for legs; the foot is each family's
 * point P) and, per family, the pivot regions: a variable's range changed from the core's
 * default box (which is sized by the trajectory, or the stride and step height on the
 * ground line). The keep-out circles keep the ground pivots out.
 */
import { useState } from 'react';
import { mechanismVariableNames } from '../../../core/synthesis/familyVariables';
import { LEG_FAMILY_IDS } from '../../../core/synthesis/legProblem';
import type { PoseFamilyId } from '../../../core/synthesis/poseFamilies';
import { FAMILY_NAMES } from '../../../core/synthesis/problem';
import { FieldIssue, useFieldIssues } from '../../suspension/targets/SetupField';
import { useLeg, useSetupDispatch } from '../store';

function RegionRow({ family, index }: { family: PoseFamilyId; index: number }) {
  const dispatch = useSetupDispatch();
  const row = useLeg((s) => s.setup.regions[family]?.[index]);
  const field = `bounds.${family}.${row?.variable ?? ''}`;
  const bad = useFieldIssues(field).length > 0;
  if (row === undefined) return null;
  return (
    <tr data-field={field}>
      <th scope="row">{row.variable}</th>
      <td><input type="text" inputMode="decimal" aria-label={`${FAMILY_NAMES[family]} ${row.variable} from (mm)`} aria-invalid={bad} value={row.min} onChange={(e) => dispatch({ type: 'regionText', family, index, field: 'min', text: e.target.value })} /></td>
      <td><input type="text" inputMode="decimal" aria-label={`${FAMILY_NAMES[family]} ${row.variable} to (mm)`} aria-invalid={bad} value={row.max} onChange={(e) => dispatch({ type: 'regionText', family, index, field: 'max', text: e.target.value })} /></td>
      <td>
        <button type="button" onClick={() => dispatch({ type: 'regionRemove', family, index })}>Default</button>
        <FieldIssue field={field} />
      </td>
    </tr>
  );
}

function Regions({ family }: { family: PoseFamilyId }) {
  const dispatch = useSetupDispatch();
  const rows = useLeg((s) => s.setup.regions[family]) ?? [];
  const variables = (mechanismVariableNames(family, 'fixed') ?? []).filter((v) => !rows.some((r) => r.variable === v));
  const [choice, setChoice] = useState('');
  const chosen = variables.includes(choice) ? choice : (variables[0] ?? '');
  return (
    <details className="legws-regions" open={rows.length > 0}>
      <summary>{`${FAMILY_NAMES[family]}: pivot regions (${rows.length === 0 ? 'the default box' : `${rows.length} changed`})`}</summary>
      <FieldIssue field={`bounds.${family}`} />
      {rows.length > 0 && (
        <table className="legws-points">
          <thead><tr><th scope="col">Variable</th><th scope="col">from (mm)</th><th scope="col">to (mm)</th><th scope="col"><span className="visually-hidden">Actions</span></th></tr></thead>
          <tbody>{rows.map((_, i) => <RegionRow key={i} family={family} index={i} />)}</tbody>
        </table>
      )}
      {variables.length > 0 && (
        <div className="legws-row">
          <label>
            Variable{' '}
            <select value={chosen} onChange={(e) => setChoice(e.target.value)}>{variables.map((v) => <option key={v} value={v}>{v}</option>)}</select>
          </label>
          <button type="button" onClick={() => dispatch({ type: 'regionAdd', family, variable: chosen })}>Set its range</button>
        </div>
      )}
    </details>
  );
}

function KeepOuts() {
  const dispatch = useSetupDispatch();
  const keepOut = useLeg((s) => s.setup.keepOut);
  return (
    <div className="legws-keepouts" data-testid="leg-keepouts">
      <h3>Keep-out circles (ground pivots stay outside)</h3>
      {keepOut.length > 0 && (
        <table className="legws-points">
          <thead><tr><th scope="col">Name</th><th scope="col">x (mm)</th><th scope="col">y (mm)</th><th scope="col">r (mm)</th><th scope="col"><span className="visually-hidden">Actions</span></th></tr></thead>
          <tbody>
            {keepOut.map((k, i) => (
              <tr key={i} data-field={`keepOut[${i}]`}>
                <td><input type="text" aria-label={`Keep-out ${i + 1} name`} value={k.name} onChange={(e) => dispatch({ type: 'keepOutText', index: i, field: 'name', text: e.target.value })} /></td>
                {(['x', 'y', 'r'] as const).map((f) => (
                  <td key={f}><input type="text" inputMode="decimal" aria-label={`Keep-out ${i + 1} ${f} (mm)`} value={k[f]} onChange={(e) => dispatch({ type: 'keepOutText', index: i, field: f, text: e.target.value })} /></td>
                ))}
                <td>
                  <button type="button" onClick={() => dispatch({ type: 'keepOutRemove', index: i })}>Remove</button>
                  <FieldIssue field={`keepOut[${i}]`} />
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
      <button type="button" onClick={() => dispatch({ type: 'keepOutAdd' })}>Add keep-out circle</button>
    </div>
  );
}

export function FamiliesFields() {
  const dispatch = useSetupDispatch();
  const families = useLeg((s) => s.setup.families);
  return (
    <fieldset className="legws-group" data-testid="leg-families">
      <legend>Families to search</legend>
      <div className="legws-families">
        {LEG_FAMILY_IDS.map((f) => (
          <label key={f}>
            <input type="checkbox" checked={families.includes(f)} onChange={(e) => dispatch({ type: 'family', family: f, on: e.target.checked })} /> {FAMILY_NAMES[f]}
          </label>
        ))}
      </div>
      <p className="susp-hint">The six-bars with Newton blocks (Stephenson II and III) are slow to search.</p>
      <FieldIssue field="families" />
      {families.map((f) => <Regions key={f} family={f} />)}
      <KeepOuts />
    </fieldset>
  );
}
