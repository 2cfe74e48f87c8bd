import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { createDemoProject } from '../../src/app/demo/demoProject';
import { bestArchived } from '../../src/app/run/interimCandidates';
import { errorMmOf, progressPatch } from '../../src/app/run/progress';
import { buildRunInput, islandsPerFamily, problemFileOf } from '../../src/app/run/runInput';
import { checkCheckpointEvery } from '../../src/app/state/fields';
import { IDLE_RUN, type Project, type TargetPoint } from '../../src/app/state/project';
import { INITIAL_UI, reduce, type WorkspaceState } from '../../src/app/state/reducer';
import { calibrateBackground, EMPTY_TARGET } from '../../src/app/state/target';
import { readProject } from '../../src/app/storage/projectSchema';
import { resamplePath } from '../../src/app/target/resample';
import { parseProblemFile } from '../../src/core/io/problem';
import { defineRun, type RunProgress } from '../../src/engine';

const pt = (x: number, y: number, driverDeg: number | null = null): TargetPoint => ({ x, y, driverDeg });

/** Distance from p to the polyline through `vertices` (segment by segment; plane geometry). */
function distanceToPolyline(p: { x: number; y: number }, vertices: readonly { x: number; y: number }[]): number {
  let best = Infinity;
  for (let i = 1; i < vertices.length; i++) {
    const a = vertices[i - 1];
    const b = vertices[i];
    const dx = b.x - a.x;
    const dy = b.y - a.y;
    const len2 = dx * dx + dy * dy;
    const t = len2 > 0 ? Math.max(0, Math.min(1, ((p.x - a.x) * dx + (p.y - a.y) * dy) / len2)) : 0;
    best = Math.min(best, Math.hypot(p.x - (a.x + t * dx), p.y - (a.y + t * dy)));
  }
  return best;
}

describe('resamplePath', () => {
  it('spreads points evenly round a square (corners and mid-sides)', () => {
    // A 40 mm square has perimeter 160 mm: 8 points 20 mm apart are its corners and mid-sides (plane geometry).
    const square = [pt(0, 0), pt(40, 0), pt(40, 40), pt(0, 40)];
    const made = resamplePath(square, true, 8);
    expect(made.ok).toBe(true);
    if (!made.ok) return;
    const expected = [
      [0, 0],
      [20, 0],
      [40, 0],
      [40, 20],
      [40, 40],
      [20, 40],
      [0, 40],
      [0, 20],
    ];
    made.points.forEach((p, i) => {
      expect(p.x).toBeCloseTo(expected[i][0], 9);
      expect(p.y).toBeCloseTo(expected[i][1], 9);
    });
  });

  it('keeps both ends of an open path, puts every point on it, evenly by arc length', () => {
    // Arc-length parametrisation: equal chords along one straight segment, and every sample on the path (theorem).
    const coordinate = fc.double({ min: -500, max: 500, noNaN: true });
    fc.assert(
      fc.property(fc.array(fc.record({ x: coordinate, y: coordinate }), { minLength: 2, maxLength: 12 }), fc.integer({ min: 3, max: 60 }), (raw, n) => {
        const points = raw.map((p) => pt(p.x, p.y));
        const length = points.slice(1).reduce((sum, p, i) => sum + Math.hypot(p.x - points[i].x, p.y - points[i].y), 0);
        fc.pre(length > 1);
        const made = resamplePath(points, false, n);
        expect(made.ok).toBe(true);
        if (!made.ok) return;
        expect(made.points).toHaveLength(n);
        expect(made.points[0].x).toBeCloseTo(points[0].x, 9);
        expect(made.points[n - 1].y).toBeCloseTo(points[points.length - 1].y, 6);
        for (const p of made.points) expect(distanceToPolyline(p, points)).toBeLessThan(1e-6 * Math.max(1, length));
      }),
    );
  });

  it('carries crank angles across 360° the short way', () => {
    const made = resamplePath([pt(0, 0, 340), pt(10, 0, 20)], false, 3);
    expect(made.ok && made.points.map((p) => p.driverDeg)).toEqual([340, 360, 380]);
  });

  it('refuses what it cannot do, saying why', () => {
    expect(resamplePath([pt(0, 0), pt(1, 1)], false, 2)).toEqual({ ok: false, reason: expect.stringMatching(/from 3 to 2000/) });
    expect(resamplePath([pt(5, 5), pt(5, 5)], false, 5)).toEqual({ ok: false, reason: expect.stringMatching(/no length/) });
  });
});

