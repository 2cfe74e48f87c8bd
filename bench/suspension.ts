/**
 * Suspension metrics against the pose solves they come from, per demo layout: full
 * suspension evaluations per second (suspensionCurves over 60 travel steps, every
 * metric, the demo bicycle's coil spring so the wheel rate too) beside, in the same run,
 * sweeps of the same layout over the same 60 shock lengths (poses and exact rates, what
 * the metrics read) and plain pose solves (60 `run` calls). The goal: an
 * evaluation costs no more than 3 sweeps (`evalOverSweepTimeRatio` ≤ 3). Beside it, the
 * metrics kernel alone (a sweep and fillCurves on a plan compiled once, curves allocated
 * once), to show how much of an evaluation is set-up rather than metrics.
 *
 * Untimed warm-up, each rate the best of a few interleaved rounds, timed by this
 * process's CPU time (rates per CPU second: the machine is shared, and the wall clock
 * counts the waits for a core too); results fold into checksums reported outside the
 * timed regions.
 */
import { compile, run as runImport, sweep as sweepImport, type Linkage, type Plan } from '../src/core/linkage';
import {
  AXLE_POINT,
  DEMO_LAYOUTS,
  DEMO_TRAIL_BIKE,
  fourBarSeatStayAxle,
  linkageDrivenSinglePivot,
  shortLinkFourBar,
  singlePivot,
  stephensonSixBar,
  suspensionCurves as suspensionCurvesImport,
  validateBicycle,
  wattSixBar,
} from '../src/core/suspension';
import { pitchRadiusMm, RUN_SCRATCH_LENGTH } from '../src/core/suspension/chain';
import { createCurves, fillCurves as fillCurvesImport, wrappedRunsInto, type CurveContext, type SuspensionCurves } from '../src/core/suspension/curves';

// Hot loops call module-local functions: tsx turns imported bindings into getters (see bench/README.md).
const run = runImport;
const sweep = sweepImport;
const suspensionCurves = suspensionCurvesImport;
const fillCurves = fillCurvesImport;

const STEPS = 60;
const ROUNDS = 3;
/** Work per timed round, in sweeps of 60 steps: evaluations take several times longer, so fewer of them. */
const SWEEPS_PER_ROUND = 60;
const EVALS_PER_ROUND = 20;
const RUN_SWEEPS_PER_ROUND = 600;
/** The goal from the issue: a full evaluation costs at most this many sweeps. */
export const EVAL_OVER_SWEEP_GOAL = 3;

const LAYOUTS: readonly (readonly [string, Linkage])[] = [
  ['singlePivot', singlePivot(DEMO_LAYOUTS.singlePivot)],
  ['linkageDrivenSinglePivot', linkageDrivenSinglePivot(DEMO_LAYOUTS.linkageDrivenSinglePivot)],
  ['fourBarSeatStayAxle', fourBarSeatStayAxle(DEMO_LAYOUTS.fourBarSeatStayAxle)],
  ['shortLinkFourBar', shortLinkFourBar(DEMO_LAYOUTS.shortLinkFourBar)],
  ['wattSixBar', wattSixBar(DEMO_LAYOUTS.wattSixBar)],
  ['stephensonSixBar', stephensonSixBar(DEMO_LAYOUTS.stephensonSixBar)],
];

const FROM_MM = DEMO_TRAIL_BIKE.shock.eyeToEyeMm;
const TO_MM = FROM_MM - DEMO_TRAIL_BIKE.shock.strokeMm;

function evalLoop(linkage: Linkage, count: number): number {
  let acc = 0;
  for (let i = 0; i < count; i++) {
    const r = suspensionCurves(linkage, DEMO_TRAIL_BIKE, { steps: STEPS });
    if (!r.ok) throw new Error(`bench: ${r.reason}`);
    acc += r.report.curves.leverageRatio[STEPS - 1] + r.report.sagPoint.antiSquatPct[0];
  }
  return acc;
}

function sweepLoop(plan: Plan, axleAt: number, count: number): number {
  let acc = 0;
  for (let i = 0; i < count; i++) {
    const sw = sweep(plan, { from: FROM_MM, to: TO_MM, steps: STEPS });
    acc += sw.poses[(STEPS - 1) * 2 * plan.slotCount + axleAt + 1] + sw.rates[axleAt + 1];
  }
  return acc;
}

/**
 * The metrics kernel alone on a compiled plan: the same context suspensionCurves builds
 * (src/core/suspension/metrics.ts), built once here, then per evaluation one sweep and
 * fillCurves into curves allocated once: what an evaluation would cost with the plan
 * compiled, the bicycle validated and the curves allocated outside the loop.
 */
