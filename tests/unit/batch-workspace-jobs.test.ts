/**
 * Rear-suspension and walking-leg jobs in the batch queue (src/app/batch/jobs.ts,
 * jobInput.ts, workspaceJobs.ts, summary.ts): the job union, a queue stored before jobs
 * had kinds read back as path jobs, the workspace's own start checks at the job's fields,
 * and the morning summary of mixed jobs (best per layout against a minimum worked out
 * here; one CSV shape with a kind column and the cautions).
 */
import { describe, expect, it } from 'vitest';
import { GAIT_CAUTION } from '../../src/core/gait';
import { SUSPENSION_CAUTION } from '../../src/core/suspension';
import { QUEUE_RECORD_FORMAT, QUEUE_RECORD_VERSION, readQueueState } from '../../src/engine/queue';
import { readWorkspaceJobDraft, type JobDraft } from '../../src/app/batch/jobInput';
import { buildRunInput } from '../../src/app/run/runInput';
import { isJobProblem, isPathJob, jobKind, jobProject, type AppQueueEntry, type JobProblem, type SuspensionJobProblem, type LegJobProblem } from '../../src/app/batch/jobs';
import { bestPerLayout, SUMMARY_CSV_HEADER, summaryCsv } from '../../src/app/batch/summary';
import { specFamilies, workspaceRunInput } from '../../src/app/batch/workspaceJobs';
import { demoLegSetup } from '../../src/app/leg/demo';
import { readLegSetup } from '../../src/app/leg/readSetup';
import { DEFAULT_SETTINGS } from '../../src/app/state/settings';
import { demoSuspensionState } from '../../src/app/suspension/state';
import { readSearchProblem } from '../../src/app/suspension/targets/searchProblem';
import { readCsv } from '../support/readCsv';

function suspensionProblem(): SuspensionJobProblem {
  const read = readSearchProblem(demoSuspensionState());
  if (!read.ok) throw new Error('the demo suspension set-up does not read');
  return { kind: 'suspension', projectName: 'demo bike', input: read.input };
}

function legProblem(): LegJobProblem {
  const read = readLegSetup(demoLegSetup());
  if (!read.ok) throw new Error('the demo leg set-up does not read');
  return { kind: 'leg', projectName: read.input.name, input: read.input };
}

const pathProblem = { projectName: 'p', target: { points: [], closed: false, timing: 'unprescribed' as const, background: null }, settings: DEFAULT_SETTINGS };

function draft(over: Partial<JobDraft>, families: readonly string[]): JobDraft {
  return { name: 'night-s', families, budgetUnit: 'evaluations', budget: '600', seed: '7', ...over };
}

describe('the job union', () => {
  it('reads each kind, a path job stored without a kind as a path job, and refuses a kind it does not know', () => {
    const s = suspensionProblem();
    const l = legProblem();
    expect(isJobProblem(s) && isJobProblem(l) && isJobProblem(pathProblem)).toBe(true);
    expect([jobKind(s), jobKind(l), jobKind(pathProblem as JobProblem)]).toEqual(['suspension', 'leg', 'path']);
    expect(isJobProblem({ ...s, kind: 'crane' })).toBe(false);
    expect(isJobProblem({ kind: 'suspension', projectName: 'x' })).toBe(false);
  });
});

/** A path problem as stored before the checkpoint interval was a setting. */
function withoutCheckpointInterval(): JobProblem {
  const stored = JSON.parse(JSON.stringify(pathProblem));
  delete stored.settings.checkpointEverySeconds;
  return stored;
}

