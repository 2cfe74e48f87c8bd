/**
 * Kernel throughput on one core: four-bar coupler-point solves per second through the
 * compiled plan, beside a hand-written four-bar loop on typed arrays doing the same
 * arithmetic in the same run, and Stephenson III solves (a Newton–Raphson block)
 * stepping round a full turn of its input from the previous pose.
 *
 * Seeded inputs (src/core/optimize/prng), untimed warm-up, each rate the best of a few
 * interleaved timed rounds; results fold into checksums reported outside the timed regions (the
 * plan and the hand-written loop must agree to the last bit).
 */
import { performance } from 'node:perf_hooks';
import { polarInto as polarImport } from '../src/core/geometry';
import { FOUR_BAR_DEFAULT, STEPHENSON_III_DEFAULT, compile, fourBar, run as runImport, stephensonIII, type Plan } from '../src/core/linkage';
import { Prng } from '../src/core/optimize/prng';

// Hot loops call module-local functions: tsx turns imported bindings into getters, a
// call per use that would also stop inlining (see src/core/linkage/run.ts).
const run = runImport;
const polarInto = polarImport;

const SEED = 20240611;
const INPUT_COUNT = 4096;
const FOURBAR_SOLVES = 4_000_000;
const STEPHENSON_SOLVES = 200_000;
const ROUNDS = 4;
/** Stephenson III input step: a full turn in 720 steps, as a sweep would take it. */
const STEPHENSON_STEP_RAD = (2 * Math.PI) / 720;

function compiled(linkage: Parameters<typeof compile>[0]): Plan {
  const result = compile(linkage);
  if (!result.ok) throw new Error(`bench: ${result.issues.map((i) => `${i.where}: ${i.message}`).join('; ')}`);
  return result.plan;
}

function planLoop(plan: Plan, angles: Float64Array, solves: number, pose: Float64Array, pSlot: number): number {
  let acc = 0;
  for (let i = 0; i < solves; i++) {
    run(plan, angles[i & (INPUT_COUNT - 1)], pose);
    acc += pose[pSlot] + pose[pSlot + 1];
  }
  return acc;
}

/** The four-bar, hand-written: crank pin by polarInto, rocker pin by circle–circle, P by body-local coordinates. */
interface FourBarDims {
  readonly a0x: number; readonly a0y: number; readonly b0x: number; readonly b0y: number;
  readonly crank: number; readonly coupler: number; readonly rocker: number; readonly branch: number;
  readonly u: number; readonly v: number;
}

function fourBarDims(): FourBarDims {
  const { A0, B0, A, B, P } = FOUR_BAR_DEFAULT;
  const wx = B.x - A.x;
  const wy = B.y - A.y;
  const w2 = wx * wx + wy * wy;
  const qx = P.x - A.x;
  const qy = P.y - A.y;
  // Branch: the side of the line from B0 (first centre) to A (second) that B is on, as the plan takes it.
  const side = (A.x - B0.x) * (B.y - B0.y) - (A.y - B0.y) * (B.x - B0.x);
  return {
    a0x: A0.x, a0y: A0.y, b0x: B0.x, b0y: B0.y,
    crank: Math.hypot(A.x - A0.x, A.y - A0.y),
    coupler: Math.hypot(wx, wy),
    rocker: Math.hypot(B.x - B0.x, B.y - B0.y),
    branch: side < 0 ? -1 : 1,
    u: (qx * wx + qy * wy) / w2,
    v: (wx * qy - wy * qx) / w2,
  };
}

function handLoop(d: FourBarDims, angles: Float64Array, solves: number, pose: Float64Array, mathTrig: boolean): number {
  const { a0x, a0y, b0x, b0y, crank, coupler, rocker, branch, u, v } = d;
  let acc = 0;
  for (let i = 0; i < solves; i++) {
    const theta = angles[i & (INPUT_COUNT - 1)];
    pose[0] = a0x;
    pose[1] = a0y;
    pose[2] = b0x;
    pose[3] = b0y;
    if (mathTrig) {
      pose[4] = a0x + crank * Math.cos(theta);
      pose[5] = a0y + crank * Math.sin(theta);
    } else {
      polarInto(pose, 4, a0x, a0y, crank, theta);
    }
    const ax = pose[4];
    const ay = pose[5];
    const dx = ax - b0x;
    const dy = ay - b0y;
    const inv = 1 / (dx * dx + dy * dy);
    const k = 0.5 * (rocker * rocker - coupler * coupler) * inv + 0.5;
    const h2 = rocker * rocker * inv - k * k;
    if (!(h2 >= 0)) continue;
    const m = branch * Math.sqrt(h2);
    const bx = b0x + k * dx - m * dy;
    const by = b0y + k * dy + m * dx;
    pose[6] = bx;
    pose[7] = by;
    const wx = bx - ax;
    const wy = by - ay;
    pose[8] = ax + u * wx - v * wy;
    pose[9] = ay + u * wy + v * wx;
    acc += pose[8] + pose[9];
  }
  return acc;
}

