/**
 * The gait figures of one leg with their units, the core's notes, and how each figure
 * is defined (GAIT_CONVENTIONS) in a details element.
 */
import { memo, useMemo } from 'react';
import { GAIT_CONVENTIONS, type GaitFigures } from '../../../core/gait';
import { gaitFigureRows } from './figureRows';

export function GaitConventions() {
  return (
    <details className="leg-conventions">
      <summary>How these figures are defined</summary>
      <ul>
        {GAIT_CONVENTIONS.map((c) => <li key={c}>{c}</li>)}
      </ul>
    </details>
  );
}

export const LegFigures = memo(function LegFigures({ figures }: { figures: GaitFigures }) {
  const rows = useMemo(() => gaitFigureRows(figures), [figures]);
  return (
    <section className="leg-figures" data-testid="leg-figures">
      <table className="leg-figure-table">
        <caption>Gait figures over one crank turn</caption>
        <tbody>
          {rows.map((r) => (
            <tr key={r.key} data-figure={r.key}>
              <th scope="row" title={r.hint}>{r.label}</th>
              <td>{r.value}</td>
            </tr>
          ))}
        </tbody>
      </table>
      {figures.notes.length > 0 && (
        <ul className="leg-notes" data-testid="leg-notes">
          {figures.notes.map((n) => <li key={n}>{n}</li>)}
        </ul>
      )}
      <GaitConventions />
    </section>
  );
});
