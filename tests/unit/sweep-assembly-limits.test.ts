/**
 * Assembly limits found from the assembly condition itself, not by stepping: a lock
 * window narrower than the sample spacing, and change points passed, in the sweep and
 * in the report's default range.
 */
import { describe, expect, it } from 'vitest';
import { compile, fourBar, sweep, type Plan } from '../../src/core/linkage';
import { analyzeLinkage } from '../../src/core/linkage/report';

const DEG = Math.PI / 180;

/**
 * A four-bar with ground A0 = (0, 0), B0 = (d, 0), crank a at angle θ (the driver),
 * coupler b, rocker c, B above the line A → B0 (circle–circle, written out here).
 */
function fourBarPlan(a: number, b: number, c: number, d: number, thetaRad: number): Plan {
  const A = { x: a * Math.cos(thetaRad), y: a * Math.sin(thetaRad) };
  const dx = d - A.x;
  const dy = -A.y;
  const dist = Math.hypot(dx, dy);
  const along = (b * b - c * c + dist * dist) / (2 * dist);
  const h = Math.sqrt(b * b - along * along);
  const B = { x: A.x + (along * dx - h * dy) / dist, y: A.y + (along * dy + h * dx) / dist };
  const result = compile(fourBar({ A0: { x: 0, y: 0 }, B0: { x: d, y: 0 }, A, B, P: { x: A.x, y: A.y + 10 } }));
  if (!result.ok) throw new Error(JSON.stringify(result.issues));
  return result.plan;
}

describe('a lock narrower than the sample spacing', () => {
  // Non-Grashof (s + l = 140 > p + q = 139.9998): the crank locks only where |A − B0|
  // exceeds b + c, coupler and rocker in line (theorem: triangle inequality), i.e. for
  // θ in (θ*, 2π − θ*) with cos θ* = (a² + d² − (b + c)²) / (2ad): a window of 0.43°.
  const a = 40;
  const b = 70;
  const c = 69.9998;
  const d = 100;
  const edge = Math.acos((a * a + d * d - (b + c) ** 2) / (2 * a * d));
  // A reference angle whose 0.5° and 1° grids both step over the window.
  const reference = 60.25 * DEG;
  const plan = fourBarPlan(a, b, c, d, reference);

  it('the window is narrower than half a degree and no 0.5° sample from the reference falls in it', () => {
    expect(2 * (Math.PI - edge)).toBeLessThan(0.44 * DEG);
    for (let k = 0; k <= 720; k++) {
      const v = reference + k * 0.5 * DEG;
      expect(v > edge && v < 2 * Math.PI - edge).toBe(false);
    }
  });

  it('the sweep lists it as a lock between two assembled samples, bounded by two dead centres of the dyad at B', () => {
    const s = sweep(plan, { from: reference, to: reference + 2 * Math.PI, steps: 361 });
    expect(s.assembled.every((f) => f === 1)).toBe(true);
    expect(s.fullTurn).toBe(false);
    expect(s.locks).toHaveLength(1);
    // theorem (above)
    expect(Math.abs(s.locks[0].from - edge)).toBeLessThan(1e-9);
    expect(Math.abs(s.locks[0].to - (2 * Math.PI - edge))).toBeLessThan(1e-9);
    expect(s.deadCentres.map((dc) => [dc.joint, dc.kind])).toEqual([['B', 'limit'], ['B', 'limit']]);
    expect(s.deadCentres[0].value).toBe(s.locks[0].from);
    expect(s.deadCentres[1].value).toBe(s.locks[0].to);
  });

  it('the same swept the other way', () => {
    const s = sweep(plan, { from: reference + 2 * Math.PI, to: reference, steps: 361 });
    // theorem (above)
    expect(s.locks).toHaveLength(1);
    expect(Math.abs(s.locks[0].from - (2 * Math.PI - edge))).toBeLessThan(1e-9);
    expect(Math.abs(s.locks[0].to - edge)).toBeLessThan(1e-9);
  });

  it('the report’s default range is the assembly range up to the window, its limits listed as dead centres', () => {
    const result = analyzeLinkage(plan);
    if (!result.ok) throw new Error(JSON.stringify(result.issues));
    const { driver, defects } = result.report;
    expect(driver.rangeRule).toBe('assembly range');
    expect(driver.fullTurn).toBe(false);
    // theorem (above): the range runs from the window's far edge round to its near edge,
    // stopping 1e-7 rad inside each (the margin the README states).
    expect(Math.abs(driver.from - (-edge + 1e-7) / DEG)).toBeLessThan(1e-6);
    expect(Math.abs(driver.to - (edge - 1e-7) / DEG)).toBeLessThan(1e-6);
    expect(defects.deadCentres.map((dc) => [dc.joint, dc.kind])).toEqual([['B', 'limit'], ['B', 'limit']]);
    expect(Math.abs(defects.deadCentres[0].at - (-edge / DEG))).toBeLessThan(1e-6);
    expect(Math.abs(defects.deadCentres[1].at - edge / DEG)).toBeLessThan(1e-6);
    expect(defects.locks).toEqual([]);
    expect(defects.unassembledSteps).toBe(0);
  });
});

describe('change points: the motion passes a dead centre of a dyad without locking', () => {
  it('a change-point four-bar (s + l = p + q) turns fully and names the change point where all four links are in line', () => {
    // Grashof 1883: s + l = p + q = 130 (40 + 90 = 70 + 60) is the change-point case. With
    // the crank along the ground towards B0 (θ = 0) |A − B0| = d − a = 20 = b − c: the
    // coupler and rocker fold onto each other (theorem: equality in the triangle inequality).
    const plan = fourBarPlan(40, 90, 70, 60, 70.3 * DEG);
    const result = analyzeLinkage(plan);
    if (!result.ok) throw new Error(JSON.stringify(result.issues));
    const { driver, defects } = result.report;
    // theorem (above): the crank turns fully and passes the change point at θ = 0 (360°).
    expect(driver.rangeRule).toBe('full turn');
    expect(driver.fullTurn).toBe(true);
    expect(defects.locks).toEqual([]);
    expect(defects.deadCentres).toHaveLength(1);
    expect(defects.deadCentres[0]).toMatchObject({ joint: 'B', kind: 'change point' });
    expect(Math.abs(defects.deadCentres[0].at - 360)).toBeLessThan(1e-6);
  });

  it('a parallelogram passes both of its change points (θ = 0 and 180°), each listed as a change point of the dyad at B', () => {
    // Crank 50, coupler 100, rocker 50, ground 100: in line at θ = 0 (|A − B0| = 50 = b − c)
    // and at θ = 180° (|A − B0| = 150 = b + c) (theorem).
    const plan = fourBarPlan(50, 100, 50, 100, 53.13 * DEG);
    const s = sweep(plan, { from: 53.13 * DEG, to: 53.13 * DEG + 2 * Math.PI, steps: 361 });
    // theorem (above)
    expect(s.locks).toEqual([]);
    expect(s.fullTurn).toBe(true);
    expect(s.deadCentres.map((dc) => [dc.joint, dc.kind])).toEqual([['B', 'change point'], ['B', 'change point']]);
    expect(Math.abs(s.deadCentres[0].value - Math.PI)).toBeLessThan(1e-6);
    expect(Math.abs(s.deadCentres[1].value - 2 * Math.PI)).toBeLessThan(1e-6);
  });
});
