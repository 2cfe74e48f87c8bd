/**
 * When the queue is done: every job with the best design of each family (layout) it
 * searched (a path job's RMS error, mm; a rear-suspension or walking-leg job's search
 * score), the evaluations and search time it used, its search and worker restarts and how it
 * ended, a button to open its designs (a path job's in the results table, a workspace
 * job's in its workspace), and the table as CSV. Rear-suspension and walking-leg rows
 * carry their workspace's caution, as the CSV does.
 */
import { useState } from 'react';
import { formatMmValue } from '../results/format';
import { downloadText } from '../results/download';
import { formatDuration } from '../run/progress';
import { requestShowKeptRun } from '../history/historyEvents';
import { jobKind, type AppQueueEntry } from './jobs';
import { requestOpenWorkspaceRun } from './openWorkspaceRun';
import { jobStateWords, summaryCsv } from './summary';
import { jobCaution, jobFamilyName, KIND_WORDS, type WorkspaceJobRun } from './workspaceJobs';

/** A score as the workspaces' tables write it: four significant figures. */
function scoreWords(score: number): string {
  return score.toPrecision(4);
}

export function MorningSummary({ jobs }: { jobs: readonly AppQueueEntry[] }) {
  const [problem, setProblem] = useState<string | null>(null);
  const open = (entry: AppQueueEntry) => {
    const kind = jobKind(entry.spec.problem);
    if (kind !== 'path') {
      const designs = entry.outcome?.designs;
      const refused = designs === undefined ? 'the job kept no designs' : requestOpenWorkspaceRun({ kind, run: designs as WorkspaceJobRun });
      setProblem(refused === null ? null : `"${entry.spec.name}" could not be opened in the ${KIND_WORDS[kind]} workspace: ${refused}.`);
      return;
    }
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
            <th scope="col">Job</th><th scope="col">Kind</th><th scope="col">Ended</th>
            <th scope="col">Best of each family or layout (path: RMS error, mm; rear suspension, walking leg: search score, lower is better)</th>
            <th scope="col">Evaluations</th><th scope="col">Search time</th><th scope="col" title="Fresh optimizer runs started after a run converged or stalled, all islands">Search restarts</th><th scope="col">Worker restarts</th><th scope="col">Designs</th>
          </tr>
        </thead>
        <tbody>
          {jobs.map((entry) => {
            const o = entry.outcome;
            const kind = jobKind(entry.spec.problem);
            const caution = jobCaution(kind);
            const canOpen = o !== null && (kind === 'path' ? o.kept : o.designs !== undefined);
            return (
              <tr key={entry.id} data-testid="summary-row" data-name={entry.spec.name} data-kind={kind}>
                <td>
                  {entry.spec.name}
                  {caution !== null && <span className="option-note batch-caution" role="note" data-testid="summary-caution"><strong> Caution.</strong> {caution}</span>}
                </td>
                <td>{KIND_WORDS[kind]}</td>
                <td>{jobStateWords(entry)}</td>
                <td>
                  {o === null || o.best.length === 0 ? '—' : (
                    <ul className="batch-best">
                      {o.best.map((b) => (
                        <li key={b.family} data-testid="summary-best" data-family={b.family}>
                          {jobFamilyName(kind, b.family)}: <span className="results-num">{'rmsMm' in b ? formatMmValue(b.rmsMm) : `score ${scoreWords(b.score)}`}</span>
                          {!b.feasible && <span className="results-badge">infeasible</span>}
                        </li>
                      ))}
                    </ul>
                  )}
                </td>
                <td className="results-num">{o === null ? '—' : o.evaluations.toLocaleString('en-GB')}</td>
                <td className="results-num">{o === null ? '—' : formatDuration(o.elapsedMs)}</td>
                <td className="results-num">{o?.searchRestarts ?? '—'}</td>
                <td className="results-num">{o === null ? '—' : o.restarts}</td>
                <td>
                  {canOpen
                    ? <button type="button" onClick={() => open(entry)} aria-label={`Open ${entry.spec.name} in the ${kind === 'path' ? 'results' : `${KIND_WORDS[kind]} workspace`}`}>{kind === 'path' ? 'Open in results' : 'Open in its workspace'}</button>
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
