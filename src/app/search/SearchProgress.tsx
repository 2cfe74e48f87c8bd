/**
 * A search's progress as a workspace shows it: evaluations of the budget, elapsed time,
 * the search's fresh starts, and the best of each job (family or layout) so far, feasible
 * or by how much not.
 */
import { figure } from '../suspension/labels';
import type { SearchSession } from './controller';
import { LongRunAids } from './LongRunAids';

const STATE_WORDS = { running: 'Searching', stopping: 'Stopping', finished: 'Finished', failed: 'Stopped' } as const;

export function SearchProgress({ session, jobName, className, testId }: {
  session: SearchSession;
  /** A job's name as the page says it (a family's or layout's). */
  jobName: (job: string) => string;
  className: string;
  testId: string;
}) {
  if (session.status === 'idle') return null;
  const budget = session.budgetEvaluations === null ? '' : ` of ${session.budgetEvaluations.toLocaleString('en-GB')}`;
  return (
    <div className={className} role="status" data-testid={testId} data-status={session.status}>
      <p>{`${STATE_WORDS[session.status]}: ${session.evaluations.toLocaleString('en-GB')}${budget} evaluations, ${(session.elapsedMs / 1000).toFixed(1)} s`}</p>
      <p className="panel-note" data-testid={`${testId}-restarts`} title="Fresh starts of the search, each in a new place, after a run converged or stalled: the search uses its whole budget">
        {`Search restarts: ${session.searchRestarts.toLocaleString('en-GB')}`}
      </p>
      {session.best.length > 0 && (
        <ul>
          {session.best.map((b) => (
            <li key={b.job}>{`${jobName(b.job)}: best score ${figure(b.value)}${b.violation > 0 ? `, infeasible (violation ${figure(b.violation, 3)})` : ', feasible'}`}</li>
          ))}
        </ul>
      )}
      <LongRunAids running={session.status === 'running' || session.status === 'stopping'} />
    </div>
  );
}
