/**
 * The page's side of a CSV import and of its target check (src/app/target/csvImport.ts,
 * src/app/state/target.ts): weights the page does not use are named, not dropped
 * unseen; repeated points are found without comparing every pair.
 */
import { describe, expect, it } from 'vitest';
import { importCsvAction } from '../../src/app/target/csvImport';
import { EMPTY_TARGET, targetProblem } from '../../src/app/state/target';
import type { TargetState } from '../../src/app/state/project';

function noticeLines(text: string): readonly string[] {
  const action = importCsvAction(text, 'test.csv', EMPTY_TARGET);
  if (action.type !== 'target/replace') throw new Error(`expected the points to be read, got ${JSON.stringify(action)}`);
  return action.notice?.lines ?? [];
}

describe('importCsvAction and weights', () => {
  it('says the weights are not used when they differ', () => {
    const lines = noticeLines('x,y,weight\n0,0,1\n10,0,2\n10,10,0.5\n');
    expect(lines.some((l) => /weight column was read but is not used/.test(l) && /target\.weights/.test(l))).toBe(true);
  });

  it('says equal weights change nothing', () => {
    expect(noticeLines('x,y,weight\n0,0,2\n10,0,2\n10,10,2\n')).toContain('The weight column gives every point the same weight, as this page does.');
  });

  it('an all-zero weight column is refused with the reason, not imported', () => {
    const action = importCsvAction('x,y,weight\n0,0,0\n10,0,0\n10,10,0\n', 'test.csv', EMPTY_TARGET);
    expect(action).toEqual({ type: 'target/import-failed', source: 'test.csv', issues: [{ row: 0, message: 'every weight is 0; expected at least one point with a weight above 0' }] });
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
