import { describe, expect, it } from 'vitest';
import { SINCOS_REDUCTION_LIMIT } from '../../src/core/geometry';
import {
  FOUR_BAR_DEFAULT,
  SLIDER_CRANK_DEFAULT,
  STEPHENSON_III_DEFAULT,
  STEPHENSON_II_DEFAULT,
  STEPHENSON_I_DEFAULT,
  WATT_II_DEFAULT,
  WATT_I_DEFAULT,
  compile,
  fourBar,
  run,
  setReferencePose,
  sliderCrank,
  stephensonI,
  stephensonII,
  stephensonIII,
  wattI,
  wattII,
  type Linkage,
} from '../../src/core/linkage';
import { OP_STRIDE, type PlanInternal } from '../../src/core/linkage/plan';
import { WASM_DEFER, runWasm, wasmKernel } from '../../bench/wasmKernel';
import { Prng } from '../../src/core/optimize/prng';

/** A family: its builder and default positions (points and, for the slider-crank, an angle). */
interface Family {
  readonly name: string;
  readonly build: (at: never) => Linkage;
  readonly defaults: object;
}

/** A joint J sliding in a slot along the crank, held by a link to B0: the circle–line operation on a moving body. */
interface SlottedCrankPositions {
  readonly A0: { x: number; y: number };
  readonly B0: { x: number; y: number };
  readonly A: { x: number; y: number };
  readonly J: { x: number; y: number };
  readonly P: { x: number; y: number };
}

function slottedCrank(at: SlottedCrankPositions): Linkage {
  return {
    joints: [
      { id: 'A0', ...at.A0, ground: true },
      { id: 'B0', ...at.B0, ground: true },
      { id: 'A', ...at.A },
      { id: 'J', ...at.J },
    ],
    bodies: [
      { id: 'crank', joints: ['A0', 'A'] },
      { id: 'link', joints: ['B0', 'J'] },
    ],
    sliders: [{ joint: 'J', body: 'crank', angle: Math.atan2(at.J.y - at.A0.y, at.J.x - at.A0.x) }],
    points: [{ id: 'P', body: 'link', ...at.P }],
    driver: { kind: 'rotation', body: 'crank', pivot: 'A0', tip: 'A' },
  };
}

const SLOTTED_CRANK_DEFAULT: SlottedCrankPositions = { A0: { x: 0, y: 0 }, B0: { x: 60, y: -20 }, A: { x: 30, y: 10 }, J: { x: 60, y: 20 }, P: { x: 70, y: 0 } };

const FAMILIES: readonly Family[] = [
  { name: 'four-bar', build: fourBar, defaults: FOUR_BAR_DEFAULT },
  { name: 'slider-crank', build: sliderCrank, defaults: SLIDER_CRANK_DEFAULT },
  { name: 'Watt I', build: wattI, defaults: WATT_I_DEFAULT },
  { name: 'Watt II', build: wattII, defaults: WATT_II_DEFAULT },
  { name: 'Stephenson I', build: stephensonI, defaults: STEPHENSON_I_DEFAULT },
  { name: 'Stephenson II', build: stephensonII, defaults: STEPHENSON_II_DEFAULT },
  { name: 'Stephenson III', build: stephensonIII, defaults: STEPHENSON_III_DEFAULT },
  { name: 'slotted crank', build: slottedCrank, defaults: SLOTTED_CRANK_DEFAULT },
];

/** Seeded designs per family. */
const DESIGNS_PER_FAMILY = 6;
/** Largest move of a default position, per coordinate (mm); large enough to change branches and assembly limits. */
const PERTURB_MM = 12;
const PERTURB_RAD = 0.3;

/** The family's default positions, every coordinate (and angle) moved by a seeded amount. */
function perturbed(defaults: object, prng: Prng): object {
  const out: Record<string, unknown> = {};
  for (const [key, value] of Object.entries(defaults)) {
    if (typeof value === 'number') out[key] = value + PERTURB_RAD * (2 * prng.float() - 1);
    else {
      const { x, y } = value as { x: number; y: number };
      out[key] = { x: x + PERTURB_MM * (2 * prng.float() - 1), y: y + PERTURB_MM * (2 * prng.float() - 1) };
    }
  }
  return out;
}

/** Plans of seeded designs that compile (a design that does not is skipped, and counted). */
function seededPlans(family: Family, seed: number): PlanInternal[][] {
  const prng = Prng.fromSeed(seed);
  const pairs: PlanInternal[][] = [];
  for (let tries = 0; pairs.length < DESIGNS_PER_FAMILY && tries < 20 * DESIGNS_PER_FAMILY; tries++) {
    const linkage = family.build(perturbed(family.defaults, prng) as never);
    const generated = compile(linkage);
    const interpreted = compile(linkage);
    if (!generated.ok || !interpreted.ok) continue;
    pairs.push([generated.plan as PlanInternal, interpreted.plan as PlanInternal]);
  }
  return pairs;
}

/** Driver angles round two turns both ways, and those where polarInto leaves its reduction, and non-finite ones. */
function driverValues(v0: number): number[] {
  const values: number[] = [];
  for (let k = -96; k <= 96; k++) values.push(v0 + (2 * Math.PI * k) / 48 + 1e-3 * k);
  values.push(-0, 0, SINCOS_REDUCTION_LIMIT, -SINCOS_REDUCTION_LIMIT, SINCOS_REDUCTION_LIMIT * (1 + 2 ** -52), 1e7, -1e15, NaN, Infinity, -Infinity);
  return values;
}

