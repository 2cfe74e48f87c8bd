/**
 * Kernel throughput on one core: four-bar coupler-point solves per second through the
 * compiled plan (its generated kernel, called per driver value through run and through
 * runSized, the entry the core's hot loops call, and through the batch entry runBatch,
 * and the interpreter that replaces it where a Content-Security-Policy
 * forbids code generation), beside a hand-written four-bar loop
 * on typed arrays doing the same arithmetic, the same loop in C (bench/c/fourbar.c,
 * gcc -O3, skipped when gcc is absent) and the plan as a WebAssembly module
 * (bench/wasmKernel.ts: through run's interface, and with the pose left in its memory),
 * all in the same rounds; and Stephenson III solves (a Newton–Raphson block) stepping
 * round a full turn of its input from the previous pose.
 *
 * Seeded inputs (src/core/optimize/prng), untimed warm-up, interleaved timed rounds
 * timed in CPU time of this process (the C program's own CPU time for it), so time the
 * shared machine gives to others is not counted: each rate is the best round's, each
 * ratio the median of the ratios within a round. Results fold into
 * checksums reported outside the timed regions, and every coupler point of the plan is
 * compared bit for bit with the hand-written loop's, the interpreter's, the WebAssembly
 * module's, the batch entry's (generated and interpreted) and the C program's.
 *
 * The plan, the batch entry and the hand-written loop are also timed again in fresh
 * processes (that import this file with the same loader), PROCESSES of them, one after
 * another: how V8 compiles and places each loop differs from one process to the next and
 * moves a loop's rate by tens of per cent, the hand-written loop's most, so one process's
 * ratio is one draw. The median over the processes, with the lowest and highest, is the
 * figure to read for those ratios.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { polarInto as polarImport } from '../src/core/geometry';
import { SINCOS_CONSTANTS, SINCOS_REDUCTION_LIMIT } from '../src/core/geometry/trig';
import { FOUR_BAR_DEFAULT, STEPHENSON_III_DEFAULT, compile, fourBar, run as runImport, stephensonIII, type Plan } from '../src/core/linkage';
import { runBatch as runBatchImport, runSized as runSizedImport } from '../src/core/linkage/run';
import type { PlanInternal } from '../src/core/linkage/plan';
import { runWasm as runWasmImport, wasmKernel, type WasmKernel } from './wasmKernel';
import { Prng } from '../src/core/optimize/prng';

// Hot loops call module-local functions: tsx turns imported bindings into getters, a
// call per use that would also stop inlining (see src/core/linkage/run.ts).
const run = runImport;
const runBatch = runBatchImport;
const runSized = runSizedImport;
const polarInto = polarImport;
const runWasm = runWasmImport;

const SEED = 20240611;
const INPUT_COUNT = 4096;
const FOURBAR_SOLVES = 500_000;
const INTERPRETER_SOLVES = 200_000;
const STEPHENSON_SOLVES = 200_000;
const ROUNDS = 8;
/** Fresh processes that time the plan, the batch entry and the hand-written loop again (see the header). */
const PROCESSES = 5;
/** Stephenson III input step: a full turn in 720 steps, as a sweep would take it. */
const STEPHENSON_STEP_RAD = (2 * Math.PI) / 720;
const C_SOURCE = join(dirname(fileURLToPath(import.meta.url)), 'c', 'fourbar.c');

function compiled(linkage: Parameters<typeof compile>[0]): Plan {
  const result = compile(linkage);
  if (!result.ok) throw new Error(`bench: ${result.issues.map((i) => `${i.where}: ${i.message}`).join('; ')}`);
  return result.plan;
}

function planLoop(plan: Plan, angles: Float64Array, solves: number, pose: Float64Array, pSlot: number): number {
  const mask = angles.length - 1;
  let acc = 0;
  for (let i = 0; i < solves; i++) {
    run(plan, angles[i & mask], pose);
    acc += pose[pSlot] + pose[pSlot + 1];
  }
  return acc;
}

