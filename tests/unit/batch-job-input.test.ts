/**
 * A new job as typed in the queue's form (src/app/batch/jobInput.ts): read by the queue
 * file's own rules, every wrong field named beside itself, nothing rounded or clamped.
 * The limits expected here are those the queue file's format documents (README, "loci
 * batch"; src/core/io/batchQueue.ts): whole evaluations from 1 to 10^9, seconds > 0 and
 * at most 30 days, a seed a whole number ≥ 0, names unique ignoring case.
 */
import { describe, expect, it } from 'vitest';
import { readJobDraft, type JobDraft } from '../../src/app/batch/jobInput';
import { createDemoProject } from '../../src/app/demo/demoProject';

const project = createDemoProject();
const draft = (patch: Partial<JobDraft>): JobDraft => ({ name: 'night-1', families: ['fourbar'], budgetUnit: 'evaluations', budget: '2000', seed: '1', ...patch });
const issuesOf = (patch: Partial<JobDraft>, others: { name: string }[] = []) => {
  const read = readJobDraft(draft(patch), others, project, 1);
  return read.ok ? {} : read.issues;
};

describe('readJobDraft', () => {
  it('takes a good job with its budget and seed as typed, and keeps the workspace target with it', () => {
    const read = readJobDraft(draft({ budgetUnit: 'seconds', budget: '90.5', seed: '42' }), [], project, 1);
    expect(read.ok).toBe(true);
    if (!read.ok) return;
    expect(read.spec).toMatchObject({ name: 'night-1', families: ['fourbar'], seconds: 90.5, seed: 42, skip: false });
    expect(read.spec.evaluations).toBeUndefined();
    expect(read.spec.problem).toMatchObject({ kind: 'path', target: project.target });
  });

  it('names a bad job name, and a name taken already ignoring case', () => {
    expect(issuesOf({ name: '' }).name).toBeDefined();
    expect(issuesOf({ name: 'has space' }).name).toMatch(/letters, digits/);
    expect(issuesOf({ name: ' night-1' }).name).toBeDefined(); // not trimmed silently
    expect(issuesOf({ name: 'Night-1' }, [{ name: 'night-1' }]).name).toMatch(/job 1 too/);
  });

  it('refuses budgets out of range rather than clamping them', () => {
    expect(issuesOf({ budget: '0' }).budget).toMatch(/from 1 to 1,000,000,000/);
    expect(issuesOf({ budget: '1000000001' }).budget).toMatch(/from 1 to 1,000,000,000/);
    expect(issuesOf({ budget: '1500.5' }).budget).toMatch(/whole number/);
    expect(issuesOf({ budget: '2,000' }).budget).toMatch(/got "2,000"/);
    expect(issuesOf({ budget: '' }).budget).toMatch(/missing/);
    expect(issuesOf({ budgetUnit: 'seconds', budget: '0' }).budget).toMatch(/> 0/);
    // 30 days is 2,592,000 s. // common practice (the format's documented limit)
    expect(issuesOf({ budgetUnit: 'seconds', budget: '2592001' }).budget).toMatch(/30 days/);
    expect(issuesOf({ budgetUnit: 'seconds', budget: '2592000' }).budget).toBeUndefined();
    expect(issuesOf({ budgetUnit: 'seconds', budget: '10s' }).budget).toMatch(/got "10s"/);
  });

  it('refuses a negative or fractional seed and no families, each beside its own field', () => {
    const issues = issuesOf({ seed: '-1', families: [] });
    expect(issues.seed).toMatch(/whole number ≥ 0/);
    expect(issues.families).toBeDefined();
    expect(issues.name).toBeUndefined();
    expect(issuesOf({ seed: '1.5' }).seed).toMatch(/whole number ≥ 0/);
  });

  it('refuses a workspace target a search could not take', () => {
    const read = readJobDraft(draft({}), [], { ...project, target: { ...project.target, points: project.target.points.slice(0, 2) } }, 1);
    expect(read.ok).toBe(false);
    if (!read.ok) expect(read.issues.problem).toBeDefined();
  });
});
