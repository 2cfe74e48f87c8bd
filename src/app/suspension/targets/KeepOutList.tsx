/**
 * The keep-out circles, typed (name, centre and radius in mm) or placed on the side view;
 * no pivot and no moving link may enter one at any step of the travel.
 */
import { memo } from 'react';
import { useSuspension, useSuspensionDispatch } from '../store';
import { FieldIssue, useFieldIssues, useSetupDispatch } from './SetupField';
import type { KeepOutDraft } from './setup';

const COLUMNS: readonly { readonly field: keyof KeepOutDraft; readonly title: string }[] = [
  { field: 'name', title: 'name' },
  { field: 'x', title: 'x (mm)' },
  { field: 'y', title: 'y (mm)' },
  { field: 'r', title: 'r (mm)' },
];

function Cell({ index, field, title, value }: { index: number; field: keyof KeepOutDraft; title: string; value: string }) {
  const dispatch = useSetupDispatch();
  const key = `keepOut.${index}.${field}`;
  const own = useFieldIssues(key);
  const circle = useFieldIssues(`keepOut.${index}`);
  const bad = own.length > 0 || (field !== 'name' && circle.length > 0);
  return (
    <td data-field={key}>
      <input
        type="text"
        inputMode={field === 'name' ? 'text' : 'decimal'}
        spellCheck={false}
        aria-label={`Keep-out ${index + 1} ${title}`}
        value={value}
        aria-invalid={bad}
        onChange={(e) => dispatch({ type: 'keepOutText', index, field, text: e.target.value })}
      />
    </td>
  );
}

export const KeepOutList = memo(function KeepOutList() {
  const keepOut = useSuspension((s) => s.search.keepOut);
  const placing = useSuspension((s) => s.setupTool?.kind === 'keepOut');
  const dispatch = useSuspensionDispatch();
  const setup = useSetupDispatch();
  return (
    <div data-testid="search-keep-out">
      <table className="susp-pivots susp-setup-keep-out">
        <caption>Circles no pivot or moving link may enter at any point of the travel</caption>
        <thead>
          <tr>{COLUMNS.map((c) => <th key={c.field} scope="col">{c.title}</th>)}<th scope="col"><span className="susp-hint">remove</span></th></tr>
        </thead>
        <tbody>
          {keepOut.map((k, index) => (
            <KeepOutRow key={index} index={index} k={k} onRemove={() => setup({ type: 'keepOutRemove', index })} />
          ))}
        </tbody>
      </table>
      <div className="susp-buttons">
        <button type="button" onClick={() => setup({ type: 'keepOutAdd' })}>Add a keep-out</button>
        <button type="button" aria-pressed={placing} onClick={() => dispatch({ type: 'setupTool', tool: placing ? null : { kind: 'keepOut' } })}>
          {placing ? 'Placing on the side view… (Esc cancels)' : 'Place a keep-out on the side view'}
        </button>
      </div>
    </div>
  );
});

function KeepOutRow({ index, k, onRemove }: { index: number; k: KeepOutDraft; onRemove: () => void }) {
  const issues = ['', '.name', '.x', '.y', '.r'].map((s) => `keepOut.${index}${s}`);
  return (
    <>
      <tr data-keep-out-row={index}>
        {COLUMNS.map((c) => <Cell key={c.field} index={index} field={c.field} title={c.title} value={k[c.field]} />)}
        <td><button type="button" onClick={onRemove} aria-label={`Remove keep-out ${index + 1} (${k.name})`}>×</button></td>
      </tr>
      {issues.map((f) => <IssueLine key={f} field={f} />)}
    </>
  );
}

function IssueLine({ field }: { field: string }) {
  if (useFieldIssues(field).length === 0) return null;
  return <tr><td colSpan={5}><FieldIssue field={field} /></td></tr>;
}
