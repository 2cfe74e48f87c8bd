import { describe, expect, it } from 'vitest';
import { compile, type Linkage } from '../../../src/core/linkage';
import {
  AXLE_POINT,
  DEMO_LAYOUTS,
  DEMO_TRAIL_BIKE,
  SHOCK_EYE,
  SHOCK_FRAME_EYE,
  fourBarSeatStayAxle,
  linkageDrivenSinglePivot,
  shortLinkFourBar,
  singlePivot,
  stephensonSixBar,
  suspensionCurves,
  wattSixBar,
  type Bicycle,
  type SuspensionOptions,
} from '../../../src/core/suspension';

const L = DEMO_LAYOUTS;
const demos: [string, Linkage, string][] = [
  ['single pivot', singlePivot(L.singlePivot), 'swingArm'],
  ['linkage-driven single pivot', linkageDrivenSinglePivot(L.linkageDrivenSinglePivot), 'swingArm'],
  ['four-bar, axle on the seat stay', fourBarSeatStayAxle(L.fourBarSeatStayAxle), 'seatStay'],
  ['short-link four-bar', shortLinkFourBar(L.shortLinkFourBar), 'rearTriangle'],
  ['Watt six-bar', wattSixBar(L.wattSixBar), 'seatStay'],
  ['Stephenson six-bar', stephensonSixBar(L.stephensonSixBar), 'seatStay'],
];

function reasonOf(linkage: Linkage, bicycle: Bicycle = DEMO_TRAIL_BIKE, options: SuspensionOptions = {}): string {
  const r = suspensionCurves(linkage, bicycle, options);
  return r.ok ? 'ok' : r.reason;
}

describe('layouts', () => {
  for (const [name, linkage, axleBody] of demos) {
    it(`${name}: compiles, driven by the shock at its eye-to-eye length, axle on ${axleBody}`, () => {
      const c = compile(linkage);
      expect(c.ok).toBe(true);
      if (!c.ok) return;
      expect(linkage.driver).toEqual({ kind: 'length', from: SHOCK_EYE, to: SHOCK_FRAME_EYE });
      expect(c.plan.driverReferenceValue).toBeCloseTo(DEMO_TRAIL_BIKE.shock.eyeToEyeMm, 9);
      expect(linkage.points?.find((p) => p.id === AXLE_POINT)?.body).toBe(axleBody);
    });
  }

  it('the Stephenson six-bar needs a Newton block: its seat stay closes two loops at once', () => {
    const c = compile(stephensonSixBar(L.stephensonSixBar));
    expect(c.ok && c.plan.newtonUnknowns).toBeGreaterThan(0);
  });

  it('the Watt six-bar can carry the axle on the chain stay', () => {
    const linkage = wattSixBar({ ...L.wattSixBar, axleBody: 'chainStay' });
    expect(linkage.points?.[0].body).toBe('chainStay');
    expect(compile(linkage).ok).toBe(true);
  });
});

describe('suspensionCurves on the demo trail bike', () => {
  for (const [name, linkage] of demos) {
    it(`${name}: curves start at zero, travel rises, sag point lies on the curves`, () => {
      const r = suspensionCurves(linkage, DEMO_TRAIL_BIKE, { steps: 41 });
      expect(r.ok).toBe(true);
      if (!r.ok) return;
      const { curves: c, sagPoint, totalTravelMm } = r.report;
      expect(c.steps).toBe(41);
      expect(c.travelMm[0]).toBe(0);
      expect(c.rearwardMm[0]).toBe(0);
      expect(c.shockTravelMm[40]).toBeCloseTo(DEMO_TRAIL_BIKE.shock.strokeMm, 9);
      for (let k = 1; k < 41; k++) expect(c.travelMm[k]).toBeGreaterThan(c.travelMm[k - 1]);
      c.chainGrowthMm.forEach((g) => expect(g[0]).toBeCloseTo(0, 12));
      expect(c.antiSquatPct).toHaveLength(DEMO_TRAIL_BIKE.cogTeeth.length);
      expect(sagPoint.travelMm).toBeCloseTo(DEMO_TRAIL_BIKE.sag * totalTravelMm, 8);
      // The sag point is solved exactly; it must lie between its neighbouring samples.
      const k = c.travelMm.findIndex((t) => t > sagPoint.travelMm);
      const lo = Math.min(c.leverageRatio[k - 1], c.leverageRatio[k]);
      const hi = Math.max(c.leverageRatio[k - 1], c.leverageRatio[k]);
      expect(sagPoint.leverageRatio).toBeGreaterThanOrEqual(lo - 1e-12);
      expect(sagPoint.leverageRatio).toBeLessThanOrEqual(hi + 1e-12);
      expect(r.report.progression).toBeCloseTo((c.leverageRatio[0] - c.leverageRatio[40]) / c.leverageRatio[0], 14);
      expect(r.report.caution).toContain('ISO 4210');
    });
  }

  it('sweeps to the wheel travel asked', () => {
    const r = suspensionCurves(demos[2][1], DEMO_TRAIL_BIKE, { travelMm: 120, steps: 11 });
    expect(r.ok && r.report.curves.travelMm[10]).toBeCloseTo(120, 8);
  });

  it('reports the instant centre path of the axle body: the main pivot for a single pivot (theorem)', () => {
    const r = suspensionCurves(demos[0][1], DEMO_TRAIL_BIKE, { steps: 5 });
    if (!r.ok) throw new Error(r.reason);
    expect(Array.from(r.report.curves.icPath.xMm)).toEqual([30, 30, 30, 30, 30]);
    expect(Array.from(r.report.curves.icPath.yMm)).toEqual([80, 80, 80, 80, 80]);
  });
});

