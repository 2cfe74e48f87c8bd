/**
 * Weights of target points in the page's state, its saved project and the problem it
 * sends (src/app/state/target.ts, src/app/storage/projectSchema.ts,
 * src/app/run/runInput.ts); the point cells' checks (src/app/target/pointFields.ts); the
 * budget ceilings the engine and the fields share; a failed run in the user's words.
 */
import { describe, expect, it } from 'vitest';
import { createDemoProject } from '../../src/app/demo/demoProject';
import { failureWords } from '../../src/app/run/failureWords';
import { problemFileOf } from '../../src/app/run/runInput';
import { checkEvaluations, checkSeconds } from '../../src/app/state/fields';
import { PROJECT_VERSION, type Project, type TargetState } from '../../src/app/state/project';
import { addPoint, deletePoint, EMPTY_TARGET, editPoint, hasWeights, setPoints, setWeighted, targetProblem } from '../../src/app/state/target';
import { readProject } from '../../src/app/storage/projectSchema';
import { checkCoordinate, checkWeight } from '../../src/app/target/pointFields';
import { resamplePath } from '../../src/app/target/resample';
import { parseProblemFile } from '../../src/core/io/problem';
import { defineRun } from '../../src/engine';

const square = (weights?: number[]): TargetState =>
  setPoints(EMPTY_TARGET, [
    { x: 0, y: 0, driverDeg: null, weight: weights?.[0] },
    { x: 10, y: 0, driverDeg: null, weight: weights?.[1] },
    { x: 10, y: 10, driverDeg: null, weight: weights?.[2] },
    { x: 0, y: 10, driverDeg: null, weight: weights?.[3] },
  ]);

describe('weights in the target state', () => {
  it('a weighted target keeps one weight per point through add, edit and delete', () => {
    let t = square([1, 2, 3, 4]);
    expect(hasWeights(t)).toBe(true);
    t = addPoint(t, 5, 15);
    expect(t.points.map((p) => p.weight)).toEqual([1, 2, 3, 4, 1]);
    t = editPoint(t, 1, 'weight', 0.25);
    t = deletePoint(t, 0);
    expect(t.points.map((p) => p.weight)).toEqual([0.25, 3, 4, 1]);
  });

  it('a weight below 0, above the problem limit, or on an unweighted target leaves the target as it was', () => {
    const t = square([1, 2, 3, 4]);
    expect(editPoint(t, 0, 'weight', -1)).toBe(t);
    expect(editPoint(t, 0, 'weight', 2e6)).toBe(t);
    expect(editPoint(t, 0, 'weight', Number.NaN)).toBe(t);
    const plain = square();
    expect(editPoint(plain, 0, 'weight', 2)).toBe(plain);
  });

  it('weights are switched on at 1 and off again; all zero is a reason not to start', () => {
    const on = setWeighted(square(), true);
    expect(on.points.map((p) => p.weight)).toEqual([1, 1, 1, 1]);
    expect(hasWeights(setWeighted(on, false))).toBe(false);
    expect(targetProblem(square([0, 0, 0, 0]))).toBe('every point has weight 0; expected at least one point with a weight above 0');
    expect(targetProblem(square([0, 0, 1, 0]))).toBeNull();
  });

  it('resampling carries weights linearly along the path', () => {
    // Open path 0 → 10 → 20 along x with weights 0, 1, 0: halfway along each segment the weight is the mean of its ends (linear interpolation).
    const made = resamplePath(
      [
        { x: 0, y: 0, driverDeg: null, weight: 0 },
        { x: 10, y: 0, driverDeg: null, weight: 1 },
        { x: 20, y: 0, driverDeg: null, weight: 0 },
      ],
      false,
      5,
    );
    if (!made.ok) throw new Error(made.reason);
    expect(made.points.map((p) => p.weight)).toEqual([0, 0.5, 1, 0.5, 0]);
  });
});

