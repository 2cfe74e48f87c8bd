/**
 * A Stephenson curve keeps the poses it solves, one per 2° bin of the driver, so a value
 * asked again costs a lookup, not a solve. Second method: a fresh curve for the same
 * design, asked only what the check needs, must give the same answers to the bit as the
 * curve that was asked other things first; and reading the samples from the bins
 * (atIoAround) must give what asking each sample in turn gives, and leave the curve
 * where those calls leave it (the solves after it land on the same bits).
 */
import { describe, expect, it } from 'vitest';
import { compile } from '../../../src/core/linkage';
import * as families from '../../../src/core/linkage/families';
import { CURVE_MARGIN, CURVE_OUT_LENGTH } from '../../../src/core/synthesis/curve';
import { createPoseFamily, type PoseFamilyId } from '../../../src/core/synthesis/poseFamilies';
import { curveAt } from '../../support/curveAt';

const SAMPLES = 180;
const TURN = 2 * Math.PI;
const CASES: readonly [PoseFamilyId, () => ReturnType<typeof families.fourBar>][] = [
  ['stephenson-ii', () => families.stephensonII()],
  ['stephenson-iii', () => families.stephensonIII()],
];

/** The family's curve with its default design loaded (whose crank turns fully: every bin holds a pose). */
function loadedCurve(family: PoseFamilyId, build: () => ReturnType<typeof families.fourBar>) {
  const compiled = compile(build());
  if (!compiled.ok) throw new Error(`${family} does not compile`);
  const encoding = createPoseFamily(family, {}, { cx: 0, cy: 0, size: 200 });
  encoding.load(Float64Array.from(compiled.plan.reference), 0, new Float64Array(16));
  return encoding.curve;
}

/** The pose the curve holds (PlanCurve's, not part of CurveEvaluator). */
function poseOf(curve: object): Float64Array {
  return (curve as { readonly pose: Float64Array }).pose;
}

/** Values between the bins' own, as a fit's driver values are: a third of a bin past each. */
const between = Array.from({ length: SAMPLES }, (_, k) => ((k + 1 / 3) * TURN) / SAMPLES);

describe("a Stephenson curve's kept poses", () => {
  for (const [family, build] of CASES) {
    it(`${family}: values between the bins asked first leave the bins' own answers as a fresh curve gives them`, () => {
      const fresh = loadedCurve(family, build);
      const asked = loadedCurve(family, build);
      const out = new Float64Array(CURVE_OUT_LENGTH);
      const first = between.map((t) => {
        expect(curveAt(asked, t, 1, out)).toBe(1);
        return Array.from(out.subarray(0, 4));
      });
      const expected = new Float64Array(CURVE_OUT_LENGTH);
      for (let k = 0; k < SAMPLES; k++) {
        const t = (k * TURN) / SAMPLES;
        expect(curveAt(fresh, t, 1, expected)).toBe(1);
        expect(curveAt(asked, t, 1, out)).toBe(1);
        expect(Array.from(out.subarray(0, 4))).toEqual(Array.from(expected.subarray(0, 4)));
      }
      // And the values between, asked again after the bins, as they were answered first.
      between.forEach((t, k) => {
        expect(curveAt(asked, t, 1, out)).toBe(1);
        expect(Array.from(out.subarray(0, 4))).toEqual(first[k]);
      });
    });

    it(`${family}: the samples read from the bins are the calls' answers, and leave the curve as the calls do`, () => {
      const read = loadedCurve(family, build);
      const called = loadedCurve(family, build);
      expect(read.atIoAround).toBeDefined();
      const around = new Float64Array(SAMPLES * CURVE_OUT_LENGTH);
      read.atIoAround?.(1, SAMPLES, around);
      const out = new Float64Array(CURVE_OUT_LENGTH);
      for (let k = 0; k < SAMPLES; k++) {
        curveAt(called, (k * TURN) / SAMPLES, 1, out);
        expect(Array.from(around.subarray(k * CURVE_OUT_LENGTH, k * CURVE_OUT_LENGTH + 4))).toEqual(Array.from(out.subarray(0, 4)));
        expect(around[k * CURVE_OUT_LENGTH + CURVE_MARGIN]).toBe(out[CURVE_MARGIN]);
      }
      // Left where the calls leave it: the last sample's pose (the start of what follows
      // where no kept poses bracket a value), and the same answers after.
      expect(Array.from(poseOf(read))).toEqual(Array.from(poseOf(called)));
      const next = new Float64Array(CURVE_OUT_LENGTH);
      for (const t of [TURN + 0.01, -0.02, ...between.slice(0, 12)]) {
        curveAt(read, t, 0, next);
        curveAt(called, t, 0, out);
        expect(Array.from(next.subarray(0, 2))).toEqual(Array.from(out.subarray(0, 2)));
      }
    });
  }
});
