/**
 * compile(linkage): validate once, then turn the topology into a plan of flat
 * operations (see planner.ts) with preallocated scratch. Expected failures come back as
 * issues; compile throws for nothing the caller could pass.
 */
import { GROUND, quoteId, type Linkage, type LinkageIssue } from './model';
import {
  EQ_DIST,
  EQ_FIXED,
  EQ_RIGID,
  EQ_SLIDER_BODY,
  EQ_SLIDER_GROUND,
  EQ_STRIDE,
  OP_DYAD,
  OP_STRIDE,
  type Plan,
  type PlanBody,
  type PlanInternal,
} from './plan';
import { equationParamCount, packEquations, planLinkage, type EquationDraft } from './planner';
import { setReferencePose } from './params';
import { specialise } from './specialise';
import { run } from './run';
import { DEAD_CENTRE_SIN_TOL, REFERENCE_REPRODUCTION_REL_TOL } from './tolerances';
import { validateMobility, validateReferencePose, validateStructure, type IndexedLinkage } from './validate';

export { setReferencePose } from './params';

/** Unplaced joints a message names; the rest are counted. */
const MAX_NAMED_UNPLACED = 10;

export type CompileResult = { readonly ok: true; readonly plan: Plan } | { readonly ok: false; readonly issues: LinkageIssue[] };

function copyLinkage(linkage: Linkage): Linkage {
  const d = linkage.driver;
  return {
    joints: linkage.joints.map((j) => (j.ground === true ? { id: j.id, x: j.x, y: j.y, ground: true } : { id: j.id, x: j.x, y: j.y })),
    bodies: linkage.bodies.map((b) => ({ id: b.id, joints: [...b.joints] })),
    ...(linkage.sliders === undefined
      ? {}
      : {
          sliders: linkage.sliders.map((s) => ({
            joint: s.joint,
            body: s.body,
            angle: s.angle,
            ...(s.through === undefined ? {} : { through: { x: s.through.x, y: s.through.y } }),
          })),
        }),
    ...(linkage.points === undefined ? {} : { points: linkage.points.map((p) => ({ id: p.id, body: p.body, x: p.x, y: p.y })) }),
    driver: d.kind === 'rotation' ? { kind: 'rotation', body: d.body, pivot: d.pivot, tip: d.tip } : { kind: 'length', from: d.from, to: d.to },
  };
}

/** Every constraint of the linkage, for closureResidualMm: bodies by their first two joints, frame positions, sliders. */
function checkEquations(ix: IndexedLinkage): EquationDraft[] {
  const n = ix.jointCount;
  const drafts: EquationDraft[] = [];
  const eq = (type: number, s0: number, s1 = -1, s2 = -1, angle = 0) => drafts.push({ type, s0, s1, s2, angle, driven: false });
  for (let j = 0; j < n; j++) if (ix.ground[j] === 1) eq(EQ_FIXED, j);
  ix.pointBodies.forEach((body, i) => { if (body === -1) eq(EQ_FIXED, n + i); });
  ix.bodies.forEach((body, b) => {
    const [a, c] = body.joints;
    eq(EQ_DIST, a, c);
    for (let k = 2; k < body.joints.length; k++) eq(EQ_RIGID, a, c, body.joints[k]);
    ix.pointBodies.forEach((pb, i) => { if (pb === b) eq(EQ_RIGID, a, c, n + i); });
  });
  for (const s of ix.sliders) {
    if (s.body === -1) eq(EQ_SLIDER_GROUND, s.joint, -1, -1, s.angle);
    else eq(EQ_SLIDER_BODY, s.joint, ix.bodies[s.body].joints[0], ix.bodies[s.body].joints[1], s.angle);
  }
  return drafts;
}

