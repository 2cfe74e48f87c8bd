/** One line per family searched: its designs, how many meet the constraints, its best error; a click shows only that family. */
import type { Dispatch } from 'react';
import { familyName, formatMmValue } from './format';
import type { FamilySummary, ResultsAction } from './state';

export function FamilyOverview({ families, active, dispatch }: { families: readonly FamilySummary[]; active: string | null; dispatch: Dispatch<ResultsAction> }) {
  return (
    <table className="results-table results-overview" data-testid="family-overview" aria-label="Best of every mechanism searched">
      <thead>
        <tr>
          <th scope="col">Mechanism</th>
          <th scope="col">Designs</th>
          <th scope="col">Feasible</th>
          <th scope="col" title="Least RMS error of the feasible designs; of all when none is feasible">Least RMS (mm)</th>
          <th scope="col">Best rank</th>
          <th scope="col">Show</th>
        </tr>
      </thead>
      <tbody>
        {families.map((f) => (
          <tr key={f.family} data-testid="family-summary" data-family={f.family} className={active === f.family ? 'results-row-selected' : undefined}>
            <th scope="row">{familyName(f.family)}</th>
            <td className="results-num">{f.designs}</td>
            <td className="results-num">{f.feasible}</td>
            <td className="results-num" data-testid="family-best">
              {f.bestRmsMm === null ? '—' : formatMmValue(f.bestRmsMm)}
              {f.bestRmsMm !== null && !f.bestFeasible && <span className="results-badge">infeasible</span>}
            </td>
            <td className="results-num">{f.bestRank ?? '—'}</td>
            <td>
              {active === f.family
                ? <button type="button" onClick={() => dispatch({ type: 'filter', filter: { family: null } })}>All families</button>
                : <button type="button" onClick={() => dispatch({ type: 'filter', filter: { family: f.family } })} aria-label={`Show only ${familyName(f.family)}`}>Only this</button>}
            </td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}
