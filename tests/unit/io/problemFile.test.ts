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

  it('rejects a box whose lower bound is not below its upper bound, in words, never swapping it', () => {
    const issues = issuesOf(file({ bounds: { 'fourbar-lengths': { r1: [3, 2] } } }));
    expect(issues).toEqual([
      { path: 'bounds.fourbar-lengths.r1', message: 'is [3, 2]: the lower bound 3 is above the upper bound 2; expected [lower, upper] with lower < upper (did you mean [2, 3]?)' },
    ]);
    const equal = issuesOf(file({ bounds: { 'fourbar-lengths': { r1: [4, 4] } } }));
    expect(equal).toEqual([{ path: 'bounds.fourbar-lengths.r1', message: expect.stringMatching(/^is \[4, 4\]: the lower and upper bounds are equal; expected \[lower, upper\] with lower < upper/) }]);
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
    const issues = issuesOf(file({ constraints: { minTransmissionRad: -1, linkLengthMm: [5, 1], keepOut: [{ x: 0, y: 0, r: 0 }] } }));
    expect(issues.map((i) => i.path)).toEqual(['constraints.minTransmissionRad', 'constraints.linkLengthMm', 'constraints.keepOut[0]']);
  });
});

// Hostile input (the issue "Hostile input and faults"): each limit is refused at the
// file, naming the field and the limit, so that `check` refuses what `fit` would fail on.
describe('parseProblemFile: limits on every input', () => {
  const line = (n: number) => Array.from({ length: n }, (_, i) => [i, 10 * Math.sin(i / 50)]);

  it('refuses a target too small to be represented, naming the rule (was a crash of fit after the search)', () => {
    // 4e-9 mm: below 1e-6 mm, the kinematics' coincident-joint tolerance, let alone the 1e-3 mm floor.
    const issues = issuesOf(file({ target: { points: [[0, 0], [2e-9, 0], [4e-9, 0]], closed: false } }));
    expect(issues).toEqual([{ path: 'target.points', message: expect.stringMatching(/span 4e-9 mm .*must span at least 0\.001 mm/) }]);
    expect(parseProblemFile(file({ target: { points: [[0, 0], [5e-4, 1e-4], [1e-3, 0]], closed: false } })).ok).toBe(true);
  });

  it('refuses points near 1e15 mm (was a crash: joints "0 mm apart")', () => {
    // IEEE 754 binary64: the spacing of doubles near 1e15 is 0.125, so a 2 mm target has 16 representable steps.
    const issues = issuesOf(file({ target: { points: [[1e15, 1e15], [1e15 + 1, 1e15], [1e15 + 2, 1e15 + 1]], closed: false } }));
    expect(issues.map((i) => i.path)).toEqual(['target.points[0]', 'target.points[1]', 'target.points[2]']);
    expect(issues[0].message).toMatch(/each coordinate must be within ±20000 mm/);
  });

  it('refuses a target whose span is under 1e-3 of its distance from the origin', () => {
    const at = (span: number) => [[2e4 - span, 2e4 - span], [2e4 - span / 2, 2e4 - span * 0.7], [2e4, 2e4 - span]];
    const issues = issuesOf(file({ target: { points: at(10), closed: false } }));
    expect(issues).toEqual([{ path: 'target.points', message: expect.stringMatching(/span 10 mm .*at least 20 mm/) }]);
    expect(parseProblemFile(file({ target: { points: at(20), closed: false } })).ok).toBe(true);
  });

  it('points at ±1e308 get a message, not an empty result', () => {
    const issues = issuesOf(file({ target: { points: [[-1e308, 0], [1e308, 0], [0, 1e308]], closed: false } }));
    expect(issues).toHaveLength(3);
    for (const issue of issues) expect(issue.message).toMatch(/each coordinate must be within ±20000 mm/);
  });

  it('free timing keeps the optimizers\' dimension: 992 points with fourbar-lengths are refused, 991 read', () => {
    // 9 variables of fourbar-lengths with a fixed placement + one driver value per point ≤ MAX_DIM = 1000 (src/core/optimize/config.ts).
    const issues = issuesOf(file({ target: { points: line(992), closed: false } }));
    expect(issues).toEqual([{ path: 'target.points', message: expect.stringMatching(/has 992 points; .*fourbar-lengths would have 1001 variables, .*at most 1000: at most 991 points/) }]);
    expect(parseProblemFile(file({ target: { points: line(991), closed: false } })).ok).toBe(true);
    const prescribed = file({ target: { points: line(992), closed: false }, timing: { mode: 'unprescribed' } });
    expect(parseProblemFile(prescribed).ok).toBe(true);
  });

  it('a target has at most 5,000 points, as a CSV import', () => {
    const issues = issuesOf(file({ target: { points: line(5001), closed: false }, timing: { mode: 'unprescribed' } }));
    expect(issues).toEqual([{ path: 'target.points', message: 'has 5001 points; a target may have at most 5000 (resample it first)' }]);
  });

  it('refuses a "__proto__" key instead of dropping it', () => {
    const json: unknown = JSON.parse(JSON.stringify(file()).replace('"placement"', '"bounds":{"__proto__":{"r1":[1,2]},"fourbar-lengths":{"__proto__":[5,1]}},"placement"'));
    expect(issuesOf(json)).toEqual([
      { path: 'bounds.__proto__', message: expect.stringMatching(/"__proto__" is not a name Loci reads/) },
      { path: 'bounds.fourbar-lengths.__proto__', message: expect.stringMatching(/"__proto__" is not a name Loci reads/) },
    ]);
  });

  it('names a family listed twice by its field (fit would name only a job)', () => {
    expect(issuesOf(file({ families: ['fourbar', 'fourbar'] }))).toEqual([{ path: 'families[1]', message: '"fourbar" is listed twice (also families[0]); expected each family once' }]);
  });

  it('refuses bounds beyond 1e6 and weights beyond 1e6, naming each field', () => {
    expect(issuesOf(file({ bounds: { 'fourbar-lengths': { r1: [-1e308, 1e308] } } }))).toEqual([
      { path: 'bounds.fourbar-lengths.r1', message: expect.stringMatching(/is \[-1e\+308, 1e\+308\]; each bound may be at most 1000000 in size/) },
    ]);
    expect(parseProblemFile(file({ bounds: { 'fourbar-lengths': { x0: [-1e6, 1e6] } } })).ok).toBe(true);
    const weights = issuesOf(file({ target: { points: [[0, 0], [10, 2], [20, 0], [30, -3]], closed: false, weights: [1e308, 1e308, 1, 1] } }));
    expect(weights.map((i) => i.path)).toEqual(['target.weights[0]', 'target.weights[1]']);
    expect(weights[0].message).toMatch(/expected a weight from 0 to 1000000/);
    expect(issuesOf(file({ target: { points: [[0, 0], [10, 2], [20, 0]], closed: false, weights: [0, 0, 0] } }))[0]).toMatchObject({ path: 'target.weights' });
  });

  it('checks prescribed driver values in the unit the file gives, before converting', () => {
    // 1.7e308 × π overflows to Infinity: the message must quote the value as written.
    const deg = issuesOf(file({ timing: { mode: 'prescribed', driverValues: [0, 1.7e308, 2, 3], unit: 'deg' } }));
    expect(deg).toEqual([{ path: 'timing.driverValues[1]', message: 'is 1.7e+308 deg; expected a driver value from −5729 to 5729 deg' }]);
    const rad = issuesOf(file({ timing: { mode: 'prescribed', driverValues: [0, 1, 200, 3] } }));
    expect(rad).toEqual([{ path: 'timing.driverValues[2]', message: 'is 200 rad; expected a driver value from −100 to 100 rad' }]);
  });

  it('checks constraint magnitudes', () => {
    const issues = issuesOf(file({ constraints: { linkLengthMm: [1, 1e308], keepOut: [{ x: 1e308, y: 0, r: 1 }] } }));
    expect(issues.map((i) => i.path)).toEqual(['constraints.linkLengthMm', 'constraints.keepOut[0]']);
  });

  it('lists at most a dozen issues and counts the rest, as the CSV reader does', () => {
    const points = [[0, 0], ...Array.from({ length: 30 }, (_, i) => [i + 1, 'bad'])];
    const issues = issuesOf(file({ target: { points, closed: false } }));
    expect(issues).toHaveLength(13);
    expect(issues[12]).toEqual({ path: '', message: 'and 18 more issues' });
  });
});
