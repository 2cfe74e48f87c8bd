import { describe, expect, it } from 'vitest';
import { fourBarLoops } from '../../src/core/linkage/analysis';
import { compile } from '../../src/core/linkage/compile';
import { fourBar, sliderCrank, stephensonI, stephensonII, stephensonIII, wattI, wattII } from '../../src/core/linkage/families';
import type { Plan } from '../../src/core/linkage/plan';
import type { Linkage } from '../../src/core/linkage/model';
import { closedFormFourBar } from '../support/closedFormFourBar';

/**
 * A plan for loop finding only: joints at the given reference positions, bodies as
 * listed (ground first, carrying the ground joints), no points.
 */
function topologyPlan(joints: Record<string, [number, number]>, groundJoints: string[], bodies: Record<string, string[]>, driven: string): Plan {
  const jointIds = Object.keys(joints);
  const slotIndex = new Map(jointIds.map((id, i) => [id, i]));
  const allBodies = [{ id: 'ground', joints: groundJoints }, ...Object.entries(bodies).map(([id, js]) => ({ id, joints: js }))];
  const linkage: Linkage = {
    joints: jointIds.map((id) => ({ id, x: joints[id][0], y: joints[id][1], ground: groundJoints.includes(id) })),
    bodies: Object.entries(bodies).map(([id, js]) => ({ id, joints: js })),
    driver: { kind: 'rotation', body: driven, pivot: bodies[driven][0], tip: bodies[driven][1] },
  };
  return {
    linkage,
    jointIds,
    pointIds: [],
    slotCount: jointIds.length,
    slotIndex,
    bodies: allBodies.map((b) => ({ id: b.id, slots: Int32Array.from(b.joints.map((j) => slotIndex.get(j) ?? -1)) })),
    bodyIndex: new Map(allBodies.map((b, i) => [b.id, i])),
    driverReferenceValue: 0,
    newtonUnknowns: 0,
    reference: Float64Array.from(jointIds.flatMap((id) => joints[id])),
  };
}

