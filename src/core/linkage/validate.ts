/**
 * Validation of a linkage at the compile boundary: every id resolves, bodies and the
 * driver make sense, the reference pose meets its own constraints, and the mobility is 1.
 * Each issue says where it is, what was wrong and what was expected.
 */
import { GROUND, type Linkage, type LinkageIssue } from './model';
import { mobility } from './analysis/mobility';
import { COINCIDENT_JOINT_TOL_MM, SLIDER_ON_LINE_TOL_MM } from './tolerances';

/** A linkage with ids resolved to indices: joints (= slots) first, points after. */
export interface IndexedLinkage {
  readonly jointCount: number;
  readonly ground: Uint8Array;
  /** Moving bodies (the frame is not among them), each with its distinct joints in order. */
  readonly bodies: readonly { readonly id: string; readonly joints: readonly number[] }[];
  /** Body of each point: an index into bodies, or -1 for the frame. */
  readonly pointBodies: readonly number[];
  /** Sliders: joint, the body carrying the line (-1 for the frame), line angle (rad). */
  readonly sliders: readonly { readonly joint: number; readonly body: number; readonly angle: number }[];
  readonly driver:
    | { readonly kind: 'rotation'; readonly body: number; readonly pivot: number; readonly tip: number }
    | { readonly kind: 'length'; readonly from: number; readonly to: number };
}

function fmt(v: number): string {
  return Number.isFinite(v) ? String(Number(v.toPrecision(6))) : String(v);
}

function isFiniteNumber(v: unknown): v is number {
  return typeof v === 'number' && Number.isFinite(v);
}

/**
 * Structure: ids, references, bodies, sliders, driver. Returns the indexed linkage when
 * there is no issue.
 */
