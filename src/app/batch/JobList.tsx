/**
 * The queue's jobs in order: each with its families, budget, seed and state, the running
 * one with its progress; move a job up or down, skip it (the running one stops and keeps
 * what it found), or delete it.
 */
import { jobFraction } from '../../engine/queue';
import { formatDuration } from '../run/progress';
import { jobKind, type AppQueueEntry } from './jobs';
import type { LiveJob, QueueRunner } from './queueRunner';
import { budgetWords, jobStateWords } from './summary';
import { jobCaution, jobFamilyName, KIND_WORDS, specFamilies } from './workspaceJobs';

const PHASE_WORDS: Record<LiveJob['phase'], string> = {
  'waiting-lock': 'waiting for the workspace\'s search (or another tab\'s) to end',
  starting: 'starting the workers',
  running: 'searching',
  pausing: 'pausing after this round',
  paused: 'paused',
  stopping: 'stopping after this round',
};

export interface JobListProps {
  readonly jobs: readonly AppQueueEntry[];
  readonly live: LiveJob | null;
  readonly notes: Readonly<Record<string, string>>;
  readonly runner: QueueRunner;
  readonly editable: boolean;
}

function statusKey(entry: AppQueueEntry): string {
  return entry.status === 'waiting' && entry.spec.skip ? 'skipped' : entry.status;
}

function LiveCell({ entry, live }: { entry: AppQueueEntry; live: LiveJob }) {
  const fraction = jobFraction(entry.spec, live.evaluations, live.elapsedMs);
  const used = entry.spec.evaluations !== undefined
    ? `${Math.round(live.evaluations).toLocaleString('en-GB')} of ${entry.spec.evaluations.toLocaleString('en-GB')} evaluations`
    : `${formatDuration(live.elapsedMs)} of ${formatDuration((entry.spec.seconds ?? 0) * 1000)}`;
  return (
    <>
      <span data-testid="job-phase" data-phase={live.phase}>{PHASE_WORDS[live.phase]}</span>
      <div className="progress-bar" role="progressbar" aria-label={`Progress of ${entry.spec.name}`} aria-valuemin={0} aria-valuemax={100} aria-valuenow={Math.floor(fraction * 100)}>
        <div className="progress-fill" style={{ transform: `scaleX(${fraction})` }} />
      </div>
      <span className="option-note" data-testid="job-used">
        {used} ({Math.floor(fraction * 100)} %)
        {live.checkpointRound !== null && <> · checkpoint at round <span data-testid="job-checkpoint">{live.checkpointRound}</span></>}
      </span>
    </>
  );
}

export function JobList({ jobs, live, notes, runner, editable }: JobListProps) {
  if (jobs.length === 0) return <p className="panel-note">No jobs yet: add one below.</p>;
  return (
    <table className="results-table batch-jobs" data-testid="queue-jobs">
      <thead>
        <tr>
          <th scope="col">#</th><th scope="col">Job</th><th scope="col">Kind</th><th scope="col">Families or layouts</th><th scope="col">Budget</th><th scope="col">Seed</th>
          <th scope="col">State</th><th scope="col">Actions</th>
        </tr>
      </thead>
      <tbody>
        {jobs.map((entry, i) => {
          const name = entry.spec.name;
          const running = entry.status === 'running';
          const shownLive = running && live !== null && live.id === entry.id ? live : null;
          const note = notes[entry.id];
          const kind = jobKind(entry.spec.problem);
          const caution = jobCaution(kind);
          return (
            <tr key={entry.id} data-testid="queue-job" data-name={name} data-status={statusKey(entry)}>
              <td className="results-num">{i + 1}</td>
              <td>
                {name}
                {caution !== null && <span className="option-note batch-caution" role="note" data-testid="job-caution"><strong> Caution.</strong> {caution}</span>}
              </td>
              <td data-testid="job-kind">{KIND_WORDS[kind]}</td>
              <td>{specFamilies(entry.spec).map((f) => jobFamilyName(kind, f)).join(', ')}</td>
              <td>{budgetWords(entry.spec)}</td>
              <td className="results-num">{entry.spec.seed}</td>
              <td>
                {shownLive === null ? <span data-testid="job-state">{running ? 'on hold (queue paused)' : jobStateWords(entry)}</span> : <LiveCell entry={entry} live={shownLive} />}
                {note !== undefined && <span className="option-note batch-note" data-testid="job-note"> {note}</span>}
              </td>
              <td className="batch-actions">
                <button type="button" className="icon" disabled={!editable || i === 0} onClick={() => runner.move(entry.id, -1)} aria-label={`Move ${name} up`}>↑</button>
                <button type="button" className="icon" disabled={!editable || i === jobs.length - 1} onClick={() => runner.move(entry.id, 1)} aria-label={`Move ${name} down`}>↓</button>
                {running ? (
                  <button type="button" disabled={!editable || shownLive?.phase === 'stopping'} onClick={() => runner.cutRunning()} aria-label={`Skip ${name} now`}>Skip now</button>
                ) : entry.status === 'waiting' ? (
                  <button type="button" disabled={!editable} onClick={() => runner.setSkip(entry.id, !entry.spec.skip)} aria-label={`${entry.spec.skip ? 'Unskip' : 'Skip'} ${name}`}>
                    {entry.spec.skip ? 'Unskip' : 'Skip'}
                  </button>
                ) : null}
                <button type="button" disabled={!editable || running} onClick={() => runner.remove(entry.id)} aria-label={`Delete ${name}`}
                  title={running ? 'Skip the running job first' : undefined}>Delete</button>
              </td>
            </tr>
          );
        })}
      </tbody>
    </table>
  );
}
