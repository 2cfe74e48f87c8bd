/**
 * The search set-up as typed in the workspace, read into a suspension problem: typing the
 * example problem file's values field by field gives the very problem the core makes of
 * the file, and each bad value comes back beside the field it was typed in, carrying the
 * core's own message for the same raw value.
 */
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { parseSynthesisProblemFile } from '../../../src/core/io/problem';
import { LAYOUT_KINDS, demoAxleBody, demoPivots, type Bicycle, type LayoutKind } from '../../../src/core/suspension';
import { createSuspensionProblem, defaultLayoutBounds, type SuspensionProblemInput } from '../../../src/core/synthesis/suspensionProblem';
import { demoSuspensionState, reduceSuspension, type SuspensionAction, type SuspensionState } from '../../../src/app/suspension/state';
import { readSearchProblem } from '../../../src/app/suspension/targets/searchProblem';
import { runLayoutBodies } from '../../../src/app/suspension/search/compare';
import { TARGET_KEYS, type SearchSetupAction, type TargetKey, type TargetTextField } from '../../../src/app/suspension/targets/setup';

const root = resolve(import.meta.dirname, '../../..');
type In = SuspensionProblemInput;
/** The example file as plain data a test may change. */
type FileInput = Omit<In, 'targets' | 'keepOut' | 'bounds'> & {
  targets: { -readonly [K in keyof In['targets']]: In['targets'][K] };
  keepOut?: In['keepOut'];
  bounds?: In['bounds'];
  format: string;
  version: number;
  description: string;
};
const file = (): FileInput => JSON.parse(readFileSync(resolve(root, 'public/examples/trail-bike-suspension-problem.json'), 'utf8')) as FileInput;

/** The workspace's own actions used here; every other one is a search set-up action. */
const WORKSPACE_ACTIONS = new Set(['load', 'field', 'name']);

function apply(state: SuspensionState, actions: readonly (SuspensionAction | SearchSetupAction)[]): SuspensionState {
  return actions.reduce<SuspensionState>((s, a) => reduceSuspension(s, WORKSPACE_ACTIONS.has(a.type) ? (a as SuspensionAction) : { type: 'search', action: a as SearchSetupAction }), state);
}

const text = (key: TargetKey, field: TargetTextField, v: unknown): SearchSetupAction => ({ type: 'targetText', key, field, text: Array.isArray(v) ? v.join(', ') : String(v) });

/** What a user types to set up the file's problem: the bicycle, layouts, every target, keep-outs and samples. */
function typedFrom(f: FileInput): SuspensionState {
  const kind: LayoutKind = 'fourBarSeatStayAxle';
  const actions: (SuspensionAction | SearchSetupAction)[] = [
    { type: 'load', design: { name: f.name, bicycle: f.bicycle, layout: { kind, pivots: demoPivots(kind), axleBody: demoAxleBody(kind) } } as never, fallbackName: '' },
    ...LAYOUT_KINDS.map((k): SearchSetupAction => ({ type: 'layout', kind: k, on: f.layouts.includes(k) })),
    ...TARGET_KEYS.map((key): SearchSetupAction => ({ type: 'targetOn', key, on: false })),
    { type: 'steps', text: String(f.steps) },
  ];
  const t = f.targets;
  const lr = t.leverageRatio as { start: number; end: number; weight: number; tolerance: number };
  actions.push({ type: 'targetOn', key: 'leverageRatio', on: true }, { type: 'leverageForm', form: 'shape' }, text('leverageRatio', 'start', lr.start), text('leverageRatio', 'end', lr.end), text('leverageRatio', 'exponent', ''), text('leverageRatio', 'weight', lr.weight), text('leverageRatio', 'tolerance', lr.tolerance));
  const as = t.antiSquatAtSag!;
  actions.push({ type: 'targetOn', key: 'antiSquatAtSag', on: true }, { type: 'targetMode', key: 'antiSquatAtSag', as: as.as! }, text('antiSquatAtSag', 'cogs', as.cogs), text('antiSquatAtSag', 'min', as.minPct), text('antiSquatAtSag', 'max', as.maxPct), text('antiSquatAtSag', 'weight', as.weight), text('antiSquatAtSag', 'tolerance', as.tolerancePct));
  const ar = t.antiRiseAtSag!;
  actions.push({ type: 'targetOn', key: 'antiRiseAtSag', on: true }, { type: 'targetMode', key: 'antiRiseAtSag', as: ar.as! }, text('antiRiseAtSag', 'min', ar.minPct), text('antiRiseAtSag', 'max', ar.maxPct), text('antiRiseAtSag', 'weight', ar.weight), text('antiRiseAtSag', 'tolerance', ''));
  const tr = t.travelMm!;
  actions.push({ type: 'targetOn', key: 'travelMm', on: true }, { type: 'targetMode', key: 'travelMm', as: tr.as! }, text('travelMm', 'min', tr.min), text('travelMm', 'max', tr.max), text('travelMm', 'weight', ''), text('travelMm', 'tolerance', ''));
  const kb = t.kickbackDeg!;
  actions.push({ type: 'targetOn', key: 'kickbackDeg', on: true }, { type: 'targetMode', key: 'kickbackDeg', as: kb.as! }, text('kickbackDeg', 'max', kb.max), text('kickbackDeg', 'cogs', kb.cogs), text('kickbackDeg', 'weight', kb.weight), text('kickbackDeg', 'tolerance', kb.toleranceDeg));
  const start = apply(demoSuspensionState(), actions);
  const cleared = apply(start, start.search.keepOut.map(() => ({ type: 'keepOutRemove', index: 0 }) as SearchSetupAction));
  const circles: SearchSetupAction[] = [];
  f.keepOut!.forEach((k, index) => {
    circles.push({ type: 'keepOutAdd' });
    for (const field of ['name', 'x', 'y', 'r'] as const) circles.push({ type: 'keepOutText', index, field, text: String(k[field]) });
  });
  return apply(cleared, circles);
}

