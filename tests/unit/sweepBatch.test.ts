import { describe, expect, it } from 'vitest';
import {
  FOUR_BAR_DEFAULT,
  SLIDER_CRANK_DEFAULT,
  STEPHENSON_I_DEFAULT,
  WATT_II_DEFAULT,
  WATT_I_DEFAULT,
  compile,
  fourBar,
  runWithRates,
  sliderCrank,
  stephensonI,
  sweep,
  wattI,
  wattII,
  type Linkage,
} from '../../src/core/linkage';
import { Prng } from '../../src/core/optimize/prng';

/**
 * A sweep of a plan without Newton blocks runs its samples in one batch (runBatch). Each
 * sample must still be what the plan gives at that driver value alone: with dyads only,
 * every joint is placed on its reference side whatever came before, so the pose and rates
 * at a value do not depend on the sweep (theorem: a dyad's position is a function of its
 * two centres and its side). Checked bit for bit against runWithRates from the reference
 * pose at each value, on seeded designs that turn fully and on designs that lock (which
 * the tracking handles); a lock's samples are the values where runWithRates fails.
 */

interface Family {
  readonly name: string;
  readonly build: (at: never) => Linkage;
  readonly defaults: object;
  /** Largest move of a default position (mm): enough that some designs lock and some turn fully. */
  readonly perturbMm: number;
}

const FAMILIES: readonly Family[] = [
  { name: 'four-bar', build: fourBar, defaults: FOUR_BAR_DEFAULT, perturbMm: 30 },
  { name: 'slider-crank', build: sliderCrank, defaults: SLIDER_CRANK_DEFAULT, perturbMm: 90 },
  { name: 'Watt I', build: wattI, defaults: WATT_I_DEFAULT, perturbMm: 30 },
  { name: 'Watt II', build: wattII, defaults: WATT_II_DEFAULT, perturbMm: 30 },
  { name: 'Stephenson I', build: stephensonI, defaults: STEPHENSON_I_DEFAULT, perturbMm: 30 },
];

const DESIGNS = 16;
const PERTURB_RAD = 0.3;
const STEPS = 181;

function perturbed(defaults: object, perturbMm: number, prng: Prng): object {
  const out: Record<string, unknown> = {};
  for (const [key, value] of Object.entries(defaults)) {
    if (typeof value === 'number') out[key] = value + PERTURB_RAD * (2 * prng.float() - 1);
    else {
      const { x, y } = value as { x: number; y: number };
      out[key] = { x: x + perturbMm * (2 * prng.float() - 1), y: y + perturbMm * (2 * prng.float() - 1) };
    }
  }
  return out;
}

function bits(a: Float64Array): string {
  return Array.from(new Uint32Array(a.buffer, a.byteOffset, 2 * a.length), (w) => w.toString(16)).join(' ');
}

describe('a sweep without Newton blocks, sample by sample against runWithRates at each value', () => {
  it.each(FAMILIES.map((f, i) => [f.name, f, 7100 + i] as const))('%s: the same poses, rates and assembled samples, bit for bit', (_name, family, seed) => {
    const prng = Prng.fromSeed(seed);
    let whole = 0;
    let locked = 0;
    for (let d = 0; d < DESIGNS; d++) {
      const compiled = compile(family.build(perturbed(family.defaults, family.perturbMm, prng) as never));
      if (!compiled.ok) continue;
      const plan = compiled.plan;
      expect(plan.newtonUnknowns).toBe(0);
      const v0 = plan.driverReferenceValue;
      const result = sweep(plan, { from: v0 - 0.3, to: v0 - 0.3 + 2 * Math.PI, steps: STEPS });
      const stride = 2 * plan.slotCount;
      const pose = new Float64Array(stride);
      const rates = new Float64Array(stride);
      let all = true;
      for (let k = 0; k < STEPS; k++) {
        pose.set(plan.reference);
        const ok = runWithRates(plan, result.values[k], pose, rates);
        expect(result.assembled[k]).toBe(ok ? 1 : 0);
        if (!ok) {
          all = false;
          continue;
        }
        expect(bits(result.poses.subarray(k * stride, (k + 1) * stride))).toBe(bits(pose));
        expect(bits(result.rates.subarray(k * stride, (k + 1) * stride))).toBe(bits(rates));
      }
      // Source: definition — a full turn is a turn of 2π that assembles throughout.
      if (all) expect(result.locks).toEqual([]);
      else expect(result.fullTurn).toBe(false);
      if (all) whole++;
      else locked++;
    }
    // The seeds hold both kinds of design, so both ways through the sweep are exercised.
    expect(whole).toBeGreaterThan(0);
    expect(locked).toBeGreaterThan(0);
  });

  it('a length-driven plan too', () => {
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
    const compiled = compile(linkage);
    if (!compiled.ok) throw new Error('the shock-driven rocker should compile');
    const plan = compiled.plan;
    const v0 = plan.driverReferenceValue;
    for (const range of [{ from: 0.8 * v0, to: 1.1 * v0, steps: 31 }, { from: 0.2 * v0, to: 1.1 * v0, steps: 31 }]) {
      const result = sweep(plan, range);
      const stride = 2 * plan.slotCount;
      const pose = new Float64Array(stride);
      const rates = new Float64Array(stride);
      let failed = 0;
      for (let k = 0; k < range.steps; k++) {
        pose.set(plan.reference);
        const ok = runWithRates(plan, result.values[k], pose, rates);
        expect(result.assembled[k]).toBe(ok ? 1 : 0);
        if (!ok) {
          failed++;
          continue;
        }
        expect(bits(result.poses.subarray(k * stride, (k + 1) * stride))).toBe(bits(pose));
        expect(bits(result.rates.subarray(k * stride, (k + 1) * stride))).toBe(bits(rates));
      }
      if (range.from < 0.5 * v0) expect(failed).toBeGreaterThan(0);
      else expect(failed).toBe(0);
    }
  });
});
