import { describe, expect, it } from 'vitest';
import { PROBLEM_FILE_FORMAT, PROBLEM_FILE_VERSION, parseProblemFile } from '../../../src/core/io/problem';

function file(overrides: Record<string, unknown> = {}): Record<string, unknown> {
  return {
    format: PROBLEM_FILE_FORMAT,
    version: PROBLEM_FILE_VERSION,
    name: 'demo',
    target: { points: [[0, 0], [10, 2], [20, 0], [30, -3]], closed: false },
    timing: { mode: 'free', wrap: false },
    placement: 'fixed',
    families: ['fourbar-lengths'],
    ...overrides,
  };
}

function issuesOf(json: unknown): { path: string; message: string }[] {
  const result = parseProblemFile(json);
  if (result.ok) throw new Error('expected the file to be rejected');
  return result.issues;
}

describe('parseProblemFile', () => {
  it('reads a minimal file with defaults filled in', () => {
    const result = parseProblemFile(file());
    expect(result.ok).toBe(true);
    if (!result.ok) return;
    expect(result.problem.measure).toBe('sum-of-squares');
    expect(Array.from(result.problem.target.points)).toEqual([0, 0, 10, 2, 20, 0, 30, -3]);
    expect(result.problem.timing).toEqual({ mode: 'free', wrap: false, refine: false });
  });

  it('converts prescribed driver values given in degrees', () => {
    const result = parseProblemFile(file({ timing: { mode: 'prescribed', driverValues: [30, 45, 60, 90], unit: 'deg' } }));
    expect(result.ok).toBe(true);
    if (!result.ok || result.problem.timing.mode !== 'prescribed') return;
    expect(result.problem.timing.driverValues[3]).toBeCloseTo(Math.PI / 2, 15);
  });

  it('says a path needs at least 3 points', () => {
    const issues = issuesOf(file({ target: { points: [[0, 0], [1, 1]], closed: false } }));
    expect(issues).toContainEqual({ path: 'target.points', message: 'target has 2 points; a path needs at least 3' });
  });

  it('names repeated consecutive points, also across the closing of a closed path', () => {
    const issues = issuesOf(file({ target: { points: [[0, 0], [5, 5], [5, 5], [9, 1], [0, 0]], closed: true } }));
    expect(issues.map((i) => i.path)).toEqual(['target.points[2]', 'target.points[0]']);
    expect(issues[0].message).toMatch(/points 2 and 3 are the same point/);
    expect(issues[1].message).toMatch(/last point repeats the first/);
  });

  it('rejects non-finite values and says where', () => {
    const issues = issuesOf(file({ target: { points: [[0, 0], [Infinity, 1], [2, NaN]], closed: false } }));
    expect(issues.map((i) => i.path)).toEqual(['target.points[1][0]', 'target.points[2][1]']);
    for (const issue of issues) expect(issue.message).toMatch(/expected a coordinate in mm/);
  });

  it('checks the weights against the points', () => {
    const issues = issuesOf(file({ target: { points: [[0, 0], [1, 1], [2, 0]], closed: false, weights: [1, 2] } }));
    expect(issues).toContainEqual({ path: 'target.weights', message: 'has 2 weights for 3 points; expected one weight per point' });
    const negative = issuesOf(file({ target: { points: [[0, 0], [1, 1], [2, 0]], closed: false, weights: [1, -2, 1] } }));
    expect(negative[0].path).toBe('target.weights[1]');
  });

  it('checks prescribed driver values per point', () => {
    const issues = issuesOf(file({ timing: { mode: 'prescribed', driverValues: [0, 1] } }));
    expect(issues).toContainEqual({ path: 'timing.driverValues', message: 'has 2 values; expected one per target point (4)' });
  });

  it('names an unknown bound variable and lists the known ones', () => {
    const issues = issuesOf(file({ bounds: { 'fourbar-lengths': { r7: [0, 1] } } }));
    expect(issues[0].path).toBe('bounds.fourbar-lengths.r7');
    expect(issues[0].message).toMatch(/"r7" is not a variable of fourbar-lengths here; expected one of "r1", "r2"/);
    expect(issues[0].message).toMatch(/"theta2" for every per-point driver value/);
    expect(parseProblemFile(file({ bounds: { 'fourbar-lengths': { theta2: [0, 6], r1: [1, 2] } } })).ok).toBe(true);
  });

  it('rejects a box whose lower bound is not below its upper bound', () => {
    const issues = issuesOf(file({ bounds: { 'fourbar-lengths': { r1: [3, 2] } } }));
    expect(issues).toContainEqual({ path: 'bounds.fourbar-lengths.r1', message: 'lower 3 is not below upper 2' });
  });

  it('names unknown fields, wrong kinds and unknown families', () => {
    expect(issuesOf(file({ placment: 'free' }))[0].message).toMatch(/unknown field "placment" in a problem file; the known fields are/);
    expect(issuesOf(file({ timing: { mode: 'sometimes' } }))[0]).toEqual({
      path: 'timing.mode',
      message: 'expected a timing mode, "prescribed", "free" or "unprescribed", got "sometimes"',
    });
    expect(issuesOf(file({ families: ['hexapod'] }))[0].path).toBe('families[0]');
    expect(issuesOf(file({ placement: 3 }))[0]).toEqual({ path: 'placement', message: 'expected "fixed" or "free", got 3' });
  });

  it('takes a search map per family, and says which map, family or placement does not fit', () => {
    const mapped = parseProblemFile(file({ searchMaps: { 'fourbar-lengths': 'fourbar-boundary' } }));
    expect(mapped.ok && mapped.problem.searchMaps).toEqual({ 'fourbar-lengths': 'fourbar-boundary' });
    const plain = parseProblemFile(file());
    expect(plain.ok && plain.problem.searchMaps).toEqual({});
    expect(issuesOf(file({ searchMaps: { 'fourbar-lengths': 'spiral' } }))[0]).toMatchObject({ path: 'searchMaps.fourbar-lengths' });
    expect(issuesOf(file({ searchMaps: { fourbar: 'fourbar-boundary' } }))).toEqual([
      { path: 'searchMaps.fourbar', message: '"fourbar" is not one of the problem\'s families (fourbar-lengths)' },
    ]);
    expect(issuesOf(file({ placement: 'free', searchMaps: { 'fourbar-lengths': 'fourbar-boundary' } }))).toEqual([
      { path: 'searchMaps.fourbar-lengths', message: 'search map "fourbar-boundary" is for fourbar-lengths with a fixed placement; got fourbar-lengths with a free placement' },
    ]);
  });

  it('checks the envelope first', () => {
    expect(issuesOf([1, 2])[0].message).toMatch(/expected a problem file/);
    expect(issuesOf(file({ format: 'loci-linkage' }))[0]).toEqual({ path: 'format', message: 'expected "loci-problem", got "loci-linkage"' });
    expect(issuesOf(file({ version: 2 }))[0].message).toMatch(/newer than this Loci reads/);
  });

  it('checks constraint values', () => {
    const issues = issuesOf(file({ constraints: { grashofTolerance: -1, linkLengthMm: [5, 1], keepOut: [{ x: 0, y: 0, r: 0 }] } }));
    expect(issues.map((i) => i.path)).toEqual(['constraints.grashofTolerance', 'constraints.linkLengthMm', 'constraints.keepOut[0]']);
  });
});
