/**
 * A plan's operations as a WebAssembly function, encoded by hand from the plan: one
 * module per plan, no imports, its own memory holding the params then the pose. The
 * arithmetic is that of the interpreter's geometry functions, operation for operation
 * (f64.sqrt is correctly rounded, as Math.sqrt is), so the poses are bit-identical
 * (tests/unit/kernel.test.ts).
 *
 * A measurement, not a kernel run.ts uses: bench/kernel.ts times it beside the generated
 * JavaScript kernel (bench/README.md, "Kernel"). Through run's interface, whose pose is
 * the caller's array, every solve copies the params in and the pose out, and then it is
 * slower than the JavaScript kernel; with the pose left in the module's memory it is
 * faster, in Node and in Chromium.
 *
 * Plans with a Newton block (solveBlock is JavaScript) get none; nor does a driver angle
 * beyond SINCOS_REDUCTION_LIMIT (polarInto defers to Math.cos and Math.sin there), for
 * which the kernel answers WASM_DEFER and the caller runs the JavaScript kernel.
 */
import { SINCOS_CONSTANTS, SINCOS_REDUCTION_LIMIT } from '../src/core/geometry/trig';
import {
  OP_CIRCLE_BODY_LINE,
  OP_CIRCLE_GROUND_LINE,
  OP_DYAD,
  OP_NEWTON,
  OP_RIGID,
  OP_ROTATE,
  OP_SET,
  OP_STRIDE,
  type PlanInternal,
} from '../src/core/linkage/plan';

/** What the module's `run` returns when the driver angle is beyond its sine–cosine reduction. */
export const WASM_DEFER = -2;

/** The module's exports: run(d) → -1, the failing operation, or WASM_DEFER. */
export interface WasmKernel {
  readonly run: (driverValue: number) => number;
  /** Params at [0, paramCount), then the pose at [paramCount, paramCount + 2 slotCount). */
  readonly memory: Float64Array;
  readonly paramCount: number;
}

// Opcodes of the WebAssembly core specification (1.0) used here.
const I32_CONST = 0x41;
const F64_CONST = 0x44;
const LOCAL_GET = 0x20;
const LOCAL_SET = 0x21;
const F64_LOAD = 0x2b;
const F64_STORE = 0x39;
const F64_ADD = 0xa0;
const F64_SUB = 0xa1;
const F64_MUL = 0xa2;
const F64_DIV = 0xa3;
const F64_SQRT = 0x9f;
const F64_ABS = 0x99;
const F64_NEG = 0x9a;
const F64_FLOOR = 0x9c;
const F64_COPYSIGN = 0xa6;
const F64_LT = 0x63;
const F64_LE = 0x65;
const F64_GE = 0x66;
const I32_AND = 0x71;
const I32_EQZ = 0x45;
const I32_TRUNC_F64_S = 0xaa;
const I32_EQ = 0x46;
const IF = 0x04;
const END = 0x0b;
const RETURN = 0x0f;
const BLOCK_VOID = 0x40;
const T_F64 = 0x7c;
const T_I32 = 0x7f;

function uleb(n: number, out: number[]): void {
  do {
    let byte = n & 0x7f;
    n >>>= 7;
    if (n !== 0) byte |= 0x80;
    out.push(byte);
  } while (n !== 0);
}

function sleb(n: number, out: number[]): void {
  for (;;) {
    const byte = n & 0x7f;
    n >>= 7;
    if ((n === 0 && (byte & 0x40) === 0) || (n === -1 && (byte & 0x40) !== 0)) {
      out.push(byte);
      return;
    }
    out.push(byte | 0x80);
  }
}

/** An f64 expression, evaluated left to right as JavaScript evaluates the same source. */
type Expr =
  | { readonly k: 'const'; readonly v: number }
  | { readonly k: 'local'; readonly i: number }
  | { readonly k: 'load'; readonly at: number }
  | { readonly k: 'bin'; readonly op: number; readonly a: Expr; readonly b: Expr }
  | { readonly k: 'un'; readonly op: number; readonly a: Expr };

