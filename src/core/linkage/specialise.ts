/**
 * A plan's operations as one straight-line function, generated once per compile (one
 * topology), with every slot offset and param index a literal. The interpreter in
 * run.ts reloads opcodes and offsets from the Int32Array and dispatches; the generated
 * code does neither.
 *
 * The kernel is a leaf: the geometry of every operation is written out in it rather than
 * called (only a Newton block calls solveBlock), and each coordinate it places is kept in
 * a local as well as written to the pose, so later operations read registers. A call
 * left in it would be inlined only while V8's inlining budget lasts, and a call that is
 * not inlined boxes every double it is passed: an allocation per argument per run.
 *
 * A second function, the batch kernel, runs the plan at many driver values per call: the
 * frame and the params are read into locals once per call, and a loop inside it runs the
 * operations per value (run.ts's runBatch).
 *
 * Dimensions stay in the plan's params, so setReferencePose works unchanged. The code
 * performs exactly the arithmetic of the interpreter's geometry functions
 * (circleCircleIntersectInto, circleLineIntersectInto, polarInto), in the same order, so
 * both give bit-identical poses (tests/unit/kernel-js.test.ts).
 */
import { SINCOS_CONSTANTS, SINCOS_REDUCTION_LIMIT } from '../geometry/trig';
import { solveBlock } from './newton';
import {
  OP_CIRCLE_BODY_LINE,
  OP_CIRCLE_GROUND_LINE,
  OP_DYAD,
  OP_NEWTON,
  OP_RIGID,
  OP_ROTATE,
  OP_SET,
  OP_STRIDE,
  type BatchKernel,
  type Kernel,
  type PlanInternal,
} from './plan';
import { failFrom } from './run';

/** The generated code's free names, bound once when the function is created. */
const BINDINGS = ['p', 'prm', 'dv', 'solveBlock', 'failFrom'] as const;

/** A double as a source literal that reads back as the same double. */
function lit(x: number): string {
  return Object.is(x, -0) ? '-0' : String(x);
}

const K = SINCOS_CONSTANTS;
const S_POLY = `(${lit(K.S1)} + z * (${lit(K.S2)} + z * (${lit(K.S3)} + z * (${lit(K.S4)} + z * (${lit(K.S5)} + z * ${lit(K.S6)})))))`;
const C_POLY = `(${lit(K.C1)} + z * (${lit(K.C2)} + z * (${lit(K.C3)} + z * (${lit(K.C4)} + z * (${lit(K.C5)} + z * ${lit(K.C6)})))))`;

/**
 * One generated function's body: its lines, and the pose offsets whose coordinates it
 * holds in locals x<offset>, y<offset>. Every write to a slot goes to its locals and the
 * pose alike, so a local never goes stale.
 */
interface Body {
  readonly lines: string[];
  readonly held: Set<number>;
  /** Offsets whose locals are declared (a Newton block's slots are declared but not held after it). */
  readonly declared: Set<number>;
  /** The statement that ends the run at operation `op`, which failed. */
  readonly fail: (op: number) => string;
  /** The expression for params[q]. */
  readonly param: (q: number) => string;
}

/** The per-value kernel's body: a failure returns its operation, params are read where used. */
function kernelBody(): Body {
  return { lines: [], held: new Set(), declared: new Set(), fail: (op) => `return ${op};`, param: (q) => `prm[${q}]` };
}

function hold(body: Body, off: number, x: string, y: string): void {
  body.lines.push(`${body.declared.has(off) ? '' : 'let '}x${off} = ${x}, y${off} = ${y};`);
  body.held.add(off);
  body.declared.add(off);
}

/** The locals holding slot `off`, loaded from the pose on first use. */
function read(body: Body, off: number): [string, string] {
  if (!body.held.has(off)) hold(body, off, `pose[${off}]`, `pose[${off + 1}]`);
  return [`x${off}`, `y${off}`];
}

/** Slot `off` := (x, y) computed by `code` into locals cx, cy; kept in locals and written to the pose. */
function place(body: Body, off: number, code: string): void {
  if (!body.declared.has(off)) body.lines.push(`let x${off}, y${off};`);
  body.lines.push(`{ ${code}`, `x${off} = cx; y${off} = cy; }`, `pose[${off}] = x${off}; pose[${off + 1}] = y${off};`);
  body.held.add(off);
  body.declared.add(off);
}