export function validateStructure(linkage: Linkage, issues: LinkageIssue[]): IndexedLinkage | null {
  const start = issues.length;
  const add = (where: string, message: string) => issues.push({ where, message });
  const slotOf = new Map<string, number>();
  const joints = linkage.joints;
  const points = linkage.points ?? [];
  const sliders = linkage.sliders ?? [];
  if (joints.length === 0) add('joints', 'the linkage has no joints; expected at least a ground pivot and a moving joint');
  joints.forEach((joint, i) => {
    if (typeof joint.id !== 'string' || joint.id.length === 0) add(`joints[${i}].id`, 'a joint id must be a non-empty string');
    else if (slotOf.has(joint.id)) add(`joints[${i}].id`, `joint id '${joint.id}' is used twice (also joints[${slotOf.get(joint.id)}]); expected unique ids`);
    else slotOf.set(joint.id, i);
    if (!isFiniteNumber(joint.x) || !isFiniteNumber(joint.y)) {
      add(`joints[${i}]`, `joint '${joint.id}' is at (${joint.x}, ${joint.y}); expected finite coordinates in mm`);
    }
  });
  const pointIds = new Map<string, number>();
  points.forEach((point, i) => {
    if (typeof point.id !== 'string' || point.id.length === 0) add(`points[${i}].id`, 'a point id must be a non-empty string');
    else if (slotOf.has(point.id)) add(`points[${i}].id`, `point id '${point.id}' is already a joint id; joint and point ids share one namespace`);
    else if (pointIds.has(point.id)) add(`points[${i}].id`, `point id '${point.id}' is used twice (also points[${pointIds.get(point.id)}]); expected unique ids`);
    else pointIds.set(point.id, i);
    if (!isFiniteNumber(point.x) || !isFiniteNumber(point.y)) {
      add(`points[${i}]`, `point '${point.id}' is at (${point.x}, ${point.y}); expected finite coordinates in mm`);
    }
  });

  const bodyOf = new Map<string, number>();
  const bodies: { id: string; joints: number[] }[] = [];
  const jointBodies: number[][] = joints.map(() => []);
  linkage.bodies.forEach((body, i) => {
    if (typeof body.id !== 'string' || body.id.length === 0) add(`bodies[${i}].id`, 'a body id must be a non-empty string');
    else if (body.id === GROUND) add(`bodies[${i}].id`, `'${GROUND}' is the frame's id; ground joints join it by \`ground: true\`, so give this body another id`);
    else if (bodyOf.has(body.id)) add(`bodies[${i}].id`, `body id '${body.id}' is used twice (also bodies[${bodyOf.get(body.id)}]); expected unique ids`);
    else bodyOf.set(body.id, i);
    const members: number[] = [];
    body.joints.forEach((id, k) => {
      const slot = slotOf.get(id);
      if (slot === undefined) add(`bodies[${i}].joints[${k}]`, `body '${body.id}' names joint '${id}', which is not in joints; expected one of ${[...slotOf.keys()].join(', ')}`);
      else if (members.includes(slot)) add(`bodies[${i}].joints[${k}]`, `body '${body.id}' lists joint '${id}' twice; expected each joint once`);
      else members.push(slot);
    });
    if (body.joints.length < 2) {
      add(`bodies[${i}].joints`, `body '${body.id}' has ${body.joints.length} joint${body.joints.length === 1 ? '' : 's'}; a body needs at least two joints to be placed (a pivot and one more)`);
    }
    const grounded = members.filter((s) => joints[s].ground === true);
    if (grounded.length > 1) {
      add(`bodies[${i}].joints`, `body '${body.id}' carries ground joints ${grounded.map((s) => `'${joints[s].id}'`).join(' and ')}; a moving body can turn about at most one pivot on the frame`);
    }
    members.forEach((s) => jointBodies[s].push(i));
    bodies.push({ id: body.id, joints: members });
  });
  joints.forEach((joint, i) => {
    if (joint.ground !== true && jointBodies[i].length === 0 && slotOf.get(joint.id) === i) {
      add(`joints[${i}]`, `joint '${joint.id}' is on no body; expected a moving joint to be listed in at least one body's joints`);
    }
  });

  const bodyRef = (name: string, where: string): number | null => {
    if (name === GROUND) return -1;
    const b = bodyOf.get(name);
    if (b === undefined) {
      add(where, `'${name}' is not a body; expected '${GROUND}' or one of ${[...bodyOf.keys()].join(', ') || '(none)'}`);
      return null;
    }
    return b;
  };
  const jointRef = (name: string, where: string): number | null => {
    const s = slotOf.get(name);
    if (s === undefined) {
      add(where, `'${name}' is not a joint; expected one of ${[...slotOf.keys()].join(', ')}`);
      return null;
    }
    return s;
  };

  const pointBodies = points.map((point, i) => bodyRef(point.body, `points[${i}].body`) ?? -1);
  const indexedSliders: { joint: number; body: number; angle: number }[] = [];
  sliders.forEach((slider, i) => {
    const joint = jointRef(slider.joint, `sliders[${i}].joint`);
    const body = bodyRef(slider.body, `sliders[${i}].body`);
    if (!isFiniteNumber(slider.angle)) add(`sliders[${i}].angle`, `slider line angle is ${slider.angle}; expected a finite angle in rad`);
    if (slider.through !== undefined && !(isFiniteNumber(slider.through.x) && isFiniteNumber(slider.through.y))) {
      add(`sliders[${i}].through`, `slider line point is (${slider.through.x}, ${slider.through.y}); expected finite coordinates in mm`);
    }
    if (joint === null || body === null) return;
    if (joints[joint].ground === true) add(`sliders[${i}].joint`, `'${slider.joint}' is a ground joint; a slider joint must move along its line`);
    if (body === -1 ? joints[joint].ground === true : bodies[body].joints.includes(joint)) {
      add(`sliders[${i}].body`, `joint '${slider.joint}' is pinned to body '${slider.body}'; a joint slides along a line of a body it is not pinned to`);
    }
    indexedSliders.push({ joint, body, angle: slider.angle });
  });

  const driver = linkage.driver;
  let indexedDriver: IndexedLinkage['driver'] | null = null;
  if (driver.kind === 'rotation') {
    const body = driver.body === GROUND ? null : bodyRef(driver.body, 'driver.body');
    if (driver.body === GROUND) add('driver.body', `the frame cannot be driven; expected a moving body turning about a ground pivot`);
    const pivot = jointRef(driver.pivot, 'driver.pivot');
    const tip = jointRef(driver.tip, 'driver.tip');
    if (body !== null && pivot !== null && tip !== null) {
      const members = bodies[body].joints;
      if (!members.includes(pivot)) add('driver.pivot', `pivot '${driver.pivot}' is not on the driven body '${driver.body}'; expected one of its joints`);
      if (joints[pivot].ground !== true) add('driver.pivot', `pivot '${driver.pivot}' is not a ground joint; a rotation driver turns its body about a pivot on the frame`);
      if (!members.includes(tip)) add('driver.tip', `tip '${driver.tip}' is not on the driven body '${driver.body}'; expected one of its joints`);
      if (tip === pivot) add('driver.tip', `tip and pivot are both '${driver.tip}'; the driver angle is that of the line from the pivot to another joint of the body`);
      else if (joints[tip].ground === true) add('driver.tip', `tip '${driver.tip}' is a ground joint; expected a moving joint of the driven body`);
      indexedDriver = { kind: 'rotation', body, pivot, tip };
    }
  } else if (driver.kind === 'length') {
    const from = jointRef(driver.from, 'driver.from');
    const to = jointRef(driver.to, 'driver.to');
    if (from !== null && to !== null) {
      if (from === to) add('driver.to', `a length driver from '${driver.from}' to itself; expected two different joints`);
      else if (joints[from].ground === true && joints[to].ground === true) {
        add('driver', `'${driver.from}' and '${driver.to}' are both ground joints; their distance cannot change, so a length driver needs a moving joint at one end`);
      } else {
        const shared = jointBodies[from].find((b) => jointBodies[to].includes(b));
        if (shared !== undefined) add('driver', `'${driver.from}' and '${driver.to}' are both on body '${bodies[shared].id}', which fixes their distance; a length driver joins joints on different bodies`);
      }
      indexedDriver = { kind: 'length', from, to };
    }
  } else {
    add('driver.kind', `driver kind '${(driver as { kind: unknown }).kind}'; expected 'rotation' or 'length'`);
  }

  if (issues.length > start || indexedDriver === null) return null;
  const ground = new Uint8Array(joints.length);
  joints.forEach((j, i) => { ground[i] = j.ground === true ? 1 : 0; });
  return { jointCount: joints.length, ground, bodies, pointBodies, sliders: indexedSliders, driver: indexedDriver };
}

