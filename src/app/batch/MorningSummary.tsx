/**
 * When the queue is done: every job with the best design of each family it searched
 * (RMS error, mm), the evaluations and search time it used, its worker restarts and how
 * it ended, a button to open its designs in the results table, and the table as CSV.
 */
import { useState } from 'react';
import { familyName, formatMmValue } from '../results/format';
import { downloadText } from '../results/download';
import { formatDuration } from '../run/progress';
import { requestShowKeptRun } from '../history/historyEvents';
import type { AppQueueEntry } from './jobs';
import { jobStateWords, summaryCsv } from './summary';

export function MorningSummary({ jobs }: { jobs: readonly AppQueueEntry[] }) {
  const [problem, setProblem] = useState<string | null>(null);
  const open = (entry: AppQueueEntry) => {
    if (entry.runId === null || !requestShowKeptRun(entry.runId)) {
      setProblem('The results view is not open: close the suspension or leg workspace to see the kept runs.');
      return;
    }
    setProblem(null);
    document.querySelector('[aria-label="Results"]')?.scrollIntoView({ block: 'start' });
  };
  return (
    <section className="batch-summary" aria-label="Queue summary" data-testid="queue-summary">
      <h3 className="results-heading">Summary of the queue</h3>
      {problem !== null && <p className="field-error" role="status">{problem}</p>}
      <table className="results-table">
        <thead>
          <tr>
            <th scope="col">Job</th><th scope="col">Ended</th><th scope="col">Best of each family (RMS error, mm)</th>
            <th scope="col">Evaluations</th><th scope="col">Search time</th><th scope="col">Worker restarts</th><th scope="col">Designs</th>
          </tr>
        </thead>
        <tbody>
          {jobs.map((entry) => {
            const o = entry.outcome;
            return (
              <tr key={entry.id} data-testid="summary-row" data-name={entry.spec.name}>
                <td>{entry.spec.name}</td>
                <td>{jobStateWords(entry)}</td>
                <td>
                  {o === null || o.best.length === 0 ? '—' : (
                    <ul className="batch-best">
                      {o.best.map((b) => (
                        <li key={b.family} data-testid="summary-best" data-family={b.family}>
                          {familyName(b.family)}: <span className="results-num">{formatMmValue(b.rmsMm)}</span>
                          {!b.feasible && <span className="results-badge">infeasible</span>}
                        </li>
                      ))}
                    </ul>
                  )}
                </td>
                <td className="results-num">{o === null ? '—' : o.evaluations.toLocaleString('en-GB')}</td>
                <td className="results-num">{o === null ? '—' : formatDuration(o.elapsedMs)}</td>
                <td className="results-num">{o === null ? '—' : o.restarts}</td>
                <td>
                  {o !== null && o.kept
                    ? <button type="button" onClick={() => open(entry)} aria-label={`Open ${entry.spec.name} in the results`}>Open in results</button>
                    : '—'}
                </td>
              </tr>
            );
          })}
        </tbody>
      </table>
      <div className="row-actions">
        <button type="button" onClick={() => downloadText(summaryCsv(jobs), 'loci-queue-summary.csv', 'text/csv')}>Export summary (CSV)</button>
      </div>
    </section>
  );
}
