/**
 * The planner: orders the placement of a linkage's joints into operations.
 *
 * Ground joints are set; the driver places its tip; then, repeatedly, every body with
 * two placed joints places the rest of its joints by body-local coordinates, and a
 * joint at fixed distances from two placed joints is placed by circle–circle
 * intersection (a dyad), or a slider joint at a fixed distance from a placed joint by
 * circle–line intersection. Where none applies, the smallest set of unplaced joints
 * whose equations match its unknowns and whose Jacobian has full rank in the reference
 * pose becomes a Newton–Raphson block, and placement goes on after it.
 */
import {
  equationRows,
  EQ_DIST,
  EQ_RIGID,
  EQ_SLIDER_BODY,
  EQ_SLIDER_GROUND,
  EQ_STRIDE,
  OP_CIRCLE_BODY_LINE,
  OP_CIRCLE_GROUND_LINE,
  OP_DYAD,
  OP_NEWTON,
  OP_RIGID,
  OP_ROTATE,
  OP_SET,
  OP_STRIDE,
} from './plan';
import type { IndexedLinkage } from './validate';
import { evaluateEquations, solveLinearInPlace } from './newton';
import { refreshEquations } from './params';
import { BLOCK_RANK_REL_TOL, BLOCK_SEARCH_MAX_SUBSETS, COINCIDENT_JOINT_TOL_MM } from './tolerances';

/** An equation before packing: slots (not pose offsets), the slider angle, and whether its length is the driver's. */
export interface EquationDraft {
  readonly type: number;
  readonly s0: number;
  readonly s1: number;
  readonly s2: number;
  readonly angle: number;
  readonly driven: boolean;
}

export interface PlanDraft {
  /** Leading OP_SET operations (frame positions); a rotation driver's OP_ROTATE follows them. */
  readonly setCount: number;
  /** OP_STRIDE entries per op, slots as pose offsets (OP_NEWTON: a is the block number). */
  readonly ops: number[];
  readonly paramCount: number;
  /** Params preset at compile: slider angles. */
  readonly presets: { readonly index: number; readonly value: number }[];
  readonly driverParams: number[];
  readonly blocks: { readonly joints: number[]; readonly equations: EquationDraft[] }[];
}

class Builder {
  readonly ops: number[] = [];
  paramCount = 0;
  readonly presets: { index: number; value: number }[] = [];
  readonly driverParams: number[] = [];
  readonly blocks: { joints: number[]; equations: EquationDraft[] }[] = [];

  op(code: number, a: number, b: number, c: number, d: number, params: number): number {
    const q = this.paramCount;
    this.ops.push(code, a < 0 ? -1 : 2 * a, b < 0 ? -1 : 2 * b, c < 0 ? -1 : 2 * c, d < 0 ? -1 : 2 * d, q);
    this.paramCount += params;
    return q;
  }
}

/** Distance partner of an unplaced joint: a placed joint at fixed (or driven) distance. */
interface Partner {
  readonly joint: number;
  readonly driven: boolean;
}

export type PlanOutcome = { readonly ok: true; readonly draft: PlanDraft } | { readonly ok: false; readonly unplaced: number[] };

/**
 * Incidence of the indexed linkage, so each step of planning looks only at the bodies
 * and sliders next to a joint, never at all of them.
 */
interface Incidence {
  /** Bodies carrying each joint, in body order. */
  readonly jointBodies: readonly number[][];
  /** Sliders of each joint, in slider order. */
  readonly jointSliders: readonly number[][];
  /** Sliders whose line is on each body. */
  readonly bodySliders: readonly number[][];
}

function incidenceOf(ix: IndexedLinkage): Incidence {
  const jointBodies: number[][] = Array.from({ length: ix.jointCount }, () => []);
  ix.bodies.forEach((body, b) => { for (const j of body.joints) jointBodies[j].push(b); });
  const jointSliders: number[][] = Array.from({ length: ix.jointCount }, () => []);
  const bodySliders: number[][] = ix.bodies.map(() => []);
  ix.sliders.forEach((s, i) => {
    jointSliders[s.joint].push(i);
    if (s.body >= 0) bodySliders[s.body].push(i);
  });
  return { jointBodies, jointSliders, bodySliders };
}