describe('a queue stored before jobs had kinds', () => {
  // The record as the page saved it before this change: path problems with no kind, outcomes by RMS error. // common practice (a stored format stays readable)
  const oldPathProblem = withoutCheckpointInterval();
  const old = {
    format: QUEUE_RECORD_FORMAT,
    version: QUEUE_RECORD_VERSION,
    mode: 'done',
    jobs: [
      {
        id: 'a', runId: 'queue-a', resumes: 0, status: 'done',
        spec: { name: 'night-a', problem: oldPathProblem, seed: 3, evaluations: 2000, skip: false, families: ['fourbar'] },
        outcome: { ended: 'budget', reason: null, evaluations: 2000, elapsedMs: 1000, restarts: 0, kept: true, best: [{ family: 'fourbar', rmsMm: 0.25, feasible: true }] },
      },
      { id: 'b', runId: null, resumes: 0, status: 'waiting', spec: { name: 'night-b', problem: oldPathProblem, seed: 1, seconds: 30, skip: false }, outcome: null },
    ],
  };

  it('reads whole, its jobs as path jobs, and its summary as before', () => {
    const read = readQueueState<JobProblem>(JSON.parse(JSON.stringify(old)), isJobProblem);
    expect(read.ok).toBe(true);
    if (!read.ok) return;
    expect(read.state.jobs.map((j) => jobKind(j.spec.problem))).toEqual(['path', 'path']);
    expect(specFamilies(read.state.jobs[1].spec)).toEqual(DEFAULT_SETTINGS.families);
    // Its path jobs checkpoint as the page did then, every 10 s.
    const spec = read.state.jobs[1].spec;
    const built = isPathJob(spec) ? buildRunInput(jobProject(spec), 1) : null;
    expect(built).toMatchObject({ ok: true, input: { checkpointEveryMs: 10_000 } });
    const csv = summaryCsv(read.state.jobs).split('\r\n');
    const cols = csv[1].split(',');
    expect(cols[SUMMARY_CSV_HEADER.indexOf('kind')]).toBe('path');
    expect(cols[SUMMARY_CSV_HEADER.indexOf('best_rms_mm')]).toBe('0.25');
    expect(cols[SUMMARY_CSV_HEADER.indexOf('best_score')]).toBe('');
    expect(cols[SUMMARY_CSV_HEADER.indexOf('caution')]).toBe('');
  });
});

describe('a workspace job as typed', () => {
  it('takes the workspace problem with its ticked layouts, the budget and seed as typed', () => {
    const p = suspensionProblem();
    const read = readWorkspaceJobDraft(draft({}, p.input.layouts), [], p, 2);
    expect(read.ok).toBe(true);
    if (!read.ok) return;
    expect(read.spec).toMatchObject({ name: 'night-s', evaluations: 600, seed: 7, families: p.input.layouts, problem: { kind: 'suspension' } });
    // The engine's run: one job per layout, each with the job's seed, under the job's budget. // common practice (one island group per family, as the workspace's search)
    const run = workspaceRunInput(read.spec as never, 2);
    expect(run.jobs.map((j) => j.id)).toEqual([...p.input.layouts]);
    expect(run.jobs.every((j) => j.seed === 7)).toBe(true);
    expect(run.budget).toEqual({ evaluations: 600, seconds: null });
  });

  it('says what is wrong beside each field and clamps nothing', () => {
    const p = legProblem();
    const bad = readWorkspaceJobDraft(draft({ name: '', budget: '10k', seed: '-1' }, p.input.families), [], p, 1);
    expect(bad.ok).toBe(false);
    if (bad.ok) return;
    expect(bad.issues.name).toBeDefined();
    expect(bad.issues.budget).toContain('10k');
    expect(bad.issues.seed).toBeDefined();
    const taken = readWorkspaceJobDraft(draft({ name: 'NIGHT-S' }, p.input.families), [{ name: 'night-s' }], p, 1);
    expect(taken.ok ? null : taken.issues.name).toBeTruthy();
    const fraction = readWorkspaceJobDraft(draft({ budget: '600.5' }, p.input.families), [], p, 1);
    expect(fraction.ok ? null : fraction.issues.budget).toBeTruthy();
    const foreign = readWorkspaceJobDraft(draft({}, ['not-a-family']), [], p, 1);
    expect(foreign.ok ? null : foreign.issues.families).toContain('not-a-family');
  });
});