const num = (v: number): Expr => ({ k: 'const', v });
const bin = (op: number) => (a: Expr, b: Expr): Expr => ({ k: 'bin', op, a, b });
const add = bin(F64_ADD);
const sub = bin(F64_SUB);
const mul = bin(F64_MUL);
const div = bin(F64_DIV);
const sqrt = (a: Expr): Expr => ({ k: 'un', op: F64_SQRT, a });
const neg = (a: Expr): Expr => ({ k: 'un', op: F64_NEG, a });

/** The i32 local (index 1, after the parameter d) holding polarInto's quadrant n & 3. */
const QUADRANT_LOCAL = 1;

/** One function body under construction: its code and its f64 locals. */
class Body {
  readonly code: number[] = [];
  /** Locals 0 (d, the parameter) and 1 (the quadrant) are taken; f64 locals follow. */
  f64End = 2;
  /** Pose offset → the local holding its x (its y is the next local). */
  readonly held = new Map<number, number>();

  constructor(readonly paramBytes: number) {}

  emit(e: Expr): void {
    const c = this.code;
    switch (e.k) {
      case 'const':
        c.push(F64_CONST, ...new Uint8Array(new Float64Array([e.v]).buffer));
        return;
      case 'local':
        c.push(LOCAL_GET);
        uleb(e.i, c);
        return;
      case 'load':
        c.push(I32_CONST, 0, F64_LOAD, 3);
        uleb(e.at, c);
        return;
      case 'bin':
        this.emit(e.a);
        this.emit(e.b);
        c.push(e.op);
        return;
      case 'un':
        this.emit(e.a);
        c.push(e.op);
        return;
    }
  }

  /** A new local := e. */
  let(e: Expr): Expr & { readonly k: 'local' } {
    const local = { k: 'local', i: this.f64End++ } as const;
    this.set(local, e);
    return local;
  }

  set(local: { readonly i: number }, e: Expr): void {
    this.emit(e);
    this.code.push(LOCAL_SET);
    uleb(local.i, this.code);
  }

  param(q: number): Expr {
    return { k: 'load', at: 8 * q };
  }

  /** Slot at pose offset `off`: its two locals, loaded from memory on first use. */
  slot(off: number): [Expr, Expr] {
    let x = this.held.get(off);
    if (x === undefined) {
      x = this.let({ k: 'load', at: this.paramBytes + 8 * off }).i;
      this.let({ k: 'load', at: this.paramBytes + 8 * (off + 1) });
      this.held.set(off, x);
    }
    return [{ k: 'local', i: x }, { k: 'local', i: x + 1 }];
  }

  /** Slot `off` := (x, y): kept in two adjacent locals and stored to memory. */
  place(off: number, x: Expr, y: Expr): void {
    const lx = this.let(x);
    this.let(y);
    this.held.set(off, lx.i);
    for (const d of [0, 1]) {
      this.code.push(I32_CONST, 0, LOCAL_GET);
      uleb(lx.i + d, this.code);
      this.code.push(F64_STORE, 3);
      uleb(this.paramBytes + 8 * (off + d), this.code);
    }
  }

  /** Pushes a < b (op F64_LT), a ≥ b (F64_GE) or a ≤ b (F64_LE) as an i32. */
  compare(a: Expr, op: number, b: Expr): void {
    this.emit(a);
    this.emit(b);
    this.code.push(op);
  }

  /** Returns `value` unless the i32 on the stack is 1. */
  returnUnless(value: number): void {
    this.code.push(I32_EQZ, IF, BLOCK_VOID, I32_CONST);
    sleb(value, this.code);
    this.code.push(RETURN, END);
  }
}

