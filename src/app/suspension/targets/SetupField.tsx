/**
 * The set-up panel's pieces: a text field with its unit and the issues beside it, an
 * issue line, and the dispatch of set-up actions. Each field carries the reader's field
 * name (`data-field`), so a message lands where the value was typed.
 */
import { createContext, useContext, useId } from 'react';
import { useSuspensionDispatch } from '../store';
import type { SearchSetupAction } from './setup';

/** The reader's issues by field name. */
export type IssuesByField = ReadonlyMap<string, readonly string[]>;
export const SetupIssuesContext = createContext<IssuesByField>(new Map());

export function useFieldIssues(field: string): readonly string[] {
  return useContext(SetupIssuesContext).get(field) ?? [];
}

export function useSetupDispatch(): (action: SearchSetupAction) => void {
  const dispatch = useSuspensionDispatch();
  return (action) => dispatch({ type: 'search', action });
}

/** The issues of a field that has no input of its own (a band, a row, a list). */
export function FieldIssue({ field, id }: { field: string; id?: string }) {
  const messages = useFieldIssues(field);
  if (messages.length === 0) return null;
  return (
    <span className="susp-issue susp-setup-issue" id={id} role="alert" data-testid={`setup-issue-${field}`}>
      {messages.join('; ')}
    </span>
  );
}

export function SetupField({ field, label, unit, value, onChange, hint, multiline, wide }: {
  field: string;
  label: string;
  unit?: string;
  value: string;
  onChange: (text: string) => void;
  hint?: string;
  multiline?: boolean;
  wide?: boolean;
}) {
  const id = useId();
  const bad = useFieldIssues(field).length > 0;
  const common = {
    id,
    value,
    spellCheck: false,
    'aria-invalid': bad,
    'aria-describedby': bad ? `${id}-issue` : undefined,
  };
  return (
    <div className={`susp-field${wide === true ? ' susp-field-wide' : ''}`} data-field={field}>
      <label htmlFor={id}>{label}</label>
      <span className="susp-input-unit">
        {multiline === true
          ? <textarea {...common} rows={3} onChange={(e) => onChange(e.target.value)} />
          : <input {...common} type="text" inputMode="decimal" onChange={(e) => onChange(e.target.value)} />}
        {unit !== undefined && unit !== '' && <span className="susp-unit">{unit}</span>}
      </span>
      {hint !== undefined && <span className="susp-hint">{hint}</span>}
      <FieldIssue field={field} id={`${id}-issue`} />
    </div>
  );
}