function issuesOf(state: SuspensionState): { field: string; message: string }[] {
  const read = readSearchProblem(state);
  return read.ok ? [] : read.issues;
}

/** The core's issues for the file's problem with one change: the messages the reader must carry. */
function coreIssues(change: (f: FileInput) => void): { path: string; message: string }[] {
  const f = file();
  change(f);
  const created = createSuspensionProblem(f);
  return created.ok ? [] : created.issues;
}

describe('readSearchProblem: the typed set-up is the problem the core makes of the same values', () => {
  it('typing the example problem file field by field gives the problem the file gives', () => {
    const f = file();
    const read = readSearchProblem(typedFrom(f));
    if (!read.ok) throw new Error(read.issues.map((i) => i.message).join('\n'));
    // Source: public/examples/trail-bike-suspension-problem.json, read by the core's own file reader.
    const fromFile = parseSynthesisProblemFile(file());
    if (!fromFile.ok) throw new Error('the example file does not read');
    expect(read.problem).toEqual(fromFile.problem);
    expect(read.problem).toEqual((createSuspensionProblem(f) as { ok: true; problem: unknown }).problem);
  });

  it('the demo opens ready: three layouts, the trail-bike targets, two keep-outs, the core default regions', () => {
    const read = readSearchProblem(demoSuspensionState());
    if (!read.ok) throw new Error(read.issues.map((i) => i.message).join('\n'));
    expect(read.problem.layouts).toEqual(['singlePivot', 'fourBarSeatStayAxle', 'wattSixBar']);
    expect(read.problem.targets.leverageRatio).toMatchObject({ form: 'shape', start: 2.9, end: 2.4 });
    expect(read.problem.targets.antiSquatAtSag).toMatchObject({ min: 95, max: 105, cogs: [21, 24, 28] });
    expect(read.problem.keepOut.map((k) => k.name)).toEqual(['chainring', 'bottle']);
    for (const kind of read.problem.layouts) expect(read.problem.bounds[kind]).toEqual(defaultLayoutBounds(kind));
    expect(read.run).toEqual({ budget: { seconds: 60, evaluations: null }, seed: 1 });
  });

  it('a region typed in mm and a shock angle typed in degrees reach the problem as mm and radians', () => {
    const state = apply(demoSuspensionState(), [
      { type: 'rangeText', layout: 'singlePivot', variable: 'mainPivot.x', bound: 'min', text: '-20.5' },
      { type: 'rangeText', layout: 'singlePivot', variable: 'mainPivot.x', bound: 'max', text: '70' },
      { type: 'rangeText', layout: 'singlePivot', variable: 'shockAngle', bound: 'min', text: '-30' },
      { type: 'rangeText', layout: 'singlePivot', variable: 'shockAngle', bound: 'max', text: '10' },
    ]);
    const read = readSearchProblem(state);
    if (!read.ok) throw new Error(read.issues.map((i) => i.message).join('\n'));
    expect(read.problem.bounds.singlePivot?.['mainPivot.x']).toEqual([-20.5, 70]);
    // theorem: 30° = π/6 rad, 10° = π/18 rad.
    expect(read.problem.bounds.singlePivot?.shockAngle[0]).toBeCloseTo(-Math.PI / 6, 14);
    expect(read.problem.bounds.singlePivot?.shockAngle[1]).toBeCloseTo(Math.PI / 18, 14);
    // The variables not typed keep the core's default box.
    expect(read.problem.bounds.singlePivot?.['mainPivot.y']).toEqual(defaultLayoutBounds('singlePivot')['mainPivot.y']);
  });

  it('a region drawn by dragging lands on the 0.1 mm grid and reads back as the same numbers', () => {
    const state = apply(demoSuspensionState(), [{ type: 'regionDrawn', layout: 'singlePivot', pivot: 'mainPivot', x: [80.04, 20.899999999999977], y: [10.05, 130] }]);
    expect(state.search.regions.singlePivot?.['mainPivot.x']).toEqual({ min: '20.9', max: '80' });
    const read = readSearchProblem(state);
    if (!read.ok) throw new Error(read.issues.map((i) => i.message).join('\n'));
    expect(read.problem.bounds.singlePivot?.['mainPivot.x']).toEqual([20.9, 80]);
    expect(read.problem.bounds.singlePivot?.['mainPivot.y']).toEqual([Number(state.search.regions.singlePivot?.['mainPivot.y'].min), 130]);
  });
});

