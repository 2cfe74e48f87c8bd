/** Variable bounds per family: the defaults, and the user's overrides (positions also show as regions on the drawing). */
import { familyLabel } from '../state/families';
import { useDispatch, useWorkspace } from '../state/store';
import type { FamilyBounds } from './boundRegions';
import { NumberInput } from './NumberInput';

export function BoundsEditor({ familyBounds }: { familyBounds: readonly FamilyBounds[] }) {
  const dispatch = useDispatch();
  const overrides = useWorkspace((s) => s.project.settings.bounds);
  if (familyBounds.length === 0) return null;
  return (
    <details className="bounds-editor">
      <summary>Variable bounds</summary>
      {familyBounds.map((fb) => (
        <table key={fb.family} className="bounds-table">
          <caption>{familyLabel(fb.family)}</caption>
          <thead>
            <tr>
              <th scope="col">variable</th>
              <th scope="col">from</th>
              <th scope="col">to</th>
              <th scope="col">
                <span className="visually-hidden">Reset</span>
              </th>
            </tr>
          </thead>
          <tbody>
            {fb.variableNames.map((name, k) => {
              const own = overrides[fb.family]?.[name];
              const lo = own?.[0] ?? fb.lower[k];
              const hi = own?.[1] ?? fb.upper[k];
              return (
                <tr key={name} className={own === undefined ? undefined : 'overridden'}>
                  <th scope="row">{name}</th>
                  <td>
                    <NumberInput value={lo} label={`${name}, lower bound`} onCommit={(v) => v !== null && dispatch({ type: 'settings/bound', family: fb.family, variable: name, range: [v, hi] })} />
                  </td>
                  <td>
                    <NumberInput value={hi} label={`${name}, upper bound`} onCommit={(v) => v !== null && dispatch({ type: 'settings/bound', family: fb.family, variable: name, range: [lo, v] })} />
                  </td>
                  <td>
                    {own !== undefined && (
                      <button type="button" className="icon" aria-label={`Reset the bounds of ${name}`} onClick={() => dispatch({ type: 'settings/bound', family: fb.family, variable: name, range: null })}>
                        ↺
                      </button>
                    )}
                  </td>
                </tr>
              );
            })}
          </tbody>
        </table>
      ))}
    </details>
  );
}