/** A min-heap of small non-negative integers, each held at most once. */
class IndexHeap {
  private readonly items: number[] = [];
  private readonly held: Uint8Array;
  constructor(size: number) { this.held = new Uint8Array(size); }
  get size(): number { return this.items.length; }
  push(v: number): void {
    if (this.held[v] === 1) return;
    this.held[v] = 1;
    const a = this.items;
    a.push(v);
    for (let i = a.length - 1; i > 0;) {
      const up = (i - 1) >> 1;
      if (a[up] <= a[i]) break;
      [a[up], a[i]] = [a[i], a[up]];
      i = up;
    }
  }
  peek(): number { return this.items[0]; }
  pop(): number {
    const a = this.items;
    const top = a[0];
    const last = a.pop()!;
    if (a.length > 0) {
      a[0] = last;
      for (let i = 0; ;) {
        const l = 2 * i + 1;
        const r = l + 1;
        let m = i;
        if (l < a.length && a[l] < a[m]) m = l;
        if (r < a.length && a[r] < a[m]) m = r;
        if (m === i) break;
        [a[m], a[i]] = [a[i], a[m]];
        i = m;
      }
    }
    this.held[top] = 0;
    return top;
  }
}

/**
 * Places in the order of the rule above: bodies by index, pass after pass, while any has
 * two placed joints; then the lowest-numbered joint a dyad or slider can place; again.
 * Work lists stand in for the passes and scans, so each placement costs what touches it.
 */
