/**
 * The side view's primitives checked against geometry worked out here: the chain's
 * upper run is the common tangent of the two pitch circles, the wheels stand where the
 * layout solved by hand (tests/reference/suspension-closed-form.ts) puts the axle, and
 * the shock's body and stroke fill the eye-to-eye length; then the SVG file's parts.
 */
import { describe, expect, it } from 'vitest';
import { SCALE_BAR_MM, sideViewSvg } from '../../../src/core/io/sideViewSvg';
import {
  DEMO_LAYOUTS,
  DEMO_TRAIL_BIKE,
  LAYOUT_KINDS,
  SUSPENSION_CAUTION,
  buildLayout,
  demoAxleBody,
  demoPivots,
  fourBarSeatStayAxle,
  sideView,
  singlePivot,
  suspensionCurves,
  type SideViewPrimitive,
} from '../../../src/core/suspension';
import { solveAt, type RockerFourBar, type V } from '../../reference/suspension-closed-form';

const L = DEMO_LAYOUTS;
const B = DEMO_TRAIL_BIKE;
const P = (p: { x: number; y: number }): V => [p.x, p.y];
const E2E = B.shock.eyeToEyeMm;
const STROKE = B.shock.strokeMm;
/** 1e-9 of the bicycle's size (mm): rounding, not method error. */
const TOL_MM = 1e-9 * 1000;

/** ISO 606 pitch circle, written out here: the circumradius of the pitch polygon, p / (2 sin(π/z)). */
const pitchR = (z: number) => B.chainPitchMm! / (2 * Math.sin(Math.PI / z));

function view(linkage: Parameters<typeof sideView>[0]['linkage'], shockLengthMm: number, cogIndex: number): SideViewPrimitive[] {
  const r = sideView({ bicycle: B, linkage }, { shockLengthMm, cogIndex });
  if (!r.ok) throw new Error(r.reason);
  return r.primitives;
}

function one<K extends SideViewPrimitive['kind']>(ps: SideViewPrimitive[], kind: K, role: string): Extract<SideViewPrimitive, { kind: K }> {
  const found = ps.filter((p) => p.kind === kind && p.role === role);
  expect(found).toHaveLength(1);
  return found[0] as Extract<SideViewPrimitive, { kind: K }>;
}

const singlePivotByHand: RockerFourBar = {
  R0: P(L.singlePivot.mainPivot), D0: P(L.singlePivot.shockEye), E0: P(L.singlePivot.shockEye), F: P(L.singlePivot.shockFrameEye),
};
const fourBarByHand: RockerFourBar = {
  R0: P(L.fourBarSeatStayAxle.rockerPivot),
  D0: P(L.fourBarSeatStayAxle.rockerStayPin),
  E0: P(L.fourBarSeatStayAxle.shockEye),
  F: P(L.fourBarSeatStayAxle.shockFrameEye),
  M: P(L.fourBarSeatStayAxle.mainPivot),
  C0: P(L.fourBarSeatStayAxle.stayPivot),
};