function bits(pose: Float64Array): string {
  return Array.from(new Uint32Array(pose.buffer, pose.byteOffset, 2 * pose.length), (w) => w.toString(16)).join(' ');
}

describe('the generated kernel (specialise.ts) against the interpreter, bit for bit', () => {
  // Second, independent method: the interpreter in run.ts, which calls the geometry
  // functions (polarInto, circleCircleIntersectInto, circleLineIntersectInto) that the
  // generated code writes out inline. Source: common practice (differential testing).
  it.each(FAMILIES.map((f, i) => [f.name, f, 20260101 + i] as const))('%s: seeded designs give the same poses, results and failing operation', (_name, family, seed) => {
    const pairs = seededPlans(family, seed);
    expect(pairs.length).toBe(DESIGNS_PER_FAMILY);
    let failures = 0;
    let successes = 0;
    for (const [generated, interpreted] of pairs) {
      expect(generated.kernel).not.toBeNull();
      interpreted.kernel = null;
      const a = Float64Array.from(generated.reference);
      const b = Float64Array.from(interpreted.reference);
      for (const v of driverValues(generated.driverReferenceValue)) {
        const ok = run(generated, v, a);
        expect(ok).toBe(run(interpreted, v, b));
        expect(generated.failedOp).toBe(interpreted.failedOp);
        expect(bits(a)).toBe(bits(b));
        if (ok) successes++;
        else failures++;
      }
    }
    // Both outcomes are exercised: assembly over part of the turn and failure (non-finite inputs at least).
    expect(successes).toBeGreaterThan(0);
    expect(failures).toBeGreaterThan(0);
  });

  // Source: the interpreter again; a length driver writes its params before the operations run.
  it('a length-driven plan and a plan whose reference pose is reset agree too', () => {
    const linkage: Linkage = {
      joints: [
        { id: 'R0', x: 0, y: 0, ground: true },
        { id: 'S0', x: 90, y: -10, ground: true },
        { id: 'S', x: 30, y: 40 },
      ],
      bodies: [{ id: 'rocker', joints: ['R0', 'S'] }],
      points: [{ id: 'P', body: 'rocker', x: -40, y: 30 }],
      driver: { kind: 'length', from: 'S0', to: 'S' },
    };
    const g = compile(linkage);
    const i = compile(linkage);
    if (!g.ok || !i.ok) throw new Error('the shock-driven rocker should compile');
    const generated = g.plan as PlanInternal;
    const interpreted = i.plan as PlanInternal;
    interpreted.kernel = null;
    const moved = Float64Array.from(generated.reference, (x, k) => 1.1 * x + (k % 2 === 0 ? 3 : -2));
    for (const reference of [generated.reference.slice(), moved]) {
      setReferencePose(generated, reference);
      setReferencePose(interpreted, reference);
      const a = Float64Array.from(reference);
      const b = Float64Array.from(reference);
      const v0 = generated.driverReferenceValue;
      for (let k = 0; k <= 64; k++) {
        const v = v0 * (0.3 + (1.4 * k) / 64);
        expect(run(generated, v, a)).toBe(run(interpreted, v, b));
        expect(generated.failedOp).toBe(interpreted.failedOp);
        expect(bits(a)).toBe(bits(b));
      }
      for (const v of [0, -v0, NaN, Infinity]) {
        expect(run(generated, v, a)).toBe(run(interpreted, v, b));
        expect(bits(a)).toBe(bits(b));
      }
    }
  });
});

describe('the WebAssembly kernel (bench/wasmKernel.ts) against the interpreter, bit for bit', () => {
  // Second, independent method: the interpreter in run.ts (as above). The module is
  // encoded by hand from the plan; f64.sqrt is correctly rounded as Math.sqrt is
  // (WebAssembly core specification 1.0, 4.3.3; ECMA-262 Math.sqrt), so the bits can agree.
  it.each(FAMILIES.map((f, i) => [f.name, f, 20260101 + i] as const))('%s: seeded designs give the same poses and failing operation, or no module for a Newton block', (_name, family, seed) => {
    let compared = 0;
    for (const [generated, interpreted] of seededPlans(family, seed)) {
      interpreted.kernel = null;
      const kernel = wasmKernel(generated);
      expect(kernel === null).toBe(generated.blockCount > 0);
      if (kernel === null) continue;
      const a = Float64Array.from(generated.reference);
      const b = Float64Array.from(interpreted.reference);
      for (const v of driverValues(generated.driverReferenceValue)) {
        generated.driverValue[0] = v;
        const failed = runWasm(kernel, generated, a);
        const ok = run(interpreted, v, b);
        if (failed === WASM_DEFER) {
          // Beyond polarInto's reduction: the caller runs the JavaScript kernel instead.
          expect(Math.abs(v)).toBeGreaterThan(SINCOS_REDUCTION_LIMIT);
          continue;
        }
        expect(failed).toBe(interpreted.failedOp);
        expect(failed < 0).toBe(ok);
        // Slots placed before the failing operation (every slot on success).
        const end = failed < 0 ? generated.opCount : failed;
        for (let op = 0; op < end; op++) {
          const c = generated.ops[op * OP_STRIDE + 3];
          expect([Object.is(a[c], b[c]), Object.is(a[c + 1], b[c + 1]), op, v]).toEqual([true, true, op, v]);
        }
        compared++;
      }
    }
    if (family.name !== 'Stephenson II' && family.name !== 'Stephenson III') expect(compared).toBeGreaterThan(0);
  });
});