export function planLinkage(ix: IndexedLinkage, reference: Float64Array): PlanOutcome {
  const n = ix.jointCount;
  const known = new Uint8Array(n);
  let placed = 0;
  const bodyDone = new Uint8Array(ix.bodies.length);
  /** Placed joints of each body, and one of them (the only one while there is one). */
  const bodyPlaced = new Int32Array(ix.bodies.length);
  const bodyAnyPlaced = new Int32Array(ix.bodies.length).fill(-1);
  /** Base pair (two placed joints) of each body once it is placed; slider lines on it are local to it. */
  const bodyBase: [number, number][] = ix.bodies.map(() => [-1, -1]);
  const builder = new Builder();
  const driver = ix.driver;
  const inc = incidenceOf(ix);
  // Bodies with two placed joints: those after the pass's cursor now, the rest next pass.
  const readyNow = new IndexHeap(ix.bodies.length);
  const readyNext = new IndexHeap(ix.bodies.length);
  let cursor = -1;
  // Joints whose neighbourhood changed since a dyad or slider was last looked for.
  const dirty = new IndexHeap(n);
  for (let j = 0; j < n; j++) dirty.push(j);

  const touch = (j: number) => { if (known[j] === 0) dirty.push(j); };
  const markKnown = (j: number) => {
    known[j] = 1;
    placed++;
    for (const b of inc.jointBodies[j]) {
      bodyPlaced[b]++;
      bodyAnyPlaced[b] = j;
      if (bodyDone[b] === 0) {
        if (bodyPlaced[b] === 2) (b > cursor ? readyNow : readyNext).push(b);
        for (const k of ix.bodies[b].joints) touch(k);
      }
    }
    if (driver.kind === 'length') {
      if (driver.from === j) touch(driver.to);
      if (driver.to === j) touch(driver.from);
    }
  };

  // The prologue run.ts executes without dispatch: every frame position, then the rotation driver.
  for (let j = 0; j < n; j++) {
    if (ix.ground[j] === 1) {
      markKnown(j);
      builder.op(OP_SET, -1, -1, j, -1, 2);
    }
  }
  ix.pointBodies.forEach((body, i) => {
    if (body === -1) builder.op(OP_SET, -1, -1, n + i, -1, 2);
  });
  const setCount = builder.ops.length / OP_STRIDE;
  if (driver.kind === 'rotation') {
    builder.op(OP_ROTATE, driver.pivot, -1, driver.tip, -1, 1);
    markKnown(driver.tip);
  }

  const coincide = (a: number, b: number) =>
    !(Math.hypot(reference[2 * a] - reference[2 * b], reference[2 * a + 1] - reference[2 * b + 1]) >= COINCIDENT_JOINT_TOL_MM);

  const completeBody = (b: number) => {
    const body = ix.bodies[b];
    let a = -1;
    let c = -1;
    for (const j of body.joints) {
      if (known[j] === 0) continue;
      if (a < 0) a = j;
      else if (c < 0) c = j;
    }
    bodyDone[b] = 1;
    bodyBase[b] = [a, c];
    for (const j of body.joints) {
      if (known[j] === 0) {
        builder.op(OP_RIGID, a, c, j, -1, 2);
        markKnown(j);
      }
    }
    for (const j of body.joints) touch(j);
    for (const s of inc.bodySliders[b]) touch(ix.sliders[s].joint);
  };

  /** Completes every ready body, pass by pass; false when there was none. */
  const completeBodies = (): boolean => {
    let progress = false;
    for (let guard = 0; guard <= ix.bodies.length; guard++) {
      if (readyNow.size === 0) {
        if (readyNext.size === 0) break;
        // A new pass: the bodies left behind the cursor come first again.
        cursor = -1;
        while (readyNext.size > 0) readyNow.push(readyNext.pop());
      }
      const b = readyNow.pop();
      cursor = b;
      if (bodyDone[b] === 1) continue;
      completeBody(b);
      progress = true;
    }
    cursor = -1;
    return progress;
  };

  const partnersOf = (j: number): Partner[] => {
    const partners: Partner[] = [];
    for (const b of inc.jointBodies[j]) {
      if (bodyDone[b] === 0 && bodyPlaced[b] === 1) partners.push({ joint: bodyAnyPlaced[b], driven: false });
    }
    if (driver.kind === 'length') {
      if (driver.from === j && known[driver.to] === 1) partners.push({ joint: driver.to, driven: true });
      if (driver.to === j && known[driver.from] === 1) partners.push({ joint: driver.from, driven: true });
    }
    return partners;
  };

  const lineKnown = (body: number) => body === -1 || bodyDone[body] === 1;

  /** Places joint j by a dyad or a slider if it can now; false otherwise. */
  const placeJoint = (j: number): boolean => {
    const partners = partnersOf(j);
    for (let p = 0; p < partners.length; p++) {
      for (let r = p + 1; r < partners.length; r++) {
        const first = partners[p];
        const second = partners[r];
        if (first.joint === second.joint || coincide(first.joint, second.joint)) continue;
        const q = builder.op(OP_DYAD, first.joint, second.joint, j, -1, 3);
        if (first.driven) builder.driverParams.push(q);
        if (second.driven) builder.driverParams.push(q + 1);
        markKnown(j);
        return true;
      }
    }
    if (partners.length === 0) return false;
    const sliderIndex = inc.jointSliders[j].find((s) => lineKnown(ix.sliders[s].body));
    if (sliderIndex === undefined) return false;
    const slider = ix.sliders[sliderIndex];
    const centre = partners[0];
    let q: number;
    if (slider.body === -1) {
      q = builder.op(OP_CIRCLE_GROUND_LINE, centre.joint, -1, j, -1, 7);
    } else {
      const [e, f] = bodyBase[slider.body];
      q = builder.op(OP_CIRCLE_BODY_LINE, centre.joint, e, j, f, 7);
    }
    builder.presets.push({ index: q + 6, value: slider.angle });
    if (centre.driven) builder.driverParams.push(q);
    markKnown(j);
    return true;
  };

  /**
   * The lowest joint a dyad or slider places now. A joint whose neighbourhood has not
   * changed since it was found unplaceable is still unplaceable, so only the dirty ones
   * are looked at, lowest first.
   */
  const placeOne = (): boolean => {
    while (dirty.size > 0) {
      const j = dirty.pop();
      if (known[j] === 0 && placeJoint(j)) return true;
    }
    return false;
  };

  const unplacedJoints = () => {
    const unplaced: number[] = [];
    for (let j = 0; j < n; j++) if (known[j] === 0) unplaced.push(j);
    return unplaced;
  };

  for (let guard = 0; guard <= n; guard++) {
    while (completeBodies() || placeOne()) {
      // Bodies first, then one dyad at a time: every placement may complete a body.
    }
    if (placed === n) break;
    const block = findBlock(ix, inc, known, bodyDone, bodyBase, reference);
    if (block === null) return { ok: false, unplaced: unplacedJoints() };
    builder.op(OP_NEWTON, -1, -1, -1, -1, 0);
    builder.ops[builder.ops.length - 5] = builder.blocks.length;
    builder.blocks.push(block);
    for (const j of block.joints) markKnown(j);
  }
  if (placed !== n) return { ok: false, unplaced: unplacedJoints() };

  ix.pointBodies.forEach((body, i) => {
    if (body !== -1) builder.op(OP_RIGID, ix.bodies[body].joints[0], ix.bodies[body].joints[1], n + i, -1, 2);
  });

  return {
    ok: true,
    draft: {
      setCount,
      ops: builder.ops,
      paramCount: builder.paramCount,
      presets: builder.presets,
      driverParams: builder.driverParams,
      blocks: builder.blocks,
    },
  };
}