describe('fourBarLoops', () => {
  it('finds the one loop of a four-bar, from ground in the order ground, input, coupler, output', () => {
    const m = closedFormFourBar({ ground: 100, input: 40, coupler: 120, output: 80, theta2: 0.7, branch: 1, origin: [3, 4], groundAngle: 1 });
    if (m === null) throw new Error('does not assemble');
    const loops = fourBarLoops(m.plan);
    expect(loops).toHaveLength(1);
    const [loop] = loops;
    expect(loop.bodyIds).toEqual(['ground', 'input', 'coupler', 'output']);
    expect(loop.jointIds).toEqual(['A0', 'A', 'B', 'B0']);
    expect(loop.joints).toEqual([0, 1, 2, 3]);
    [100, 40, 120, 80].forEach((l, i) => expect(loop.lengthsMm[i]).toBeCloseTo(l, 10));
    expect(loop.grounded).toBe(true);
    expect(loop.inputDriven).toBe(true);
    expect(loop.grashof).toBe('grashof');
    expect(loop.classification?.name).toBe('crank-rocker');
  });

  it('starts from the driven link whichever side of ground it is on', () => {
    const m = closedFormFourBar({ ground: 100, input: 80, coupler: 120, output: 40, theta2: 1.5, branch: 1 });
    if (m === null) throw new Error('does not assemble');
    // the same linkage driven from the other ground-pivoted link
    const plan: Plan = { ...m.plan, linkage: { ...m.plan.linkage, driver: { kind: 'rotation', body: 'output', pivot: 'B0', tip: 'B' } } };
    const [loop] = fourBarLoops(plan);
    expect(loop.bodyIds).toEqual(['ground', 'output', 'coupler', 'input']);
    expect(loop.jointIds).toEqual(['B0', 'B', 'A', 'A0']);
    expect(loop.inputDriven).toBe(true);
    expect(loop.classification?.name).toBe('crank-rocker'); // the 40 mm link is now the input
  });

  // A one-degree-of-freedom six-bar has two ternary links. Joined directly (Watt's chain)
  // the loops have four, four and six links; apart (Stephenson's chain) four, five and five
  // (any mechanism text; theorem of the two graphs). Only the four-link loops are four-bars.
  it("finds two loops in Watt's chain and one in Stephenson's", () => {
    // Watt: ground and T are the ternaries, joined at O2; loops ground–a–b–T and ground–c–d–T
    const watt = topologyPlan(
      { O1: [0, 0], O2: [50, 0], O3: [120, 0], A: [0, 30], B: [60, 40], C: [110, 60], D: [150, 40] },
      ['O1', 'O2', 'O3'],
      { crank: ['O1', 'A'], link1: ['A', 'B'], T: ['O2', 'B', 'C'], link2: ['C', 'D'], rocker: ['D', 'O3'] },
      'crank',
    );
    const wattLoops = fourBarLoops(watt);
    expect(wattLoops.map((l) => l.bodyIds)).toEqual([
      ['ground', 'crank', 'link1', 'T'],
      ['ground', 'T', 'link2', 'rocker'],
    ]);
    expect(wattLoops.map((l) => l.inputDriven)).toEqual([true, false]);
    // Stephenson: the ternaries ground and coupler share no joint; loops
    // ground–crank–coupler–rocker (4), ground–rocker–coupler–link2–link3 and
    // ground–crank–coupler–link2–link3 (5 each)
    const stephenson = topologyPlan(
      { O1: [0, 0], O2: [100, 0], O3: [200, 0], A: [0, 40], B: [80, 60], C: [170, 60], E: [120, 90] },
      ['O1', 'O2', 'O3'],
      { crank: ['O1', 'A'], coupler: ['A', 'B', 'E'], rocker: ['O2', 'B'], link2: ['E', 'C'], link3: ['C', 'O3'] },
      'crank',
    );
    expect(fourBarLoops(stephenson).map((l) => l.bodyIds)).toEqual([['ground', 'crank', 'coupler', 'rocker']]);
  });

  it('reports a loop without ground by its lengths and Grashof condition only', () => {
    // Stephenson's chain with ground a binary link: its four-link loop T1–b1–T2–b2 floats
    const plan = topologyPlan(
      { O1: [0, 0], O2: [200, 0], A: [0, 50], B: [40, 120], C: [120, 130], D: [90, 40], E: [160, 60] },
      ['O1', 'O2'],
      { crank: ['O2', 'E'], T1: ['O1', 'A', 'D'], b1: ['A', 'B'], T2: ['B', 'C', 'E'], b2: ['D', 'C'] },
      'crank',
    );
    const loops = fourBarLoops(plan);
    expect(loops).toHaveLength(1);
    const [loop] = loops;
    expect(loop.bodyIds).toEqual(['T1', 'b1', 'T2', 'b2']);
    expect(loop.jointIds).toEqual(['A', 'B', 'C', 'D']);
    expect(loop.grounded).toBe(false);
    expect(loop.inputDriven).toBe(false);
    expect(loop.classification).toBeNull();
    const lengths = [Math.hypot(90, -10), Math.hypot(40, 70), Math.hypot(80, 10), Math.hypot(30, 90)]; // D–A, A–B, B–C, C–D
    lengths.forEach((l, i) => expect(loop.lengthsMm[i]).toBeCloseTo(l, 10));
    const [s, p, q, l] = [...lengths].sort((x, y) => x - y);
    expect(loop.slMinusPq).toBeCloseTo(s + l - p - q, 10);
    expect(loop.grashof).toBe('non-grashof');
  });

  it('does not count a sliding pair as a pin', () => {
    const m = closedFormFourBar({ ground: 100, input: 40, coupler: 120, output: 80, theta2: 0.7, branch: 1 });
    if (m === null) throw new Error('does not assemble');
    const plan: Plan = { ...m.plan, linkage: { ...m.plan.linkage, sliders: [{ joint: 'B', body: 'output', angle: 0 }] } };
    expect(fourBarLoops(plan)).toHaveLength(0);
  });

  describe('on the compiled families', () => {
    const compiled = (linkage: Linkage) => {
      const r = compile(linkage);
      if (!r.ok) throw new Error(JSON.stringify(r.issues));
      return r.plan;
    };
    // Per family: its loops as the builders document the bodies (Watt's chain: two
    // four-link loops; Stephenson's: one; a slider-crank: no loop of pins), with
    // [bodies from ground or the lowest body, grounded, driven input].
    const expected: [string, Plan, [string[], boolean, boolean][]][] = [
      ['fourBar', compiled(fourBar()), [[['ground', 'crank', 'coupler', 'rocker'], true, true]]],
      ['sliderCrank', compiled(sliderCrank()), []],
      ['wattI', compiled(wattI()), [
        [['ground', 'crank', 'coupler', 'rocker'], true, true],
        [['crank', 'coupler', 'link2', 'link1'], false, false],
      ]],
      ['wattII', compiled(wattII()), [
        [['ground', 'crank', 'coupler', 'rocker'], true, true],
        [['ground', 'rocker', 'coupler2', 'output'], true, false],
      ]],
      ['stephensonI', compiled(stephensonI()), [[['ground', 'crank', 'coupler', 'rocker'], true, true]]],
      ['stephensonII', compiled(stephensonII()), [[['crank', 'link1', 'coupler', 'link2'], false, false]]],
      ['stephensonIII', compiled(stephensonIII()), [[['ground', 'rockerA', 'coupler', 'rockerB'], true, false]]],
    ];
    for (const [name, plan, loops] of expected) {
      it(`${name}: ${loops.length} loop(s)`, () => {
        const found = fourBarLoops(plan);
        expect(found.map((l) => [l.bodyIds, l.grounded, l.inputDriven])).toEqual(loops);
        for (const loop of found) {
          // each length is the distance between the loop's joints on that body, in the reference pose
          loop.lengthsMm.forEach((length, i) => {
            const a = loop.joints[(i + 3) % 4];
            const b = loop.joints[i];
            expect(length).toBeCloseTo(Math.hypot(plan.reference[2 * b] - plan.reference[2 * a], plan.reference[2 * b + 1] - plan.reference[2 * a + 1]), 12);
          });
          expect(loop.classification === null).toBe(!loop.grounded);
        }
      });
    }
  });
});