describe('sideView', () => {
  const cases = [
    { name: 'single pivot', linkage: singlePivot(L.singlePivot), axleAt: (s: number) => solveAt(singlePivotByHand, s)!.rocker(P(B.rearAxleMm)) },
    { name: 'four-bar, axle on the seat stay', linkage: fourBarSeatStayAxle(L.fourBarSeatStayAxle), axleAt: (s: number) => solveAt(fourBarByHand, s)!.coupler(P(B.rearAxleMm)) },
  ];
  for (const c of cases) {
    for (const [s, cog] of [[E2E, 0], [E2E - 0.4 * STROKE, 5], [E2E - STROKE, 11]] as const) {
      it(`${c.name}, shock ${s} mm, cog ${B.cogTeeth[cog]} T: wheels, sprockets and the chain's upper run`, () => {
        const ps = view(c.linkage, s, cog);
        const A = c.axleAt(s);
        const R = B.wheelRadiusMm;
        // theorem: the axle solved by hand (law of cosines, circle–circle intersection)
        const rear = one(ps, 'circle', 'rearWheel');
        expect(Math.hypot(rear.cxMm - A[0], rear.cyMm - A[1])).toBeLessThan(TOL_MM);
        expect(rear.rMm).toBe(R);
        // The front wheel, of the same radius, on the level ground through the rear contact patch, at the front contact's x
        const front = one(ps, 'circle', 'frontWheel');
        expect(front.cxMm).toBe(B.rearAxleMm.x + B.wheelbaseMm!);
        expect(front.cyMm - R).toBeCloseTo(rear.cyMm - R, 9);
        const ground = one(ps, 'segment', 'ground');
        expect(ground.y1Mm).toBeCloseTo(A[1] - R, 9);

        const ring = one(ps, 'circle', 'chainring');
        const cogCircle = one(ps, 'circle', 'cog');
        expect([ring.cxMm, ring.cyMm]).toEqual([0, 0]);
        expect(ring.rMm).toBeCloseTo(pitchR(B.chainringTeeth), 12);
        expect(cogCircle.rMm).toBeCloseTo(pitchR(B.cogTeeth[cog]), 12);
        expect([cogCircle.cxMm, cogCircle.cyMm]).toEqual([rear.cxMm, rear.cyMm]);

        // theorem: a segment tangent to a circle has its end on the circle and is perpendicular to the radius there
        const chain = one(ps, 'segment', 'chain');
        const d: V = [chain.x2Mm - chain.x1Mm, chain.y2Mm - chain.y1Mm];
        const len = Math.hypot(...d);
        const ends: [V, SideViewPrimitive & { kind: 'circle' }][] = [[[chain.x1Mm, chain.y1Mm], cogCircle], [[chain.x2Mm, chain.y2Mm], ring]];
        for (const [end, circle] of ends) {
          const r: V = [end[0] - circle.cxMm, end[1] - circle.cyMm];
          expect(Math.hypot(...r)).toBeCloseTo(circle.rMm, 9);
          expect(Math.abs(r[0] * d[0] + r[1] * d[1]) / (circle.rMm * len)).toBeLessThan(1e-12);
          // The distance from the centre to the line is the radius (no crossing: a tangent, not a secant)
          const distance = Math.abs((circle.cxMm - chain.x1Mm) * d[1] - (circle.cyMm - chain.y1Mm) * d[0]) / len;
          expect(distance).toBeCloseTo(circle.rMm, 9);
        }
        // The upper run: both tangent points above the line of centres, on the same side (an external tangent)
        const side = (p: V) => (p[0] - rear.cxMm) * (0 - rear.cyMm) - (p[1] - rear.cyMm) * (0 - rear.cxMm);
        expect(Math.sign(side([chain.x1Mm, chain.y1Mm]))).toBe(Math.sign(side([chain.x2Mm, chain.y2Mm])));
        expect(chain.y1Mm).toBeGreaterThan(rear.cyMm);
        expect(chain.y2Mm).toBeGreaterThan(0);

        // The shock: the body as long as the shock fully compressed, then what is left of the stroke, eye to eye in line
        const body = one(ps, 'segment', 'shockBody');
        const stroke = one(ps, 'segment', 'shockStroke');
        expect(Math.hypot(body.x2Mm - body.x1Mm, body.y2Mm - body.y1Mm)).toBeCloseTo(E2E - STROKE, 9);
        expect(Math.hypot(stroke.x2Mm - stroke.x1Mm, stroke.y2Mm - stroke.y1Mm)).toBeCloseTo(s - (E2E - STROKE), 9);
        expect([stroke.x1Mm, stroke.y1Mm]).toEqual([body.x2Mm, body.y2Mm]);
        expect(Math.hypot(stroke.x2Mm - body.x1Mm, stroke.y2Mm - body.y1Mm)).toBeCloseTo(s, 9);
        const frameEye = ps.find((p) => p.kind === 'point' && p.label === 'shockFrameEye');
        expect(frameEye).toMatchObject({ role: 'framePivot', xMm: body.x1Mm, yMm: body.y1Mm });
      });
    }
  }

  for (const kind of LAYOUT_KINDS) {
    it(`${kind}: at full compression the rear wheel stands where the swept metrics put the axle`, () => {
      const linkage = buildLayout(kind, demoPivots(kind), B.rearAxleMm, demoAxleBody(kind));
      const r = suspensionCurves(linkage, B, { steps: 31 });
      if (!r.ok) throw new Error(r.reason);
      const c = r.report.curves;
      const rear = one(view(linkage, c.shockLengthMm[30], 11), 'circle', 'rearWheel');
      // The same branch reached two ways: 30 steps of the metrics' sweep, and the side view's own from the drawn pose
      expect(Math.hypot(rear.cxMm - c.axleXMm[30], rear.cyMm - c.axleYMm[30])).toBeLessThan(1e-6);
    });
  }

  it('draws every pivot, labelled, and the links between them', () => {
    const ps = view(fourBarSeatStayAxle(L.fourBarSeatStayAxle), E2E, 0);
    const labels = ps.filter((p) => p.kind === 'point').map((p) => p.label).sort();
    expect(labels).toEqual(['bottom bracket', 'mainPivot', 'rear axle', 'rockerPivot', 'rockerStayPin', 'shockEye', 'shockFrameEye', 'stayPivot'].sort());
    const links = ps.filter((p) => p.kind === 'segment' && p.role === 'link').map((p) => p.label);
    // chain stay 1, seat stay 1 + 2 to the axle, rocker's triangle 3
    expect(links.sort()).toEqual(['chainStay', 'rocker', 'rocker', 'rocker', 'seatStay', 'seatStay', 'seatStay']);
  });

  it('refuses a shock length outside the stroke and a cog the cassette lacks, in words', () => {
    const linkage = singlePivot(L.singlePivot);
    const outside = sideView({ bicycle: B, linkage }, { shockLengthMm: E2E + 1, cogIndex: 0 });
    expect(outside).toEqual({ ok: false, reason: `shock length ${E2E + 1} mm is outside the shock's stroke; expected ${E2E - STROKE} to ${E2E} mm` });
    const cog = sideView({ bicycle: B, linkage }, { shockLengthMm: E2E, cogIndex: 12 });
    expect(!cog.ok && cog.reason).toBe('cog 12 is not one of the cassette\'s; expected an index from 0 to 11');
  });
});

