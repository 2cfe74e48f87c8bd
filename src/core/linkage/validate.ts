/**
 * Validation of a linkage at the compile boundary: every id resolves, bodies and the
 * driver make sense, the reference pose meets its own constraints, and the mobility is 1.
 * Each issue says where it is, what was wrong and what was expected.
 */
import {
  GROUND,
  MAX_BODIES,
  MAX_COORDINATE_MM,
  MAX_ID_LENGTH,
  MAX_JOINTS,
  MAX_POINTS,
  MAX_REACH_OVER_SHORTEST_LINK,
  MAX_SLIDER_ANGLE_RAD,
  MAX_SLIDERS,
  UNPRINTABLE_ID_CHARS,
  printableId,
  quoteId,
  type Linkage,
  type LinkageIssue,
} from './model';
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

/** A coordinate a computation can use: finite and within ±MAX_COORDINATE_MM. */
function inRange(v: unknown): boolean {
  return typeof v === 'number' && Math.abs(v) <= MAX_COORDINATE_MM;
}

const COORDINATES_EXPECTED = `finite coordinates in mm within ±${MAX_COORDINATE_MM} mm`;

/** What is wrong with an id, or null: a non-empty string of printable characters, not too long. */
function idProblem(id: unknown, what: string): string | null {
  if (typeof id !== 'string' || id.length === 0) return `a ${what} id must be a non-empty string`;
  if (id.length > MAX_ID_LENGTH) return `${what} id ${quoteId(id)} has ${id.length} characters; expected at most ${MAX_ID_LENGTH}`;
  if (UNPRINTABLE_ID_CHARS.test(id)) return `${what} id ${quoteId(id)} holds a control or bidirectional-format character; expected printable characters only`;
  return null;
}

/** Up to MAX_NAMED_CHOICES names for an "expected one of" list, with how many there are. */
const MAX_NAMED_CHOICES = 10;
function choices(names: Iterable<string>): string {
  const all = [...names];
  const shown = all.slice(0, MAX_NAMED_CHOICES).map(printableId).join(', ');
  return all.length > MAX_NAMED_CHOICES ? `${shown}, … (${all.length} in all)` : shown;
}

/** Counts above the limits in model.ts: one issue each. False when any was found, and nothing more is looked at. */
function withinLimits(linkage: Linkage, add: (where: string, message: string) => void): boolean {
  let ok = true;
  const count = (where: string, n: number, max: number, what: string) => {
    if (n > max) {
      add(where, `the linkage has ${n} ${what}; the limit is ${max}`);
      ok = false;
    }
  };
  count('joints', linkage.joints.length, MAX_JOINTS, 'joints');
  count('bodies', linkage.bodies.length, MAX_BODIES, 'bodies');
  count('points', linkage.points?.length ?? 0, MAX_POINTS, 'points');
  count('sliders', linkage.sliders?.length ?? 0, MAX_SLIDERS, 'sliders');
  linkage.bodies.forEach((body, i) => {
    if (body.joints.length > MAX_JOINTS) {
      add(`bodies[${i}].joints`, `body lists ${body.joints.length} joints; the limit is ${MAX_JOINTS}, the most joints a linkage has`);
      ok = false;
    }
  });
  return ok;
}

/**
 * Structure: ids, references, bodies, sliders, driver. Returns the indexed linkage when
 * there is no issue.
 */
