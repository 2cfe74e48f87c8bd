/**
 * Published test functions of global optimisation, as search objectives, so the engine
 * and the optimizers can be run and measured against a known minimum without a
 * linkage in the loop. Definitions and domains from Jamil and Yang (2013), "A literature
 * survey of benchmark functions for global optimization problems".
 */
import { fromUnitBoxInto, toUnitBoxInto } from '../src/core/optimize';
import type { SearchObjective } from './searchObjective';
import { TEST_FUNCTION_NAMES, type TestFunctionName } from './testFunctionNames';


/** The dimensions a test-function objective accepts. */
export const MAX_TEST_FUNCTION_DIM = 1000;

interface TestFunction {
  readonly lower: number;
  readonly upper: number;
  readonly minDim: number;
  /** The global minimiser's coordinate (the same in every dimension) and the minimum. */
  readonly optimumCoordinate: number;
  readonly minimum: number;
  value(x: Float64Array): number;
}

const FUNCTIONS: Readonly<Record<TestFunctionName, TestFunction>> = {
  // Rosenbrock: Σ 100 (x_{i+1} − x_i²)² + (x_i − 1)², −30 ≤ x_i ≤ 30, minimum 0 at (1, …, 1).
  rosenbrock: {
    lower: -30,
    upper: 30,
    minDim: 2,
    optimumCoordinate: 1,
    minimum: 0,
    value(x) {
      let sum = 0;
      for (let i = 0; i + 1 < x.length; i++) {
        const a = x[i + 1] - x[i] * x[i];
        const b = x[i] - 1;
        sum += 100 * a * a + b * b;
      }
      return sum;
    },
  },
  // Rastrigin: 10 d + Σ (x_i² − 10 cos(2π x_i)), −5.12 ≤ x_i ≤ 5.12, minimum 0 at (0, …, 0);
  // a local minimum near every integer point, the multimodal case for restarts.
  rastrigin: {
    lower: -5.12,
    upper: 5.12,
    minDim: 1,
    optimumCoordinate: 0,
    minimum: 0,
    value(x) {
      let sum = 10 * x.length;
      for (let i = 0; i < x.length; i++) sum += x[i] * x[i] - 10 * Math.cos(2 * Math.PI * x[i]);
      return sum;
    },
  },
};

export function isTestFunctionName(name: unknown): name is TestFunctionName {
  return typeof name === 'string' && (TEST_FUNCTION_NAMES as readonly string[]).includes(name);
}

/** The objective of a test function, or what is wrong with the name or dimension. */
export function testFunctionObjective(
  name: unknown,
  dim: unknown,
): { ok: true; objective: SearchObjective } | { ok: false; reason: string } {
  if (!isTestFunctionName(name)) {
    return { ok: false, reason: `test function is ${JSON.stringify(name)}; expected one of ${TEST_FUNCTION_NAMES.join(', ')}` };
  }
  const f = FUNCTIONS[name];
  if (!(typeof dim === 'number' && Number.isInteger(dim) && dim >= f.minDim && dim <= MAX_TEST_FUNCTION_DIM)) {
    return { ok: false, reason: `dim of ${name} is ${JSON.stringify(dim)}; expected an integer in [${f.minDim}, ${MAX_TEST_FUNCTION_DIM}]` };
  }
  const lower = new Float64Array(dim).fill(f.lower);
  const upper = new Float64Array(dim).fill(f.upper);
  const objective: SearchObjective = {
    dim,
    lower,
    upper,
    fromSearchBoxInto: (u, x) => fromUnitBoxInto(u, lower, upper, x),
    toSearchBoxInto: (x, u) => toUnitBoxInto(x, lower, upper, u),
    variableNames: Array.from({ length: dim }, (_, i) => `x${i + 1}`),
    evaluate(x, out) {
      out[0] = f.value(x);
      out[1] = 0;
    },
    describe(x) {
      let squared = 0;
      for (let i = 0; i < x.length; i++) squared += (x[i] - f.optimumCoordinate) ** 2;
      return { kind: 'test-function', name, value: f.value(x), minimum: f.minimum, distanceToOptimum: Math.sqrt(squared) };
    },
  };
  return { ok: true, objective };
}