/** The equations of the joints `inBlock` (listed in `joints`) with the placed joints, or null when they do not match 2 unknowns per joint. */
function blockEquations(
  ix: IndexedLinkage, inc: Incidence, joints: readonly number[], inBlock: Uint8Array, known: Uint8Array, bodyDone: Uint8Array,
  bodyBase: readonly (readonly [number, number])[],
): EquationDraft[] | null {
  const size = joints.length;
  const eqs: EquationDraft[] = [];
  let rows = 0;
  const present = (j: number) => inBlock[j] === 1 || known[j] === 1;
  const membersIn = (body: number) => {
    const members = ix.bodies[body].joints.filter(present);
    // A placed joint first, so it is the base's fixed end.
    members.sort((a, b) => known[b] - known[a]);
    return members;
  };
  // The bodies that carry a block joint, in body order: only they can touch the block.
  const touching = [...new Set(joints.flatMap((j) => inc.jointBodies[j]))].sort((a, b) => a - b);
  const touches = new Set(touching);
  for (const b of touching) {
    if (bodyDone[b] === 1) continue;
    const members = membersIn(b);
    if (members.length < 2) continue;
    eqs.push({ type: EQ_DIST, s0: members[0], s1: members[1], s2: -1, angle: 0, driven: false });
    for (let k = 2; k < members.length; k++) eqs.push({ type: EQ_RIGID, s0: members[0], s1: members[1], s2: members[k], angle: 0, driven: false });
    rows += 2 * members.length - 3;
    if (rows > 2 * size) return null;
  }
  // Sliders of a block joint, or on the line of a touching body, in slider order.
  const sliderIndices = [...new Set([...joints.flatMap((j) => inc.jointSliders[j]), ...touching.flatMap((b) => inc.bodySliders[b])])].sort((a, b) => a - b);
  for (const s of sliderIndices) {
    const slider = ix.sliders[s];
    const lineTouches = slider.body !== -1 && touches.has(slider.body);
    if (!(inBlock[slider.joint] === 1 || lineTouches) || !present(slider.joint)) continue;
    if (slider.body === -1) {
      eqs.push({ type: EQ_SLIDER_GROUND, s0: slider.joint, s1: -1, s2: -1, angle: slider.angle, driven: false });
    } else if (bodyDone[slider.body] === 1) {
      const [e, f] = bodyBase[slider.body];
      eqs.push({ type: EQ_SLIDER_BODY, s0: slider.joint, s1: e, s2: f, angle: slider.angle, driven: false });
    } else {
      const members = membersIn(slider.body);
      if (members.length < 2) continue;
      eqs.push({ type: EQ_SLIDER_BODY, s0: slider.joint, s1: members[0], s2: members[1], angle: slider.angle, driven: false });
    }
    rows += 1;
  }
  const driver = ix.driver;
  if (driver.kind === 'length' && present(driver.from) && present(driver.to) && (inBlock[driver.from] === 1 || inBlock[driver.to] === 1)) {
    eqs.push({ type: EQ_DIST, s0: driver.from, s1: driver.to, s2: -1, angle: 0, driven: true });
    rows += 1;
  }
  return rows === 2 * size ? eqs : null;
}

