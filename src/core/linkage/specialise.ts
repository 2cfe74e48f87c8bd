/**
 * A plan's operations as one straight-line function, generated once per compile (one
 * topology), with every slot offset and param index a literal. Measured on the bench's
 * four-bar: the interpreter in run.ts spends its time reloading opcodes and offsets from
 * the Int32Array and dispatching, which the generated code does not do at all.
 *
 * Dimensions stay in the plan's params, so setReferencePose works unchanged. The
 * generated code performs exactly the interpreter's arithmetic, calling the same
 * geometry functions, so both give bit-identical poses (tests/unit/linkage-run.test.ts).
 */
import { circleCircleIntersectInto, circleLineIntersectInto } from '../geometry/intersect';
import { polarInto } from '../geometry/trig';
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
  type Kernel,
  type PlanInternal,
} from './plan';

/** The generated code's free names, bound once when the function is created. */
const BINDINGS = ['p', 'prm', 'dv', 'polarInto', 'circleCircleIntersectInto', 'circleLineIntersectInto', 'solveBlock'] as const;

function operationSource(p: PlanInternal, op: number): string {
  const ops = p.ops;
  const o = op * OP_STRIDE;
  const a = ops[o + 1];
  const b = ops[o + 2];
  const c = ops[o + 3];
  const d = ops[o + 4];
  const q = ops[o + 5];
  switch (ops[o]) {
    case OP_SET:
      return `pose[${c}] = prm[${q}]; pose[${c + 1}] = prm[${q + 1}];`;
    case OP_ROTATE:
      return `polarInto(pose, ${c}, pose[${a}], pose[${a + 1}], prm[${q}], d);`;
    case OP_RIGID:
      return `{ const ax = pose[${a}]; const ay = pose[${a + 1}]; const wx = pose[${b}] - ax; const wy = pose[${b + 1}] - ay;
        const u = prm[${q}]; const v = prm[${q + 1}];
        pose[${c}] = ax + u * wx - v * wy; pose[${c + 1}] = ay + u * wy + v * wx; }`;
    case OP_DYAD:
      return `if (!circleCircleIntersectInto(pose[${a}], pose[${a + 1}], prm[${q}], pose[${b}], pose[${b + 1}], prm[${q + 1}], prm[${q + 2}], pose, ${c})) return ${op};`;
    case OP_CIRCLE_GROUND_LINE:
      return `if (!circleLineIntersectInto(pose[${a}], pose[${a + 1}], prm[${q}], prm[${q + 2}], prm[${q + 3}], prm[${q + 4}], prm[${q + 5}], prm[${q + 1}], pose, ${c})) return ${op};`;
    case OP_CIRCLE_BODY_LINE:
      return `{ const ex = pose[${b}]; const ey = pose[${b + 1}]; const wx = pose[${d}] - ex; const wy = pose[${d + 1}] - ey;
        const u = prm[${q + 2}]; const v = prm[${q + 3}]; const alpha = prm[${q + 4}]; const beta = prm[${q + 5}];
        if (!circleLineIntersectInto(pose[${a}], pose[${a + 1}], prm[${q}], ex + u * wx - v * wy, ey + u * wy + v * wx,
          alpha * wx - beta * wy, alpha * wy + beta * wx, prm[${q + 1}], pose, ${c})) return ${op}; }`;
    case OP_NEWTON:
      return `if (!solveBlock(p, ${a}, pose)) return ${op};`;
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

/** The kernel's body; the driver checks and writes are those of run.ts's interpreter. */
function kernelSource(p: PlanInternal): string {
  const lines = ['"use strict";'];
  const chunked = p.opCount > KERNEL_CHUNK_OPS;
  if (chunked) {
    for (let first = 0, c = 0; first < p.opCount; first += KERNEL_CHUNK_OPS, c++) {
      lines.push(`function chunk${c}(pose, d) {`);
      for (let op = first; op < Math.min(first + KERNEL_CHUNK_OPS, p.opCount); op++) lines.push(operationSource(p, op));
      lines.push('return -1;', '}');
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
    for (let op = 0; op < p.opCount; op++) lines.push(operationSource(p, op));
  }
  lines.push('return -1;', '};');
  return lines.join('\n');
}

/**
 * The plan's kernel, or null where the environment forbids code generation (a
 * Content-Security-Policy without 'unsafe-eval' makes Function throw EvalError); run.ts
 * then interprets the operations.
 */
export function specialise(p: PlanInternal): Kernel | null {
  let factory: (...bound: unknown[]) => Kernel;
  try {
    factory = new Function(...BINDINGS, kernelSource(p)) as typeof factory;
  } catch (error) {
    if (error instanceof EvalError) return null;
    throw error;
  }
  return factory(p, p.params, p.driverValue, polarInto, circleCircleIntersectInto, circleLineIntersectInto, solveBlock);
}
