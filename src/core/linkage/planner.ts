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

export function planLinkage(ix: IndexedLinkage, reference: Float64Array): PlanOutcome {
  const n = ix.jointCount;
  const known = new Uint8Array(n);
  const bodyDone = new Uint8Array(ix.bodies.length);
  /** Base pair (two placed joints) of each body once it is placed; slider lines on it are local to it. */
  const bodyBase: [number, number][] = ix.bodies.map(() => [-1, -1]);
  const builder = new Builder();
  const driver = ix.driver;

  // The prologue run.ts executes without dispatch: every frame position, then the rotation driver.
  for (let j = 0; j < n; j++) {
    if (ix.ground[j] === 1) {
      known[j] = 1;
      builder.op(OP_SET, -1, -1, j, -1, 2);
    }
  }
  ix.pointBodies.forEach((body, i) => {
    if (body === -1) builder.op(OP_SET, -1, -1, n + i, -1, 2);
  });
  const setCount = builder.ops.length / OP_STRIDE;
  if (driver.kind === 'rotation') {
    builder.op(OP_ROTATE, driver.pivot, -1, driver.tip, -1, 1);
    known[driver.tip] = 1;
  }

  const placedCount = () => known.reduce((s, k) => s + k, 0);
  const coincide = (a: number, b: number) =>
    !(Math.hypot(reference[2 * a] - reference[2 * b], reference[2 * a + 1] - reference[2 * b + 1]) >= COINCIDENT_JOINT_TOL_MM);

  const completeBodies = (): boolean => {
    let progress = false;
    ix.bodies.forEach((body, b) => {
      if (bodyDone[b] === 1) return;
      const placed = body.joints.filter((j) => known[j] === 1);
      if (placed.length < 2) return;
      const [a, c] = placed;
      for (const j of body.joints) {
        if (known[j] === 0) {
          builder.op(OP_RIGID, a, c, j, -1, 2);
          known[j] = 1;
        }
      }
      bodyDone[b] = 1;
      bodyBase[b] = [a, c];
      progress = true;
    });
    return progress;
  };

  const partnersOf = (j: number): Partner[] => {
    const partners: Partner[] = [];
    ix.bodies.forEach((body, b) => {
      if (bodyDone[b] === 1 || !body.joints.includes(j)) return;
      const placed = body.joints.filter((k) => known[k] === 1);
      if (placed.length === 1) partners.push({ joint: placed[0], driven: false });
    });
    if (driver.kind === 'length') {
      if (driver.from === j && known[driver.to] === 1) partners.push({ joint: driver.to, driven: true });
      if (driver.to === j && known[driver.from] === 1) partners.push({ joint: driver.from, driven: true });
    }
    return partners;
  };

  const lineKnown = (body: number) => body === -1 || bodyDone[body] === 1;

  const placeOne = (): boolean => {
    for (let j = 0; j < n; j++) {
      if (known[j] === 1) continue;
      const partners = partnersOf(j);
      for (let p = 0; p < partners.length; p++) {
        for (let r = p + 1; r < partners.length; r++) {
          const first = partners[p];
          const second = partners[r];
          if (first.joint === second.joint || coincide(first.joint, second.joint)) continue;
          const q = builder.op(OP_DYAD, first.joint, second.joint, j, -1, 3);
          if (first.driven) builder.driverParams.push(q);
          if (second.driven) builder.driverParams.push(q + 1);
          known[j] = 1;
          return true;
        }
      }
      if (partners.length === 0) continue;
      const slider = ix.sliders.find((s) => s.joint === j && lineKnown(s.body));
      if (slider === undefined) continue;
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
      known[j] = 1;
      return true;
    }
    return false;
  };

  for (let guard = 0; guard <= n; guard++) {
    while (completeBodies() || placeOne()) {
      // Bodies first, then one dyad at a time: every placement may complete a body.
    }
    if (placedCount() === n) break;
    const block = findBlock(ix, known, bodyDone, bodyBase, reference);
    if (block === null) {
      const unplaced: number[] = [];
      for (let j = 0; j < n; j++) if (known[j] === 0) unplaced.push(j);
      return { ok: false, unplaced };
    }
    builder.op(OP_NEWTON, -1, -1, -1, -1, 0);
    builder.ops[builder.ops.length - 5] = builder.blocks.length;
    builder.blocks.push(block);
    for (const j of block.joints) known[j] = 1;
  }
  if (placedCount() !== n) {
    const unplaced: number[] = [];
    for (let j = 0; j < n; j++) if (known[j] === 0) unplaced.push(j);
    return { ok: false, unplaced };
  }

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

/** The equations of the joints `inBlock` with the placed joints, or null when they do not match 2 unknowns per joint. */
function blockEquations(
  ix: IndexedLinkage, inBlock: Uint8Array, known: Uint8Array, bodyDone: Uint8Array,
  bodyBase: readonly (readonly [number, number])[], size: number,
): EquationDraft[] | null {
  const eqs: EquationDraft[] = [];
  let rows = 0;
  const present = (j: number) => inBlock[j] === 1 || known[j] === 1;
  const membersIn = (body: number) => {
    const members = ix.bodies[body].joints.filter(present);
    // A placed joint first, so it is the base's fixed end.
    members.sort((a, b) => known[b] - known[a]);
    return members;
  };
  const touches = (body: number) => ix.bodies[body].joints.some((j) => inBlock[j] === 1);
  for (let b = 0; b < ix.bodies.length; b++) {
    if (bodyDone[b] === 1 || !touches(b)) continue;
    const members = membersIn(b);
    if (members.length < 2) continue;
    eqs.push({ type: EQ_DIST, s0: members[0], s1: members[1], s2: -1, angle: 0, driven: false });
    for (let k = 2; k < members.length; k++) eqs.push({ type: EQ_RIGID, s0: members[0], s1: members[1], s2: members[k], angle: 0, driven: false });
    rows += 2 * members.length - 3;
    if (rows > 2 * size) return null;
  }
  for (const slider of ix.sliders) {
    const lineTouches = slider.body !== -1 && touches(slider.body);
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
  ix: IndexedLinkage, known: Uint8Array, bodyDone: Uint8Array,
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
      const eqs = blockEquations(ix, inBlock, known, bodyDone, bodyBase, size);
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