describe('readSearchProblem: every issue beside its field, with the core’s message', () => {
  const demo = demoSuspensionState();

  it('a band the wrong way round is the band’s issue, in the core’s words', () => {
    const state = apply(demo, [text('antiSquatAtSag', 'min', 110), text('antiSquatAtSag', 'max', 95)]);
    const core = coreIssues((f) => { f.targets.antiSquatAtSag = { ...f.targets.antiSquatAtSag!, minPct: 110, maxPct: 95 }; });
    expect(core.map((i) => i.path)).toEqual(['targets.antiSquatAtSag']);
    expect(issuesOf(state)).toEqual([{ field: 'targets.antiSquatAtSag', message: expect.stringContaining(core[0].message) as unknown as string }]);
  });

  it('a cog not on the cassette, a negative weight, a zero tolerance, a bad keep-out and an empty region are each at their field', () => {
    const state = apply(demo, [
      text('antiSquatAtSag', 'cogs', '21, 20'),
      text('leverageRatio', 'weight', '-1'),
      text('travelMm', 'tolerance', '0'),
      { type: 'keepOutText', index: 1, field: 'r', text: '0' },
      { type: 'rangeText', layout: 'wattSixBar', variable: 'mainPivot.y', bound: 'max', text: '-1000' },
      { type: 'rangeText', layout: 'wattSixBar', variable: 'mainPivot.y', bound: 'min', text: '-1000' },
    ]);
    const core = coreIssues((f) => {
      f.targets.antiSquatAtSag = { ...f.targets.antiSquatAtSag!, cogs: [21, 20] };
      f.targets.leverageRatio = { ...f.targets.leverageRatio!, weight: -1 };
      f.targets.travelMm = { ...f.targets.travelMm!, toleranceMm: 0 };
      f.keepOut = [f.keepOut![0], { ...f.keepOut![1], r: 0 }];
      f.bounds = { wattSixBar: { 'mainPivot.y': [-1000, -1000] } };
    });
    const got = issuesOf(state);
    const byField = new Map(got.map((i) => [i.field, i.message]));
    const expected: [string, string][] = [
      ['targets.antiSquatAtSag.cogs', 'targets.antiSquatAtSag.cogs[1]'],
      ['targets.leverageRatio.weight', 'targets.leverageRatio.weight'],
      ['targets.travelMm.tolerance', 'targets.travelMm.toleranceMm'],
      ['keepOut.1', 'keepOut[1]'],
      ['regions.wattSixBar.mainPivot.y', 'bounds.wattSixBar.mainPivot.y'],
    ];
    for (const [field, path] of expected) {
      const coreIssue = core.find((i) => i.path === path);
      expect(coreIssue, path).toBeDefined();
      expect(byField.get(field), field).toContain(coreIssue!.message);
    }
    expect(got.length).toBe(expected.length);
  });

  it('text that is not a number is the field’s own issue, not repeated by the core’s NaN, and nothing is rounded or clamped', () => {
    const state = apply(demo, [
      text('travelMm', 'min', '13o'),
      { type: 'keepOutText', index: 0, field: 'x', text: '' },
      { type: 'rangeText', layout: 'singlePivot', variable: 'mainPivot.x', bound: 'max', text: '1600' },
    ]);
    const got = issuesOf(state);
    expect(got.map((i) => i.field)).toEqual(['targets.travelMm.min', 'keepOut.0.x', 'regions.singlePivot.mainPivot.x']);
    expect(got[0].message).toContain('"13o" is not a number');
    expect(got[1].message).toContain('empty; expected a coordinate in mm');
    // The core refuses a bound beyond its reach: the reader passes 1600 as typed.
    expect(got[2].message).toContain('1600');
  });

  it('the bicycle panel’s problems, the budget and the seed block the problem too, and the targets are still checked', () => {
    const state = apply(demo, [
      { type: 'field', field: 'stroke', text: '400' },
      { type: 'budget', field: 'seconds', text: '' },
      { type: 'budget', field: 'evaluations', text: '' },
      { type: 'seed', text: '-1' },
      text('travelMm', 'min', '160'),
    ]);
    const fields = issuesOf(state).map((i) => i.field);
    expect(fields).toContain('bicycle.stroke');
    expect(fields).toContain('budget');
    expect(fields).toContain('seed');
    expect(fields).toContain('targets.travelMm');
    expect(fields).not.toContain('bicycle');
  });

  it('no layout and no target are the list’s issues', () => {
    const state = apply(demo, [
      ...demo.search.layouts.map((kind): SearchSetupAction => ({ type: 'layout', kind, on: false })),
      ...TARGET_KEYS.map((key): SearchSetupAction => ({ type: 'targetOn', key, on: false })),
    ]);
    const core = createSuspensionProblem({ kind: 'suspension', name: 'x', bicycle: file().bicycle as Bicycle, layouts: [], targets: {} });
    expect(core.ok).toBe(false);
    const got = issuesOf(state);
    expect(got.map((i) => i.field)).toEqual(['layouts', 'targets']);
    if (!core.ok) for (const [k, i] of core.issues.entries()) expect(got[k].message).toContain(i.message);
  });
});