describe('calibrating the background image', () => {
  it('scales the image about the first point so the two points end up the given distance apart', () => {
    // A similarity about a fixed point keeps that point and scales every distance by one factor (theorem).
    const target = {
      ...EMPTY_TARGET,
      background: { imageId: 'i', name: 'side.png', widthPx: 800, heightPx: 600, leftMm: 10, topMm: 300, mmPerPx: 0.5, opacity: 1, calibrated: false },
    };
    const a = { x: 60, y: 250 };
    const b = { x: 160, y: 250 };
    const done = calibrateBackground(target, a, b, 250);
    expect(done.ok).toBe(true);
    if (!done.ok || done.target.background === null) return;
    const before = target.background;
    const after = done.target.background;
    const pixelOf = (bg: typeof before, p: { x: number; y: number }) => ({ u: (p.x - bg.leftMm) / bg.mmPerPx, v: (bg.topMm - p.y) / bg.mmPerPx });
    const worldOf = (bg: typeof before, q: { u: number; v: number }) => ({ x: bg.leftMm + q.u * bg.mmPerPx, y: bg.topMm - q.v * bg.mmPerPx });
    const a2 = worldOf(after, pixelOf(before, a));
    const b2 = worldOf(after, pixelOf(before, b));
    expect(a2.x).toBeCloseTo(a.x, 9);
    expect(a2.y).toBeCloseTo(a.y, 9);
    expect(Math.hypot(b2.x - a2.x, b2.y - a2.y)).toBeCloseTo(250, 9);
    expect(after.calibrated).toBe(true);
  });

  it('says what is wrong with a bad calibration', () => {
    const target = { ...EMPTY_TARGET, background: { imageId: 'i', name: 'x', widthPx: 10, heightPx: 10, leftMm: 0, topMm: 10, mmPerPx: 1, opacity: 1, calibrated: false } };
    expect(calibrateBackground(target, { x: 1, y: 1 }, { x: 1, y: 1 }, 10)).toEqual({ ok: false, reason: expect.stringMatching(/same place/) });
    expect(calibrateBackground(target, { x: 1, y: 1 }, { x: 2, y: 1 }, -3)).toEqual({ ok: false, reason: expect.stringMatching(/greater than 0/) });
  });
});

describe('the workspace reducer', () => {
  const state = (): WorkspaceState => ({ project: createDemoProject(), ui: INITIAL_UI });

  it('keeps the target when an import fails, and shows every issue', () => {
    const s0 = state();
    const s1 = reduce(s0, { type: 'target/import-failed', source: 'the pasted text', issues: [{ row: 3, message: 'row 3: y is "abc", which is not a number' }] });
    expect(s1.project).toBe(s0.project);
    expect(s1.ui.targetNotice?.lines).toEqual(['row 3: y is "abc", which is not a number']);
  });

  it('leaves the target and settings alone while a search runs', () => {
    const running = reduce(state(), { type: 'run/update', patch: { status: 'running' } });
    expect(reduce(running, { type: 'target/delete', index: 0 }).project.target).toBe(running.project.target);
    expect(reduce(running, { type: 'settings/seed', seed: 7 }).project.settings).toBe(running.project.settings);
  });

  it('moves the selection with a deletion before it', () => {
    const s = reduce(reduce(state(), { type: 'ui/select', index: 5 }), { type: 'target/delete', index: 2 });
    expect(s.ui.selectedPoint).toBe(4);
    expect(s.project.target.points).toHaveLength(23);
  });
});

describe('from the project to the engine', () => {
  it('writes a problem file that the problem reader accepts (src/core/io/problem.ts)', () => {
    const project = createDemoProject();
    const parsed = parseProblemFile(JSON.parse(JSON.stringify(problemFileOf(project))));
    expect(parsed.ok).toBe(true);
    if (!parsed.ok) return;
    expect(parsed.problem.target.points.length).toBe(2 * project.target.points.length);
    expect(parsed.problem.target.closed).toBe(true);
  });

  it('gives prescribed crank angles in radians, and the constraints with their units', () => {
    const demo = createDemoProject();
    const project: Project = {
      ...demo,
      target: { ...demo.target, timing: 'prescribed' },
      settings: { ...demo.settings, constraints: { fullTurnCrank: true, minTransmissionDeg: 30, linkLengthMm: [5, 400], keepOut: [{ x: 50, y: 50, r: 10 }], maxSizeSpans: null } },
    };
    const parsed = parseProblemFile(JSON.parse(JSON.stringify(problemFileOf(project))));
    expect(parsed.ok).toBe(true);
    if (!parsed.ok || parsed.problem.timing.mode !== 'prescribed') return;
    // 15° = π/12 rad (definition of the radian).
    expect(parsed.problem.timing.driverValues[1]).toBeCloseTo(Math.PI / 12, 12);
    expect(parsed.problem.constraints.minTransmissionRad).toBeCloseTo(Math.PI / 6, 12);
    expect(parsed.problem.constraints.keepOut).toEqual([{ x: 50, y: 50, r: 10 }]);
  });

  it('makes one job per family with islands for every worker, and a run the engine accepts', () => {
    const demo = createDemoProject();
    const project: Project = { ...demo, settings: { ...demo.settings, families: ['fourbar', 'watt-i'], budget: { mode: 'time', evaluations: 100, seconds: 90 } } };
    const built = buildRunInput(project, 3);
    expect(built.ok).toBe(true);
    if (!built.ok) return;
    const defined = defineRun(built.input);
    expect(defined.ok).toBe(true);
    if (!defined.ok) return;
    expect(defined.spec.jobs.map((j) => [j.id, j.islands])).toEqual([
      ['fourbar', 2],
      ['watt-i', 2],
    ]);
    expect(defined.spec.budget).toEqual({ evaluations: null, seconds: 90 });
    expect(defined.spec.checkpointEveryMs).toBe(project.settings.checkpointEverySeconds * 1000);
    expect(islandsPerFamily(3, 1)).toBe(1);
  });

  it('checkpoints as often as the setting says, within the engine\'s range, and refuses the rest beside the field', () => {
    const state: WorkspaceState = { project: createDemoProject(), ui: INITIAL_UI };
    const every = reduce(state, { type: 'settings/checkpoint-every', seconds: 2.5 });
    expect(every.project.settings.checkpointEverySeconds).toBe(2.5);
    const built = buildRunInput(every.project, 1);
    expect(built.ok && defineRun(built.input)).toMatchObject({ ok: true, spec: { checkpointEveryMs: 2500 } });
    // Refused, not clamped: the setting stays as it was.
    expect(reduce(every, { type: 'settings/checkpoint-every', seconds: 0.5 }).project.settings.checkpointEverySeconds).toBe(2.5);
    expect(reduce(every, { type: 'settings/checkpoint-every', seconds: 90_000 }).project.settings.checkpointEverySeconds).toBe(2.5);
    expect(checkCheckpointEvery('0,5')).toEqual({ ok: false, message: expect.stringMatching(/^Checkpoint every: 0,5 s is under 1 s .*; expected a time from 1 s to 86,400 s \(a day\)\.$/) });
    expect(checkCheckpointEvery('ten')).toEqual({ ok: false, message: expect.stringMatching(/^Checkpoint every: "ten" is not a number; /) });
    expect(checkCheckpointEvery('86400')).toEqual({ ok: true, value: 86_400 });
  });
});

