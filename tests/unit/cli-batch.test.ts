/**
 * `loci batch`: a queue of fit jobs run one after another, continued where it stopped.
 * Each job's results are checked against a second route, `loci fit` run by hand with the
 * same problem, families, seed and budget (deterministic under --evals, so the candidates
 * must be the same to the last digit).
 *
 * The problem is the five-point prescribed-timing four-bar problem of Cabrera, Simon and
 * Prado (2002, Mech. Mach. Theory 37:1165-1177), as in cli-fit.test.ts.
 */
import { existsSync, mkdtempSync, readFileSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { loci } from '../support/cli';

const TIMED5 = {
  format: 'loci-problem',
  version: 1,
  name: 'timed5',
  target: { points: [[3, 3], [2.759, 3.363], [2.372, 3.663], [1.89, 3.862], [1.355, 3.943]], closed: false },
  timing: { mode: 'prescribed', driverValues: [30, 45, 60, 75, 90], unit: 'deg' },
  placement: 'fixed',
  families: ['fourbar-lengths', 'fourbar'],
  bounds: {
    'fourbar-lengths': { r1: [0.5, 6], r2: [0.5, 6], r3: [0.5, 6], r4: [0.5, 6], rcx: [-5, 5], rcy: [-5, 5], x0: [-5, 5], y0: [-5, 5] },
  },
  constraints: { fullTurnCrank: true },
};

const EVALS = 600;

let dir = '';
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'loci-batch-'));
  writeFileSync(join(dir, 'timed5.json'), JSON.stringify(TIMED5));
});
afterAll(() => {
  rmSync(dir, { recursive: true, force: true });
});

function queue(name: string, jobs: unknown[]): string {
  const path = join(dir, `${name}.json`);
  writeFileSync(path, JSON.stringify({ format: 'loci-batch', version: 1, name, jobs }));
  return path;
}

const readJson = (path: string) => JSON.parse(readFileSync(path, 'utf8')) as Record<string, unknown>;

