/**
 * The search set-up kept in the project: written and read back through the project's
 * schema unchanged (text as typed, a value still being corrected too); a project kept
 * before there was a set-up still reads; a stored region of a variable the layout does
 * not have is refused, not dropped.
 */
import { describe, expect, it } from 'vitest';
import { DEMO_TRAIL_BIKE } from '../../../src/core/suspension';
import { createDemoProject } from '../../../src/app/demo/demoProject';
import { readProject } from '../../../src/app/storage/projectSchema';
import { demoSuspensionState, reduceSuspension, type SuspensionState } from '../../../src/app/suspension/state';
import { sameDesign, stateOf, storedOf, storedSuspensionSchema } from '../../../src/app/suspension/stored';
import { demoSearchSetup, type SearchSetupAction } from '../../../src/app/suspension/targets/setup';

function withSearch(state: SuspensionState, actions: readonly SearchSetupAction[]): SuspensionState {
  return actions.reduce((s, action) => reduceSuspension(s, { type: 'search', action }), state);
}

const typed = withSearch(demoSuspensionState(), [
  { type: 'layout', kind: 'stephensonSixBar', on: true },
  { type: 'targetText', key: 'travelMm', field: 'min', text: '13o' },
  { type: 'rangeText', layout: 'stephensonSixBar', variable: 'shockAngle', bound: 'max', text: '-60' },
  { type: 'regionDrawn', layout: 'singlePivot', pivot: 'mainPivot', x: [10.04, 60.96], y: [40, 99.95] },
  { type: 'keepOutAdd' },
  { type: 'keepOutText', index: 2, field: 'name', text: 'tyre at full compression' },
  { type: 'budget', field: 'evaluations', text: '50000' },
]);

describe('the search set-up in the project', () => {
  it('is written and read back through the project schema as typed', () => {
    const project = { ...createDemoProject(), suspension: storedOf(typed) };
    const read = readProject(JSON.parse(JSON.stringify(project)));
    if (!read.ok) throw new Error(read.reason);
    const back = stateOf(read.project.suspension!);
    expect(back.search).toEqual(typed.search);
    expect(back.search.targets.travelMm.min).toBe('13o');
    expect(back.search.regions.singlePivot?.['mainPivot.x']).toEqual({ min: '10', max: '61' });
  });

  it('a change of the set-up is a change of the design (the project is saved), a change of the drawing tool is not', () => {
    const s = demoSuspensionState();
    expect(sameDesign(s, withSearch(s, [{ type: 'seed', text: '2' }]))).toBe(false);
    expect(sameDesign(s, reduceSuspension(s, { type: 'setupTool', tool: { kind: 'keepOut' } }))).toBe(true);
  });

  it('a design kept before the set-up existed opens with the demo’s set-up', () => {
    const { search: _dropped, ...older } = storedOf(demoSuspensionState());
    const project = { ...createDemoProject(), suspension: older };
    const read = readProject(JSON.parse(JSON.stringify(project)));
    if (!read.ok) throw new Error(read.reason);
    expect(stateOf(read.project.suspension!).search).toEqual(demoSearchSetup());
  });

  it('refuses a region of a variable the layout has not, and a layout listed twice', () => {
    const stored = JSON.parse(JSON.stringify(storedOf(typed)));
    stored.search.regions.singlePivot['rockerPivot.x'] = { min: '0', max: '1' };
    const bad = storedSuspensionSchema.safeParse(stored);
    expect(bad.success).toBe(false);
    if (!bad.success) expect(bad.error.issues[0].path.join('.')).toBe('search.regions.singlePivot.rockerPivot.x');
    const twice = JSON.parse(JSON.stringify(storedOf(typed)));
    twice.search.layouts = ['singlePivot', 'singlePivot'];
    expect(storedSuspensionSchema.safeParse(twice).success).toBe(false);
  });

  it('loading a design file keeps the set-up being written', () => {
    const s = typed;
    const loaded = reduceSuspension(s, { type: 'load', design: { bicycle: DEMO_TRAIL_BIKE, layout: { kind: s.layout.kind, pivots: s.layout.pivots } }, fallbackName: 'f' });
    expect(loaded.search).toBe(s.search);
  });
});

describe('the drawing tool', () => {
  it('ends a region being drawn when the layout shown changes, and keeps a keep-out being placed', () => {
    const s = demoSuspensionState();
    const drawing = reduceSuspension(s, { type: 'setupTool', tool: { kind: 'region', layout: s.layout.kind, pivot: 'mainPivot' } });
    expect(reduceSuspension(drawing, { type: 'layoutKind', kind: 'singlePivot' }).setupTool).toBeNull();
    const placing = reduceSuspension(s, { type: 'setupTool', tool: { kind: 'keepOut' } });
    expect(reduceSuspension(placing, { type: 'layoutKind', kind: 'singlePivot' }).setupTool).toEqual({ kind: 'keepOut' });
  });
});