describe('weights in what is saved and what is sent', () => {
  const weighted = (): Project => {
    const demo = createDemoProject();
    return { ...demo, target: setPoints(demo.target, demo.target.points.map((p, i) => ({ ...p, weight: i === 0 ? 5 : 1 }))) };
  };

  it('the problem sent to the engine has target.weights, one per point, and the problem reader takes it', () => {
    const file = problemFileOf(weighted());
    const n = file.target.points.length;
    expect(file.target.weights).toEqual([5, ...Array.from({ length: n - 1 }, () => 1)]);
    expect(parseProblemFile(JSON.parse(JSON.stringify(file)) as unknown).ok).toBe(true);
    expect('weights' in problemFileOf(createDemoProject()).target).toBe(false);
  });

  it('a version 1 project (no weights, no message details) opens as an unweighted target', () => {
    const saved = JSON.parse(JSON.stringify(createDemoProject()));
    saved.version = 1;
    delete saved.run.messageDetail;
    const read = readProject(saved);
    if (!read.ok) throw new Error(read.reason);
    expect(read.project.version).toBe(PROJECT_VERSION);
    expect(hasWeights(read.project.target)).toBe(false);
    expect(read.project.run.messageDetail).toBeNull();
  });

  it('a saved weighted project reads back with its weights; weights on some points only are refused', () => {
    const read = readProject(JSON.parse(JSON.stringify(weighted())));
    if (!read.ok) throw new Error(read.reason);
    expect(read.project.target.points[0].weight).toBe(5);
    const partial = JSON.parse(JSON.stringify(weighted()));
    delete partial.target.points[2].weight;
    expect(readProject(partial)).toEqual({ ok: false, reason: 'target.points: expected a weight on every point or on none' });
  });
});

describe('point cells', () => {
  it('an empty or unreadable x is refused, never read as the old value', () => {
    expect(checkCoordinate('x', 2, '')).toEqual({ ok: false, message: expect.stringMatching(/^Point 2, x: empty; expected a coordinate in mm/) });
    expect(checkCoordinate('y', 2, '1..2')).toEqual({ ok: false, message: expect.stringMatching(/^Point 2, y: "1\.\.2" is not a number/) });
    expect(checkCoordinate('x', 1, '12,5')).toEqual({ ok: true, value: 12.5 });
  });

  it('a weight of 0 is refused only where it would make every weight 0', () => {
    expect(checkWeight(1, '0', false)).toEqual({ ok: true, value: 0 });
    expect(checkWeight(1, '0', true)).toEqual({ ok: false, message: 'Point 1, weight: 0 would make every weight 0; expected at least one point with a weight above 0.' });
  });
});

describe('budget ceilings from the engine', () => {
  const run = (budget: { evaluations?: number; seconds?: number }) => defineRun({ jobs: [{ id: 'j', objective: { kind: 'test-function', name: 'sphere', dim: 2 }, seed: 1 }], budget }).ok;

  it('what the fields take, the engine takes, and one past it neither does', () => {
    expect(checkEvaluations('1000000000', 1).ok).toBe(true);
    expect(run({ evaluations: 1_000_000_000 })).toBe(true);
    expect(checkEvaluations('1000000001', 1).ok).toBe(false);
    expect(run({ evaluations: 1_000_000_001 })).toBe(false);
    // 30 days in seconds: 30 × 24 × 3600 (arithmetic).
    expect(checkSeconds('2592000').ok).toBe(true);
    expect(run({ seconds: 2_592_000 })).toBe(true);
    expect(checkSeconds('2592001').ok).toBe(false);
    expect(run({ seconds: 2_592_001 })).toBe(false);
  });
});

describe('a failed run in the user words', () => {
  it('names no worker and no call, and keeps the reason apart', () => {
    const words = failureWords('stopped', 'worker 0 refused init: target.points[3] is [1, 2]; each coordinate must be within ±2000 mm');
    expect(words.message).not.toMatch(/worker \d|refused init|target\./);
    expect(words.message).toMatch(/^The search stopped before its end: the search workers refused this problem/);
    expect(words.messageDetail).toBe('target.points[3] is [1, 2]; each coordinate must be within ±2000 mm');
    const lost = failureWords('stopped', 'worker 1 failed: no answer to run within 60000 ms; gave up after 2 restart(s) without progress');
    expect(lost.message).toMatch(/a search worker stopped working and could not be replaced/);
    expect(lost.messageDetail).not.toMatch(/worker \d/);
  });
});
