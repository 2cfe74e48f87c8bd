/**
 * The leg search as the workspace runs it, in Node through the same engine (real worker
 * threads, a small seeded budget): one job per family, the best of each family kept, and
 * every figure of a row equal to the gait figures of the design's exported leg file,
 * taken again by the core's gait analysis (what `loci analyze` runs).
 */
import { describe, expect, it } from 'vitest';
import { gaitFigures } from '../../../src/core/gait';
import { parseLegFileText } from '../../../src/core/io/legFile';
import { nodeEnvironment } from '../../../src/engine/node';
import { LegSearchController } from '../../../src/app/leg/search/controller';
import { bestOfEachFamily, type LegSearchRun } from '../../../src/app/leg/search/results';
import { readLegSetup } from '../../../src/app/leg/readSetup';
import { reduceLegSetup, emptyLegSetup, type LegSetupAction } from '../../../src/app/leg/setup';
import { storedLegSchema } from '../../../src/app/leg/stored';
import { metCount, targetJudges, targetMarksOf } from '../../../src/app/leg/search/targetMarks';

/** An own small foot trajectory (mm), a step height and a duty factor, on a level ground line. */
const ACTIONS: LegSetupAction[] = [
  { type: 'pointsReplace', points: [{ x: '12', y: '-30' }, { x: '0', y: '-30' }, { x: '-12', y: '-30' }, { x: '-8', y: '-24' }, { x: '0', y: '-22' }, { x: '8', y: '-24' }] },
  { type: 'groundText', field: 'yMm', text: '-30' },
];

function setupOf() {
  const base = [
    ...ACTIONS,
    { type: 'stanceTolerance', text: '1' },
    { type: 'targetOn', key: 'stepHeightMm', on: true },
    { type: 'targetText', key: 'stepHeightMm', field: 'value', text: '8' },
    { type: 'targetOn', key: 'minDutyFactor', on: true },
    { type: 'targetText', key: 'minDutyFactor', field: 'value', text: '0.4' },
    { type: 'family', family: 'watt-i', on: true },
    { type: 'budget', field: 'evaluations', text: '800' },
    { type: 'seed', text: '7' },
  ] as LegSetupAction[];
  return base.reduce(reduceLegSetup, emptyLegSetup());
}

