/** Variable bounds per family: the defaults, and the user's overrides (positions also show as regions on the drawing). */
import { useId, useState } from 'react';
import { familyLabel, type FamilyId } from '../state/families';
import { checkBounds, formatValue } from '../state/fields';
import { useDispatch, useWorkspace } from '../state/store';
import { variableUnit, type FamilyBounds } from './boundRegions';
import { FieldInput, useDraft } from './NumberInput';

/** One variable's pair: both texts are checked together, and only a range the check accepts is stored. */
function BoundRow({ family, name, lower, upper, own }: { family: FamilyId; name: string; lower: number; upper: number; own: boolean }) {
  const dispatch = useDispatch();
  const [lo, setLo] = useDraft(formatValue(lower));
  const [hi, setHi] = useDraft(formatValue(upper));
  const variable = `${familyLabel(family)} ${name}`;
  const checked = checkBounds(variable, variableUnit(name), lo, hi);
  const commit = () => {
    if (!checked.ok) return;
    const [a, b] = checked.value;
    // What the row shows is what it stores: an untouched default stays the default.
    if (a !== Number(formatValue(lower)) || b !== Number(formatValue(upper))) dispatch({ type: 'settings/bound', family, variable: name, range: [a, b] });
  };
  // A message for the pair (a reversed or empty range) shows once; the messages go in a row below the fields.
  const lowerMessage = checked.ok ? null : checked.lower;
  const upperMessage = checked.ok || checked.upper === checked.lower ? null : checked.upper;
  const key = `bound:${family}:${name}`;
  const id = useId();
  return (
    <>
      <tr className={own ? 'overridden' : undefined}>
        <th scope="row">{name}</th>
        <td>
          <FieldInput text={lo} label={`${name}, lower bound`} issueKey={`${key}:lower`} message={lowerMessage} messageId={`${id}-lower`} onText={setLo} onDone={commit} />
        </td>
        <td>
          <FieldInput
            text={hi}
            label={`${name}, upper bound`}
            issueKey={`${key}:upper`}
            message={checked.ok ? null : checked.upper}
            messageId={upperMessage === null ? `${id}-lower` : `${id}-upper`}
            onText={setHi}
            onDone={commit}
          />
        </td>
        <td>
          {own && (
            <button type="button" className="icon" aria-label={`Reset the bounds of ${name}`} onClick={() => dispatch({ type: 'settings/bound', family, variable: name, range: null })}>
              ↺
            </button>
          )}
        </td>
      </tr>
      {(lowerMessage !== null || upperMessage !== null) && (
        <tr className="bound-messages">
          <td colSpan={4}>
            {lowerMessage !== null && (
              <span className="field-error" id={`${id}-lower`} data-testid="field-error">
                {lowerMessage}
              </span>
            )}
            {upperMessage !== null && (
              <span className="field-error" id={`${id}-upper`} data-testid="field-error">
                {upperMessage}
              </span>
            )}
          </td>
        </tr>
      )}
    </>
  );
}

export function BoundsEditor({ familyBounds }: { familyBounds: readonly FamilyBounds[] }) {
  const overrides = useWorkspace((s) => s.project.settings.bounds);
  const hasIssue = useWorkspace((s) => Object.keys(s.ui.fieldIssues).some((k) => k.startsWith('bound:')));
  const [open, setOpen] = useState(false);
  if (familyBounds.length === 0) return null;
  return (
    // Opened by the user, or while a bound is wrong, so its message is in sight.
    <details className="bounds-editor" open={open || hasIssue} onToggle={(e) => setOpen(e.currentTarget.open)}>
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
              return <BoundRow key={name} family={fb.family} name={name} lower={own?.[0] ?? fb.lower[k]} upper={own?.[1] ?? fb.upper[k]} own={own !== undefined} />;
            })}
          </tbody>
        </table>
      ))}
    </details>
  );
}
