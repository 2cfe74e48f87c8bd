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
import { runBatch } from '../../src/core/linkage/run';
import { KERNEL_CHUNK_OPS } from '../../src/core/linkage/specialise';
import { readLinkageFile } from '../../src/core/io/linkageFile';
import { dyadChain } from './hostileLinkages';
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
      // The batch entry, whose generated code reads the driver value for the length it sets.
      const values = Float64Array.from({ length: 40 }, (_, k) => (k % 13 === 5 ? -v0 : v0 * (0.3 + (1.4 * k) / 40)));
      const slots = Int32Array.from({ length: generated.slotCount }, (_, k) => 2 * k);
      const out = new Float64Array(2 * slots.length * values.length);
      const expected = new Float64Array(out.length);
      let failed = 0;
      values.forEach((v, k) => {
        const ok = run(interpreted, v, b);
        if (!ok) failed++;
        slots.forEach((s, j) => {
          expected[2 * (k * slots.length + j)] = ok ? b[s] : NaN;
          expected[2 * (k * slots.length + j) + 1] = ok ? b[s + 1] : NaN;
        });
      });
      expect(runBatch(generated, values, a, slots, out)).toBe(failed);
      expect(failed).toBeGreaterThan(0);
      expect(bits(out)).toBe(bits(expected));
      expect(bits(a)).toBe(bits(b));
      expect(generated.params).toEqual(interpreted.params);
    }
  });
});

describe('the batch entry (runBatch) against run called value by value, bit for bit', () => {
  // Second, independent method: run called once per driver value on the interpreter, the
  // outputs read from its pose after each call. Source: common practice (differential testing).
  it.each(FAMILIES.map((f, i) => [f.name, f, 20260101 + i] as const))('%s: the generated batch and the interpreter\'s give the poses, outputs, failures and failing operation of run', (_name, family, seed) => {
    let failures = 0;
    let values = 0;
    for (const [generated, interpreted] of seededPlans(family, seed)) {
      expect(generated.kernel?.batch).toBeTypeOf('function');
      interpreted.kernel = null;
      const reference = compile(generated.linkage);
      if (!reference.ok) throw new Error('the design compiled once and should again');
      const byValue = reference.plan as PlanInternal;
      byValue.kernel = null;
      // All driver values in one call, then a few calls of a few values: the pose carries over.
      const all = Float64Array.from(driverValues(generated.driverReferenceValue));
      const chunks = [all, all.subarray(0, 5), all.subarray(5, 6), all.subarray(190, 203), new Float64Array(0)];
      // Every joint and point, the coupler point alone, and a slot twice.
      const slotSets = [Int32Array.from({ length: generated.slotCount }, (_, k) => 2 * k), Int32Array.of(2 * (generated.slotCount - 1)), Int32Array.of(0, 2, 0)];
      for (const slots of slotSets) {
        const a = Float64Array.from(generated.reference);
        const b = Float64Array.from(generated.reference);
        const c = Float64Array.from(generated.reference);
        for (const chunk of chunks) {
          const outA = new Float64Array(2 * slots.length * chunk.length);
          const outB = new Float64Array(outA.length);
          const outC = new Float64Array(outA.length);
          const failedA = runBatch(generated, chunk, a, slots, outA);
          const failedB = runBatch(interpreted, chunk, b, slots, outB);
          let failedC = 0;
          chunk.forEach((v, i) => {
            const ok = run(byValue, v, c);
            if (!ok) failedC++;
            slots.forEach((s, j) => {
              outC[2 * (i * slots.length + j)] = ok ? c[s] : NaN;
              outC[2 * (i * slots.length + j) + 1] = ok ? c[s + 1] : NaN;
            });
          });
          expect([failedA, failedB]).toEqual([failedC, failedC]);
          if (chunk.length > 0) expect([generated.failedOp, interpreted.failedOp]).toEqual([byValue.failedOp, byValue.failedOp]);
          expect(bits(outA)).toBe(bits(outC));
          expect(bits(outB)).toBe(bits(outC));
          expect(bits(a)).toBe(bits(c));
          expect(bits(b)).toBe(bits(c));
          failures += failedC;
          values += chunk.length;
        }
      }
    }
    // Both outcomes are exercised (non-finite driver values fail at least).
    expect(failures).toBeGreaterThan(0);
    expect(values - failures).toBeGreaterThan(0);
  });

  // Source: run value by value again; a plan too long for one function has no generated batch, and runBatch calls its chunked kernel per value.
  it('a plan longer than one generated function gives run\'s bits too', () => {
    const parsed = readLinkageFile(dyadChain(600));
    if (!parsed.ok) throw new Error(JSON.stringify(parsed.issues));
    const plan = parsed.plan as PlanInternal;
    expect(plan.opCount).toBeGreaterThan(KERNEL_CHUNK_OPS);
    expect(plan.kernel).not.toBeNull();
    expect(plan.kernel?.batch).toBeNull();
    const v0 = plan.driverReferenceValue;
    const values = Float64Array.of(v0, v0 + 0.01, v0 + 2.5, NaN, v0 - 0.01);
    const slots = Int32Array.of(0, 2 * (plan.slotCount - 1));
    const a = Float64Array.from(plan.reference);
    const b = Float64Array.from(plan.reference);
    const out = new Float64Array(2 * slots.length * values.length);
    const expected = new Float64Array(out.length);
    let failed = 0;
    values.forEach((v, k) => {
      const ok = run(plan, v, b);
      if (!ok) failed++;
      slots.forEach((s, j) => {
        expected[2 * (k * slots.length + j)] = ok ? b[s] : NaN;
        expected[2 * (k * slots.length + j) + 1] = ok ? b[s + 1] : NaN;
      });
    });
    expect(runBatch(plan, values, a, slots, out)).toBe(failed);
    expect(failed).toBeGreaterThan(0);
    expect(bits(out)).toBe(bits(expected));
    expect(bits(a)).toBe(bits(b));
  });

  it('refuses an output array of the wrong length and a slot that is not a pose offset, saying what was expected', () => {
    const compiled = compile(fourBar());
    if (!compiled.ok) throw new Error('the four-bar compiles');
    const plan = compiled.plan;
    const pose = Float64Array.from(plan.reference);
    expect(() => runBatch(plan, new Float64Array(3), pose, Int32Array.of(8), new Float64Array(5))).toThrow(/out has 5 numbers; expected 6/);
    expect(() => runBatch(plan, new Float64Array(3), pose, Int32Array.of(3), new Float64Array(6))).toThrow(/slots\[0\] is 3; expected a pose offset/);
    expect(() => runBatch(plan, new Float64Array(3), pose, Int32Array.of(10), new Float64Array(6))).toThrow(/slots\[0\] is 10/);
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
