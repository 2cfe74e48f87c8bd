/** The filters above the ranked table: family, feasible only, largest RMS error (mm). */
import { useState, type Dispatch } from 'react';
import { familyName } from './format';
import type { ResultsAction, ResultsFilter } from './state';

export function ResultsToolbar({
  families,
  filter,
  shown,
  total,
  running,
  dispatch,
}: {
  families: readonly string[];
  filter: ResultsFilter;
  shown: number;
  total: number;
  running: boolean;
  dispatch: Dispatch<ResultsAction>;
}) {
  // The field keeps what is typed; the filter takes it once it reads as a number ≥ 0.
  const [maxRmsText, setMaxRmsText] = useState(filter.maxRmsMm === null ? '' : String(filter.maxRmsMm));
  const maxRmsValid = maxRmsText.trim() === '' || Number(maxRmsText) >= 0;
  return (
    <div className="results-toolbar" role="group" aria-label="Filter the candidates">
      <label>
        Family{' '}
        <select value={filter.family ?? ''} onChange={(e) => dispatch({ type: 'filter', filter: { family: e.target.value === '' ? null : e.target.value } })}>
          <option value="">all families</option>
          {families.map((f) => <option key={f} value={f}>{familyName(f)}</option>)}
        </select>
      </label>
      <label>
        <input type="checkbox" checked={filter.feasibleOnly} onChange={(e) => dispatch({ type: 'filter', filter: { feasibleOnly: e.target.checked } })} />{' '}
        feasible only
      </label>
      <label>
        Max. RMS error (mm){' '}
        <input
          type="text"
          inputMode="decimal"
          size={7}
          value={maxRmsText}
          aria-invalid={!maxRmsValid}
          placeholder="any"
          onChange={(e) => {
            const text = e.target.value;
            setMaxRmsText(text);
            const trimmed = text.trim().replace(',', '.');
            const value = Number(trimmed);
            if (trimmed === '') dispatch({ type: 'filter', filter: { maxRmsMm: null } });
            else if (value >= 0) dispatch({ type: 'filter', filter: { maxRmsMm: value } });
          }}
        />
      </label>
      {!maxRmsValid && <span className="results-field-error">expected a number of mm ≥ 0</span>}
      <span className="results-count" aria-live="polite">
        {shown === total ? `${total} candidates` : `${shown} of ${total} candidates`}
        {running ? ' · search running' : ''}
      </span>
    </div>
  );
}