describe('suspensionCurves: bad bicycles and layouts, in words', () => {
  it('a shock longer than the layout allows', () => {
    expect(reasonOf(demos[0][1], { ...DEMO_TRAIL_BIKE, shock: { eyeToEyeMm: 450, strokeMm: 55 } })).toMatch(
      /^the shock's eye-to-eye length 450 mm is longer than the layout allows: drawn with the shock at 210 mm, it assembles only up to 409\.\d+ mm$/,
    );
  });

  it('a stroke that bottoms out before the travel asked', () => {
    expect(reasonOf(demos[0][1], DEMO_TRAIL_BIKE, { travelMm: 160 })).toMatch(
      /^the shock bottoms out before the travel asked: its 55 mm stroke gives 143\.\d+ mm of wheel travel, less than the 160 mm asked$/,
    );
  });

  it('a linkage that locks inside the travel', () => {
    // The frame eye 339.7 mm from the pivot: the arm and the shock fall in line at 150 mm.
    const pivot = L.singlePivot.mainPivot;
    const eye = L.singlePivot.shockEye;
    const a = Math.hypot(eye.x - pivot.x, eye.y - pivot.y);
    const b = a + 150;
    const gamma = Math.acos((a * a + b * b - 210 * 210) / (2 * a * b));
    const t = Math.atan2(eye.y - pivot.y, eye.x - pivot.x) - gamma;
    const locking = singlePivot({ ...L.singlePivot, shockFrameEye: { x: pivot.x + b * Math.cos(t), y: pivot.y + b * Math.sin(t) } });
    expect(reasonOf(locking, { ...DEMO_TRAIL_BIKE, shock: { eyeToEyeMm: 210, strokeMm: 80 } })).toMatch(
      /^the linkage locks inside the stroke: at shock length 150 mm \(60 mm into the 80 mm stroke\) joint 'shockEye' can no longer be placed \(its links fall in line\); the shock cannot reach the end of its stroke$/,
    );
  });

  it('a shock that extends as the wheel rises', () => {
    const eye = L.singlePivot.shockEye;
    const backwards = singlePivot({ ...L.singlePivot, shockFrameEye: { x: eye.x - 210, y: eye.y } });
    expect(reasonOf(backwards)).toMatch(/^the rear axle does not rise as the shock shortens at shock length 210 mm/);
  });

  it('a layout drawn away from the bicycle’s rear axle', () => {
    const off = singlePivot({ ...L.singlePivot, axle: { x: -440, y: -12 } });
    expect(reasonOf(off)).toBe(
      "at full extension (shock 210 mm) the layout puts the rear axle at (-440, -12) mm, 5 mm from the bicycle's rear axle (-435, -12) mm; expected them within 0.5 mm: draw the layout at full extension or correct the bicycle",
    );
  });

  it('an invalid bicycle, a missing axle, an unknown brake body, too few steps', () => {
    expect(reasonOf(demos[0][1], { ...DEMO_TRAIL_BIKE, shock: { eyeToEyeMm: 65, strokeMm: 80 } })).toBe(
      'the bicycle is not valid: shock.strokeMm: stroke 80 mm is not shorter than the eye-to-eye length 65 mm',
    );
    expect(reasonOf(demos[0][1], DEMO_TRAIL_BIKE, { axlePoint: 'hub' })).toBe(
      'the layout has no rear axle point "hub" on a moving body; expected a named point on the axle-carrying body',
    );
    expect(reasonOf(demos[2][1], DEMO_TRAIL_BIKE, { floatingBrakeBody: 'ground' })).toBe(
      'the floating brake body "ground" is not a moving body of the layout; expected one of chainStay, seatStay, rocker',
    );
    expect(reasonOf(demos[0][1], DEMO_TRAIL_BIKE, { steps: 1 })).toBe('steps 1 is not a whole number from 2 to 10001');
  });
});