/** The reference pose must meet the linkage's own constraints. */
export function validateReferencePose(linkage: Linkage, ix: IndexedLinkage, issues: LinkageIssue[]): void {
  const add = (where: string, message: string) => issues.push({ where, message });
  const j = linkage.joints;
  const gap = (a: number, b: number) => Math.hypot(j[a].x - j[b].x, j[a].y - j[b].y);
  ix.bodies.forEach((body, i) => {
    for (let a = 0; a < body.joints.length; a++) {
      for (let b = a + 1; b < body.joints.length; b++) {
        const d = gap(body.joints[a], body.joints[b]);
        if (!(d >= COINCIDENT_JOINT_TOL_MM)) {
          add(`bodies[${i}].joints`, `joints '${j[body.joints[a]].id}' and '${j[body.joints[b]].id}' of body '${body.id}' are ${fmt(d)} mm apart in the reference pose, a link of zero length; expected at least ${COINCIDENT_JOINT_TOL_MM} mm`);
        }
      }
    }
  });
  const driver = ix.driver;
  if (driver.kind === 'rotation') {
    const d = gap(driver.pivot, driver.tip);
    if (!(d >= COINCIDENT_JOINT_TOL_MM)) {
      add('driver.tip', `tip '${j[driver.tip].id}' is ${fmt(d)} mm from pivot '${j[driver.pivot].id}' in the reference pose, so the driver angle is undefined; expected them at least ${COINCIDENT_JOINT_TOL_MM} mm apart`);
    }
  } else {
    const d = gap(driver.from, driver.to);
    if (!(d >= COINCIDENT_JOINT_TOL_MM)) {
      add('driver', `the driven length from '${j[driver.from].id}' to '${j[driver.to].id}' is ${fmt(d)} mm in the reference pose; expected a positive length (at least ${COINCIDENT_JOINT_TOL_MM} mm)`);
    }
  }
  (linkage.sliders ?? []).forEach((slider, i) => {
    if (slider.through === undefined) return;
    const joint = j[ix.sliders[i].joint];
    const off = Math.abs(Math.cos(slider.angle) * (joint.y - slider.through.y) - Math.sin(slider.angle) * (joint.x - slider.through.x));
    if (!(off <= SLIDER_ON_LINE_TOL_MM)) {
      add(`sliders[${i}]`, `slider joint '${joint.id}' is ${fmt(off)} mm off its line through (${fmt(slider.through.x)}, ${fmt(slider.through.y)}) at ${fmt(slider.angle)} rad in the reference pose; expected it on the line (within ${SLIDER_ON_LINE_TOL_MM} mm)`);
    }
  });
}

/** Mobility must be 1: one driver, one freedom. */
export function validateMobility(linkage: Linkage, issues: LinkageIssue[]): void {
  const m = mobility(linkage);
  if (m.mobility !== 1) {
    issues.push({
      where: 'linkage',
      message: `mobility is ${m.mobility} by the Kutzbach–Grübler count (n = ${m.links} links with the frame, j1 = ${m.fullJoints} pin pairs, j2 = ${m.halfJoints} sliders: 3(n − 1) − 2 j1 − j2 = ${m.mobility}); expected 1 for a linkage moved by one driver (${m.mobility > 1 ? 'it needs more links or joints to fix its extra freedom' : 'it is locked: remove a link or joint'})`,
    });
  }
}
