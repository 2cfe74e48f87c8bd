/**
 * The four-bar loops of a linkage: every cycle of four distinct bodies joined by four
 * distinct pin joints in the body–joint graph, with its link lengths and Grashof class.
 * A Watt six-bar has two such loops and a Stephenson six-bar one; where ground is a
 * binary link of Stephenson's chain, that loop does not contain ground.
 */
import { GROUND } from '../model';
import { CHANGE_POINT_REL_TOL, classifyLengths, type FourBarClass, type GrashofCondition } from './grashof';
import type { Plan } from '../plan';

type Four<T> = readonly [T, T, T, T];

export interface FourBarLoop {
  /**
   * Plan body indices in loop order. A loop through ground starts there: (ground,
   * input, coupler, output), the input being the driven body when it is next to ground
   * in the loop. Other loops start from their lowest body index.
   */
  readonly bodies: Four<number>;
  readonly bodyIds: Four<string>;
  /** Pose slots of the pins: `joints[i]` joins `bodies[i]` and `bodies[(i + 1) % 4]`. */
  readonly joints: Four<number>;
  readonly jointIds: Four<string>;
  /** `lengthsMm[i]` is the length of `bodies[i]`, between `joints[(i + 3) % 4]` and `joints[i]`. */
  readonly lengthsMm: Four<number>;
  /** `bodies[0]` is ground. */
  readonly grounded: boolean;
  /** `bodies[1]` is the driven body (a rotation driver's link). */
  readonly inputDriven: boolean;
  readonly grashof: GrashofCondition;
  /** s + l − p − q, mm. */
  readonly slMinusPq: number;
  /** Barker's class with (ground, input, coupler, output) as above; null for a loop without ground. */
  readonly classification: FourBarClass | null;
}

/**
 * Every four-bar loop of `plan`, with lengths measured in `pose` (default: the reference
 * pose; lengths do not change as the linkage moves). Throws for a pose of the wrong
 * length or with a loop joint that is not finite: a solved or reference pose never is.
 *
 * The loops are the 4-cycles of the body graph, found from its paths of length two
 * (Chiba and Nishizeki, 1985, without their degree order): two paths b0–b1–b2 and b0–b3–b2 close a cycle. The work
 * grows with the sum over pins of the degrees of the bodies they join, so a long chain
 * of dyads costs in proportion to its length; the order is that of a search over
 * (b0, b1, b3, b2) and then the pins, b0 the lowest body index and b1 < b3.
 */
export function fourBarLoops(
  plan: Plan,
  pose: Float64Array = plan.reference,
  relTol: number = CHANGE_POINT_REL_TOL,
): FourBarLoop[] {
  if (pose.length !== 2 * plan.slotCount) {
    throw new RangeError(`fourBarLoops: pose has ${pose.length} numbers; expected 2 × ${plan.slotCount} slots`);
  }
  const pins = pinsBetweenBodies(plan);
  const driven = drivenBody(plan);
  const found: Cycle[] = [];
  // Paths b0–b1–b2 from one b0, bucketed by b2; every body on them is above b0.
  const paths = new Map<number, Path[]>();
  for (let b0 = 0; b0 < pins.length; b0++) {
    paths.clear();
    for (const first of pins[b0]) {
      if (first.body <= b0) continue;
      for (const second of pins[first.body]) {
        if (second.body <= b0 || second.joint === first.joint) continue;
        let bucket = paths.get(second.body);
        if (bucket === undefined) paths.set(second.body, (bucket = []));
        bucket.push({ b1: first.body, j01: first.joint, j12: second.joint });
      }
    }
    for (const [b2, bucket] of paths) {
      for (const p of bucket) {
        for (const q of bucket) {
          // q runs back from b2 to b0 through b3 = q.b1: j23 = q.j12, j30 = q.j01.
          if (!(p.b1 < q.b1) || q.j12 === p.j01 || q.j12 === p.j12 || q.j01 === p.j01 || q.j01 === p.j12) continue;
          found.push([[b0, p.b1, b2, q.b1], [p.j01, p.j12, q.j12, q.j01]]);
        }
      }
    }
  }
  found.sort(searchOrder);
  return found.map(([[b0, b1, b2, b3], [j01, j12, j23, j30]]) => {
    const reverse = b0 === 0 && b3 === driven && b1 !== driven;
    const bodies: Four<number> = reverse ? [b0, b3, b2, b1] : [b0, b1, b2, b3];
    const joints: Four<number> = reverse ? [j30, j23, j12, j01] : [j01, j12, j23, j30];
    return makeLoop(plan, bodies, joints, pose, driven, relTol);
  });
}