/** planLoop through runSized, the entry the core's hot loops call (their pose is made for the plan: no check of its length); its own function, so each loop's JIT feedback is its own. */
function planSizedLoop(plan: Plan, angles: Float64Array, solves: number, pose: Float64Array, pSlot: number): number {
  const mask = angles.length - 1;
  let acc = 0;
  for (let i = 0; i < solves; i++) {
    runSized(plan, angles[i & mask], pose);
    acc += pose[pSlot] + pose[pSlot + 1];
  }
  return acc;
}

/** The batch entry: the angles in calls of INPUT_COUNT (the rest in one shorter call), P's (x, y) out of each. */
interface Batch {
  readonly slots: Int32Array;
  readonly out: Float64Array;
  readonly tail: Float64Array;
  readonly tailOut: Float64Array;
}

function batchFor(angles: Float64Array, solves: number, pSlot: number): Batch {
  const rest = solves % angles.length;
  return { slots: Int32Array.of(pSlot), out: new Float64Array(2 * angles.length), tail: angles.subarray(0, rest), tailOut: new Float64Array(2 * rest) };
}

function batchLoop(plan: Plan, angles: Float64Array, solves: number, pose: Float64Array, b: Batch): number {
  let acc = 0;
  for (let done = 0; done < solves; done += angles.length) {
    const whole = solves - done >= angles.length;
    const out = whole ? b.out : b.tailOut;
    runBatch(plan, whole ? angles : b.tail, pose, b.slots, out);
    for (let i = 0; i < out.length; i += 2) acc += out[i] + out[i + 1];
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
  // Branch: the side of the line from A (first centre) to B0 (second) that B is on, as the plan takes it.
  const side = (B0.x - A.x) * (B.y - A.y) - (B0.y - A.y) * (B.x - A.x);
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

function handLoop(d: FourBarDims, angles: Float64Array, solves: number, pose: Float64Array): number {
  const { a0x, a0y, b0x, b0y, crank, coupler, rocker, branch, u, v } = d;
  const mask = angles.length - 1;
  let acc = 0;
  for (let i = 0; i < solves; i++) {
    const theta = angles[i & mask];
    pose[0] = a0x;
    pose[1] = a0y;
    pose[2] = b0x;
    pose[3] = b0y;
    polarInto(pose, 4, a0x, a0y, crank, theta);
    const ax = pose[4];
    const ay = pose[5];
    const dx = b0x - ax;
    const dy = b0y - ay;
    const inv = 1 / (dx * dx + dy * dy);
    const k = 0.5 * (coupler * coupler - rocker * rocker) * inv + 0.5;
    const h2 = coupler * coupler * inv - k * k;
    if (!(h2 >= 0)) continue;
    const m = branch * Math.sqrt(h2);
    const bx = ax + k * dx - m * dy;
    const by = ay + k * dy + m * dx;
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

/** handLoop with Math.cos and Math.sin for the crank pin (its own function, so each loop's JIT feedback is its own). */
function handLoopMathTrig(d: FourBarDims, angles: Float64Array, solves: number, pose: Float64Array): number {
  const { a0x, a0y, b0x, b0y, crank, coupler, rocker, branch, u, v } = d;
  const mask = angles.length - 1;
  let acc = 0;
  for (let i = 0; i < solves; i++) {
    const theta = angles[i & mask];
    pose[0] = a0x;
    pose[1] = a0y;
    pose[2] = b0x;
    pose[3] = b0y;
    pose[4] = a0x + crank * Math.cos(theta);
    pose[5] = a0y + crank * Math.sin(theta);
    const ax = pose[4];
    const ay = pose[5];
    const dx = b0x - ax;
    const dy = b0y - ay;
    const inv = 1 / (dx * dx + dy * dy);
    const k = 0.5 * (coupler * coupler - rocker * rocker) * inv + 0.5;
    const h2 = coupler * coupler * inv - k * k;
    if (!(h2 >= 0)) continue;
    const m = branch * Math.sqrt(h2);
    const bx = ax + k * dx - m * dy;
    const by = ay + k * dy + m * dx;
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

/** The WebAssembly kernel as run would call it: params copied in, the pose copied out, each solve. */
function wasmLoop(k: WasmKernel, plan: PlanInternal, angles: Float64Array, solves: number, pose: Float64Array, pSlot: number): number {
  const mask = angles.length - 1;
  const dv = plan.driverValue;
  let acc = 0;
  for (let i = 0; i < solves; i++) {
    dv[0] = angles[i & mask];
    runWasm(k, plan, pose);
    acc += pose[pSlot] + pose[pSlot + 1];
  }
  return acc;
}

/** The WebAssembly kernel alone: the params copied in once, the pose read where the module leaves it. */
function wasmInMemoryLoop(k: WasmKernel, angles: Float64Array, solves: number, pSlot: number): number {
  const mask = angles.length - 1;
  const memory = k.memory;
  const at = k.paramCount + pSlot;
  const wasmRun = k.run;
  let acc = 0;
  for (let i = 0; i < solves; i++) {
    wasmRun(angles[i & mask]);
    acc += memory[at] + memory[at + 1];
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

/** A timed loop: solves per call of body, which returns its checksum. */
interface Loop {
  readonly solves: number;
  readonly body: () => number;
  /** The rate of the last call where the loop times itself (in another process), else absent. */
  readonly ownRate?: () => number;
}

interface Rates {
  /** Per loop: the best round's solves per second, and the last checksum. */
  readonly perS: number[];
  readonly checksum: number[];
  /** Per loop: its rate over loop 0's within each round. */
  readonly overFirst: number[][];
}

/** Timed rounds of several loops, interleaved so that load on the shared machine falls on all alike. */
function interleaved(loops: readonly Loop[]): Rates {
  const perS = loops.map(() => 0);
  const checksum = loops.map((loop) => loop.body());
  const overFirst: number[][] = loops.map(() => []);
  for (let r = 0; r < ROUNDS; r++) {
    const round = loops.map((loop, i) => {
      const t0 = process.cpuUsage();
      checksum[i] = loop.body();
      const spent = process.cpuUsage(t0);
      return loop.ownRate ? loop.ownRate() : loop.solves / ((spent.user + spent.system) / 1e6);
    });
    round.forEach((rate, i) => {
      perS[i] = Math.max(perS[i], rate);
      overFirst[i].push(rate / round[0]);
    });
  }
  return { perS, checksum, overFirst };
}

function median(values: readonly number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  const mid = sorted.length >> 1;
  return sorted.length % 2 === 1 ? sorted[mid] : 0.5 * (sorted[mid - 1] + sorted[mid]);
}

/** The C program of bench/c/fourbar.c built with gcc -O3, or why it could not be. */
interface NativeLoop {
  /** One timed round of `solves` in a fresh process: solves per CPU second and checksum. */
  round(solves: number): { perS: number; checksum: number };
  /** P (x, y) for each angle, from the program's warm-up round. */
  points(): Float64Array;
  dispose(): void;
}

function buildNative(angles: Float64Array, d: FourBarDims): NativeLoop | string {
  const dir = mkdtempSync(join(tmpdir(), 'loci-bench-c-'));
  const binary = join(dir, 'fourbar');
  // The constants of polarInto, defined once in trig.ts, passed as compile-time macros.
  const macros = Object.entries({ ...SINCOS_CONSTANTS, SINCOS_REDUCTION_LIMIT }).map(([name, value]) => `-D${name}=(${String(value)})`);
  const built = spawnSync('gcc', ['-O3', '-std=c11', '-ffp-contract=off', ...macros, '-o', binary, C_SOURCE, '-lm'], { encoding: 'utf8' });
  if (built.error || built.status !== 0) {
    rmSync(dir, { recursive: true, force: true });
    return built.error ? `gcc not available (${built.error.message})` : `gcc failed: ${built.stderr.trim()}`;
  }
  const anglesFile = join(dir, 'angles.f64');
  const pointsFile = join(dir, 'points.f64');
  writeFileSync(anglesFile, new Uint8Array(angles.buffer, angles.byteOffset, angles.byteLength));
  const dims = [d.a0x, d.a0y, d.b0x, d.b0y, d.crank, d.coupler, d.rocker, d.branch, d.u, d.v].map(String);
  return {
    round(solves) {
      const out = spawnSync(binary, [anglesFile, String(solves), '1', pointsFile, ...dims], { encoding: 'utf8' });
      if (out.error || out.status !== 0) throw new Error(`bench: the C loop failed: ${out.error?.message ?? out.stderr}`);
      const [perS, checksum] = out.stdout.trim().split(' ').map(Number);
      return { perS, checksum };
    },
    points() {
      const bytes = readFileSync(pointsFile);
      return new Float64Array(bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength));
    },
    dispose() {
      rmSync(dir, { recursive: true, force: true });
    },
  };
}

/** Index of the first coupler point (x, y per angle) that differs in any bit, or -1. */
function firstDifference(a: Float64Array, b: Float64Array): number {
  for (let i = 0; i < a.length; i++) if (!Object.is(a[i], b[i])) return i >> 1;
  return -1;
}

/** One process's rounds of the plan (through run and through runSized), the hand-written loop and the batch entry: the median ratios within a round, and the checksums. */
interface ProcessRatios {
  readonly planOverHand: number;
  readonly planSizedOverHand: number;
  readonly batchOverHand: number;
  readonly checksums: readonly number[];
}

/** Exported for the processes of processRatios, which import this file and print what it returns. */
export function fourBarProcessRounds(): ProcessRatios {
  const prng = Prng.fromSeed(SEED);
  const angles = new Float64Array(INPUT_COUNT);
  prng.fillFloats(angles, INPUT_COUNT);
  for (let i = 0; i < INPUT_COUNT; i++) angles[i] *= 2 * Math.PI;
  const plan = compiled(fourBar());
  const p = 2 * (plan.slotIndex.get('P') ?? -1);
  const pose = Float64Array.from(plan.reference);
  const poseB = Float64Array.from(plan.reference);
  const poseS = Float64Array.from(plan.reference);
  const hand = new Float64Array(10);
  const dims = fourBarDims();
  const batch = batchFor(angles, FOURBAR_SOLVES, p);
  planLoop(plan, angles, 200_000, pose, p);
  handLoop(dims, angles, 200_000, hand);
  batchLoop(plan, angles, 200_000, poseB, batchFor(angles, 200_000, p));
  planSizedLoop(plan, angles, 200_000, poseS, p);
  const rates = interleaved([
    { solves: FOURBAR_SOLVES, body: () => planLoop(plan, angles, FOURBAR_SOLVES, pose, p) },
    { solves: FOURBAR_SOLVES, body: () => handLoop(dims, angles, FOURBAR_SOLVES, hand) },
    { solves: FOURBAR_SOLVES, body: () => batchLoop(plan, angles, FOURBAR_SOLVES, poseB, batch) },
    { solves: FOURBAR_SOLVES, body: () => planSizedLoop(plan, angles, FOURBAR_SOLVES, poseS, p) },
  ]);
  const overHand = (loop: number) => median(rates.overFirst[loop].map((r, i) => r / rates.overFirst[1][i]));
  return {
    planOverHand: 1 / median(rates.overFirst[1]),
    planSizedOverHand: overHand(3),
    batchOverHand: overHand(2),
    checksums: rates.checksum,
  };
}

/**
 * PROCESSES fresh processes of fourBarProcessRounds, never two at once, each with this
 * process's loader; or why there can be none (this file was bundled into another).
 */
function processRatios(): ProcessRatios[] | string {
  if (!import.meta.url.endsWith('.ts')) return 'this file runs bundled, so no process can import it alone';
  const code = `import(${JSON.stringify(import.meta.url)}).then((m) => process.stdout.write(JSON.stringify(m.fourBarProcessRounds())))`;
  const out: ProcessRatios[] = [];
  for (let k = 0; k < PROCESSES; k++) {
    const child = spawnSync(process.execPath, [...process.execArgv, '--input-type=module', '--eval', code], { encoding: 'utf8' });
    if (child.error || child.status !== 0) throw new Error(`bench: a timing process failed: ${child.error?.message ?? child.stderr}`);
    out.push(JSON.parse(child.stdout) as ProcessRatios);
  }
  return out;
}

export async function benchKernel(): Promise<Record<string, number | null>> {
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
  if ((plan4 as PlanInternal).kernel === null) throw new Error('bench: code generation is unavailable here, so the plan is interpreted');
  const wasm = wasmKernel(plan4 as PlanInternal);
  if (wasm === null) throw new Error('bench: no WebAssembly kernel for the four-bar');
  wasm.memory.set((plan4 as PlanInternal).params);
  const poseW = Float64Array.from(plan4.reference);
  const native = buildNative(angles, dims);
  if (typeof native === 'string') console.log(`kernel: the C comparison is skipped: ${native}`);

  const batch4 = batchFor(angles, FOURBAR_SOLVES, p4);
  const poseB = Float64Array.from(plan4.reference);
  const poseS = Float64Array.from(plan4.reference);

  // Warm-up: let the JIT compile every loop before timing.
  planLoop(plan4, angles, 200_000, pose4, p4);
  planSizedLoop(plan4, angles, 200_000, poseS, p4);
  batchLoop(plan4, angles, 200_000, poseB, batchFor(angles, 200_000, p4));
  handLoop(dims, angles, 200_000, hand);
  handLoopMathTrig(dims, angles, 200_000, hand);
  wasmLoop(wasm, plan4 as PlanInternal, angles, 200_000, poseW, p4);
  wasmInMemoryLoop(wasm, angles, 200_000, p4);

  const fourBarLoops: Loop[] = [
    { solves: FOURBAR_SOLVES, body: () => planLoop(plan4, angles, FOURBAR_SOLVES, pose4, p4) },
    { solves: FOURBAR_SOLVES, body: () => handLoop(dims, angles, FOURBAR_SOLVES, hand) },
    { solves: FOURBAR_SOLVES, body: () => handLoopMathTrig(dims, angles, FOURBAR_SOLVES, hand) },
    { solves: FOURBAR_SOLVES, body: () => wasmLoop(wasm, plan4 as PlanInternal, angles, FOURBAR_SOLVES, poseW, p4) },
    { solves: FOURBAR_SOLVES, body: () => wasmInMemoryLoop(wasm, angles, FOURBAR_SOLVES, p4) },
    { solves: FOURBAR_SOLVES, body: () => batchLoop(plan4, angles, FOURBAR_SOLVES, poseB, batch4) },
    { solves: FOURBAR_SOLVES, body: () => planSizedLoop(plan4, angles, FOURBAR_SOLVES, poseS, p4) },
  ];
  const BATCH_LOOP = 5;
  const SIZED_LOOP = 6;
  const C_LOOP = 7;
  if (typeof native !== 'string') {
    // The C loop times itself inside its process, so the spawn is not counted.
    let nativeRate = 0;
    fourBarLoops.push({
      solves: FOURBAR_SOLVES,
      body: () => {
        const round = native.round(FOURBAR_SOLVES);
        nativeRate = round.perS;
        return round.checksum;
      },
      ownRate: () => nativeRate,
    });
  }
  let four: Rates;
  let nativePoints: Float64Array | null = null;
  try {
    four = interleaved(fourBarLoops);
    if (typeof native !== 'string') nativePoints = native.points();
  } finally {
    if (typeof native !== 'string') native.dispose();
  }

  // The interpreter, as under a Content-Security-Policy without 'unsafe-eval', beside the plan again.
  const interpreted = compiled(fourBar()) as PlanInternal;
  interpreted.kernel = null;
  const poseI = Float64Array.from(interpreted.reference);
  const poseIB = Float64Array.from(interpreted.reference);
  const batchI = batchFor(angles, INTERPRETER_SOLVES, p4);
  planLoop(interpreted, angles, 50_000, poseI, p4);
  batchLoop(interpreted, angles, 50_000, poseIB, batchFor(angles, 50_000, p4));
  const fallback = interleaved([
    { solves: FOURBAR_SOLVES, body: () => planLoop(plan4, angles, FOURBAR_SOLVES, pose4, p4) },
    { solves: INTERPRETER_SOLVES, body: () => planLoop(interpreted, angles, INTERPRETER_SOLVES, poseI, p4) },
    { solves: INTERPRETER_SOLVES, body: () => batchLoop(interpreted, angles, INTERPRETER_SOLVES, poseIB, batchI) },
  ]);

  const plan6 = compiled(stephensonIII(STEPHENSON_III_DEFAULT));
  const pose6 = Float64Array.from(plan6.reference);
  const p6 = 2 * (plan6.slotIndex.get('P') ?? -1);
  stephensonLoop(plan6, plan6.driverReferenceValue, 50_000, pose6, p6);
  let stephFailed = 0;
  const steph = interleaved([
    {
      solves: STEPHENSON_SOLVES,
      body: () => {
        pose6.set(plan6.reference);
        const result = stephensonLoop(plan6, plan6.driverReferenceValue, STEPHENSON_SOLVES, pose6, p6);
        stephFailed += result.failed;
        return result.acc;
      },
    },
  ]);
  if (stephFailed > 0) throw new Error(`bench: Stephenson III failed to assemble ${stephFailed} times over full turns`);

  // Outside the timed regions: every coupler point, plan against hand-written, interpreter and C.
  const planPoints = new Float64Array(2 * INPUT_COUNT);
  const handPoints = new Float64Array(2 * INPUT_COUNT);
  const interpretedPoints = new Float64Array(2 * INPUT_COUNT);
  const wasmPoints = new Float64Array(2 * INPUT_COUNT);
  for (let i = 0; i < INPUT_COUNT; i++) {
    run(plan4, angles[i], pose4);
    run(interpreted, angles[i], poseI);
    handLoop(dims, angles.subarray(i, i + 1), 1, hand);
    planPoints.set(pose4.subarray(p4, p4 + 2), 2 * i);
    interpretedPoints.set(poseI.subarray(p4, p4 + 2), 2 * i);
    handPoints.set(hand.subarray(8, 10), 2 * i);
    (plan4 as PlanInternal).driverValue[0] = angles[i];
    if (runWasm(wasm, plan4 as PlanInternal, poseW) !== -1) throw new Error(`bench: the WebAssembly kernel failed at ${angles[i]} rad`);
    wasmPoints.set(poseW.subarray(p4, p4 + 2), 2 * i);
  }
  const batchPoints = new Float64Array(2 * INPUT_COUNT);
  const interpretedBatchPoints = new Float64Array(2 * INPUT_COUNT);
  runBatch(plan4, angles, poseB, batch4.slots, batchPoints);
  runBatch(interpreted, angles, poseIB, batch4.slots, interpretedBatchPoints);
  const against: [string, Float64Array][] = [
    ['the hand-written loop', handPoints], ['the interpreter', interpretedPoints], ['the WebAssembly kernel', wasmPoints],
    ['the batch entry', batchPoints], ["the interpreter's batch entry", interpretedBatchPoints],
  ];
  if (nativePoints !== null) against.push(['the C loop', nativePoints]);
  for (const [name, points] of against) {
    const at = firstDifference(planPoints, points);
    if (at >= 0) throw new Error(`bench: the plan's coupler point at angle ${angles[at]} rad differs from ${name}'s`);
  }
  if (four.checksum[4] !== four.checksum[0]) throw new Error(`bench: the WebAssembly kernel's checksum ${four.checksum[4]} differs from the plan's ${four.checksum[0]}`);
  if (four.checksum[0] !== four.checksum[1]) throw new Error(`bench: plan checksum ${four.checksum[0]} differs from the hand-written loop's ${four.checksum[1]}`);
  if (four.checksum[BATCH_LOOP] !== four.checksum[0]) throw new Error(`bench: the batch entry's checksum ${four.checksum[BATCH_LOOP]} differs from the plan's ${four.checksum[0]}`);
  if (four.checksum[SIZED_LOOP] !== four.checksum[0]) throw new Error(`bench: runSized's checksum ${four.checksum[SIZED_LOOP]} differs from run's ${four.checksum[0]}`);
  // Within each round: one loop over another (the hand-written loop, the C loop).
  const over = (loop: number, other: number) => median(four.overFirst[loop].map((r, i) => r / four.overFirst[other][i]));
  const batchOver = (other: number) => over(BATCH_LOOP, other);

  const nativeRatio = typeof native === 'string' ? null : median(four.overFirst[C_LOOP]);

  const ran = processRatios();
  if (typeof ran === 'string') console.log(`kernel: the figures of fresh processes are skipped: ${ran}`);
  const processes = typeof ran === 'string' ? [] : ran;
  for (const r of processes) {
    if (r.checksums.some((c) => c !== four.checksum[0])) {
      throw new Error(`bench: a timing process's checksums ${r.checksums.join(', ')} differ from the plan's ${four.checksum[0]}`);
    }
  }
  const spread = (ratios: number[]) => (ratios.length === 0 ? [null, null, null] : [median(ratios), Math.min(...ratios), Math.max(...ratios)]);
  const [planMedian, planLowest, planHighest] = spread(processes.map((r) => r.planOverHand));
  const [sizedMedian, sizedLowest, sizedHighest] = spread(processes.map((r) => r.planSizedOverHand));
  const [batchMedian, batchLowest, batchHighest] = spread(processes.map((r) => r.batchOverHand));
  return {
    fourbar_plan_per_s: four.perS[0],
    fourbar_handwritten_per_s: four.perS[1],
    fourbar_plan_over_handwritten_ratio: 1 / median(four.overFirst[1]),
    fourbar_plan_over_handwritten_ratio_median_of_processes: planMedian,
    fourbar_plan_over_handwritten_ratio_lowest_process: planLowest,
    fourbar_plan_over_handwritten_ratio_highest_process: planHighest,
    fourbar_plan_sized_per_s: four.perS[SIZED_LOOP],
    fourbar_plan_sized_over_handwritten_ratio: over(SIZED_LOOP, 1),
    fourbar_plan_sized_over_handwritten_ratio_median_of_processes: sizedMedian,
    fourbar_plan_sized_over_handwritten_ratio_lowest_process: sizedLowest,
    fourbar_plan_sized_over_handwritten_ratio_highest_process: sizedHighest,
    fourbar_c_per_s: typeof native === 'string' ? null : four.perS[C_LOOP],
    fourbar_plan_over_c_ratio: nativeRatio === null ? null : 1 / nativeRatio,
    fourbar_batch_per_s: four.perS[BATCH_LOOP],
    fourbar_batch_over_handwritten_ratio: batchOver(1),
    fourbar_batch_over_handwritten_ratio_median_of_processes: batchMedian,
    fourbar_batch_over_handwritten_ratio_lowest_process: batchLowest,
    fourbar_batch_over_handwritten_ratio_highest_process: batchHighest,
    fourbar_batch_over_c_ratio: typeof native === 'string' ? null : batchOver(C_LOOP),
    fourbar_wasm_per_s: four.perS[3],
    fourbar_wasm_over_plan_ratio: median(four.overFirst[3]),
    fourbar_wasm_inmemory_per_s: four.perS[4],
    fourbar_wasm_inmemory_over_plan_ratio: median(four.overFirst[4]),
    fourbar_interpreter_per_s: fallback.perS[1],
    fourbar_interpreter_over_plan_ratio: median(fallback.overFirst[1]),
    fourbar_interpreter_batch_over_plan_ratio: median(fallback.overFirst[2]),
    fourbar_handwritten_mathtrig_per_s: four.perS[2],
    stephenson3_per_s: steph.perS[0],
    fourbar_checksum: four.checksum[0],
    fourbar_mathtrig_checksum: four.checksum[2],
    fourbar_c_checksum: typeof native === 'string' ? null : four.checksum[C_LOOP],
    stephenson3_checksum: steph.checksum[0],
  };
}