/** circleCircleIntersectInto's arithmetic, in its order; returns `op` where the circles do not meet. */
function dyad(w: Body, ax: Expr, ay: Expr, rAe: Expr, bx: Expr, by: Expr, rBe: Expr, branch: Expr, op: number): [Expr, Expr] {
  const dx = w.let(sub(bx, ax));
  const dy = w.let(sub(by, ay));
  const inv = w.let(div(num(1), add(mul(dx, dx), mul(dy, dy))));
  const rA = w.let(rAe);
  const rB = w.let(rBe);
  const k = w.let(add(mul(mul(num(0.5), sub(mul(rA, rA), mul(rB, rB))), inv), num(0.5)));
  const h2 = w.let(sub(mul(mul(rA, rA), inv), mul(k, k)));
  w.compare(h2, F64_GE, num(0));
  w.compare(inv, F64_LT, num(Infinity));
  w.code.push(I32_AND);
  w.returnUnless(op);
  const m = w.let(mul(branch, sqrt(h2)));
  return [sub(add(ax, mul(k, dx)), mul(m, dy)), add(add(ay, mul(k, dy)), mul(m, dx))];
}

/** circleLineIntersectInto's arithmetic, in its order; returns `op` where the circle misses the line. */
function circleLine(w: Body, ox: Expr, oy: Expr, r: Expr, px: Expr, py: Expr, lx: Expr, ly: Expr, branch: Expr, op: number): [Expr, Expr] {
  const inv = w.let(div(num(1), sqrt(add(mul(lx, lx), mul(ly, ly)))));
  const ux = w.let(mul(lx, inv));
  const uy = w.let(mul(ly, inv));
  const wx = w.let(sub(ox, px));
  const wy = w.let(sub(oy, py));
  const t0 = w.let(add(mul(wx, ux), mul(wy, uy)));
  const h = w.let(sub(mul(ux, wy), mul(uy, wx)));
  const rr = w.let(r);
  const disc = w.let(sub(mul(rr, rr), mul(h, h)));
  w.compare(disc, F64_GE, num(0));
  w.compare(inv, F64_LT, num(Infinity));
  w.code.push(I32_AND);
  w.returnUnless(op);
  const t = w.let(add(t0, mul(branch, sqrt(disc))));
  return [add(px, mul(t, ux)), add(py, mul(t, uy))];
}

/** polarInto's reduction and polynomials; the caller has checked |d| ≤ SINCOS_REDUCTION_LIMIT. */
function polar(w: Body, ax: Expr, ay: Expr, r: Expr): [Expr, Expr] {
  const K = SINCOS_CONSTANTS;
  const d: Expr = { k: 'local', i: 0 };
  // n = Math.round(d · 2/π): the nearest integer, ties towards +∞, with the sign of the
  // argument at zero (x − ⌊x⌋ is exact here, |x| < 2^20).
  const q = w.let(mul(d, num(K.TWO_OVER_PI)));
  const n = w.let({ k: 'un', op: F64_FLOOR, a: q });
  w.compare(sub(q, n), F64_GE, num(0.5));
  w.code.push(IF, BLOCK_VOID);
  w.set(n, add(n, num(1)));
  w.code.push(END);
  w.set(n, { k: 'bin', op: F64_COPYSIGN, a: n, b: q });
  const x = w.let(sub(sub(d, mul(n, num(K.PIO2_HI))), mul(n, num(K.PIO2_LO))));
  const z = w.let(mul(x, x));
  const poly = (c: readonly number[]): Expr => c.slice(0, -1).reduceRight<Expr>((acc, ci) => add(num(ci), mul(z, acc)), num(c[c.length - 1]));
  const sinX = w.let(add(x, mul(mul(x, z), poly([K.S1, K.S2, K.S3, K.S4, K.S5, K.S6]))));
  const hz = w.let(mul(num(0.5), z));
  const wv = w.let(sub(num(1), hz));
  const cosX = w.let(add(wv, add(sub(sub(num(1), wv), hz), mul(mul(z, z), poly([K.C1, K.C2, K.C3, K.C4, K.C5, K.C6])))));
  // (c, s) by n & 3: 0 → (cos, sin), 1 → (−sin, cos), 2 → (−cos, −sin), 3 → (sin, −cos).
  const c = w.let(cosX);
  const s = w.let(sinX);
  w.emit(n);
  w.code.push(I32_TRUNC_F64_S, I32_CONST, 3, I32_AND, LOCAL_SET, QUADRANT_LOCAL);
  const quadrant = (value: number, cc: Expr, ss: Expr): void => {
    w.code.push(LOCAL_GET, QUADRANT_LOCAL, I32_CONST, value, I32_EQ, IF, BLOCK_VOID);
    w.set(c, cc);
    w.set(s, ss);
    w.code.push(END);
  };
  quadrant(1, neg(sinX), cosX);
  quadrant(2, neg(cosX), neg(sinX));
  quadrant(3, sinX, neg(cosX));
  return [add(ax, mul(r, c)), add(ay, mul(r, s))];
}