interface Path {
  readonly b1: number;
  readonly j01: number;
  readonly j12: number;
}

/** A pin of a body: the body it joins and the joint slot. */
interface Pin {
  readonly body: number;
  readonly joint: number;
}

/** A 4-cycle as found: bodies (b0, b1, b2, b3) and pins (j01, j12, j23, j30). */
type Cycle = readonly [Four<number>, Four<number>];

function searchOrder([ba, ja]: Cycle, [bb, jb]: Cycle): number {
  return ba[0] - bb[0] || ba[1] - bb[1] || ba[3] - bb[3] || ba[2] - bb[2] ||
    ja[0] - jb[0] || ja[1] - jb[1] || ja[2] - jb[2] || ja[3] - jb[3];
}

function makeLoop(
  plan: Plan,
  bodies: Four<number>,
  joints: Four<number>,
  pose: Float64Array,
  driven: number,
  relTol: number,
): FourBarLoop {
  const lengths = [0, 0, 0, 0];
  for (let i = 0; i < 4; i++) {
    const from = joints[(i + 3) % 4];
    const to = joints[i];
    const dx = pose[2 * to] - pose[2 * from];
    const dy = pose[2 * to + 1] - pose[2 * from + 1];
    const length = Math.hypot(dx, dy);
    if (!Number.isFinite(length)) {
      throw new RangeError(`fourBarLoops: joint ${plan.jointIds[to]} or ${plan.jointIds[from]} is not finite in the pose`);
    }
    lengths[i] = length;
  }
  const lengthsMm: Four<number> = [lengths[0], lengths[1], lengths[2], lengths[3]];
  const k = classifyLengths(lengths[0], lengths[1], lengths[2], lengths[3], relTol);
  const grounded = bodies[0] === 0;
  return {
    bodies,
    bodyIds: [plan.bodies[bodies[0]].id, plan.bodies[bodies[1]].id, plan.bodies[bodies[2]].id, plan.bodies[bodies[3]].id],
    joints,
    jointIds: [plan.jointIds[joints[0]], plan.jointIds[joints[1]], plan.jointIds[joints[2]], plan.jointIds[joints[3]]],
    lengthsMm,
    grounded,
    inputDriven: driven >= 0 && bodies[1] === driven,
    grashof: k.grashof,
    slMinusPq: k.slMinusPq,
    classification: grounded ? k : null,
  };
}

/**
 * pins[a]: every pin of body a, with the body it joins. A joint that slides on a body (a
 * prismatic pair) is no pin of that body.
 */
function pinsBetweenBodies(plan: Plan): Pin[][] {
  const n = plan.bodies.length;
  const jointCount = plan.jointIds.length;
  const sliding = new Set<string>();
  for (const s of plan.linkage.sliders ?? []) sliding.add(`${s.joint}\u0000${s.body}`);
  const carriers: number[][] = Array.from({ length: jointCount }, () => []);
  for (let b = 0; b < n; b++) {
    const body = plan.bodies[b];
    for (const slot of body.slots) {
      if (slot >= jointCount) continue; // a named point, not a joint
      if (sliding.has(`${plan.jointIds[slot]}\u0000${body.id}`)) continue;
      carriers[slot].push(b);
    }
  }
  const pins: Pin[][] = Array.from({ length: n }, () => []);
  for (let j = 0; j < jointCount; j++) {
    const on = carriers[j];
    for (let x = 0; x < on.length; x++) {
      for (let y = x + 1; y < on.length; y++) {
        pins[on[x]].push({ body: on[y], joint: j });
        pins[on[y]].push({ body: on[x], joint: j });
      }
    }
  }
  return pins;
}

/** The plan index of the body a rotation driver turns; -1 for a length driver. */
function drivenBody(plan: Plan): number {
  const driver = plan.linkage.driver;
  if (driver.kind !== 'rotation' || driver.body === GROUND) return -1;
  return plan.bodyIndex.get(driver.body) ?? -1;
}
