/**
 * The kept runs of the project and the shortlist of pinned designs: show a run's designs
 * in the table, rename or delete a run, compare or unpin a pinned design.
 */
import { useState } from 'react';
import { familyName, formatMmValue } from '../results/format';
import type { RunHistory } from './useRunHistory';
import type { KeptRunSummary } from './types';

const DATE_FORMAT = new Intl.DateTimeFormat('en-GB', { dateStyle: 'medium', timeStyle: 'short' });

export interface HistoryPanelProps {
  readonly history: RunHistory;
  /** Compare keys of the pinned designs picked for comparison. */
  readonly compared: readonly string[];
  readonly compareFull: boolean;
  readonly onToggleCompare: (key: string) => void;
}

export function pinCompareKey(pinKey: string): string {
  return `pin:${pinKey}`;
}

export function HistoryPanel({ history, compared, compareFull, onToggleCompare }: HistoryPanelProps) {
  return (
    <section className="results-history" aria-label="Run history" data-testid="run-history">
      <h3 className="results-heading">Kept runs</h3>
      {history.problem !== null && <p className="results-note" role="status">{history.problem}</p>}
      {history.runs.length === 0
        ? <p className="results-note">Every search that ends with designs is kept here, with its settings and target, so a new search never takes them away.</p>
        : (
          <table className="results-table results-history-table">
            <thead>
              <tr>
                <th scope="col">Name</th><th scope="col">Kept</th><th scope="col">Families</th><th scope="col">Designs</th>
                <th scope="col">Best RMS (mm)</th><th scope="col">Ended</th><th scope="col">Actions</th>
              </tr>
            </thead>
            <tbody>
              {history.runs.map((run) => <RunRow key={run.runId} run={run} history={history} />)}
            </tbody>
          </table>
        )}
      <h3 className="results-heading">Shortlist</h3>
      {history.pins.length === 0
        ? <p className="results-note">Pin designs from any run (the Pin column of the table) to keep them here across runs and compare them.</p>
        : (
          <table className="results-table results-shortlist" data-testid="shortlist">
            <thead>
              <tr><th scope="col">Run</th><th scope="col">Rank</th><th scope="col">Family</th><th scope="col">RMS (mm)</th><th scope="col">Compare</th><th scope="col">Pin</th></tr>
            </thead>
            <tbody>
              {history.pins.map((pin) => {
                const key = pinCompareKey(pin.pinKey);
                const label = `${pin.runName}, rank ${pin.rank}`;
                const on = compared.includes(key);
                return (
                  <tr key={pin.pinKey} data-testid="pinned-design">
                    <td>{pin.runName}</td>
                    <td className="results-num">{pin.rank}</td>
                    <td>{familyName(pin.candidate.family)}{!pin.candidate.feasible && <span className="results-badge">infeasible</span>}</td>
                    <td className="results-num">{formatMmValue(pin.candidate.error.rmsMm)}</td>
                    <td><input type="checkbox" aria-label={`Compare the pinned design ${label}`} checked={on} disabled={!on && compareFull} onChange={() => onToggleCompare(key)} /></td>
                    <td><button type="button" onClick={() => history.unpin(pin.pinKey)} aria-label={`Unpin ${label}`}>Unpin</button></td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        )}
    </section>
  );
}

function RunRow({ run, history }: { run: KeptRunSummary; history: RunHistory }) {
  const [name, setName] = useState(run.name);
  const [confirming, setConfirming] = useState(false);
  const shown = history.shown?.runId === run.runId;
  const current = history.currentRunId === run.runId;
  const commit = () => {
    const trimmed = name.trim();
    if (trimmed === '') setName(run.name);
    else if (trimmed !== run.name) history.rename(run.runId, trimmed);
  };
  return (
    <tr data-testid="kept-run" className={shown ? 'results-row-selected' : undefined}>
      <td>
        <input
          type="text"
          aria-label={`Name of ${run.name}`}
          value={name}
          onChange={(e) => setName(e.target.value)}
          onBlur={commit}
          onKeyDown={(e) => e.key === 'Enter' && commit()}
        />
        {current && <span className="results-badge results-badge-info">latest</span>}
      </td>
      <td>{DATE_FORMAT.format(run.keptAt)}</td>
      <td>{run.families.map(familyName).join(', ')}</td>
      <td className="results-num">{run.designs}</td>
      <td className="results-num">{run.bestRmsMm === null ? '—' : formatMmValue(run.bestRmsMm)}</td>
      <td>{run.ended} · {run.evaluations.toLocaleString('en-GB')} evaluations</td>
      <td className="results-history-actions">
        {shown
          ? <button type="button" onClick={() => history.show(null)}>Back to latest results</button>
          : <button type="button" onClick={() => history.show(run.runId)} aria-label={`Show ${run.name}`}>Show</button>}
        {confirming ? (
          <span role="group" aria-label={`Confirm deleting ${run.name}`}>
            Delete this run and its {run.designs} designs? Pinned designs stay.{' '}
            <button type="button" onClick={() => history.remove(run.runId)}>Delete</button>{' '}
            <button type="button" onClick={() => setConfirming(false)}>Keep</button>
          </span>
        ) : (
          <button type="button" onClick={() => setConfirming(true)} aria-label={`Delete ${run.name}`}>Delete…</button>
        )}
      </td>
    </tr>
  );
}