/** Packs drafted equations into typed arrays: slots become pose offsets; params from `firstParam`. */
export function packEquations(
  drafts: readonly EquationDraft[], eqs: Int32Array, at: number, firstParam: number,
  params: Float64Array, driverParams: number[] | null,
): number {
  let q = firstParam;
  drafts.forEach((eq, i) => {
    const e = (at + i) * EQ_STRIDE;
    eqs[e] = eq.type;
    eqs[e + 1] = 2 * eq.s0;
    eqs[e + 2] = eq.s1 < 0 ? -1 : 2 * eq.s1;
    eqs[e + 3] = eq.s2 < 0 ? -1 : 2 * eq.s2;
    eqs[e + 4] = q;
    if (eq.type === EQ_SLIDER_GROUND || eq.type === EQ_SLIDER_BODY) params[q + 4] = eq.angle;
    if (eq.driven && driverParams !== null) driverParams.push(q);
    q += equationParamCount(eq.type);
  });
  return q;
}

export function equationParamCount(type: number): number {
  return type === EQ_DIST ? 1 : type === EQ_RIGID ? 2 : 5;
}

/** Full rank of the block's Jacobian in the reference pose. */
function fullRankAtReference(drafts: readonly EquationDraft[], joints: readonly number[], slotCount: number, reference: Float64Array): boolean {
  const size = 2 * joints.length;
  const eqs = new Int32Array(drafts.length * EQ_STRIDE);
  let paramCount = 0;
  for (const d of drafts) paramCount += equationParamCount(d.type);
  const params = new Float64Array(paramCount);
  packEquations(drafts, eqs, 0, 0, params, null);
  if (!refreshEquations(eqs, 0, drafts.length, params, reference)) return false;
  const columns = new Int32Array(slotCount).fill(-1);
  joints.forEach((j, k) => { columns[j] = 2 * k; });
  const jac = new Float64Array(size * size);
  const scratch = new Float64Array(size);
  evaluateEquations(eqs, 0, drafts.length, params, new Float64Array(paramCount), reference, columns, 0, size, scratch, jac, null, scratch);
  return solveLinearInPlace(jac, size, new Float64Array(size), BLOCK_RANK_REL_TOL);
}

/** The smallest solvable block of unplaced joints, or null. Subsets by increasing size, at most BLOCK_SEARCH_MAX_SUBSETS. */
function findBlock(
  ix: IndexedLinkage, inc: Incidence, known: Uint8Array, bodyDone: Uint8Array,
  bodyBase: readonly (readonly [number, number])[], reference: Float64Array,
): { joints: number[]; equations: EquationDraft[] } | null {
  const unplaced: number[] = [];
  for (let j = 0; j < ix.jointCount; j++) if (known[j] === 0) unplaced.push(j);
  const slotCount = reference.length >> 1;
  const inBlock = new Uint8Array(ix.jointCount);
  let tried = 0;
  for (let size = 1; size <= unplaced.length; size++) {
    const pick = Array.from({ length: size }, (_, i) => i);
    while (true) {
      if (++tried > BLOCK_SEARCH_MAX_SUBSETS) return null;
      const joints = pick.map((i) => unplaced[i]);
      for (const j of joints) inBlock[j] = 1;
      const eqs = blockEquations(ix, inc, joints, inBlock, known, bodyDone, bodyBase);
      for (const j of joints) inBlock[j] = 0;
      if (eqs !== null && eqs.reduce((s, e) => s + equationRows(e.type), 0) === 2 * size && fullRankAtReference(eqs, joints, slotCount, reference)) {
        return { joints, equations: eqs };
      }
      // Next combination of `size` out of unplaced.length, in lexicographic order.
      let i = size - 1;
      while (i >= 0 && pick[i] === unplaced.length - size + i) i--;
      if (i < 0) break;
      pick[i]++;
      for (let k = i + 1; k < size; k++) pick[k] = pick[k - 1] + 1;
    }
  }
  return null;
}