/** circleCircleIntersectInto's arithmetic: runs `fail` where the circles do not meet. */
function circleCircle(ax: string, ay: string, rA: string, bx: string, by: string, rB: string, branch: string, fail: string): string {
  return `const dx = ${bx} - ${ax}; const dy = ${by} - ${ay}; const inv = 1 / (dx * dx + dy * dy);
  const rA = ${rA}; const rB = ${rB};
  const k = 0.5 * (rA * rA - rB * rB) * inv + 0.5; const h2 = rA * rA * inv - k * k;
  if (!(h2 >= 0) || !(inv < Infinity)) ${fail}
  const m = ${branch} * Math.sqrt(h2);
  const cx = ${ax} + k * dx - m * dy; const cy = ${ay} + k * dy + m * dx;`;
}

/** circleLineIntersectInto's arithmetic, after `setup` has defined ox, oy, r, px, py, lx, ly, branch. */
function circleLine(setup: string, fail: string): string {
  return `${setup}
  const inv = 1 / Math.sqrt(lx * lx + ly * ly); const ux = lx * inv; const uy = ly * inv;
  const wx = ox - px; const wy = oy - py; const t0 = wx * ux + wy * uy; const h = ux * wy - uy * wx;
  const disc = r * r - h * h;
  if (!(disc >= 0) || !(inv < Infinity)) ${fail}
  const t = t0 + branch * Math.sqrt(disc);
  const cx = px + t * ux; const cy = py + t * uy;`;
}

/** polarInto's arithmetic for the driver angle d: (ax, ay) + r (cos d, sin d). */
function polar(ax: string, ay: string, r: string): string {
  return `const r = ${r}; let cx, cy;
  if (!(Math.abs(d) <= ${lit(SINCOS_REDUCTION_LIMIT)})) { cx = ${ax} + r * Math.cos(d); cy = ${ay} + r * Math.sin(d); }
  else {
    const n = Math.round(d * ${lit(K.TWO_OVER_PI)}); const x = d - n * ${lit(K.PIO2_HI)} - n * ${lit(K.PIO2_LO)}; const z = x * x;
    const sinX = x + x * z * ${S_POLY};
    const hz = 0.5 * z; const w = 1 - hz;
    const cosX = w + ((1 - w - hz) + z * z * ${C_POLY});
    let c, s;
    switch (n & 3) { case 0: c = cosX; s = sinX; break; case 1: c = -sinX; s = cosX; break; case 2: c = -cosX; s = -sinX; break; default: c = sinX; s = -cosX; break; }
    cx = ${ax} + r * c; cy = ${ay} + r * s;
  }`;
}

