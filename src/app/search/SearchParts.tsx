/**
 * The parts of a workspace's search section that are the same in every workspace: how a
 * run's end is said, the controller's message, the latest/previous run choice, and the
 * question before a new run drops the older kept run.
 */
import type { RunStopReason } from '../../engine';
import type { SearchSession } from './controller';

const ENDED_BY: Readonly<Record<RunStopReason, string>> = { budget: 'its budget', time: 'its time budget', converged: 'convergence', target: 'its target', cancelled: 'Stop' };

/** "seed …, … evaluations, ended by … at … UTC": the part of a run's summary every workspace says the same way. */
export function runEndWords(run: { readonly seed: number; readonly evaluations: number; readonly stopReason: RunStopReason; readonly finishedAt: string }): string {
  const when = run.finishedAt.replace('T', ' ').replace(/\.\d+Z$/, ' UTC');
  return `seed ${run.seed}, ${run.evaluations.toLocaleString('en-GB')} evaluations, ended by ${ENDED_BY[run.stopReason]} at ${when}`;
}

export function SearchMessage({ session, testId }: { session: SearchSession; testId: string }) {
  if (session.message === null) return null;
  return (
    <p className="susp-problem" role="alert" data-testid={testId}>
      {session.message}
      {session.messageDetail !== null && <><br /><small>{`Details: ${session.messageDetail}`}</small></>}
    </p>
  );
}

export function RunShownSelect({ hasPrevious, showPrevious, onShowPrevious }: { hasPrevious: boolean; showPrevious: boolean; onShowPrevious: (previous: boolean) => void }) {
  return (
    <label>
      Run shown{' '}
      <select value={showPrevious && hasPrevious ? 'previous' : 'latest'} onChange={(e) => onShowPrevious(e.target.value === 'previous')} disabled={!hasPrevious}>
        <option value="latest">Latest run</option>
        {hasPrevious && <option value="previous">Previous run</option>}
      </select>
    </label>
  );
}

/** A new run makes the latest the previous one: the older previous run (`olderSummary`) would be dropped, so it asks first. */
export function DropOlderRunConfirm({ olderSummary, onStart, onCancel }: { olderSummary: string; onStart: () => void; onCancel: () => void }) {
  return (
    <div className="susp-confirm" role="alertdialog" aria-label="Drop the older run?">
      <p>{`A new search keeps the latest run as the previous run; the older previous run (${olderSummary}) is dropped.`}</p>
      <button type="button" onClick={onStart}>Start and drop the older run</button>
      <button type="button" onClick={onCancel}>Cancel</button>
    </div>
  );
}