/** The function body for the plan's operations, or null if one of them is a Newton block. */
function operations(p: PlanInternal, paramBytes: number): Body | null {
  const w = new Body(paramBytes);
  const ops = p.ops;
  for (let op = 0; op < p.opCount; op++) {
    const o = op * OP_STRIDE;
    const a = ops[o + 1];
    const b = ops[o + 2];
    const c = ops[o + 3];
    const e = ops[o + 4];
    const q = ops[o + 5];
    const prm = (k: number) => w.param(q + k);
    switch (ops[o]) {
      case OP_SET:
        w.place(c, prm(0), prm(1));
        break;
      case OP_ROTATE: {
        const [ax, ay] = w.slot(a);
        const [x, y] = polar(w, ax, ay, w.let(prm(0)));
        w.place(c, x, y);
        break;
      }
      case OP_RIGID: {
        const [ax, ay] = w.slot(a);
        const [bx, by] = w.slot(b);
        const wx = w.let(sub(bx, ax));
        const wy = w.let(sub(by, ay));
        const u = w.let(prm(0));
        const v = w.let(prm(1));
        w.place(c, sub(add(ax, mul(u, wx)), mul(v, wy)), add(add(ay, mul(u, wy)), mul(v, wx)));
        break;
      }
      case OP_DYAD: {
        const [ax, ay] = w.slot(a);
        const [bx, by] = w.slot(b);
        const [x, y] = dyad(w, ax, ay, prm(0), bx, by, prm(1), prm(2), op);
        w.place(c, x, y);
        break;
      }
      case OP_CIRCLE_GROUND_LINE: {
        const [ax, ay] = w.slot(a);
        const [x, y] = circleLine(w, ax, ay, prm(0), prm(2), prm(3), prm(4), prm(5), prm(1), op);
        w.place(c, x, y);
        break;
      }
      case OP_CIRCLE_BODY_LINE: {
        const [ax, ay] = w.slot(a);
        const [ex, ey] = w.slot(b);
        const [fx, fy] = w.slot(e);
        const wx = w.let(sub(fx, ex));
        const wy = w.let(sub(fy, ey));
        const u = w.let(prm(2));
        const v = w.let(prm(3));
        const alpha = w.let(prm(4));
        const beta = w.let(prm(5));
        const px = w.let(sub(add(ex, mul(u, wx)), mul(v, wy)));
        const py = w.let(add(add(ey, mul(u, wy)), mul(v, wx)));
        const lx = w.let(sub(mul(alpha, wx), mul(beta, wy)));
        const ly = w.let(add(mul(alpha, wy), mul(beta, wx)));
        const [x, y] = circleLine(w, ax, ay, prm(0), px, py, lx, ly, prm(1), op);
        w.place(c, x, y);
        break;
      }
      case OP_NEWTON:
        return null;
      default:
        throw new Error(`wasmKernel: unknown opcode ${ops[o]} at operation ${op}`);
    }
  }
  return w;
}

function section(id: number, content: readonly number[]): number[] {
  const out = [id];
  uleb(content.length, out);
  return out.concat(content);
}

function name(text: string): number[] {
  const out: number[] = [];
  uleb(text.length, out);
  for (let i = 0; i < text.length; i++) out.push(text.charCodeAt(i));
  return out;
}