function stephensonLoop(plan: Plan, start: number, solves: number, pose: Float64Array, pSlot: number): { acc: number; failed: number } {
  let acc = 0;
  let failed = 0;
  for (let i = 0; i < solves; i++) {
    if (run(plan, start + (i % 720) * STEPHENSON_STEP_RAD, pose)) acc += pose[pSlot] + pose[pSlot + 1];
    else {
      failed++;
      pose.set(plan.reference);
    }
  }
  return { acc, failed };
}

/** Timed rounds of several loops, interleaved so that load on the shared machine falls on all alike; each keeps its best rate. */
function interleaved<T>(loops: readonly { readonly solves: number; readonly body: () => T }[]): { perS: number; result: T }[] {
  const out = loops.map((loop) => ({ perS: 0, result: loop.body() }));
  for (let r = 0; r < ROUNDS; r++) {
    loops.forEach((loop, i) => {
      const t0 = performance.now();
      out[i].result = loop.body();
      const seconds = (performance.now() - t0) / 1000;
      out[i].perS = Math.max(out[i].perS, loop.solves / seconds);
    });
  }
  return out;
}

export async function benchKernel(): Promise<Record<string, number>> {
  const prng = Prng.fromSeed(SEED);
  const angles = new Float64Array(INPUT_COUNT);
  prng.fillFloats(angles, INPUT_COUNT);
  for (let i = 0; i < INPUT_COUNT; i++) angles[i] *= 2 * Math.PI;

  const plan4 = compiled(fourBar());
  const pose4 = Float64Array.from(plan4.reference);
  const p4 = 2 * (plan4.slotIndex.get('P') ?? -1);
  const dims = fourBarDims();
  const hand = new Float64Array(10);
  if (plan4.slotCount !== 5 || p4 !== 8) throw new Error('bench: four-bar slot layout changed; the hand-written loop expects A0, B0, A, B, P');

  // Warm-up: let the JIT compile every loop before timing.
  planLoop(plan4, angles, 200_000, pose4, p4);
  handLoop(dims, angles, 200_000, hand, false);
  handLoop(dims, angles, 200_000, hand, true);

  const [planRate, handRate, mathRate] = interleaved([
    { solves: FOURBAR_SOLVES, body: () => planLoop(plan4, angles, FOURBAR_SOLVES, pose4, p4) },
    { solves: FOURBAR_SOLVES, body: () => handLoop(dims, angles, FOURBAR_SOLVES, hand, false) },
    { solves: FOURBAR_SOLVES, body: () => handLoop(dims, angles, FOURBAR_SOLVES, hand, true) },
  ]);

  const plan6 = compiled(stephensonIII(STEPHENSON_III_DEFAULT));
  const pose6 = Float64Array.from(plan6.reference);
  const p6 = 2 * (plan6.slotIndex.get('P') ?? -1);
  stephensonLoop(plan6, plan6.driverReferenceValue, 50_000, pose6, p6);
  pose6.set(plan6.reference);
  const [stephRate] = interleaved([
    {
      solves: STEPHENSON_SOLVES,
      body: () => {
        pose6.set(plan6.reference);
        return stephensonLoop(plan6, plan6.driverReferenceValue, STEPHENSON_SOLVES, pose6, p6);
      },
    },
  ]);
  if (stephRate.result.failed > 0) throw new Error(`bench: Stephenson III failed to assemble ${stephRate.result.failed} times over full turns`);

  // Outside the timed regions: the checksums (plan and hand-written must agree exactly).
  if (planRate.result !== handRate.result) {
    throw new Error(`bench: plan checksum ${planRate.result} differs from the hand-written loop's ${handRate.result}`);
  }
  return {
    fourbar_plan_per_s: planRate.perS,
    fourbar_handwritten_per_s: handRate.perS,
    stephenson3_per_s: stephRate.perS,
    fourbar_plan_over_handwritten_ratio: planRate.perS / handRate.perS,
    fourbar_handwritten_mathtrig_per_s: mathRate.perS,
    fourbar_checksum: planRate.result,
    fourbar_mathtrig_checksum: mathRate.result,
    stephenson3_checksum: stephRate.result.acc,
  };
}