describe('the six-bar shown, as drawn', () => {
  it('a searched six-bar is searched, and its designs analysed, with the bodies the layout panel shows', () => {
    // The demo ticks the Watt six-bar; show it with the shock from the bell crank to the rocker.
    let state = reduceSuspension(demoSuspensionState(), { type: 'layoutKind', kind: 'wattSixBar' });
    const shock = { eye: 'bellCrank', frameEye: 'rocker' } as const;
    state = reduceSuspension(state, { type: 'shockBodies', shock });
    const reading = readSearchProblem(state);
    expect(reading.ok).toBe(true);
    if (!reading.ok) return;
    expect(reading.problem.layoutBodies.wattSixBar).toEqual({ axleBody: state.layout.axleBody, shock });
    // The compare view and an opened row build the design with the same bodies the run searched.
    expect(runLayoutBodies(reading.input, 'wattSixBar')).toEqual({ axleBody: state.layout.axleBody, shock });
    // Kinds not shown keep the defaults, and a default choice adds nothing to the problem.
    expect(runLayoutBodies(reading.input, 'stephensonSixBar')).toEqual({ axleBody: demoAxleBody('stephensonSixBar'), shock: { eye: 'bellCrank', frameEye: 'frontFrame' } });
    const plain = readSearchProblem(reduceSuspension(demoSuspensionState(), { type: 'layoutKind', kind: 'wattSixBar' }));
    expect(plain.ok && plain.input.layoutBodies).toBe(undefined);
  });
});