export function validateStructure(linkage: Linkage, issues: LinkageIssue[]): IndexedLinkage | null {
  const start = issues.length;
  const add = (where: string, message: string) => issues.push({ where, message });
  if (!withinLimits(linkage, add)) return null;
  const slotOf = new Map<string, number>();
  const joints = linkage.joints;
  const points = linkage.points ?? [];
  const sliders = linkage.sliders ?? [];
  if (joints.length === 0) add('joints', 'the linkage has no joints; expected at least a ground pivot and a moving joint');
  joints.forEach((joint, i) => {
    const idIssue = idProblem(joint.id, 'joint');
    if (idIssue !== null) add(`joints[${i}].id`, idIssue);
    else if (slotOf.has(joint.id)) add(`joints[${i}].id`, `joint id ${quoteId(joint.id)} is used twice (also joints[${slotOf.get(joint.id)}]); expected unique ids`);
    else slotOf.set(joint.id, i);
    if (!inRange(joint.x) || !inRange(joint.y)) {
      add(`joints[${i}]`, `joint ${quoteId(String(joint.id))} is at (${joint.x}, ${joint.y}); expected ${COORDINATES_EXPECTED}`);
    }
  });
  const pointIds = new Map<string, number>();
  points.forEach((point, i) => {
    const idIssue = idProblem(point.id, 'point');
    if (idIssue !== null) add(`points[${i}].id`, idIssue);
    else if (slotOf.has(point.id)) add(`points[${i}].id`, `point id ${quoteId(point.id)} is already a joint id; joint and point ids share one namespace`);
    else if (pointIds.has(point.id)) add(`points[${i}].id`, `point id ${quoteId(point.id)} is used twice (also points[${pointIds.get(point.id)}]); expected unique ids`);
    else pointIds.set(point.id, i);
    if (!inRange(point.x) || !inRange(point.y)) {
      add(`points[${i}]`, `point ${quoteId(String(point.id))} is at (${point.x}, ${point.y}); expected ${COORDINATES_EXPECTED}`);
    }
  });

  const jointChoices = choices(slotOf.keys());
  const bodyOf = new Map<string, number>();
  const bodies: { id: string; joints: number[] }[] = [];
  const jointBodies: number[][] = joints.map(() => []);
  linkage.bodies.forEach((body, i) => {
    const idIssue = idProblem(body.id, 'body');
    if (idIssue !== null) add(`bodies[${i}].id`, idIssue);
    else if (body.id === GROUND) add(`bodies[${i}].id`, `${quoteId(GROUND)} is the frame's id; ground joints join it by \`ground: true\`, so give this body another id`);
    else if (bodyOf.has(body.id)) add(`bodies[${i}].id`, `body id ${quoteId(body.id)} is used twice (also bodies[${bodyOf.get(body.id)}]); expected unique ids`);
    else bodyOf.set(body.id, i);
    const members: number[] = [];
    // One issue for the first unknown id of a body and one for its first repeat, each
    // counting the rest: the issues stay in proportion to the bodies, not to their lists.
    let unknown = -1;
    let unknownCount = 0;
    let repeat = -1;
    let repeatCount = 0;
    body.joints.forEach((id, k) => {
      const slot = slotOf.get(id);
      if (slot === undefined) {
        if (unknownCount++ === 0) unknown = k;
      } else if (members.includes(slot)) {
        if (repeatCount++ === 0) repeat = k;
      } else {
        members.push(slot);
      }
    });
    const others = (n: number, what: string) => (n > 1 ? ` (and ${n - 1} more ${what} in this body)` : '');
    if (unknown >= 0) {
      add(`bodies[${i}].joints[${unknown}]`, `body ${quoteId(body.id)} names joint ${quoteId(body.joints[unknown])}, which is not in joints${others(unknownCount, 'such ids')}; expected one of ${jointChoices}`);
    }
    if (repeat >= 0) {
      add(`bodies[${i}].joints[${repeat}]`, `body ${quoteId(body.id)} lists joint ${quoteId(body.joints[repeat])} twice${others(repeatCount, 'repeats')}; expected each joint once`);
    }
    if (body.joints.length < 2) {
      add(`bodies[${i}].joints`, `body ${quoteId(body.id)} has ${body.joints.length} joint${body.joints.length === 1 ? '' : 's'}; a body needs at least two joints to be placed (a pivot and one more)`);
    }
    const grounded = members.filter((s) => joints[s].ground === true);
    if (grounded.length > 1) {
      add(`bodies[${i}].joints`, `body ${quoteId(body.id)} carries ground joints ${grounded.map((s) => `${quoteId(joints[s].id)}`).join(' and ')}; a moving body can turn about at most one pivot on the frame`);
    }
    members.forEach((s) => jointBodies[s].push(i));
    bodies.push({ id: body.id, joints: members });
  });
  joints.forEach((joint, i) => {
    // A length driver's end on the frame (a shock's mount) is on no body, and in use.
    const driverEnd = linkage.driver.kind === 'length' && (linkage.driver.from === joint.id || linkage.driver.to === joint.id);
    if (jointBodies[i].length === 0 && !driverEnd && slotOf.get(joint.id) === i) {
      add(`joints[${i}]`, joint.ground === true
        ? `ground joint ${quoteId(joint.id)} is on no body; expected every ground joint to carry a body or a length driver's end (a fixed mark on the frame is a point with body ${quoteId(GROUND)})`
        : `joint ${quoteId(joint.id)} is on no body; expected a moving joint to be listed in at least one body's joints`);
    }
  });

  const bodyChoices = choices(bodyOf.keys());
  const bodyRef = (name: string, where: string): number | null => {
    if (name === GROUND) return -1;
    const b = bodyOf.get(name);
    if (b === undefined) {
      add(where, `${quoteId(name)} is not a body; expected '${GROUND}' or one of ${bodyChoices || '(none)'}`);
      return null;
    }
    return b;
  };
  const jointRef = (name: string, where: string): number | null => {
    const s = slotOf.get(name);
    if (s === undefined) {
      add(where, `${quoteId(name)} is not a joint; expected one of ${jointChoices}`);
      return null;
    }
    return s;
  };

  const pointBodies = points.map((point, i) => bodyRef(point.body, `points[${i}].body`) ?? -1);
  const indexedSliders: { joint: number; body: number; angle: number }[] = [];
  sliders.forEach((slider, i) => {
    const joint = jointRef(slider.joint, `sliders[${i}].joint`);
    const body = bodyRef(slider.body, `sliders[${i}].body`);
    if (!(isFiniteNumber(slider.angle) && Math.abs(slider.angle) <= MAX_SLIDER_ANGLE_RAD)) {
      add(`sliders[${i}].angle`, `slider line angle is ${slider.angle}; expected a finite angle in rad within ±2π`);
    }
    if (slider.through !== undefined && !(inRange(slider.through.x) && inRange(slider.through.y))) {
      add(`sliders[${i}].through`, `slider line point is (${slider.through.x}, ${slider.through.y}); expected ${COORDINATES_EXPECTED}`);
    }
    if (joint === null || body === null) return;
    if (joints[joint].ground === true) add(`sliders[${i}].joint`, `${quoteId(slider.joint)} is a ground joint; a slider joint must move along its line`);
    if (body === -1 ? joints[joint].ground === true : bodies[body].joints.includes(joint)) {
      add(`sliders[${i}].body`, `joint ${quoteId(slider.joint)} is pinned to body ${quoteId(slider.body)}; a joint slides along a line of a body it is not pinned to`);
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
      if (!members.includes(pivot)) add('driver.pivot', `pivot ${quoteId(driver.pivot)} is not on the driven body ${quoteId(driver.body)}; expected one of its joints`);
      if (joints[pivot].ground !== true) add('driver.pivot', `pivot ${quoteId(driver.pivot)} is not a ground joint; a rotation driver turns its body about a pivot on the frame`);
      if (!members.includes(tip)) add('driver.tip', `tip ${quoteId(driver.tip)} is not on the driven body ${quoteId(driver.body)}; expected one of its joints`);
      if (tip === pivot) add('driver.tip', `tip and pivot are both ${quoteId(driver.tip)}; the driver angle is that of the line from the pivot to another joint of the body`);
      else if (joints[tip].ground === true) add('driver.tip', `tip ${quoteId(driver.tip)} is a ground joint; expected a moving joint of the driven body`);
      indexedDriver = { kind: 'rotation', body, pivot, tip };
    }
  } else if (driver.kind === 'length') {
    const from = jointRef(driver.from, 'driver.from');
    const to = jointRef(driver.to, 'driver.to');
    if (from !== null && to !== null) {
      if (from === to) add('driver.to', `a length driver from ${quoteId(driver.from)} to itself; expected two different joints`);
      else if (joints[from].ground === true && joints[to].ground === true) {
        add('driver', `${quoteId(driver.from)} and ${quoteId(driver.to)} are both ground joints; their distance cannot change, so a length driver needs a moving joint at one end`);
      } else {
        const shared = jointBodies[from].find((b) => jointBodies[to].includes(b));
        if (shared !== undefined) add('driver', `${quoteId(driver.from)} and ${quoteId(driver.to)} are both on body ${quoteId(bodies[shared].id)}, which fixes their distance; a length driver joins joints on different bodies`);
      }
      indexedDriver = { kind: 'length', from, to };
    }
  } else {
    add('driver.kind', `driver kind ${quoteId(String((driver as { kind: unknown }).kind))}; expected 'rotation' or 'length'`);
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
  const start = issues.length;
  let shortest = { d: Infinity, body: -1, a: -1, b: -1 };
  ix.bodies.forEach((body, i) => {
    for (let a = 0; a < body.joints.length; a++) {
      for (let b = a + 1; b < body.joints.length; b++) {
        const d = gap(body.joints[a], body.joints[b]);
        if (d < shortest.d) shortest = { d, body: i, a: body.joints[a], b: body.joints[b] };
        if (!(d >= COINCIDENT_JOINT_TOL_MM)) {
          add(`bodies[${i}].joints`, `joints ${quoteId(j[body.joints[a]].id)} and ${quoteId(j[body.joints[b]].id)} of body ${quoteId(body.id)} are ${fmt(d)} mm apart in the reference pose, a link of zero length; expected at least ${COINCIDENT_JOINT_TOL_MM} mm`);
        }
      }
    }
  });
  const driver = ix.driver;
  if (driver.kind === 'rotation') {
    const d = gap(driver.pivot, driver.tip);
    if (!(d >= COINCIDENT_JOINT_TOL_MM)) {
      add('driver.tip', `tip ${quoteId(j[driver.tip].id)} is ${fmt(d)} mm from pivot ${quoteId(j[driver.pivot].id)} in the reference pose, so the driver angle is undefined; expected them at least ${COINCIDENT_JOINT_TOL_MM} mm apart`);
    }
  } else {
    const d = gap(driver.from, driver.to);
    if (!(d >= COINCIDENT_JOINT_TOL_MM)) {
      add('driver', `the driven length from ${quoteId(j[driver.from].id)} to ${quoteId(j[driver.to].id)} is ${fmt(d)} mm in the reference pose; expected a positive length (at least ${COINCIDENT_JOINT_TOL_MM} mm)`);
    }
  }
  (linkage.sliders ?? []).forEach((slider, i) => {
    if (slider.through === undefined) return;
    const joint = j[ix.sliders[i].joint];
    const off = Math.abs(Math.cos(slider.angle) * (joint.y - slider.through.y) - Math.sin(slider.angle) * (joint.x - slider.through.x));
    if (!(off <= SLIDER_ON_LINE_TOL_MM)) {
      add(`sliders[${i}]`, `slider joint ${quoteId(joint.id)} is ${fmt(off)} mm off its line through (${fmt(slider.through.x)}, ${fmt(slider.through.y)}) at ${fmt(slider.angle)} rad in the reference pose; expected it on the line (within ${SLIDER_ON_LINE_TOL_MM} mm)`);
    }
  });
  if (issues.length > start || shortest.body < 0) return;
  // The tolerances scale with the reach (plan.lengthScaleMm, the largest |coordinate|).
  let reach = 0;
  for (const joint of j) reach = Math.max(reach, Math.abs(joint.x), Math.abs(joint.y));
  for (const point of linkage.points ?? []) reach = Math.max(reach, Math.abs(point.x), Math.abs(point.y));
  // Compared as the message shows it (6 digits), so a refusal never reads "100000, above 100000".
  const ratio = Number((reach / shortest.d).toPrecision(6));
  if (!(ratio <= MAX_REACH_OVER_SHORTEST_LINK)) {
    const body = ix.bodies[shortest.body];
    add(`bodies[${shortest.body}].joints`, `the linkage reaches ${fmt(reach)} mm from the origin but the link from ${quoteId(j[shortest.a].id)} to ${quoteId(j[shortest.b].id)} of body ${quoteId(body.id)} is ${fmt(shortest.d)} mm long: a ratio of ${ratio}, above the ${MAX_REACH_OVER_SHORTEST_LINK} up to which double precision still closes the linkage within Loci's tolerances; expected the linkage nearer the origin or that link longer`);
  }
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
