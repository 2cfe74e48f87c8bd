/**
 * The six-bars' axle and shock bodies in the app's state and in the stored project: set
 * by the layout panel's actions, kept through the project schema, absent in projects
 * stored before the choice (read as the bell crank to the front frame), and the app's
 * analysis builds the layout with them.
 */
import { describe, expect, it } from 'vitest';
import { createDemoProject } from '../../../src/app/demo/demoProject';
import { readProject } from '../../../src/app/storage/projectSchema';
import { analyse } from '../../../src/app/suspension/analysis';
import { readDraft } from '../../../src/app/suspension/fields';
import { demoSuspensionState, reduceSuspension } from '../../../src/app/suspension/state';
import { stateOf, storedOf } from '../../../src/app/suspension/stored';
import { DEMO_LAYOUTS, DEMO_TRAIL_BIKE, buildLayout, demoPivots, wattSixBar } from '../../../src/core/suspension';

const shock = { eye: 'bellCrank', frameEye: 'rocker' } as const;
const frameEye = { x: DEMO_LAYOUTS.wattSixBar.shockEye.x, y: DEMO_LAYOUTS.wattSixBar.shockEye.y + 210 };

function wattWithBodies() {
  let s = reduceSuspension(demoSuspensionState(), { type: 'layoutKind', kind: 'wattSixBar' });
  s = reduceSuspension(s, { type: 'pivot', name: 'shockFrameEye', at: frameEye });
  s = reduceSuspension(s, { type: 'axleBody', body: 'chainStay' });
  return reduceSuspension(s, { type: 'shockBodies', shock });
}

describe('six-bar bodies in the app', () => {
  it('are kept through the project schema', () => {
    const typed = wattWithBodies();
    const read = readProject(JSON.parse(JSON.stringify({ ...createDemoProject(), suspension: storedOf(typed) })));
    if (!read.ok) throw new Error(read.reason);
    const back = stateOf(read.project.suspension!);
    expect(back.layout).toEqual(typed.layout);
    expect(back.layout.shock).toEqual(shock);
    expect(back.layout.axleBody).toBe('chainStay');
  });

  it('a project stored before the choice opens with the shock from the bell crank to the front frame', () => {
    const s = reduceSuspension(demoSuspensionState(), { type: 'layoutKind', kind: 'wattSixBar' });
    const stored = JSON.parse(JSON.stringify(storedOf(s)));
    delete stored.layout.shock;
    const read = readProject({ ...createDemoProject(), suspension: stored });
    if (!read.ok) throw new Error(read.reason);
    const back = stateOf(read.project.suspension!);
    expect(back.layout.shock).toBeUndefined();
    const analysis = analyse(readDraft(back.draft), back.layout);
    // Second route: the builder with today's bodies, called directly.
    expect(analysis.linkage).toEqual(buildLayout('wattSixBar', demoPivots('wattSixBar'), DEMO_TRAIL_BIKE.rearAxleMm, 'seatStay'));
  });

  it('the analysis builds the layout with the chosen bodies', () => {
    const s = wattWithBodies();
    const analysis = analyse(readDraft(s.draft), s.layout);
    expect(analysis.linkage).toEqual(wattSixBar({ ...DEMO_LAYOUTS.wattSixBar, shockFrameEye: frameEye, axleBody: 'chainStay', shock }));
    expect(analysis.result?.ok).toBe(true);
  });
});