describe('progress in the workspace terms', () => {
  it('turns a sum of squares into the RMS error', () => {
    // RMS = √(Σ d² / n) (definition).
    expect(errorMmOf(8, 'sum-of-squares', 2)).toBe(2);
    expect(errorMmOf(0.4, 'rms', 24)).toBe(0.4);
    expect(errorMmOf(Infinity, 'max', 24)).toBe(Infinity);
  });

  it('notes a checkpoint when its round moves on, with the evaluations it holds', () => {
    const progress = {
      status: 'running',
      rounds: 12,
      evaluations: 5000,
      budgetEvaluations: 20000,
      elapsedMs: 4000,
      evaluationsPerSecond: 1250,
      remainingMs: 12000,
      best: { jobId: 'fourbar', value: 0.25, violation: 0 },
      islands: 1,
      islandsRunning: 1,
      workers: 1,
      restarts: 0,
      searchRestarts: 3,
      checkpointRound: 12,
    } satisfies RunProgress;
    const patch = progressPatch(progress, { ...IDLE_RUN, measure: 'rms', targetPointCount: 24 }, 1_000);
    expect(patch.checkpoint).toEqual({ round: 12, evaluations: 5000, savedAtMs: 1_000 });
    expect(patch.bestErrorMm).toBe(0.25);
    expect(patch.bestFeasible).toBe(true);
    expect(patch.searchRestarts).toBe(3);
    const again = progressPatch(progress, { ...IDLE_RUN, checkpoint: { round: 12, evaluations: 5000, savedAtMs: 1_000 } }, 2_000);
    expect(again.checkpoint).toBeUndefined();
  });

  it('ranks archived designs feasible first, then by value (Deb, 2000)', () => {
    // Source: K. Deb, "An efficient constraint handling method for genetic algorithms", CMAME 186, 2000 (feasibility rules).
    const best = bestArchived(
      {
        archive: [
          { jobId: 'a', entries: [{ x: [1], value: 0.1, violation: 0.5 }, { x: [2], value: 3, violation: 0 }] },
          { jobId: 'b', entries: [{ x: [3], value: 2, violation: 0 }, { x: [4], value: 0.2, violation: 0.1 }] },
        ],
      },
      3,
    );
    expect(best.map((d) => d.x[0])).toEqual([3, 2, 4]);
  });
});

describe('reading a saved project back', () => {
  it('reads what the workspace saves', () => {
    const project = createDemoProject();
    const read = readProject(JSON.parse(JSON.stringify(project)));
    expect(read.ok).toBe(true);
  });

  it('reads a project saved before the checkpoint interval was a setting with the interval it ran with, 10 s', () => {
    const stored = JSON.parse(JSON.stringify(createDemoProject()));
    delete stored.settings.checkpointEverySeconds;
    expect(readProject(stored)).toMatchObject({ ok: true, project: { settings: { checkpointEverySeconds: 10 } } });
  });

  it('says where a damaged record is wrong', () => {
    const project = JSON.parse(JSON.stringify(createDemoProject()));
    project.target.points[3].x = 'twelve';
    expect(readProject(project)).toEqual({ ok: false, reason: expect.stringMatching(/^target\.points\.3\.x: /) });
    expect(readProject({ format: 'something else' }).ok).toBe(false);
  });
});
