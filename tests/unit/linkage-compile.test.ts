import { describe, expect, it } from 'vitest';
import {
  compile,
  fourBar,
  mobility,
  sliderCrank,
  stephensonI,
  stephensonII,
  stephensonIII,
  wattI,
  wattII,
  type Linkage,
  type LinkageIssue,
} from '../../src/core/linkage';

/** The issues of a linkage that must not compile. */
function issuesOf(linkage: Linkage): LinkageIssue[] {
  const result = compile(linkage);
  if (result.ok) throw new Error('expected compile to fail');
  return result.issues;
}

function expectIssue(linkage: Linkage, where: string, message: RegExp): void {
  const issues = issuesOf(linkage);
  expect(issues, JSON.stringify(issues, null, 2)).toContainEqual({ where, message: expect.stringMatching(message) });
}

const base = fourBar();

describe('compile: the families compile, with the planned Newton blocks', () => {
  it.each([
    ['fourBar', fourBar(), 0],
    ['sliderCrank', sliderCrank(), 0],
    ['wattI', wattI(), 0],
    ['wattII', wattII(), 0],
    ['stephensonI', stephensonI(), 0],
    ['stephensonII', stephensonII(), 6],
    ['stephensonIII', stephensonIII(), 6],
  ] as const)('%s', (_name, linkage, newtonUnknowns) => {
    const result = compile(linkage);
    expect(result.ok).toBe(true);
    if (!result.ok) return;
    expect(result.plan.newtonUnknowns).toBe(newtonUnknowns);
    expect(result.plan.bodies[0].id).toBe('ground');
    expect(result.plan.slotCount).toBe(linkage.joints.length + (linkage.points?.length ?? 0));
    expect(mobility(linkage).mobility).toBe(1);
  });

  it('keeps a defensive copy: changing the source afterwards changes nothing', () => {
    const joints = base.joints.map((j) => ({ ...j }));
    const linkage = { ...base, joints };
    const result = compile(linkage);
    expect(result.ok).toBe(true);
    if (!result.ok) return;
    (joints[2] as { x: number }).x = 999;
    expect(result.plan.linkage.joints[2].x).toBe(base.joints[2].x);
    expect(result.plan.reference[4]).toBe(base.joints[2].x);
  });
});