describe('loci batch', () => {
  it('runs each job as loci fit runs the same problem, families, seed and budget', async () => {
    const q = queue('night', [
      { name: 'lengths-s1', problem: 'timed5.json', families: ['fourbar-lengths'], seed: 1, evaluations: EVALS, islands: 1 },
      { name: 'lengths-s2', problem: 'timed5.json', families: ['fourbar-lengths'], seed: 2, evaluations: EVALS, islands: 1, skip: true },
    ]);
    const batch = await loci('batch', q, '--workers', '1');
    expect(batch.stderr).not.toMatch(/failed/);
    expect(batch.code).toBe(0);
    expect(batch.stdout).toMatch(/night: 2 jobs: 1 done, 1 skipped/);
    const out = join(dir, 'night.results');
    expect(existsSync(join(out, 'lengths-s2.json'))).toBe(false);

    // Second route: the same search by hand, with the families narrowed in the file.
    const narrowed = join(dir, 'timed5-lengths.json');
    writeFileSync(narrowed, JSON.stringify({ ...TIMED5, families: ['fourbar-lengths'] }));
    const byHand = await loci('fit', narrowed, '--seed', '1', '--evals', String(EVALS), '--islands', '1', '--workers', '1');
    expect(byHand.code).toBe(0);
    const batched = readJson(join(out, 'lengths-s1.json'));
    expect(batched.candidates).toEqual((JSON.parse(byHand.stdout) as Record<string, unknown>).candidates);
    expect(batched.stopReason).toBe('budget');
    // The job's problem file is kept beside its results, with its families.
    expect(readJson(join(out, 'lengths-s1.problem.json')).families).toEqual(['fourbar-lengths']);
    const status = readJson(join(out, 'batch-status.json')) as { jobs: Record<string, { state: string; best: { value: number } | null }> };
    expect(status.jobs['lengths-s1'].state).toBe('done');
    expect(status.jobs['lengths-s2'].state).toBe('skipped');
    expect(status.jobs['lengths-s1'].best?.value).toBe((readJson(join(out, 'lengths-s1.json')).candidates as { value: number }[])[0].value);
  }, 120_000);

  it('passes over done jobs when run again, and resumes a job left running', async () => {
    const q = queue('resume', [{ name: 'only', problem: 'timed5.json', families: ['fourbar-lengths'], seed: 5, evaluations: EVALS, islands: 1 }]);
    const first = await loci('batch', q, '--workers', '1');
    expect(first.code).toBe(0);
    const out = join(dir, 'resume.results');
    const results = readFileSync(join(out, 'only.json'), 'utf8');

    const again = await loci('batch', q, '--workers', '1');
    expect(again.code).toBe(0);
    expect(again.stderr).toMatch(/only: already done .*passed over/);
    expect(readFileSync(join(out, 'only.json'), 'utf8')).toBe(results);

    // As if the batch had been killed mid-job: the status still says running.
    const statusPath = join(out, 'batch-status.json');
    const status = readJson(statusPath) as { jobs: Record<string, Record<string, unknown>> };
    status.jobs.only = { ...status.jobs.only, state: 'running' };
    writeFileSync(statusPath, JSON.stringify(status));
    const resumed = await loci('batch', q, '--workers', '1');
    expect(resumed.code).toBe(0);
    expect(resumed.stderr).toMatch(/only: was running when the last batch ended; resuming it from its checkpoint/);
    expect(resumed.stderr).toMatch(/\[only\] loci fit: resuming from/);
    expect(readJson(join(out, 'only.json')).candidates).toEqual(JSON.parse(results).candidates);

    // A damaged status file is said, and nothing is lost: the job resumes from its checkpoint.
    writeFileSync(statusPath, '{ "format": "loci-batch-status", ');
    const damaged = await loci('batch', q, '--workers', '1');
    expect(damaged.code).toBe(0);
    expect(damaged.stderr).toMatch(/batch-status\.json cannot be used \(not valid JSON/);
    expect(readJson(join(out, 'only.json')).candidates).toEqual(JSON.parse(results).candidates);
  }, 120_000);

  it('keeps a changed job\'s earlier results under another name and runs it afresh', async () => {
    const job = { name: 'changing', problem: 'timed5.json', families: ['fourbar-lengths'], seed: 7, evaluations: EVALS, islands: 1 };
    const q = queue('change', [job]);
    expect((await loci('batch', q, '--workers', '1')).code).toBe(0);
    const out = join(dir, 'change.results');
    const earlier = readFileSync(join(out, 'changing.json'), 'utf8');
    queue('change', [{ ...job, seed: 8 }]);
    const changed = await loci('batch', q, '--workers', '1');
    expect(changed.code).toBe(0);
    expect(changed.stderr).toMatch(/changing: its entry or problem changed; its earlier files are kept as/);
    const superseded = readdirSync(out).filter((f) => /^changing\.superseded-[0-9a-f]{8}\.json$/.test(f));
    expect(superseded).toHaveLength(1);
    expect(readFileSync(join(out, superseded[0]), 'utf8')).toBe(earlier);
    expect((readJson(join(out, 'changing.json')).search as { seed: number }).seed).toBe(8);
  }, 120_000);

  it('refuses a bad queue before running anything, naming each field', async () => {
    const q = queue('bad', [
      { name: 'a', problem: 'timed5.json', seed: 1, evaluations: 100, seconds: 5 },
      { name: 'A', problem: 'timed5.json', seed: 1, evaluations: 100 },
      { name: 'b/c', problem: 'timed5.json', evaluations: 100 },
      { name: 'd', problem: 'timed5.json' },
    ]);
    const bad = await loci('batch', q);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toMatch(/jobs\[0\]\.seconds: give evaluations or seconds, not both/);
    expect(bad.stderr).toMatch(/jobs\[2\]\.name: expected 1 to 80 letters/);
    expect(bad.stderr).toMatch(/jobs\[3\]\.evaluations: missing; give a budget/);
    expect(existsSync(join(dir, 'bad.results'))).toBe(false);

    const twice = queue('twice', [
      { name: 'a', problem: 'timed5.json', evaluations: 100 },
      { name: 'A', problem: 'timed5.json', evaluations: 100 },
    ]);
    expect((await loci('batch', twice)).stderr).toMatch(/jobs\[1\]\.name: "A" is the name of jobs\[0\] too/);

    const families = queue('families', [
      { name: 'ok', problem: 'timed5.json', evaluations: 100 },
      { name: 'wrong', problem: 'timed5.json', families: ['watt1'], evaluations: 100 },
      { name: 'missing', problem: 'nowhere.json', evaluations: 100 },
    ]);
    const refused = await loci('batch', families);
    expect(refused.code).toBe(2);
    expect(refused.stderr).toMatch(/jobs\[1\] \(wrong\): families: "watt1" is not among the problem's families \(fourbar-lengths, fourbar\)/);
    expect(refused.stderr).toMatch(/jobs\[2\] \(missing\): .*nowhere\.json/);
    expect(existsSync(join(dir, 'families.results'))).toBe(false);

    const notQueue = join(dir, 'timed5.json');
    const wrongFile = await loci('batch', notQueue);
    expect(wrongFile.code).toBe(2);
    expect(wrongFile.stderr).toMatch(/format: expected "loci-batch", got "loci-problem"/);
  }, 60_000);
});
