/**
 * The queue's morning summary (src/app/batch/summary.ts): the best design of each family
 * a job found, checked against a minimum worked out separately here; and the CSV file,
 * read back with a separate RFC 4180 reader, one line per job and family.
 */
import { describe, expect, it } from 'vitest';
import type { CandidateReport } from '../../src/core/synthesis';
import { bestPerFamily, SUMMARY_CSV_HEADER, summaryCsv } from '../../src/app/batch/summary';
import type { AppQueueEntry } from '../../src/app/batch/jobs';
import { DEFAULT_SETTINGS } from '../../src/app/state/settings';
import { readCsv } from '../support/readCsv';

/** Only the fields the summary reads; the rest of a report plays no part in it. */
function report(family: string, rmsMm: number, feasible: boolean): CandidateReport {
  return { family, error: { rmsMm }, feasible } as unknown as CandidateReport;
}

describe('bestPerFamily', () => {
  const candidates = [
    report('fourbar', 0.8, true), report('fourbar', 0.3, false), report('fourbar', 0.5, true),
    report('watt-i', 0.9, false), report('watt-i', 0.7, false), report('watt-i', Number.NaN, false),
  ];

  it('takes each family\'s least RMS error among its feasible designs, of all when none is feasible', () => {
    const best = bestPerFamily(candidates);
    // A minimum taken separately, feasibility first (Deb, 2000). // theorem (a minimum)
    for (const family of ['fourbar', 'watt-i']) {
      const own = candidates.filter((c) => c.family === family && Number.isFinite(c.error.rmsMm));
      const pool = own.some((c) => c.feasible) ? own.filter((c) => c.feasible) : own;
      expect(best.find((b) => b.family === family))
        .toMatchObject({ rmsMm: Math.min(...pool.map((c) => c.error.rmsMm)) });
      expect(pool.length).toBeGreaterThan(0);
    }
    expect(best.map((b) => b.family)).toEqual(['fourbar', 'watt-i']);
    expect(best[1].feasible).toBe(false);
  });

  it('gives nothing for a job that found nothing', () => {
    expect(bestPerFamily([])).toEqual([]);
  });
});

describe('summaryCsv', () => {
  const problem = { projectName: 'p', target: { points: [], closed: false, timing: 'unprescribed' as const, background: null }, settings: DEFAULT_SETTINGS };
  const jobs: AppQueueEntry[] = [
    {
      id: '1', runId: 'queue-a', resumes: 1, status: 'done',
      spec: { name: 'night-a', problem, seed: 3, evaluations: 2000, skip: false, families: ['fourbar', 'watt-i'] },
      outcome: { ended: 'budget', reason: null, evaluations: 2000, elapsedMs: 12_345, restarts: 0, searchRestarts: 3, kept: true, best: [{ family: 'fourbar', rmsMm: 0.123456789, feasible: true }, { family: 'watt-i', rmsMm: 0.5, feasible: false }] },
    },
    {
      id: '2', runId: 'queue-b', resumes: 0, status: 'failed',
      spec: { name: 'night-b', problem, seed: 1, seconds: 30, skip: false },
      outcome: { ended: 'failed', reason: 'worker 0 failed: out of memory, "badly"', evaluations: 10, elapsedMs: 500, restarts: 2, kept: false, best: [] },
    },
    { id: '3', runId: null, resumes: 0, status: 'waiting', spec: { name: 'night-c', problem, seed: 1, evaluations: 5, skip: true }, outcome: null },
  ];

  it('writes one line per job and family, numbers in full, and quotes what needs it', () => {
    const rows = readCsv(summaryCsv(jobs));
    expect(rows[0]).toEqual([...SUMMARY_CSV_HEADER]);
    expect(rows.slice(1).map((r) => [r[0], r[SUMMARY_CSV_HEADER.indexOf('family')]])).toEqual([['night-a', 'fourbar'], ['night-a', 'watt-i'], ['night-b', ''], ['night-c', '']]);
    const col = (name: (typeof SUMMARY_CSV_HEADER)[number]) => SUMMARY_CSV_HEADER.indexOf(name);
    expect(Number(rows[1][col('best_rms_mm')])).toBe(0.123456789);
    expect(rows[2][col('feasible')]).toBe('no');
    expect(Number(rows[1][col('time_s')])).toBe(12.345);
    expect(rows[3][col('state')]).toBe('failed: worker 0 failed: out of memory, "badly"');
    expect(rows[3][col('worker_restarts')]).toBe('2');
    expect(rows[1][col('search_restarts')]).toBe('3');
    // An outcome kept before search restarts were counted leaves the field empty, not 0.
    expect(rows[3][col('search_restarts')]).toBe('');
    expect(rows[3][col('budget_s')]).toBe('30');
    expect(rows[4][col('state')]).toBe('skipped');
    expect(rows.every((r) => r.length === SUMMARY_CSV_HEADER.length)).toBe(true);
  });
});
