/**
 * The batch queue's logic (src/engine/queue.ts): jobs run in order, one at a time; the
 * order, skip and delete change what runs next and nothing else; a queue read back after
 * a reload goes on with the job it was on; one tab holds the lease at a time.
 * The expected orders are worked out by hand from the operations in each test.
 */
import { describe, expect, it } from 'vitest';
import {
  addJob, beginJob, deleteJob, emptyQueue, endJob, finishQueue, jobFraction, LEASE_MS, leaseHolder, moveJob, nextJob, nextStep, noteResume, pauseQueue,
  readQueueState, runningJob, setSkip, startQueue, tally, type JobOutcome, type QueueChange, type QueueState, type QueuedJobSpec,
} from '../../src/engine/queue';

type P = { readonly target: string };
const isP = (p: unknown): boolean => typeof p === 'object' && p !== null && typeof (p as P).target === 'string';

const spec = (name: string, extra: Partial<QueuedJobSpec<P>> = {}): QueuedJobSpec<P> => ({ name, problem: { target: 't' }, seed: 1, evaluations: 1000, skip: false, ...extra });
const outcome: JobOutcome = { ended: 'budget', reason: null, evaluations: 1000, elapsedMs: 1200, restarts: 0, best: [{ family: 'fourbar', rmsMm: 0.5, feasible: true }], kept: true };

function ok(change: QueueChange<P>): QueueState<P> {
  if (!change.ok) throw new Error(`refused: ${change.reason}`);
  return change.state;
}

function queueOf(...names: string[]): QueueState<P> {
  return names.reduce((s, n) => ok(addJob(s, n, spec(n))), emptyQueue<P>());
}

const names = (s: QueueState<P>) => s.jobs.map((j) => j.spec.name);

/** Runs the queue to its end as the runner does, returning the order jobs began in. */
function runAll(state: QueueState<P>): { order: string[]; state: QueueState<P> } {
  let s = ok(startQueue(state));
  const order: string[] = [];
  for (let guard = 0; guard < 100; guard++) {
    const step = nextStep(s);
    if (step.kind === 'finish') return { order, state: ok(finishQueue(s)) };
    if (step.kind !== 'begin') throw new Error(`unexpected step ${step.kind}`);
    order.push(step.job.spec.name);
    s = ok(beginJob(s, step.job.id, `queue-${step.job.id}`));
    s = ok(endJob(s, step.job.id, 'done', outcome));
  }
  throw new Error('the queue did not end');
}

describe('batch queue: order and state transitions', () => {
  it('runs the jobs in the order they were added, one at a time, and is done after the last', () => {
    const { order, state } = runAll(queueOf('a', 'b', 'c'));
    expect(order).toEqual(['a', 'b', 'c']);
    expect(state.jobs.every((j) => j.status === 'done')).toBe(true);
    expect(state.mode).toBe('done');
  });

  it('refuses a second running job and a job that is not waiting', () => {
    let s = ok(startQueue(queueOf('a', 'b')));
    s = ok(beginJob(s, 'a', 'queue-1'));
    const second = beginJob(s, 'b', 'queue-2');
    expect(second.ok).toBe(false);
    if (!second.ok) expect(second.reason).toContain('"a" is running');
    s = ok(endJob(s, 'a', 'done', outcome));
    expect(beginJob(s, 'a', 'queue-3').ok).toBe(false);
  });

  it('moves a job up and down; the first cannot go up nor the last down', () => {
    let s = queueOf('a', 'b', 'c');
    s = ok(moveJob(s, 'c', -1));
    expect(names(s)).toEqual(['a', 'c', 'b']);
    s = ok(moveJob(s, 'a', 1));
    expect(names(s)).toEqual(['c', 'a', 'b']);
    expect(moveJob(s, 'c', -1).ok).toBe(false);
    expect(moveJob(s, 'b', 1).ok).toBe(false);
    expect(runAll(s).order).toEqual(['c', 'a', 'b']);
  });

  it('passes over a skipped job, runs it again once unskipped, and counts it apart', () => {
    let s = ok(setSkip(queueOf('a', 'b', 'c'), 'b', true));
    expect(tally(s)).toEqual({ runnable: 2, ended: 0, skipped: 1 });
    const run = runAll(s);
    expect(run.order).toEqual(['a', 'c']);
    expect(run.state.jobs.find((j) => j.id === 'b')?.status).toBe('waiting');
    s = ok(setSkip(s, 'b', false));
    expect(runAll(s).order).toEqual(['a', 'b', 'c']);
  });

  it('does not skip or delete the running job through the waiting-job paths, and deletes others', () => {
    let s = ok(startQueue(queueOf('a', 'b', 'c')));
    s = ok(beginJob(s, 'a', 'queue-1'));
    expect(setSkip(s, 'a', true).ok).toBe(false);
    const del = deleteJob(s, 'a');
    expect(del.ok).toBe(false);
    if (!del.ok) expect(del.reason).toContain('skip it first');
    s = ok(deleteJob(s, 'b'));
    expect(names(s)).toEqual(['a', 'c']);
    // Skipped while running: it ends as cut, and the queue goes on.
    s = ok(endJob(s, 'a', 'cut', { ...outcome, ended: 'cancelled' }));
    expect(nextStep(s)).toMatchObject({ kind: 'begin', job: { id: 'c' } });
  });

  it('holds while paused and goes on with the same job when resumed', () => {
    let s = ok(startQueue(queueOf('a', 'b')));
    s = ok(beginJob(s, 'a', 'queue-1'));
    s = ok(pauseQueue(s));
    expect(nextStep(s).kind).toBe('hold');
    expect(runningJob(s)?.id).toBe('a');
    s = ok(startQueue(s));
    expect(nextStep(s)).toMatchObject({ kind: 'resume', job: { id: 'a', runId: 'queue-1' } });
  });

  it('is done when the last waiting job is skipped or deleted while it runs nothing', () => {
    let s = ok(startQueue(queueOf('a', 'b')));
    s = ok(beginJob(s, 'a', 'queue-1'));
    s = ok(endJob(s, 'a', 'done', outcome));
    expect(finishQueue(s).ok).toBe(false);
    s = ok(setSkip(s, 'b', true));
    expect(nextStep(s).kind).toBe('finish');
    s = ok(finishQueue(s));
    expect(s.mode).toBe('done');
    // New work takes a done queue back to idle, to be started again.
    s = ok(addJob(s, 'c', spec('c')));
    expect(s.mode).toBe('idle');
    expect(startQueue(ok(setSkip(queueOf('x'), 'x', true))).ok).toBe(false);
  });
});

