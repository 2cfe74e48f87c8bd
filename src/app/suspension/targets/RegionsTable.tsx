/**
 * Where each pivot may go, per layout searched: an x and a y range (mm) per pivot and the
 * shock's direction (degrees here, radians in the problem), each the core's default box
 * until changed. The layout shown on the side view can have a region drawn there.
 */
import { memo, type ReactNode } from 'react';
import { LAYOUT_NAMES, type LayoutKind } from '../../../core/suspension';
import { SHOCK_ANGLE_VARIABLE } from '../../../core/synthesis/suspensionProblem';
import { pivotLabel } from '../labels';
import { useSuspension, useSuspensionDispatch } from '../store';
import { FieldIssue, useFieldIssues, useSetupDispatch } from './SetupField';
import { rangeText, searchedPivots } from './setup';

function BoundCell({ kind, variable, bound, label }: { kind: LayoutKind; variable: string; bound: 'min' | 'max'; label: string }) {
  const dispatch = useSetupDispatch();
  const value = useSuspension((s) => rangeText(s.search, kind, variable).range[bound]);
  const field = `regions.${kind}.${variable}.${bound}`;
  const own = useFieldIssues(field);
  const pair = useFieldIssues(`regions.${kind}.${variable}`);
  const bad = own.length > 0 || pair.length > 0;
  return (
    <td data-field={field}>
      <input
        type="text"
        inputMode="decimal"
        spellCheck={false}
        aria-label={label}
        value={value}
        aria-invalid={bad}
        onChange={(e) => dispatch({ type: 'rangeText', layout: kind, variable, bound, text: e.target.value })}
      />
    </td>
  );
}

function VariableRows({ kind, variable, what, unit, tool }: { kind: LayoutKind; variable: string; what: string; unit: string; tool?: ReactNode }) {
  const dispatch = useSetupDispatch();
  const changed = useSuspension((s) => rangeText(s.search, kind, variable).changed);
  const name = LAYOUT_NAMES[kind];
  return (
    <>
      <tr data-variable={variable} className={changed ? 'susp-setup-changed' : undefined}>
        <th scope="row">{`${what} (${unit})`}</th>
        <BoundCell kind={kind} variable={variable} bound="min" label={`${name}, ${what} from (${unit})`} />
        <BoundCell kind={kind} variable={variable} bound="max" label={`${name}, ${what} to (${unit})`} />
        <td className="susp-setup-row-tools">
          {changed
            ? <button type="button" onClick={() => dispatch({ type: 'rangeDefault', layout: kind, variable })} aria-label={`Default range for ${name}, ${what}`} title="back to the default range">reset</button>
            : <span className="susp-hint">default</span>}
          {tool}
        </td>
      </tr>
      {[`regions.${kind}.${variable}`, `regions.${kind}.${variable}.min`, `regions.${kind}.${variable}.max`].map((f) => (
        <IssueRow key={f} field={f} />
      ))}
    </>
  );
}

function IssueRow({ field }: { field: string }) {
  const has = useFieldIssues(field).length > 0;
  if (!has) return null;
  return <tr><td colSpan={4}><FieldIssue field={field} /></td></tr>;
}

const LayoutRegions = memo(function LayoutRegions({ kind, shown }: { kind: LayoutKind; shown: boolean }) {
  const dispatch = useSuspensionDispatch();
  const tool = useSuspension((s) => s.setupTool);
  return (
    <table className="susp-pivots susp-setup-regions" data-testid={`regions-${kind}`}>
      <caption>
        {LAYOUT_NAMES[kind]}
        {shown ? ' (shown on the side view: draw a region there)' : ' (choose it in the Layout panel to draw its regions)'}
      </caption>
      <thead>
        <tr><th scope="col">variable</th><th scope="col">from</th><th scope="col">to</th><th scope="col"><span className="susp-hint">range</span></th></tr>
      </thead>
      <tbody>
        {searchedPivots(kind).map((pivot) => {
          const drawing = tool?.kind === 'region' && tool.layout === kind && tool.pivot === pivot;
          const draw = shown ? (
            <button
              type="button"
              aria-pressed={drawing}
              aria-label={`Draw the region of the ${pivotLabel(pivot)} on the side view`}
              onClick={() => dispatch({ type: 'setupTool', tool: drawing ? null : { kind: 'region', layout: kind, pivot } })}
            >
              {drawing ? 'drawing…' : 'draw'}
            </button>
          ) : undefined;
          return (
            <VariableRowsPair key={pivot} kind={kind} pivot={pivot} draw={draw} />
          );
        })}
        <VariableRows kind={kind} variable={SHOCK_ANGLE_VARIABLE} what="shock angle, CCW from +x" unit="°" />
      </tbody>
    </table>
  );
});

function VariableRowsPair({ kind, pivot, draw }: { kind: LayoutKind; pivot: string; draw: ReactNode }) {
  return (
    <>
      <VariableRows kind={kind} variable={`${pivot}.x`} what={`${pivotLabel(pivot)} x`} unit="mm" tool={draw} />
      <VariableRows kind={kind} variable={`${pivot}.y`} what={`${pivotLabel(pivot)} y`} unit="mm" />
    </>
  );
}

export const RegionsTable = memo(function RegionsTable() {
  const layouts = useSuspension((s) => s.search.layouts);
  const shownKind = useSuspension((s) => s.layout.kind);
  return (
    <div className="susp-setup-regions-list" data-testid="search-regions">
      <p className="susp-note">
        Where each pivot may go at full extension, mm (the shock’s frame eye follows from the shock angle: degrees here, radians in the
        problem). Each range is the default box around the layout’s demo drawing until you change it.
      </p>
      {layouts.length === 0 && <p className="susp-note">Tick a layout to search to set its regions.</p>}
      {layouts.map((kind) => <LayoutRegions key={kind} kind={kind} shown={kind === shownKind} />)}
    </div>
  );
});
