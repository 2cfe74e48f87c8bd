/** A number field that commits on blur or Enter, reads a decimal comma, and marks what is not a number. */
import { useState } from 'react';

export function NumberInput({
  value,
  label,
  onCommit,
  allowEmpty = false,
}: {
  value: number | null;
  label: string;
  onCommit: (value: number | null) => void;
  allowEmpty?: boolean;
}) {
  const shown = value === null ? '' : String(value);
  const [text, setText] = useState(shown);
  const [was, setWas] = useState(shown);
  if (was !== shown) {
    setWas(shown);
    setText(shown);
  }
  const trimmed = text.trim();
  const parsed = trimmed.length === 0 ? null : Number(trimmed.replace(',', '.'));
  const bad = (parsed === null && !allowEmpty) || (parsed !== null && !Number.isFinite(parsed));
  const commit = () => {
    if (bad) return;
    if (parsed !== value) onCommit(parsed);
    // The store may clamp the value; show what it keeps.
    setWas('');
  };
  return (
    <input
      className={`number${bad ? ' invalid' : ''}`}
      aria-label={label}
      aria-invalid={bad}
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