describe('batch queue: a reload', () => {
  // What IndexedDB gives back is a structured clone: JSON round trip stands for it here.
  const reloaded = (s: QueueState<P>) => ok(readQueueState<P>(JSON.parse(JSON.stringify(s)), isP));

  it('between jobs: the next job begins, the ended ones stay ended', () => {
    let s = ok(startQueue(queueOf('a', 'b', 'c')));
    s = ok(beginJob(s, 'a', 'queue-1'));
    s = ok(endJob(s, 'a', 'done', outcome));
    const after = reloaded(s);
    expect(after).toEqual(s);
    expect(nextStep(after)).toMatchObject({ kind: 'begin', job: { id: 'b' } });
  });

  it('mid-job: the job it was on resumes under the same run id (its checkpoints), and the resume is counted', () => {
    let s = ok(startQueue(queueOf('a', 'b')));
    s = ok(beginJob(s, 'a', 'queue-1'));
    const after = reloaded(s);
    const step = nextStep(after);
    expect(step).toMatchObject({ kind: 'resume', job: { id: 'a', runId: 'queue-1' } });
    expect(ok(noteResume(after, 'a')).jobs[0].resumes).toBe(1);
  });

  it('refuses a damaged record whole and says where', () => {
    const s = ok(startQueue(queueOf('a', 'b')));
    const damaged = JSON.parse(JSON.stringify(s)) as { jobs: { spec: { problem: unknown } }[] };
    damaged.jobs[1].spec.problem = 42;
    const read = readQueueState<P>(damaged, isP);
    expect(read.ok).toBe(false);
    if (!read.ok) expect(read.reason).toContain('job 2');
    expect(readQueueState<P>({ format: 'other' }, isP).ok).toBe(false);
    const two = ok(beginJob(s, 'a', 'queue-1'));
    const twoRunning = { ...two, jobs: two.jobs.map((j) => ({ ...j, status: 'running', runId: 'r' })) };
    expect(readQueueState<P>(twoRunning, isP).ok).toBe(false);
  });
});

describe('batch queue: progress and ownership', () => {
  it('measures a job by its own budget, and never beyond whole', () => {
    expect(jobFraction({ evaluations: 2000 }, 500, 99_999)).toBe(0.25);
    expect(jobFraction({ seconds: 60 }, 1e9, 15_000)).toBe(0.25);
    expect(jobFraction({ evaluations: 2000 }, 4000, 0)).toBe(1);
    expect(jobFraction({ evaluations: 2000 }, Number.NaN, 0)).toBe(0);
  });

  // common practice: a lease renewed well inside its term, taken over only once it lapses
  it('gives the queue to one tab at a time by lease', () => {
    const now = 1_000_000;
    expect(leaseHolder(null, 'me', now)).toBe('free');
    expect(leaseHolder({ owner: 'me', expiresAt: now + 1 }, 'me', now)).toBe('mine');
    expect(leaseHolder({ owner: 'other', expiresAt: now + LEASE_MS / 2 }, 'me', now)).toBe('other');
    expect(leaseHolder({ owner: 'other', expiresAt: now }, 'me', now)).toBe('free');
    expect(leaseHolder({ owner: 'other', expiresAt: Number.NaN }, 'me', now)).toBe('free');
    // A lease stamped by a clock far ahead does not hold the queue for ever.
    expect(leaseHolder({ owner: 'other', expiresAt: now + 10 * LEASE_MS }, 'me', now)).toBe('free');
  });

  it('finds no next job in an empty queue', () => {
    expect(nextJob(emptyQueue<P>())).toBeNull();
    expect(nextStep(emptyQueue<P>()).kind).toBe('hold');
  });
});
