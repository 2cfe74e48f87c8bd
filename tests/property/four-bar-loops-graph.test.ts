/**
 * fourBarLoops against a second, independent method written here: every ordered choice
 * of four distinct bodies and four distinct pins joining them in a ring, reduced to one
 * key per cycle (its smallest rotation or reflection). On random body–joint graphs,
 * sliding pairs and joints shared by three bodies included, both must give the same
 * cycles, each once. Source: theorem (a 4-cycle of a graph is its set of rotations and
 * reflections, 8 ordered tuples each).
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { fourBarLoops } from '../../src/core/linkage/analysis';
import type { Linkage } from '../../src/core/linkage/model';
import type { Plan } from '../../src/core/linkage/plan';

interface Topology {
  readonly jointCount: number;
  /** Joints of each moving body (distinct). */
  readonly bodies: readonly (readonly number[])[];
  readonly groundJoints: readonly number[];
  /** [joint, body] pairs: the joint slides on that body (body 0 is ground). */
  readonly sliders: readonly (readonly [number, number])[];
}

const topology: fc.Arbitrary<Topology> = fc
  .integer({ min: 3, max: 8 })
  .chain((jointCount) =>
    fc.record({
      jointCount: fc.constant(jointCount),
      bodies: fc.array(fc.uniqueArray(fc.nat({ max: jointCount - 1 }), { minLength: 2, maxLength: 3 }), { minLength: 2, maxLength: 7 }),
      groundJoints: fc.uniqueArray(fc.nat({ max: jointCount - 1 }), { minLength: 1, maxLength: 3 }),
      sliders: fc.array(fc.tuple(fc.nat({ max: jointCount - 1 }), fc.nat({ max: 7 })), { maxLength: 2 }),
    }),
  );

/** A plan for loop finding only: ground first (carrying the ground joints), then the bodies; no points. */
function planOf(t: Topology): Plan {
  const jointIds = Array.from({ length: t.jointCount }, (_, j) => `J${j}`);
  const bodyIds = ['ground', ...t.bodies.map((_, b) => `B${b + 1}`)];
  const allBodies = [t.groundJoints, ...t.bodies];
  const linkage: Linkage = {
    joints: jointIds.map((id, j) => ({ id, x: j, y: j * j, ground: t.groundJoints.includes(j) })),
    bodies: t.bodies.map((joints, b) => ({ id: bodyIds[b + 1], joints: joints.map((j) => jointIds[j]) })),
    sliders: t.sliders
      .filter(([, body]) => body < bodyIds.length)
      .map(([joint, body]) => ({ joint: jointIds[joint], body: bodyIds[body], angle: 0 })),
    driver: { kind: 'rotation', body: bodyIds[1], pivot: jointIds[t.bodies[0][0]], tip: jointIds[t.bodies[0][1]] },
  };
  return {
    linkage,
    jointIds,
    pointIds: [],
    slotCount: t.jointCount,
    slotIndex: new Map(jointIds.map((id, j) => [id, j])),
    bodies: allBodies.map((joints, b) => ({ id: bodyIds[b], slots: Int32Array.from(joints) })),
    bodyIndex: new Map(bodyIds.map((id, b) => [id, b])),
    driverReferenceValue: 0,
    newtonUnknowns: 0,
    reference: Float64Array.from(jointIds.flatMap((_, j) => [j, j * j])),
  };
}

/** The smallest of the 8 ways to write the ring b0 j01 b1 j12 b2 j23 b3 j30. */
function cycleKey(bodies: readonly number[], joints: readonly number[]): string {
  const keys: string[] = [];
  for (let r = 0; r < 4; r++) {
    const forward: number[] = [];
    const backward: number[] = [];
    for (let i = 0; i < 4; i++) {
      forward.push(bodies[(r + i) % 4], joints[(r + i) % 4]);
      // reversed: bodies r, r−1, …; the pin between b_k and b_{k−1} is j_{k−1}
      backward.push(bodies[(r - i + 8) % 4], joints[(r - i - 1 + 8) % 4]);
    }
    keys.push(forward.join(','), backward.join(','));
  }
  return keys.sort()[0];
}

/** Every 4-cycle by brute force over ordered tuples, as keys, each once. */
function bruteForceCycles(plan: Plan, t: Topology): Set<string> {
  const bodyCount = plan.bodies.length;
  const sliding = new Set(plan.linkage.sliders?.map((s) => `${plan.slotIndex.get(s.joint)}:${plan.bodyIndex.get(s.body)}`));
  const pinOf = (j: number, b: number) => Array.from(plan.bodies[b].slots).includes(j) && !sliding.has(`${j}:${b}`);
  const found = new Set<string>();
  const range = (n: number) => Array.from({ length: n }, (_, i) => i);
  const between = range(bodyCount).map((a) => range(bodyCount).map((b) => range(t.jointCount).filter((j) => pinOf(j, a) && pinOf(j, b))));
  for (const b0 of range(bodyCount)) for (const b1 of range(bodyCount)) for (const b2 of range(bodyCount)) for (const b3 of range(bodyCount)) {
    if (new Set([b0, b1, b2, b3]).size < 4) continue;
    const ring = [b0, b1, b2, b3];
    const options = ring.map((b, i) => between[b][ring[(i + 1) % 4]]);
    for (const j0 of options[0]) for (const j1 of options[1]) for (const j2 of options[2]) for (const j3 of options[3]) {
      if (new Set([j0, j1, j2, j3]).size === 4) found.add(cycleKey(ring, [j0, j1, j2, j3]));
    }
  }
  return found;
}

describe('fourBarLoops on random body–joint graphs', () => {
  it('finds exactly the 4-cycles a brute-force search finds, each once', () => {
    fc.assert(
      fc.property(topology, (t) => {
        const plan = planOf(t);
        const loops = fourBarLoops(plan);
        const keys = loops.map((loop) => cycleKey(loop.bodies, loop.joints));
        expect(new Set(keys).size).toBe(keys.length);
        expect(new Set(keys)).toEqual(bruteForceCycles(plan, t));
        for (const loop of loops) {
          // joints[i] joins bodies[i] and bodies[i + 1]
          loop.joints.forEach((j, i) => {
            expect(Array.from(plan.bodies[loop.bodies[i]].slots)).toContain(j);
            expect(Array.from(plan.bodies[loop.bodies[(i + 1) % 4]].slots)).toContain(j);
          });
        }
      }),
      { seed: 4242, numRuns: 200 },
    );
  }, 60_000);
});