export function compile(linkage: Linkage): CompileResult {
  const issues: LinkageIssue[] = [];
  const source = copyLinkage(linkage);
  const ix = validateStructure(source, issues);
  if (ix === null) return { ok: false, issues };
  validateReferencePose(source, ix, issues);
  validateMobility(source, issues);
  if (issues.length > 0) return { ok: false, issues };

  const points = source.points ?? [];
  const jointIds = source.joints.map((j) => j.id);
  const pointIds = points.map((p) => p.id);
  const slotCount = jointIds.length + pointIds.length;
  const reference = new Float64Array(2 * slotCount);
  source.joints.forEach((j, i) => { reference[2 * i] = j.x; reference[2 * i + 1] = j.y; });
  points.forEach((p, i) => { reference[2 * (jointIds.length + i)] = p.x; reference[2 * (jointIds.length + i) + 1] = p.y; });

  const outcome = planLinkage(ix, reference);
  if (!outcome.ok) {
    const named = outcome.unplaced.slice(0, MAX_NAMED_UNPLACED).map((j) => quoteId(jointIds[j])).join(', ');
    const names = outcome.unplaced.length > MAX_NAMED_UNPLACED ? `${named}, … (${outcome.unplaced.length} in all)` : named;
    issues.push({
      where: 'linkage',
      message: `no plan places joint${outcome.unplaced.length === 1 ? '' : 's'} ${names}: no dyad, slider or solvable Newton block reaches ${outcome.unplaced.length === 1 ? 'it' : 'them'} from the frame and the driver; expected every joint held by exactly enough links (one part of the linkage is over-constrained and another free)`,
    });
    return { ok: false, issues };
  }
  const draft = outcome.draft;

  let paramCount = draft.paramCount;
  const blockEqCount = new Int32Array(draft.blocks.length);
  const blockEqStart = new Int32Array(draft.blocks.length);
  const blockUnknownStart = new Int32Array(draft.blocks.length);
  const blockUnknownCount = new Int32Array(draft.blocks.length);
  let eqTotal = 0;
  let unknownTotal = 0;
  let largest = 0;
  draft.blocks.forEach((block, b) => {
    blockEqStart[b] = eqTotal;
    blockEqCount[b] = block.equations.length;
    blockUnknownStart[b] = unknownTotal;
    blockUnknownCount[b] = block.joints.length;
    eqTotal += block.equations.length;
    unknownTotal += block.joints.length;
    largest = Math.max(largest, 2 * block.joints.length);
    for (const eq of block.equations) paramCount += equationParamCount(eq.type);
  });
  const checkDrafts = checkEquations(ix);
  for (const eq of checkDrafts) paramCount += equationParamCount(eq.type);

  const params = new Float64Array(paramCount);
  for (const preset of draft.presets) params[preset.index] = preset.value;
  const driverParams = [...draft.driverParams];
  const blockEqs = new Int32Array(eqTotal * EQ_STRIDE);
  const blockUnknowns = new Int32Array(unknownTotal);
  const blockColumns = new Int32Array(draft.blocks.length * slotCount).fill(-1);
  let q = draft.paramCount;
  draft.blocks.forEach((block, b) => {
    q = packEquations(block.equations, blockEqs, blockEqStart[b], q, params, driverParams);
    block.joints.forEach((j, k) => {
      blockUnknowns[blockUnknownStart[b] + k] = 2 * j;
      blockColumns[b * slotCount + j] = 2 * k;
    });
  });
  const checks = new Int32Array(checkDrafts.length * EQ_STRIDE);
  packEquations(checkDrafts, checks, 0, q, params, null);
  const paramRates = new Float64Array(paramCount);
  for (const k of driverParams) paramRates[k] = 1;

  const bodies: PlanBody[] = [
    {
      id: GROUND,
      slots: Int32Array.from([
        ...jointIds.map((_, j) => j).filter((j) => ix.ground[j] === 1),
        ...ix.pointBodies.map((b, i) => (b === -1 ? jointIds.length + i : -1)).filter((s) => s >= 0),
      ]),
    },
    ...ix.bodies.map((body, b) => ({
      id: body.id,
      slots: Int32Array.from([...body.joints, ...ix.pointBodies.map((pb, i) => (pb === b ? jointIds.length + i : -1)).filter((s) => s >= 0)]),
    })),
  ];
  const driver = ix.driver;
  const plan: PlanInternal = {
    linkage: source,
    jointIds,
    pointIds,
    slotCount,
    slotIndex: new Map([...jointIds, ...pointIds].map((id, s) => [id, s])),
    bodies,
    bodyIndex: new Map(bodies.map((body, b) => [body.id, b])),
    driverReferenceValue: 0,
    newtonUnknowns: 2 * unknownTotal,
    reference: new Float64Array(2 * slotCount),
    driverIsLength: driver.kind === 'length',
    driverSlots: Int32Array.from(driver.kind === 'rotation' ? [2 * driver.pivot, 2 * driver.tip] : [2 * driver.from, 2 * driver.to]),
    driverValue: new Float64Array(1),
    opCount: draft.ops.length / OP_STRIDE,
    setCount: draft.setCount,
    ops: Int32Array.from(draft.ops),
    params,
    paramRates,
    driverParams: Int32Array.from(driverParams),
    blockCount: draft.blocks.length,
    blockUnknownStart,
    blockUnknownCount,
    blockUnknowns,
    blockEqStart,
    blockEqCount,
    blockEqs,
    blockColumns,
    checkCount: checkDrafts.length,
    checks,
    jacobian: new Float64Array(largest * largest),
    residual: new Float64Array(largest),
    step: new Float64Array(largest),
    saved: new Float64Array(largest),
    lengthScaleMm: 1,
    newtonTolMm: 0,
    referenceValid: false,
    failedOp: -1,
    kernel: null,
  };
  plan.kernel = specialise(plan);
  setReferencePose(plan, reference);

  // The plan must give back its own reference pose; a dyad at a dead centre in the
  // reference pose is where it would not.
  const pose = Float64Array.from(reference);
  const reproduced = run(plan, plan.driverReferenceValue, pose);
  let worst = 0;
  for (let i = 0; i < pose.length; i++) worst = Math.max(worst, Math.abs(pose[i] - reference[i]));
  if (!reproduced || !(worst <= REFERENCE_REPRODUCTION_REL_TOL * plan.lengthScaleMm)) {
    const failed = plan.failedOp >= 0 ? plan.ops[plan.failedOp * OP_STRIDE + 3] >> 1 : -1;
    issues.push({
      where: failed >= 0 && failed < jointIds.length ? `joints[${failed}]` : 'linkage',
      message: reproduced
        ? `the plan moves the reference pose by ${worst.toPrecision(3)} mm when it re-solves it; expected it back within ${(REFERENCE_REPRODUCTION_REL_TOL * plan.lengthScaleMm).toPrecision(3)} mm (is a joint at a dead centre in the reference pose?)`
        : `the plan cannot re-solve the reference pose${failed >= 0 ? ` at joint ${quoteId(jointIds[failed])}` : ''}; a dyad at its dead centre (links in line) in the reference pose has no defined branch: move the reference pose off the toggle`,
    });
    return { ok: false, issues };
  }
  // With its links exactly in line, a dyad gives the reference pose back whichever
  // branch it keeps, so reproduction cannot see it; but the branch the motion then
  // takes would be arbitrary.
  const toggled = deadCentreDyadJoint(plan, reference);
  if (toggled >= 0) {
    issues.push({
      where: `joints[${toggled}]`,
      message: `joint ${quoteId(jointIds[toggled])} is placed by a dyad whose links are in line in the reference pose (a dead centre), so its assembly branch is undefined; expected the reference pose off the toggle`,
    });
    return { ok: false, issues };
  }
  return { ok: true, plan };
}

/** The joint index of the first dyad at a dead centre in `pose` (|sin| of the angle between its links below DEAD_CENTRE_SIN_TOL), or −1. */
function deadCentreDyadJoint(plan: PlanInternal, pose: Float64Array): number {
  const ops = plan.ops;
  for (let o = 0; o < plan.opCount * OP_STRIDE; o += OP_STRIDE) {
    if (ops[o] !== OP_DYAD) continue;
    const a = ops[o + 1];
    const b = ops[o + 2];
    const c = ops[o + 3];
    // The angle between the two links at the placed joint: symmetric in the dyad's centres.
    const ux = pose[a] - pose[c];
    const uy = pose[a + 1] - pose[c + 1];
    const vx = pose[b] - pose[c];
    const vy = pose[b + 1] - pose[c + 1];
    const sin = Math.abs(ux * vy - uy * vx) / (Math.hypot(ux, uy) * Math.hypot(vx, vy));
    if (!(sin >= DEAD_CENTRE_SIN_TOL)) return c >> 1;
  }
  return -1;
}
