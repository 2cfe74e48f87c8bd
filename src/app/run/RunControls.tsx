/** Start, pause, resume and stop the search, and how far it has got: evaluations, best error (mm), rate and time left. */
import { useEffect, useState } from 'react';
import { LongRunAids } from '../search/LongRunAids';
import { useServices } from '../services';
import { isActive, previousResultsTarget, type RunState, type RunStatus } from '../state/project';
import { useWorkspace } from '../state/store';
import { formatDuration, fractionDone } from './progress';

const STATUS_TEXT: Record<RunState['status'], string> = {
  idle: 'Ready',
  starting: 'Starting the workers…',
  running: 'Searching',
  pausing: 'Pausing after this round…',
  paused: 'Paused',
  stopping: 'Stopping after this round…',
  finished: 'Finished',
  failed: 'Stopped with a problem',
};

const STOP_TEXT: Record<string, string> = {
  budget: 'the evaluation budget is used up',
  time: 'the time budget is used up',
  converged: 'the search converged',
  target: 'the target error was reached',
  cancelled: 'stopped by you',
};

function formatCount(n: number): string {
  return Math.round(n).toLocaleString('en-GB');
}

function useSecondsSince(ms: number | null): number | null {
  const [now, setNow] = useState(() => Date.now());
  useEffect(() => {
    if (ms === null) return;
    const timer = setInterval(() => setNow(Date.now()), 1000);
    return () => clearInterval(timer);
  }, [ms]);
  return ms === null ? null : Math.max(0, Math.round((now - ms) / 1000));
}

/** Whether the note on a run resumed after a reload belongs on screen: only while that run searches on. */
function showsResumed(status: RunStatus): boolean {
  return status === 'starting' || status === 'running' || status === 'pausing';
}

export function RunControls({ startIssues }: { startIssues: readonly string[] }) {
  const { controller } = useServices();
  const run = useWorkspace((s) => s.project.run);
  const candidateCount = useWorkspace((s) => s.project.candidates.length);
  const previous = useWorkspace((s) => previousResultsTarget(s.project));
  const active = isActive(run.status);
  const since = useSecondsSince(active ? (run.checkpoint?.savedAtMs ?? null) : null);
  const done = fractionDone(run);
  const errorLabel = `${run.measure === 'max' ? 'best largest error' : 'best RMS error'}${run.withTerms ? ' with the weighted terms' : ''}`;

  return (
    <section className="panel run-panel" aria-label="Search">
      <div className="run-buttons">
        <button type="button" className="primary" disabled={active || run.status === 'paused' || startIssues.length > 0}
          onClick={() => void controller.start()}
          aria-describedby={startIssues.length > 0 ? 'start-issues' : undefined}
        >
          Start search
        </button>
        <button type="button" disabled={run.status !== 'running'} onClick={() => void controller.pause()}>
          Pause
        </button>
        <button type="button" disabled={run.status !== 'paused'} onClick={() => controller.resume()}>
          Resume
        </button>
        <button type="button" disabled={!(active || run.status === 'paused') || run.status === 'stopping'} onClick={() => controller.stop()}>
          Stop
        </button>
      </div>
      {startIssues.length > 0 && !active && run.status !== 'paused' && (
        <div className="notice notice-error start-issues" id="start-issues" data-testid="start-issues">
          <p className="notice-head">To start a search, fix {startIssues.length === 1 ? 'this' : `these ${startIssues.length}`}:</p>
          <ul>
            {startIssues.map((issue) => (
              <li key={issue}>{issue}</li>
            ))}
          </ul>
        </div>
      )}
      <div className="progress" data-testid="run-progress" data-status={run.status}>
        <div
          className="progress-bar"
          role="progressbar"
          aria-label="Search progress"
          aria-valuemin={0}
          aria-valuemax={100}
          aria-valuenow={Math.round(done * 100)}
        >
          <div className="progress-fill" style={{ transform: `scaleX(${done.toFixed(4)})` }} />
        </div>
        <p className="run-status" data-testid="run-status">
          {STATUS_TEXT[run.status]}
          {run.status === 'finished' && run.stopReason !== null ? `: ${STOP_TEXT[run.stopReason] ?? run.stopReason}, ${candidateCount} candidates ranked` : ''}
          {run.status === 'finished' && candidateCount === 0 ? '. No design within the bounds gave an error that could be ranked: check the variable bounds and the constraints.' : ''}
        </p>
        {previous !== null && !active && (
          <p className="panel-note previous-target" data-testid="run-previous-target">
            These figures are from the search on the previous target ({previous.points.length} points), not the one in the drawing now.
          </p>
        )}
        <dl className="run-figures">
          <div>
            <dt>evaluations</dt>
            <dd data-testid="run-evaluations" data-evaluations={run.evaluations} data-elapsed-ms={Math.round(run.elapsedMs)}>
              {formatCount(run.evaluations)}
              {run.budgetEvaluations !== null ? ` of ${formatCount(run.budgetEvaluations)}` : ''}
            </dd>
          </div>
          <div>
            <dt>{errorLabel}</dt>
            <dd data-testid="run-best-error">
              {run.bestErrorMm === null || !Number.isFinite(run.bestErrorMm) ? '—' : `${run.bestErrorMm.toFixed(3)} mm`}
              {run.bestFeasible === false ? ' (not yet feasible)' : ''}
            </dd>
          </div>
          <div>
            <dt>evaluations per second</dt>
            <dd>{run.evaluationsPerSecond > 0 ? formatCount(run.evaluationsPerSecond) : '—'}</dd>
          </div>
          <div title="Fresh starts of the search, each in a new place, after a run converged or stalled: the search uses its whole budget">
            <dt>search restarts</dt>
            <dd data-testid="run-search-restarts">{formatCount(run.searchRestarts)}</dd>
          </div>
          <div>
            <dt>time left</dt>
            <dd>{active ? formatDuration(run.remainingMs) : run.status === 'paused' ? 'paused' : '—'}</dd>
          </div>
        </dl>
        {run.checkpoint !== null && (active || run.status === 'paused') && (
          <p className="panel-note" data-testid="run-checkpoint" data-round={run.checkpoint.round} data-evaluations={run.checkpoint.evaluations}>
            Last checkpoint: round {run.checkpoint.round}, {formatCount(run.checkpoint.evaluations)} evaluations{since === null ? '' : `, ${since} s ago`}. A reload goes on from
            there.
          </p>
        )}
        {run.resumedFrom !== null && showsResumed(run.status) && (
          <p className="panel-note" data-testid="run-resumed" data-evaluations={run.resumedFrom.evaluations}>
            Resumed after a reload from the checkpoint of round {run.resumedFrom.round} ({formatCount(run.resumedFrom.evaluations)} evaluations).
          </p>
        )}
        {run.message !== null && (
          <p className={run.status === 'failed' ? 'notice notice-error' : 'panel-note'} role={run.status === 'failed' ? 'alert' : undefined}>
            {run.message}
          </p>
        )}
        {run.message !== null && run.messageDetail !== null && (
          <details className="panel-note run-message-detail" data-testid="run-message-detail">
            <summary>Details</summary>
            {run.messageDetail}
          </details>
        )}
      </div>
      <LongRunAids running={active} />
    </section>
  );
}