function kernelContext(plan: Plan): CurveContext {
  const checked = validateBicycle(DEMO_TRAIL_BIKE);
  if (!checked.ok) throw new Error('bench: demo bicycle invalid');
  const bicycle = checked.bicycle;
  const axleAt = 2 * (plan.slotIndex.get(AXLE_POINT) as number);
  const axleBody = plan.bodyIndex.get(plan.linkage.points?.find((p) => p.id === AXLE_POINT)?.body ?? '') as number;
  const ref = plan.reference;
  let axleRefAt = -1;
  let far = 0;
  for (const slot of plan.bodies[axleBody].slots) {
    const d = Math.hypot(ref[2 * slot] - ref[axleAt], ref[2 * slot + 1] - ref[axleAt + 1]);
    if (d > far) {
      far = d;
      axleRefAt = 2 * slot;
    }
  }
  const ringRadiusMm = pitchRadiusMm(bicycle.chainringTeeth, bicycle.chainPitchMm);
  const cogRadiusMm = Float64Array.from(bicycle.cogTeeth, (z) => pitchRadiusMm(z, bicycle.chainPitchMm));
  const wrapped0 = new Float64Array(cogRadiusMm.length);
  wrappedRunsInto(ref[axleAt], ref[axleAt + 1], cogRadiusMm, ringRadiusMm, wrapped0);
  return {
    plan, bicycle, eyeToEyeMm: FROM_MM, axleBody, axleAt, axleRefAt, brakeBody: -1, brakeAt: -1, brakeRefAt: -1,
    cogRadiusMm, ringRadiusMm, axleX0: ref[axleAt], axleY0: ref[axleAt + 1], wrapped0,
    bodyDx0: ref[axleRefAt] - ref[axleAt], bodyDy0: ref[axleRefAt + 1] - ref[axleAt + 1],
    runScratch: new Float64Array(RUN_SCRATCH_LENGTH), centreScratch: new Float64Array(3),
    poseScratch: new Float64Array(2 * plan.slotCount), rateScratch: new Float64Array(2 * plan.slotCount),
  };
}

function kernelLoop(ctx: CurveContext, out: SuspensionCurves, count: number): number {
  let acc = 0;
  for (let i = 0; i < count; i++) {
    fillCurves(ctx, sweep(ctx.plan, { from: FROM_MM, to: TO_MM, steps: STEPS }), out);
    acc += out.leverageRatio[STEPS - 1] + out.antiSquatPct[0][STEPS - 1];
  }
  return acc;
}

function runLoop(plan: Plan, axleAt: number, count: number, pose: Float64Array): number {
  let acc = 0;
  const step = (TO_MM - FROM_MM) / (STEPS - 1);
  for (let i = 0; i < count; i++) {
    pose.set(plan.reference);
    for (let k = 0; k < STEPS; k++) {
      if (!run(plan, FROM_MM + k * step, pose)) throw new Error('bench: a pose solve failed inside the stroke');
    }
    acc += pose[axleAt + 1];
  }
  return acc;
}

/** This process's CPU time, s: on a shared, loaded machine the wall clock also counts the time spent waiting for a core. */
function cpuS(): number {
  const used = process.cpuUsage();
  return (used.user + used.system) / 1e6;
}

/** Timed rounds of several loops, interleaved so that load on the shared machine falls on all alike; each keeps its best rate per CPU second. */
function interleaved(loops: readonly { readonly count: number; readonly body: () => number }[]): { perS: number; checksum: number }[] {
  const out = loops.map((loop) => ({ perS: 0, checksum: loop.body() }));
  for (let r = 0; r < ROUNDS; r++) {
    loops.forEach((loop, i) => {
      const t0 = cpuS();
      out[i].checksum = loop.body();
      out[i].perS = Math.max(out[i].perS, loop.count / (cpuS() - t0));
    });
  }
  return out;
}

export async function benchSuspension(): Promise<Record<string, number | string>[]> {
  const rows: Record<string, number | string>[] = [];
  for (const [layout, linkage] of LAYOUTS) {
    const compiled = compile(linkage);
    if (!compiled.ok) throw new Error(`bench: ${layout} does not compile`);
    const plan = compiled.plan;
    const axleAt = 2 * (plan.slotIndex.get('axle') ?? -1);
    const pose = new Float64Array(2 * plan.slotCount);
    const ctx = kernelContext(plan);
    const curves = createCurves(STEPS, ctx.cogRadiusMm.length, true, false, ctx.bicycle.cogTeeth);
    const [evals, kernels, sweeps, runs] = interleaved([
      { count: EVALS_PER_ROUND, body: () => evalLoop(linkage, EVALS_PER_ROUND) },
      { count: SWEEPS_PER_ROUND, body: () => kernelLoop(ctx, curves, SWEEPS_PER_ROUND) },
      { count: SWEEPS_PER_ROUND, body: () => sweepLoop(plan, axleAt, SWEEPS_PER_ROUND) },
      { count: RUN_SWEEPS_PER_ROUND, body: () => runLoop(plan, axleAt, RUN_SWEEPS_PER_ROUND, pose) },
    ]);
    rows.push({
      layout,
      steps: STEPS,
      evalsPerCpuS: evals.perS,
      sweepsPerCpuS: sweeps.perS,
      plainSolveSweepsPerCpuS: runs.perS,
      kernelEvalsPerCpuS: kernels.perS,
      evalOverSweepTimeRatio: sweeps.perS / evals.perS,
      kernelEvalOverSweepTimeRatio: sweeps.perS / kernels.perS,
      evalOverPlainSolvesTimeRatio: runs.perS / evals.perS,
      goalEvalOverSweepMax: EVAL_OVER_SWEEP_GOAL,
      evalChecksum: evals.checksum,
      kernelChecksum: kernels.checksum,
      sweepChecksum: sweeps.checksum,
      plainSolveChecksum: runs.checksum,
    });
  }
  await Promise.resolve();
  return rows;
}