describe('the summary of mixed jobs', () => {
  const designs = [
    { family: 'fourbar-seatstay', value: 3.5, feasible: true },
    { family: 'fourbar-seatstay', value: 1.25, feasible: true },
    { family: 'fourbar-seatstay', value: 0.5, feasible: false },
    { family: 'single-pivot', value: 9, feasible: false },
    { family: 'single-pivot', value: 4, feasible: false },
    { family: 'single-pivot', value: Number.NaN, feasible: false },
  ];

  it('takes the least score of each layout among its feasible designs, of all when none is feasible', () => {
    const best = bestPerLayout(designs);
    // A minimum taken separately here, feasibility first (Deb, 2000). // theorem (a minimum)
    for (const family of ['fourbar-seatstay', 'single-pivot']) {
      const own = designs.filter((d) => d.family === family && Number.isFinite(d.value));
      const pool = own.some((d) => d.feasible) ? own.filter((d) => d.feasible) : own;
      let least = Infinity;
      for (const d of pool) if (d.value < least) least = d.value;
      expect(best.find((b) => b.family === family)).toEqual({ family, score: least, feasible: pool[0].feasible });
    }
    expect(best.map((b) => b.family)).toEqual(['fourbar-seatstay', 'single-pivot']);
  });

  it('writes one CSV shape for every kind: the score for workspace jobs, RMS for path jobs, each kind with its caution', () => {
    const s = suspensionProblem();
    const l = legProblem();
    const done = { ended: 'budget', reason: null, evaluations: 600, elapsedMs: 2000, restarts: 0, kept: false } as const;
    const jobs: AppQueueEntry[] = [
      { id: '1', runId: 'queue-1', resumes: 0, status: 'done', spec: { name: 'path-a', problem: pathProblem, seed: 1, evaluations: 600, skip: false }, outcome: { ...done, kept: true, best: [{ family: 'fourbar', rmsMm: 0.75, feasible: true }] } },
      { id: '2', runId: 'queue-2', resumes: 0, status: 'done', spec: { name: 'susp-a', problem: s, seed: 1, evaluations: 600, skip: false }, outcome: { ...done, best: bestPerLayout(designs) } },
      { id: '3', runId: 'queue-3', resumes: 0, status: 'done', spec: { name: 'leg, "a"', problem: l, seed: 1, evaluations: 600, skip: false }, outcome: { ...done, best: [{ family: l.input.families[0], score: 0.125, feasible: true }] } },
    ];
    const text = summaryCsv(jobs);
    const col = (name: (typeof SUMMARY_CSV_HEADER)[number]) => SUMMARY_CSV_HEADER.indexOf(name);
    const rows = readCsv(text);
    expect(rows[0]).toEqual([...SUMMARY_CSV_HEADER]);
    expect(rows.slice(1).map((r) => [r[col('job')], r[col('kind')], r[col('family')]])).toEqual([
      ['path-a', 'path', 'fourbar'],
      ['susp-a', 'suspension', 'fourbar-seatstay'],
      ['susp-a', 'suspension', 'single-pivot'],
      ['leg, "a"', 'leg', l.input.families[0]],
    ]);
    expect(rows.every((r) => r.length === SUMMARY_CSV_HEADER.length)).toBe(true);
    expect([rows[1][col('best_rms_mm')], rows[1][col('best_score')], rows[1][col('caution')]]).toEqual(['0.75', '', '']);
    expect([rows[2][col('best_rms_mm')], Number(rows[2][col('best_score')]), rows[2][col('caution')]]).toEqual(['', 1.25, SUSPENSION_CAUTION]);
    expect(rows[3][col('caution')]).toBe(SUSPENSION_CAUTION);
    expect([Number(rows[4][col('best_score')]), rows[4][col('caution')]]).toEqual([0.125, GAIT_CAUTION]);
  });
});

