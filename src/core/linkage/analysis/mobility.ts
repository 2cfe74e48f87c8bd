/**
 * Mobility of a planar linkage by the Kutzbach–Grübler count (Grübler 1917, Kutzbach
 * 1929): M = 3 (n − 1) − 2 j1 − j2.
 * - n: links, the ground included (every body of the linkage plus the frame);
 * - j1: full (one-freedom) joints: a pin shared by k bodies (the frame counts as one
 *   of them for a ground joint) is k − 1 pin pairs;
 * - j2: half (two-freedom) joints: each slider, a pin sliding in a slot, turns and slides;
 * - a length driver is the input, not a link: it does not enter the count.
 */
import type { Linkage } from '../model';

export interface MobilityCount {
  readonly mobility: number;
  /** n, the ground included. */
  readonly links: number;
  /** j1, pin pairs. */
  readonly fullJoints: number;
  /** j2, sliders. */
  readonly halfJoints: number;
}

/** The count over the linkage as written; ids that name no joint are skipped (compile reports them). */
export function mobility(linkage: Linkage): MobilityCount {
  const bodiesPerJoint = new Map<string, number>();
  for (const joint of linkage.joints) if (!bodiesPerJoint.has(joint.id)) bodiesPerJoint.set(joint.id, joint.ground === true ? 1 : 0);
  for (const body of linkage.bodies) {
    for (const id of new Set(body.joints)) {
      const k = bodiesPerJoint.get(id);
      if (k !== undefined) bodiesPerJoint.set(id, k + 1);
    }
  }
  let fullJoints = 0;
  for (const k of bodiesPerJoint.values()) fullJoints += Math.max(0, k - 1);
  const links = linkage.bodies.length + 1;
  const halfJoints = linkage.sliders?.length ?? 0;
  return { mobility: 3 * (links - 1) - 2 * fullJoints - halfJoints, links, fullJoints, halfJoints };
}