/** The module's bytes: memory 0 and function run(d: f64) → i32, both exported; null for a plan with a Newton block. */
export function wasmKernelBytes(p: PlanInternal): Uint8Array<ArrayBuffer> | null {
  const paramBytes = 8 * p.params.length;
  const w = operations(p, paramBytes);
  if (w === null) return null;
  const pages = Math.max(1, Math.ceil((paramBytes + 16 * p.slotCount) / 65536));
  // run(d): the driver angle beyond the reduction defers; a length driver sets its params.
  const head: number[] = [];
  const d: Expr = { k: 'local', i: 0 };
  if (p.driverIsLength) {
    for (const k of p.driverParams) {
      head.push(I32_CONST, 0, LOCAL_GET, 0, F64_STORE, 3);
      uleb(8 * k, head);
    }
  } else {
    const guard = new Body(paramBytes);
    guard.compare({ k: 'un', op: F64_ABS, a: d }, F64_LE, num(SINCOS_REDUCTION_LIMIT));
    guard.returnUnless(WASM_DEFER);
    head.push(...guard.code);
  }
  const locals: number[] = [];
  uleb(2, locals);
  locals.push(1, T_I32);
  uleb(w.f64End - 2, locals);
  locals.push(T_F64);
  const body = [...locals, ...head, ...w.code, I32_CONST];
  sleb(-1, body);
  body.push(END);
  const fn: number[] = [];
  uleb(body.length, fn);
  const code = [1, ...fn, ...body];
  const bytes = [
    0x00, 0x61, 0x73, 0x6d, 0x01, 0x00, 0x00, 0x00,
    ...section(1, [1, 0x60, 1, T_F64, 1, T_I32]),
    ...section(3, [1, 0]),
    ...section(5, [1, 0, ...(() => { const out: number[] = []; uleb(pages, out); return out; })()]),
    ...section(7, [2, ...name('run'), 0x00, 0, ...name('memory'), 0x02, 0]),
    ...section(10, code),
  ];
  return Uint8Array.from(bytes);
}

/**
 * The plan's WebAssembly kernel, or null: for a plan with a Newton block, or where
 * WebAssembly is missing or refused (a Content-Security-Policy without
 * 'wasm-unsafe-eval').
 */
export function wasmKernel(p: PlanInternal): WasmKernel | null {
  const bytes = wasmKernelBytes(p);
  if (bytes === null || typeof WebAssembly !== 'object') return null;
  let instance: WebAssembly.Instance;
  try {
    instance = new WebAssembly.Instance(new WebAssembly.Module(bytes));
  } catch (error) {
    if (error instanceof WebAssembly.CompileError || error instanceof EvalError) return null;
    throw error;
  }
  const exports = instance.exports as { run: (d: number) => number; memory: WebAssembly.Memory };
  return { run: exports.run, memory: new Float64Array(exports.memory.buffer), paramCount: p.params.length };
}

/**
 * Runs the plan at p.driverValue[0] through its WebAssembly kernel on `pose`, as a
 * Kernel does (the driver checks and a length driver's params as run.ts's interpreter):
 * -1, the index of the failing operation, or WASM_DEFER. The params are copied into the
 * module's memory and the pose out of it on every call (the pose the caller passes is not
 * in that memory): the copies are what the kernel bench measures against the JavaScript
 * kernel. Slots from a failing operation on are left as they were.
 */
export function runWasm(k: WasmKernel, p: PlanInternal, pose: Float64Array): number {
  const d = p.driverValue[0];
  const prm = p.params;
  if (p.driverIsLength) {
    if (!(d > 0 && d < Infinity && p.referenceValid)) return 0;
    const driverParams = p.driverParams;
    for (let i = 0; i < driverParams.length; i++) prm[driverParams[i]] = d;
  } else if (!(Math.abs(d) < Infinity && p.referenceValid)) {
    return 0;
  }
  const memory = k.memory;
  const base = k.paramCount;
  for (let i = 0; i < base; i++) memory[i] = prm[i];
  const failed = k.run(d);
  if (failed === WASM_DEFER) return failed;
  const ops = p.ops;
  for (let o = 0, end = (failed < 0 ? p.opCount : failed) * OP_STRIDE; o < end; o += OP_STRIDE) {
    const c = ops[o + 3];
    pose[c] = memory[base + c];
    pose[c + 1] = memory[base + c + 1];
  }
  return failed;
}
