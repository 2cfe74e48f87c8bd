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
  const n = plan.bodies.length;
  const driven = drivenBody(plan);
  const loops: FourBarLoop[] = [];
  // Each cycle once: b0 is its lowest body index and b1 < b3 fixes the direction.
  for (let b0 = 0; b0 < n; b0++) {
    for (let b1 = b0 + 1; b1 < n; b1++) {
      for (let b3 = b1 + 1; b3 < n; b3++) {
        for (let b2 = b0 + 1; b2 < n; b2++) {
          if (b2 === b1 || b2 === b3) continue;
          for (const j01 of pins[b0][b1]) {
            for (const j12 of pins[b1][b2]) {
              if (j12 === j01) continue;
              for (const j23 of pins[b2][b3]) {
                if (j23 === j01 || j23 === j12) continue;
                for (const j30 of pins[b3][b0]) {
                  if (j30 === j01 || j30 === j12 || j30 === j23) continue;
                  const reverse = b0 === 0 && b3 === driven && b1 !== driven;
                  const bodies: Four<number> = reverse ? [b0, b3, b2, b1] : [b0, b1, b2, b3];
                  const joints: Four<number> = reverse ? [j30, j23, j12, j01] : [j01, j12, j23, j30];
                  loops.push(makeLoop(plan, bodies, joints, pose, driven, relTol));
                }
              }
            }
          }
        }
      }
    }
  }
  return loops;
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
 * pins[a][b]: the joint slots carried by both bodies a and b. A joint that slides on a
 * body (a prismatic pair) is no pin of that body.
 */
function pinsBetweenBodies(plan: Plan): number[][][] {
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
  const pins: number[][][] = Array.from({ length: n }, () => Array.from({ length: n }, () => []));
  for (let j = 0; j < jointCount; j++) {
    const on = carriers[j];
    for (let x = 0; x < on.length; x++) {
      for (let y = x + 1; y < on.length; y++) {
        pins[on[x]][on[y]].push(j);
        pins[on[y]][on[x]].push(j);
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