describe('compile: structural issues', () => {
  it('a body with fewer than two joints', () => {
    const linkage: Linkage = { ...base, bodies: [...base.bodies, { id: 'stub', joints: ['B'] }] };
    expectIssue(linkage, 'bodies[3].joints', /body 'stub' has 1 joint; a body needs at least two joints/);
  });

  it('a moving joint on no body', () => {
    const linkage: Linkage = { ...base, joints: [...base.joints, { id: 'Q', x: 5, y: 5 }] };
    expectIssue(linkage, 'joints[4]', /joint 'Q' is on no body; expected a moving joint to be listed in at least one body's joints/);
  });

  it('an unknown id in a body, a point, a slider and the driver', () => {
    expectIssue({ ...base, bodies: [...base.bodies.slice(0, 2), { id: 'rocker', joints: ['B0', 'X'] }] }, 'bodies[2].joints[1]', /names joint 'X', which is not in joints; expected one of A0, B0, A, B/);
    expectIssue({ ...base, points: [{ id: 'P', body: 'nowhere', x: 0, y: 0 }] }, 'points[0].body', /'nowhere' is not a body; expected 'ground' or one of crank, coupler, rocker/);
    expectIssue({ ...base, sliders: [{ joint: 'Z', body: 'ground', angle: 0 }] }, 'sliders[0].joint', /'Z' is not a joint/);
    expectIssue({ ...base, sliders: [{ joint: 'B', body: 'frame', angle: 0 }] }, 'sliders[0].body', /'frame' is not a body/);
    expectIssue({ ...base, driver: { kind: 'rotation', body: 'crank', pivot: 'O', tip: 'A' } }, 'driver.pivot', /'O' is not a joint/);
    expectIssue({ ...base, driver: { kind: 'length', from: 'A0', to: 'nope' } }, 'driver.to', /'nope' is not a joint/);
  });

  it('duplicate ids: joints, bodies, a point named like a joint, and the reserved frame id', () => {
    expectIssue({ ...base, joints: [...base.joints, { id: 'A', x: 1, y: 1 }] }, 'joints[4].id', /joint id 'A' is used twice \(also joints\[2\]\); expected unique ids/);
    expectIssue({ ...base, bodies: [...base.bodies, { id: 'crank', joints: ['A', 'B0'] }] }, 'bodies[3].id', /body id 'crank' is used twice/);
    expectIssue({ ...base, points: [{ id: 'B', body: 'coupler', x: 0, y: 0 }] }, 'points[0].id', /point id 'B' is already a joint id/);
    expectIssue({ ...base, bodies: [...base.bodies, { id: 'ground', joints: ['A0', 'B0'] }] }, 'bodies[3].id', /'ground' is the frame's id/);
  });

  it('a body with two ground joints (welded to the frame)', () => {
    const linkage: Linkage = { ...base, bodies: [...base.bodies.slice(0, 2), { id: 'rocker', joints: ['B0', 'B', 'A0'] }] };
    expectIssue(linkage, 'bodies[2].joints', /body 'rocker' carries ground joints 'B0' and 'A0'; a moving body can turn about at most one pivot/);
  });

  it('non-finite coordinates and slider angles', () => {
    expectIssue({ ...base, joints: [...base.joints.slice(0, 3), { id: 'B', x: NaN, y: 0 }] }, 'joints[3]', /joint 'B' is at \(NaN, 0\); expected finite coordinates in mm/);
    expectIssue({ ...sliderCrank(), sliders: [{ joint: 'B', body: 'ground', angle: Infinity }] }, 'sliders[0].angle', /expected a finite angle in rad/);
  });

  it('a slider that cannot slide: a ground joint, or a joint pinned to the body of its own line', () => {
    expectIssue({ ...base, sliders: [{ joint: 'B0', body: 'crank', angle: 0 }] }, 'sliders[0].joint', /'B0' is a ground joint; a slider joint must move along its line/);
    expectIssue({ ...base, sliders: [{ joint: 'B', body: 'coupler', angle: 0 }] }, 'sliders[0].body', /joint 'B' is pinned to body 'coupler'/);
  });
});

describe('compile: drivers that do not fit', () => {
  it('a rotation body that lacks the pivot, a pivot not on the frame, a tip off the body, a ground tip, the frame driven', () => {
    expectIssue({ ...base, driver: { kind: 'rotation', body: 'crank', pivot: 'B0', tip: 'A' } }, 'driver.pivot', /pivot 'B0' is not on the driven body 'crank'/);
    expectIssue({ ...base, driver: { kind: 'rotation', body: 'coupler', pivot: 'A', tip: 'B' } }, 'driver.pivot', /pivot 'A' is not a ground joint; a rotation driver turns its body about a pivot on the frame/);
    expectIssue({ ...base, driver: { kind: 'rotation', body: 'crank', pivot: 'A0', tip: 'B' } }, 'driver.tip', /tip 'B' is not on the driven body 'crank'/);
    expectIssue({ ...base, driver: { kind: 'rotation', body: 'crank', pivot: 'A0', tip: 'A0' } }, 'driver.tip', /tip and pivot are both 'A0'/);
    expectIssue({ ...base, driver: { kind: 'rotation', body: 'ground', pivot: 'A0', tip: 'A' } }, 'driver.body', /the frame cannot be driven/);
  });

  it('a length driver between joints of one body, between two ground joints, or from a joint to itself', () => {
    expectIssue({ ...base, driver: { kind: 'length', from: 'A', to: 'B' } }, 'driver', /'A' and 'B' are both on body 'coupler', which fixes their distance/);
    expectIssue({ ...base, driver: { kind: 'length', from: 'A0', to: 'B0' } }, 'driver', /both ground joints; their distance cannot change/);
    expectIssue({ ...base, driver: { kind: 'length', from: 'A', to: 'A' } }, 'driver.to', /from 'A' to itself; expected two different joints/);
  });
});

describe('compile: a reference pose that violates its own constraints', () => {
  it('a slider joint off its line', () => {
    const linkage = { ...sliderCrank(), sliders: [{ joint: 'B', body: 'ground', angle: 0, through: { x: 0, y: 12.5 } }] };
    expectIssue(linkage, 'sliders[0]', /slider joint 'B' is 2\.5 mm off its line through \(0, 12\.5\) at 0 rad in the reference pose; expected it on the line/);
    // On the line it compiles.
    expect(compile({ ...sliderCrank(), sliders: [{ joint: 'B', body: 'ground', angle: 0, through: { x: -40, y: 10 } }] }).ok).toBe(true);
  });

  it('coincident joints of one body (a link of zero length)', () => {
    const linkage: Linkage = { ...base, joints: base.joints.map((j) => (j.id === 'B' ? { ...j, x: 24, y: 32 } : j)) };
    expectIssue(linkage, 'bodies[1].joints', /joints 'A' and 'B' of body 'coupler' are 0 mm apart in the reference pose, a link of zero length/);
  });

  it('a driver tip at its pivot, and a length driver of zero length', () => {
    const atPivot: Linkage = { ...base, joints: base.joints.map((j) => (j.id === 'A' ? { ...j, x: 0, y: 0 } : j)) };
    expectIssue(atPivot, 'driver.tip', /tip 'A' is 0 mm from pivot 'A0' in the reference pose, so the driver angle is undefined/);
    const zero: Linkage = {
      joints: [
        { id: 'R0', x: 0, y: 0, ground: true },
        { id: 'S0', x: 50, y: 40, ground: true },
        { id: 'S', x: 50, y: 40 },
      ],
      bodies: [{ id: 'rocker', joints: ['R0', 'S'] }],
      driver: { kind: 'length', from: 'S0', to: 'S' },
    };
    expectIssue(zero, 'driver', /the driven length from 'S0' to 'S' is 0 mm in the reference pose; expected a positive length/);
  });

  it('a dyad at its dead centre in the reference pose (links in line), which the plan cannot re-solve', () => {
    // B on the line through A and B0: coupler and rocker in line, the two branches meet.
    const toggled = fourBar({ A0: { x: 0, y: 0 }, B0: { x: 100, y: 0 }, A: { x: 30, y: 0 }, B: { x: 150, y: 0 }, P: { x: 60, y: 30 } });
    expectIssue(toggled, 'joints[3]', /cannot re-solve the reference pose at joint 'B'; a dyad at its dead centre/);
  });

  // Found by the renumbering property test (fast-check seed 809560484): folded links in
  // line re-solve to the same reference pose on either branch, so the plan compiled, and
  // the branch it then moved on depended on the order the joints were listed in.
  it('a dyad whose links are folded in line in the reference pose, which re-solving cannot see', () => {
    const folded = fourBar({ A0: { x: 0, y: 0 }, B0: { x: 100, y: 0 }, A: { x: -48.658618818030185, y: 0 }, B: { x: 0, y: 0 }, P: { x: 0, y: 0 } });
    expectIssue(folded, 'joints[3]', /joint 'B' is placed by a dyad whose links are in line in the reference pose \(a dead centre\)/);
  });
});

describe('compile: mobility and solvability', () => {
  it('mobility other than 1 by the Kutzbach–Grübler count', () => {
    // A five-bar (ground + 4 links, 5 pins): M = 3·4 − 2·5 = 2 (Kutzbach–Grübler; theorem).
    const fiveBar: Linkage = {
      joints: [
        { id: 'A0', x: 0, y: 0, ground: true },
        { id: 'B0', x: 100, y: 0, ground: true },
        { id: 'A', x: 20, y: 30 },
        { id: 'B', x: 110, y: 40 },
        { id: 'C', x: 60, y: 80 },
      ],
      bodies: [
        { id: 'l1', joints: ['A0', 'A'] },
        { id: 'l2', joints: ['A', 'C'] },
        { id: 'l3', joints: ['C', 'B'] },
        { id: 'l4', joints: ['B0', 'B'] },
      ],
      driver: { kind: 'rotation', body: 'l1', pivot: 'A0', tip: 'A' },
    };
    expect(mobility(fiveBar)).toEqual({ mobility: 2, links: 5, fullJoints: 5, halfJoints: 0 });
    expectIssue(fiveBar, 'linkage', /mobility is 2 by the Kutzbach–Grübler count \(n = 5 links with the frame, j1 = 5 pin pairs, j2 = 0 sliders: 3\(n − 1\) − 2 j1 − j2 = 2\); expected 1/);
    // A triangle on the frame (ground + 2 links, 3 pins): M = 3·2 − 2·3 = 0, a structure.
    const truss: Linkage = {
      joints: [
        { id: 'A0', x: 0, y: 0, ground: true },
        { id: 'B0', x: 100, y: 0, ground: true },
        { id: 'C', x: 50, y: 50 },
      ],
      bodies: [
        { id: 'l1', joints: ['A0', 'C'] },
        { id: 'l2', joints: ['B0', 'C'] },
      ],
      driver: { kind: 'rotation', body: 'l1', pivot: 'A0', tip: 'C' },
    };
    expectIssue(truss, 'linkage', /mobility is 0 .*it is locked: remove a link or joint/);
  });

  it('counts a shared pin as k − 1 pairs, a slider as a half joint, and a length driver as no link', () => {
    // Slider-crank: n = 3, pins A0, A (2), slider B (1): M = 6 − 4 − 1 = 1.
    expect(mobility(sliderCrank())).toEqual({ mobility: 1, links: 3, fullJoints: 2, halfJoints: 1 });
    // Peaucellier-style joint C on three bodies counts 2 pairs.
    const threeOnOne: Linkage = {
      joints: [
        { id: 'O', x: 0, y: 0, ground: true },
        { id: 'C', x: 10, y: 0 },
        { id: 'D', x: 20, y: 5 },
        { id: 'E', x: 20, y: -5 },
      ],
      bodies: [
        { id: 'a', joints: ['O', 'C'] },
        { id: 'b', joints: ['C', 'D'] },
        { id: 'c', joints: ['C', 'E'] },
      ],
      driver: { kind: 'rotation', body: 'a', pivot: 'O', tip: 'C' },
    };
    expect(mobility(threeOnOne)).toMatchObject({ links: 4, fullJoints: 3 });
    // A rocker moved by a shock between the frame and its tip: n = 2, pins R0 (1): M = 3 − 2 = 1.
    const shock: Linkage = {
      joints: [
        { id: 'R0', x: 0, y: 0, ground: true },
        { id: 'S0', x: 80, y: 0, ground: true },
        { id: 'S', x: 30, y: 40 },
      ],
      bodies: [{ id: 'rocker', joints: ['R0', 'S'] }],
      driver: { kind: 'length', from: 'S0', to: 'S' },
    };
    expect(mobility(shock)).toEqual({ mobility: 1, links: 2, fullJoints: 1, halfJoints: 0 });
    expect(compile(shock).ok).toBe(true);
  });

  it('a topology no plan can solve: mobility 1, but one part over-constrained and another free', () => {
    // A five-bar (M = 2) beside a triangle braced three ways to the frame (M = −1): the
    // count is 1, yet the five-bar cannot be placed by one driver.
    const split: Linkage = {
      joints: [
        { id: 'A0', x: 0, y: 0, ground: true },
        { id: 'B0', x: 100, y: 0, ground: true },
        { id: 'G1', x: 200, y: 0, ground: true },
        { id: 'G2', x: 260, y: 0, ground: true },
        { id: 'G3', x: 230, y: 80, ground: true },
        { id: 'A', x: 20, y: 30 },
        { id: 'B', x: 110, y: 40 },
        { id: 'C', x: 60, y: 80 },
        { id: 'X', x: 230, y: 30 },
      ],
      bodies: [
        { id: 'l1', joints: ['A0', 'A'] },
        { id: 'l2', joints: ['A', 'C'] },
        { id: 'l3', joints: ['C', 'B'] },
        { id: 'l4', joints: ['B0', 'B'] },
        { id: 't1', joints: ['G1', 'X'] },
        { id: 't2', joints: ['G2', 'X'] },
        { id: 't3', joints: ['G3', 'X'] },
      ],
      driver: { kind: 'rotation', body: 'l1', pivot: 'A0', tip: 'A' },
    };
    expect(mobility(split).mobility).toBe(1);
    expectIssue(split, 'linkage', /no plan places joints 'B', 'C': no dyad, slider or solvable Newton block reaches them/);
  });
});