describe('leg search through the engine', () => {
  it('ranks every family\'s designs, and each row\'s figures are gaitFigures of its exported leg file', async () => {
    const reading = readLegSetup(setupOf());
    if (!reading.ok) throw new Error(JSON.stringify(reading.issues));
    const runs: LegSearchRun[] = [];
    let id = 0;
    const controller = new LegSearchController({
      env: { ...nodeEnvironment(), defaultWorkerCount: () => 2 },
      wallNow: () => 0,
      newRunId: () => `test-${id++}`,
      onFinished: (run) => runs.push(run),
    });
    await controller.start(reading.input, reading.settings);
    expect(controller.session.getState().status).toBe('finished');
    expect(runs).toHaveLength(1);
    const run = runs[0];
    expect(run.evaluations).toBeGreaterThan(0);
    const best = bestOfEachFamily(run.candidates);
    expect(best.map((c) => c.family).sort()).toEqual(['fourbar', 'watt-i']);
    // Feasible first: no infeasible design ranks above a feasible one.
    const ranked = [...run.candidates].sort((a, b) => a.rank - b.rank);
    const firstInfeasible = ranked.findIndex((c) => !c.feasible);
    if (firstInfeasible >= 0) expect(ranked.slice(firstInfeasible).every((c) => !c.feasible)).toBe(true);
    let checked = 0;
    for (const c of run.candidates) {
      // Second, independent method: the leg file as text, read back and analysed by the core's gait figures (the CLI's analyze path).
      const read = parseLegFileText(JSON.stringify(c.legFile));
      if (!read.ok) throw new Error(JSON.stringify(read.issues));
      const g = gaitFigures(read.design.linkage, read.design.leg);
      if (c.figures === null) {
        expect(g.ok).toBe(false);
        continue;
      }
      if (!g.ok) throw new Error(g.reason);
      const f = g.figures;
      const s = f.longestStance;
      const worst = f.transmission.loops.map((l) => l.worstInStanceDeg).filter((v): v is number => v !== null);
      expect(c.figures).toEqual({
        strideMm: s === null ? null : s.strideMm,
        stepHeightMm: f.stepHeightMm,
        dutyFactor: f.dutyFactor.value,
        dutyToleranceMm: f.dutyFactor.toleranceMm,
        flatnessPeakToPeakMm: s === null ? null : s.flatness.peakToPeakMm,
        speedVariation: s === null ? null : s.speed.variation,
        worstTransmissionInStanceDeg: worst.length === 0 ? null : Math.min(...worst),
        widthMm: f.size.widthMm,
        heightMm: f.size.heightMm,
      });
      expect(c.figures.dutyToleranceMm).toBe(1);
      // common practice: a value target is met within its tolerance (a mm target takes the stance tolerance, 1 mm, unless set), a limit on its side; judged here from the analysed file's figures.
      expect(targetMarksOf(targetJudges(run.problem), c)).toEqual({
        trajectoryRmsMm: { met: c.trajectoryRmsMm !== null && c.trajectoryRmsMm <= 1, wanted: '≤ 1 mm' },
        stepHeightMm: { met: Math.abs(f.stepHeightMm - 8) <= 1, wanted: '8 ± 1 mm' },
        dutyFactor: { met: f.dutyFactor.value >= 0.4, wanted: '≥ 0.4' },
      });
      checked++;
    }
    expect(checked).toBeGreaterThan(0);
    // What the project keeps of the run reads back through its schema.
    expect(storedLegSchema.safeParse(JSON.parse(JSON.stringify({ setup: setupOf(), results: { current: run, previous: null } }))).success).toBe(true);
  }, 120_000);

  it('marks each target met or missed on the figures a row shows, and a figure the leg lacks as missed', () => {
    const reading = readLegSetup(setupOf());
    if (!reading.ok) throw new Error(JSON.stringify(reading.issues));
    const problem = {
      ...reading.input,
      targets: { ...reading.input.targets, strideMm: { value: 30, toleranceMm: 2 }, maxFlatnessMm: { max: 0.5 }, sizeBoxMm: { widthMm: 100, heightMm: 60 } },
    };
    const judges = targetJudges(problem);
    const figures = { strideMm: 32, stepHeightMm: 9.5, dutyFactor: 0.4, dutyToleranceMm: 1, flatnessPeakToPeakMm: 0.6, speedVariation: 0.1, worstTransmissionInStanceDeg: 40, widthMm: 100, heightMm: 61 };
    const candidate = { rank: 1, family: 'fourbar', value: 0, violation: 0, feasible: true, defects: [], trajectoryRmsMm: null, figures, failure: null } as unknown as Parameters<typeof targetMarksOf>[1];
    // Boundaries by hand: no trajectory RMS (missed), 32 is 30 + 2 (met), 9.5 is 8 + 1.5 (missed), 0.4 = 0.4 (met), 0.6 > 0.5 (missed), 100 = 100 (met), 61 > 60 (missed).
    const marks = targetMarksOf(judges, candidate);
    expect(Object.fromEntries(Object.entries(marks).map(([k, m]) => [k, m.met]))).toEqual({
      trajectoryRmsMm: false, strideMm: true, stepHeightMm: false, dutyFactor: true, flatnessPeakToPeakMm: false, widthMm: true, heightMm: false,
    });
    expect(metCount(marks)).toEqual({ met: 3, of: 7 });
    // No stance: no stride and no flatness, so those targets are missed, not passed by default.
    const noStance = targetMarksOf(judges, { ...candidate, figures: { ...figures, strideMm: null, flatnessPeakToPeakMm: null } });
    expect(noStance.strideMm?.met).toBe(false);
    expect(noStance.flatnessPeakToPeakMm?.met).toBe(false);
    // Refused by the gait analysis: nothing judged.
    expect(targetMarksOf(judges, { ...candidate, figures: null })).toEqual({});
  });

  it('Stop ends the run between rounds and keeps the designs found so far', async () => {
    const reading = readLegSetup(reduceLegSetup(setupOf(), { type: 'budget', field: 'evaluations', text: '5000000' }));
    if (!reading.ok) throw new Error(JSON.stringify(reading.issues));
    const runs: LegSearchRun[] = [];
    const controller = new LegSearchController({
      env: { ...nodeEnvironment(), defaultWorkerCount: () => 2 },
      wallNow: () => 0,
      newRunId: () => 'stopped',
      onFinished: (run) => runs.push(run),
    });
    // Stop once the first evaluations are counted: an event, not a time.
    const unsubscribe = controller.session.subscribe(() => {
      if (controller.session.getState().evaluations > 0) controller.stop();
    });
    await controller.start(reading.input, reading.settings);
    unsubscribe();
    expect(controller.session.getState().message).toMatch(/^Stopped/);
    expect(runs).toHaveLength(1);
    expect(runs[0].stopReason).toBe('cancelled');
    expect(runs[0].evaluations).toBeLessThan(5_000_000);
    expect(runs[0].candidates.length).toBeGreaterThan(0);
  }, 120_000);
});