function emitOperation(body: Body, p: PlanInternal, op: number): void {
  const ops = p.ops;
  const o = op * OP_STRIDE;
  const a = ops[o + 1];
  const b = ops[o + 2];
  const c = ops[o + 3];
  const e = ops[o + 4];
  const q = ops[o + 5];
  const prm = body.param;
  const fail = body.fail(op);
  switch (ops[o]) {
    case OP_SET:
      place(body, c, `const cx = ${prm(q)}; const cy = ${prm(q + 1)};`);
      return;
    case OP_ROTATE: {
      const [ax, ay] = read(body, a);
      place(body, c, polar(ax, ay, prm(q)));
      return;
    }
    case OP_RIGID: {
      const [ax, ay] = read(body, a);
      const [bx, by] = read(body, b);
      place(body, c, `const wx = ${bx} - ${ax}; const wy = ${by} - ${ay}; const u = ${prm(q)}; const v = ${prm(q + 1)};
  const cx = ${ax} + u * wx - v * wy; const cy = ${ay} + u * wy + v * wx;`);
      return;
    }
    case OP_DYAD: {
      const [ax, ay] = read(body, a);
      const [bx, by] = read(body, b);
      place(body, c, circleCircle(ax, ay, prm(q), bx, by, prm(q + 1), prm(q + 2), fail));
      return;
    }
    case OP_CIRCLE_GROUND_LINE: {
      const [ax, ay] = read(body, a);
      place(body, c, circleLine(`const ox = ${ax}; const oy = ${ay}; const r = ${prm(q)}; const branch = ${prm(q + 1)};
  const px = ${prm(q + 2)}; const py = ${prm(q + 3)}; const lx = ${prm(q + 4)}; const ly = ${prm(q + 5)};`, fail));
      return;
    }
    case OP_CIRCLE_BODY_LINE: {
      const [ax, ay] = read(body, a);
      const [ex, ey] = read(body, b);
      const [fx, fy] = read(body, e);
      place(body, c, circleLine(`const ox = ${ax}; const oy = ${ay}; const r = ${prm(q)}; const branch = ${prm(q + 1)};
  const wx0 = ${fx} - ${ex}; const wy0 = ${fy} - ${ey};
  const u = ${prm(q + 2)}; const v = ${prm(q + 3)}; const alpha = ${prm(q + 4)}; const beta = ${prm(q + 5)};
  const px = ${ex} + u * wx0 - v * wy0; const py = ${ey} + u * wy0 + v * wx0;
  const lx = alpha * wx0 - beta * wy0; const ly = alpha * wy0 + beta * wx0;`, fail));
      return;
    }
    case OP_NEWTON:
      // solveBlock reads and writes the pose; the slots it places are loaded from it when used.
      body.lines.push(`if (!solveBlock(p, ${a}, pose)) ${fail}`);
      for (let k = 0; k < p.blockUnknownCount[a]; k++) body.held.delete(p.blockUnknowns[p.blockUnknownStart[a] + k]);
      return;
    default:
      throw new Error(`specialise: unknown opcode ${ops[o]} at operation ${op}`);
  }
}

/**
 * Operations per generated function. V8's stack use grows with a function's size, and
 * one of some 20,000 operations overflowed it, when compiled or entered; a longer plan
 * runs as a sequence of functions of this many operations each (a call per chunk,
 * nothing per operation), and a plan this short stays one function.
 */
export const KERNEL_CHUNK_OPS = 1024;

function operations(p: PlanInternal, first: number, end: number): string[] {
  const body = kernelBody();
  for (let op = first; op < end; op++) emitOperation(body, p, op);
  return body.lines;
}

/**
 * The batch kernel's body (see BatchKernel), for a plan short enough to be one function:
 * the frame placed once, the params read into locals once (a length driver's own are the
 * driver value), and the operations from the driver on in a loop over the values. A
 * failure ends its value's labelled block; the pose is then what run leaves (run.ts's
 * failFrom), and the frame is placed again before the next value, as run would. It
 * returns the failures negated when the last value failed, and leaves plan.failedOp to
 * runBatch otherwise.
 */
function batchSource(p: PlanInternal): string {
  const hoisted = new Set<number>();
  const driverParams = new Set(p.driverParams);
  const body: Body = {
    lines: [], held: new Set(), declared: new Set(),
    fail: (op) => `{ failed = ${op}; break sample; }`,
    param: (q) => {
      if (driverParams.has(q)) return 'd';
      hoisted.add(q);
      return `q${q}`;
    },
  };
  const ops = p.ops;
  for (let op = 0; op < p.setCount; op++) emitOperation(body, p, op);
  const frame = body.lines.splice(0);
  const restoreFrame: string[] = [];
  for (let op = 0; op < p.setCount; op++) {
    const c = ops[op * OP_STRIDE + 3];
    restoreFrame.push(`pose[${c}] = x${c}; pose[${c + 1}] = y${c};`);
  }
  for (let op = p.setCount; op < p.opCount; op++) emitOperation(body, p, op);
  const lines = ['"use strict";', 'return function batch(pose, values, slots, out) {',
    'const count = values.length; const ns = slots.length; const valid = p.referenceValid;',
    // Nothing reads the driver value from the plan during the batch; run leaves the last there.
    'dv[0] = values[count - 1];',
    // One output slot (a coupler point) is written without the loop over slots.
    'const only = ns === 1 ? slots[0] : -1;',
    'let failures = 0; let failed = -1; let w = 0; let last = 0;'];
  for (const q of [...hoisted].sort((x, y) => x - y)) lines.push(`const q${q} = prm[${q}];`);
  lines.push(...frame, 'for (let i = 0; i < count; i++) {', 'const d = values[i];');
  lines.push('if (failed >= 0) {', ...restoreFrame, 'failed = -1;', '}');
  lines.push('sample: {');
  if (p.driverIsLength) {
    lines.push('if (!(d > 0 && d < Infinity && valid)) { failed = 0; break sample; }');
    for (const k of p.driverParams) lines.push(`prm[${k}] = d;`);
  } else {
    lines.push('if (!(Math.abs(d) < Infinity && valid)) { failed = 0; break sample; }');
  }
  lines.push(...body.lines, '}');
  // The outcome is settled inside the loop: code after a loop that V8 compiled on stack
  // replacement has no type feedback, and an operation there (it was p.failedOp = failed)
  // made every call deoptimise on its way out.
  lines.push(
    'if (failed >= 0) {',
    'failures++; failFrom(p, failed, pose); last = -failures;',
    'for (let j = 0; j < ns; j++) { out[w] = NaN; out[w + 1] = NaN; w += 2; }',
    '} else {',
    'last = failures;',
    'if (only >= 0) { out[w] = pose[only]; out[w + 1] = pose[only + 1]; w += 2; }',
    'else for (let j = 0; j < ns; j++) { const s = slots[j]; out[w] = pose[s]; out[w + 1] = pose[s + 1]; w += 2; }',
    '}',
    '}',
    'return last;',
    '};',
  );
  return lines.join('\n');
}

