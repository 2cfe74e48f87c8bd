/**
 * The page's side of a CSV import and of its target check (src/app/target/csvImport.ts,
 * src/app/state/target.ts): weights reach the points, a table says itself whether
 * it closes, and repeated points are found without comparing every pair.
 */
import { describe, expect, it } from 'vitest';
import { importCsvAction } from '../../src/app/target/csvImport';
import { EMPTY_TARGET, targetProblem } from '../../src/app/state/target';
import type { TargetState } from '../../src/app/state/project';

describe('importCsvAction and weights', () => {
  it('carries each weight to its point and says the search uses them', () => {
    const action = importCsvAction('x,y,weight\n0,0,1\n10,0,2\n10,10,0.5\n', 'test.csv', EMPTY_TARGET);
    if (action.type !== 'target/replace') throw new Error(`expected the points to be read, got ${JSON.stringify(action)}`);
    // The file's own column, row by row.
    expect(action.points.map((p) => p.weight)).toEqual([1, 2, 0.5]);
    expect(action.notice?.lines.some((l) => /Weights were read \(from 0\.5 to 2\)/.test(l) && !/not used/.test(l))).toBe(true);
  });

  it('a file without a weight column gives points without weights', () => {
    const action = importCsvAction('x,y\n0,0\n10,0\n10,10\n', 'test.csv', EMPTY_TARGET);
    if (action.type !== 'target/replace') throw new Error('expected the points to be read');
    expect(action.points.every((p) => p.weight === undefined)).toBe(true);
  });

  it('an all-zero weight column is refused with the reason, not imported', () => {
    const action = importCsvAction('x,y,weight\n0,0,0\n10,0,0\n10,10,0\n', 'test.csv', EMPTY_TARGET);
    expect(action).toEqual({ type: 'target/import-failed', source: 'test.csv', issues: [{ row: 0, message: 'every weight is 0; expected at least one point with a weight above 0' }] });
  });
});

describe('importCsvAction: open or closed from the table itself', () => {
  const closedTarget: TargetState = { ...EMPTY_TARGET, closed: true };

  it('an open table pasted over a closed path is open, and the notice says so', () => {
    const action = importCsvAction('0,0\n10,0\n10,10\n', 'test.csv', closedTarget);
    if (action.type !== 'target/replace') throw new Error('expected the points to be read');
    expect(action.closed).toBe(false);
    expect(action.notice?.lines.some((l) => /does not repeat the first, so the path is open/.test(l))).toBe(true);
  });

  it('a table whose last row repeats the first is closed', () => {
    // common practice: a loop is written with its first point again at the end.
    const action = importCsvAction('0,0\n10,0\n10,10\n0,10\n0,0\n', 'test.csv', EMPTY_TARGET);
    if (action.type !== 'target/replace') throw new Error('expected the points to be read');
    expect(action.closed).toBe(true);
    expect(action.points).toHaveLength(4);
  });
});

describe('targetProblem: repeated points', () => {
  const target = (pts: [number, number][]): TargetState => ({ ...EMPTY_TARGET, points: pts.map(([x, y]) => ({ x, y, driverDeg: null })) });

  it('names the first pair in the same place, also when they are not neighbours', () => {
    expect(targetProblem(target([[0, 0], [10, 0], [10, 10], [10, 0], [0, 10]]))).toBe('points 2 and 4 are in the same place; each point must be different');
    expect(targetProblem(target([[0, 0], [10, 0], [10, 10]]))).toBeNull();
  });

  it('5,000 points on one vertical line, the last repeating the first', () => {
    const pts = Array.from({ length: 5000 }, (_, i): [number, number] => [0, i * 0.01]);
    pts[4999] = [0, 0];
    // Independent answer: point 5000 (index 4999) equals point 1 by construction; no earlier pair is closer than 0.01 mm.
    expect(targetProblem(target(pts))).toBe('points 1 and 5000 are in the same place; each point must be different');
  });
});
