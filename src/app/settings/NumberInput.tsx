/**
 * Fields that check what is typed as it is typed: the message beside the field says what
 * is wrong and what is expected, and goes into the store's list of field issues, which
 * keeps a search from starting. A field commits on blur or Enter, and only a value its
 * check accepts; it never changes what was typed.
 */
import { useEffect, useId, useState } from 'react';
import type { Checked } from '../state/fields';
import { useDispatch } from '../state/store';

/** Publishes a field's message (or its absence) under `key`, and withdraws it when the field goes. */
export function useFieldIssue(key: string, message: string | null): void {
  const dispatch = useDispatch();
  useEffect(() => {
    dispatch({ type: 'ui/field-issue', key, message });
  }, [dispatch, key, message]);
  useEffect(() => () => dispatch({ type: 'ui/field-issue', key, message: null }), [dispatch, key]);
}

/** The text of a field: what the user typed, replaced when the stored value changes from elsewhere. */
export function useDraft(shown: string): [string, (text: string) => void] {
  const [text, setText] = useState(shown);
  const [was, setWas] = useState(shown);
  if (was !== shown) {
    setWas(shown);
    setText(shown);
  }
  return [text, setText];
}

export function FieldInput({
  text,
  label,
  message,
  issueKey,
  onText,
  onDone,
  className = 'number',
  autoFocus = false,
  messageId,
}: {
  text: string;
  label: string;
  message: string | null;
  issueKey: string;
  onText: (text: string) => void;
  onDone: () => void;
  className?: string;
  /** For a field the user has just asked for (Rename), so typing goes straight in. */
  autoFocus?: boolean;
  /** The id of an element elsewhere that shows the message (a row below a table's fields); the field then shows none itself. */
  messageId?: string;
}) {
  const ownId = `${useId()}-error`;
  const describedBy = messageId ?? ownId;
  useFieldIssue(issueKey, message);
  return (
    <span className="field">
      <input
        className={`${className}${message === null ? '' : ' invalid'}`}
        aria-label={label}
        autoFocus={autoFocus}
        aria-invalid={message !== null}
        aria-describedby={message === null ? undefined : describedBy}
        inputMode={className === 'number' ? 'decimal' : undefined}
        value={text}
        onChange={(e) => onText(e.target.value)}
        onBlur={onDone}
        onKeyDown={(e) => {
          if (e.key === 'Enter') onDone();
        }}
      />
      {message !== null && messageId === undefined && (
        <span className="field-error" id={ownId} data-testid="field-error">
          {message}
        </span>
      )}
    </span>
  );
}

/** One number field: `check` reads the text; a value it accepts is committed on blur or Enter. */
export function NumberInput<T extends number | null>({
  value,
  label,
  issueKey,
  check,
  onCommit,
  format = (v) => String(v),
}: {
  value: T;
  label: string;
  issueKey: string;
  check: (text: string) => Checked<T>;
  onCommit: (value: T) => void;
  format?: (value: number) => string;
}) {
  const [text, setText] = useDraft(value === null ? '' : format(value));
  const checked = check(text);
  const commit = () => {
    if (checked.ok && checked.value !== value) onCommit(checked.value);
  };
  return <FieldInput text={text} label={label} message={checked.ok ? null : checked.message} issueKey={issueKey} onText={setText} onDone={commit} />;
}
