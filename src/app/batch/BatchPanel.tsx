/**
 * The batch queue: jobs run one after another in this tab, unattended, each job's designs
 * kept in the run history; the queue's progress and each job's, the controls, the form
 * to add a job and, when the queue is done, the summary. Only the tab that owns the queue
 * changes it; another tab is told so and shows it as it stands.
 */
import { useEffect, useSyncExternalStore } from 'react';
import { jobFraction, runningJob, tally } from '../../engine/queue';
import { APP_TITLE } from '../run/runTitle';
import type { LociDb } from '../storage';
import { newJobId, queueRunner } from './bootQueue';
import { JobForm } from './JobForm';
import { JobList } from './JobList';
import { MorningSummary } from './MorningSummary';
import { NotifyChoice } from './NotifyChoice';
import type { QueueRunner, QueueView } from './queueRunner';
import './batch.css';

/** The queue's share done: ended jobs whole, the running one by its budget. */
function queueFraction(view: QueueView): { fraction: number; ended: number; runnable: number } {
  const { runnable, ended } = tally(view.state);
  const running = runningJob(view.state);
  const live = view.live;
  const part = running !== null && live !== null && live.id === running.id ? jobFraction(running.spec, live.evaluations, live.elapsedMs) : 0;
  return { fraction: runnable === 0 ? 0 : (ended + part) / runnable, ended, runnable };
}

function useQueueTitle(view: QueueView): void {
  const { fraction, ended, runnable } = queueFraction(view);
  const mode = view.state.mode;
  const title = view.owner !== 'self' ? null
    : mode === 'done' ? `Queue done · ${APP_TITLE}`
      : mode === 'running' ? `Queue ${Math.min(runnable, ended + 1)}/${runnable} · ${Math.min(99, Math.floor(fraction * 100))} % · ${APP_TITLE}`
        : mode === 'paused' ? `Queue paused · ${APP_TITLE}` : null;
  useEffect(() => {
    if (title !== null) document.title = title;
  }, [title]);
}

export function BatchPanel({ db, defaultWorkers }: { db: LociDb | null; defaultWorkers: number }) {
  const runner = queueRunner();
  if (db === null || runner === null) {
    return (
      <section className="panel batch-panel" aria-label="Batch queue">
        <h2>Batch queue</h2>
        <p className="panel-note">This browser keeps no storage for Loci (private window?), so a queue could not survive a reload: it is not offered.</p>
      </section>
    );
  }
  return <QueuePanel db={db} runner={runner} defaultWorkers={defaultWorkers} />;
}

function QueuePanel({ db, runner, defaultWorkers }: { db: LociDb; runner: QueueRunner; defaultWorkers: number }) {
  const view = useSyncExternalStore(runner.subscribe, runner.snapshot);
  useQueueTitle(view);
  const { state, owner } = view;
  const mine = owner === 'self';
  const { fraction, ended, runnable } = queueFraction(view);
  const skipped = tally(state).skipped;
  return (
    <section className="panel batch-panel" aria-label="Batch queue" data-testid="batch-queue" data-mode={state.mode} data-owner={owner}>
      <h2>Batch queue</h2>
      <p className="panel-note">
        Jobs run one after another in this tab while it stays open (in the background too), each with its own problem, families, budget and seed: path jobs
        added below, rear-suspension and walking-leg jobs added with Add to queue beside those workspaces' Start. A path job's designs are kept in the run
        history; a rear-suspension or walking-leg job's are kept in the queue's summary, which opens them in their workspace. A reload, or closing and opening the browser, goes on where the queue was, the running job from its last checkpoint.
      </p>
      {owner === 'other' && (
        <p className="notice notice-info" role="status" data-testid="queue-owned-elsewhere">
          <strong>This queue is run by another Loci tab or window.</strong> It can be changed only there. This tab shows it as it stands, and takes it over
          when that one closes.
        </p>
      )}
      {owner === 'checking' && <p className="panel-note">Opening the queue…</p>}
      {view.problem !== null && <p className="notice notice-error" role="alert" data-testid="queue-problem">{view.problem}</p>}
      {state.jobs.length > 0 && (
        <div className="batch-progress">
          <div className="progress-bar" role="progressbar" aria-label="Progress of the queue" aria-valuemin={0} aria-valuemax={100} aria-valuenow={Math.floor(fraction * 100)}>
            <div className="progress-fill" style={{ transform: `scaleX(${fraction})` }} />
          </div>
          <span className="option-note" data-testid="queue-tally">
            {ended} of {runnable} job{runnable === 1 ? '' : 's'} ended{skipped > 0 ? `, ${skipped} skipped` : ''} · {Math.floor(fraction * 100)} % of the queue's budgets
            {state.mode === 'paused' ? ' · paused' : state.mode === 'done' ? ' · done' : ''}
          </span>
        </div>
      )}
      <div className="row-actions">
        {state.mode === 'running'
          ? <button type="button" disabled={!mine} onClick={() => void runner.pause()}>Pause queue</button>
          : <button type="button" className="primary" disabled={!mine || state.jobs.length === 0} onClick={() => runner.start()}>{state.mode === 'paused' ? 'Resume queue' : 'Start queue'}</button>}
      </div>
      <NotifyChoice db={db} disabled={!mine} />
      <JobList jobs={state.jobs} live={view.live} notes={view.notes} runner={runner} editable={mine} />
      {state.mode === 'done' && <MorningSummary jobs={state.jobs} />}
      <JobForm jobs={state.jobs} defaultWorkers={defaultWorkers} disabled={!mine} onAdd={(spec) => runner.add(newJobId(), spec)} />
    </section>
  );
}