/** The kernel's body; the driver checks and writes are those of run.ts's interpreter. */
function kernelSource(p: PlanInternal): string {
  const lines = ['"use strict";'];
  const chunked = p.opCount > KERNEL_CHUNK_OPS;
  if (chunked) {
    for (let first = 0, c = 0; first < p.opCount; first += KERNEL_CHUNK_OPS, c++) {
      lines.push(`function chunk${c}(pose, d) {`, ...operations(p, first, Math.min(first + KERNEL_CHUNK_OPS, p.opCount)), 'return -1;', '}');
    }
  }
  lines.push('return function kernel(pose) {', 'const d = dv[0];');
  if (p.driverIsLength) {
    lines.push('if (!(d > 0 && d < Infinity && p.referenceValid)) return 0;');
    for (const k of p.driverParams) lines.push(`prm[${k}] = d;`);
  } else {
    lines.push('if (!(Math.abs(d) < Infinity && p.referenceValid)) return 0;');
  }
  if (chunked) {
    lines.push('let failed = -1;');
    for (let c = 0; c * KERNEL_CHUNK_OPS < p.opCount; c++) lines.push(`if ((failed = chunk${c}(pose, d)) >= 0) return failed;`);
  } else {
    lines.push(...operations(p, 0, p.opCount));
  }
  lines.push('return -1;', '};');
  return lines.join('\n');
}

/**
 * Set by the first refusal, or up front where the realm runs under a policy that refuses
 * code built from strings: each refusal is a reported policy violation, and the policy
 * does not change.
 */
let codeGenerationRefused = false;

/** From now on this realm's plans are interpreted (run.ts), with the same results; no code is generated. */
export function forgoKernelGeneration(): void {
  codeGenerationRefused = true;
}

/**
 * The plan's kernel, or null where the environment forbids code generation (a
 * Content-Security-Policy without 'unsafe-eval' makes Function throw EvalError) or it was
 * forgone; run.ts then interprets the operations.
 */
export function specialise(p: PlanInternal): Kernel | null {
  if (codeGenerationRefused) return null;
  let factory: (...bound: unknown[]) => (pose: Float64Array) => number;
  type BatchFactory = (...bound: unknown[]) => BatchKernel;
  let batchFactory: BatchFactory | null = null;
  try {
    factory = new Function(...BINDINGS, kernelSource(p)) as typeof factory;
    if (p.opCount <= KERNEL_CHUNK_OPS) batchFactory = new Function(...BINDINGS, batchSource(p)) as BatchFactory;
  } catch (error) {
    if (error instanceof EvalError) {
      codeGenerationRefused = true;
      return null;
    }
    throw error;
  }
  const bound = [p, p.params, p.driverValue, solveBlock, failFrom];
  const kernel = factory(...bound) as Kernel;
  kernel.batch = batchFactory === null ? null : batchFactory(...bound);
  return kernel;
}