describe('sideViewSvg', () => {
  const ps = view(fourBarSeatStayAxle(L.fourBarSeatStayAxle), E2E - 0.3 * STROKE, 4);
  const svg = sideViewSvg(ps, { caution: SUSPENSION_CAUTION, title: 'Trail bike <four-bar> & sag' });

  it('has a title, the caution whole in <desc> and as text lines, and the ISO 4210 words', () => {
    expect(svg.startsWith('<svg xmlns="http://www.w3.org/2000/svg"')).toBe(true);
    expect(svg).toContain('<title>Trail bike &lt;four-bar&gt; &amp; sag</title>');
    expect(svg).toContain(`<desc>${SUSPENSION_CAUTION}</desc>`);
    const lines = [...svg.matchAll(/<text[^>]*class="caution"[^>]*>([^<]*)<\/text>/g)].map((m) => m[1]);
    expect(lines.length).toBeGreaterThan(1);
    expect(lines.join(' ')).toBe(SUSPENSION_CAUTION);
    for (const words of ['kinematics only', 'qualified engineer', 'ISO 4210']) expect(svg).toContain(words);
  });

  it('labels every pivot, draws the axes from the bottom bracket and a scale bar of its stated length', () => {
    for (const label of ['mainPivot', 'stayPivot', 'rockerPivot', 'rockerStayPin', 'shockEye', 'shockFrameEye', 'rear axle', 'bottom bracket']) {
      expect(svg).toContain(`class="label">${label}</text>`);
    }
    expect(svg).toMatch(/<path d="M0 0 H60 /);
    expect(svg).toMatch(/<path d="M0 0 V-60 /);
    expect(svg).toContain('origin (0, 0): bottom bracket');
    const bar = /<path d="M(-?[\d.]+) (-?[\d.]+) V(-?[\d.]+) H(-?[\d.]+) V(-?[\d.]+)"[^>]*data-role="scale-bar"/.exec(svg);
    expect(bar).not.toBeNull();
    expect(Number(bar![4]) - Number(bar![1])).toBeCloseTo(SCALE_BAR_MM, 6);
    expect(svg).toContain(`>${SCALE_BAR_MM} mm</text>`);
  });

  it('draws at 1:1 with y up: the rear wheel circle at (x, −y), its radius in mm', () => {
    const rear = one(ps, 'circle', 'rearWheel');
    const m = /<circle cx="(-?[\d.]+)" cy="(-?[\d.]+)" r="(-?[\d.]+)"[^>]*data-role="rearWheel"/.exec(svg);
    expect(m).not.toBeNull();
    expect(Number(m![1])).toBeCloseTo(rear.cxMm, 3);
    expect(Number(m![2])).toBeCloseTo(-rear.cyMm, 3);
    expect(Number(m![3])).toBe(B.wheelRadiusMm);
    const [, , , w, h] = /viewBox="(-?[\d.]+) (-?[\d.]+) ([\d.]+) ([\d.]+)"/.exec(svg)!;
    expect(svg).toContain(`width="${w}mm" height="${h}mm"`);
  });

  it('escapes labels', () => {
    const out = sideViewSvg([{ kind: 'point', role: 'pivot', label: 'a<b&"c"', xMm: 0, yMm: 0 }], { caution: 'x' });
    expect(out).toContain('a&lt;b&amp;&quot;c&quot;');
    expect(out).not.toContain('a<b');
  });
});
