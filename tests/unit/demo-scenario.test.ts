import { describe, expect, it } from 'vitest';
import { DEMO_FOUR_BAR, demoTargetPoints } from '../../src/app/demo/transferDemo';
import { createDemoProject } from '../../src/app/demo/demoProject';
import { targetProblem } from '../../src/app/state/target';
import { parsePointsCsv, formatPointsCsv } from '../../src/core/io/pointsCsv';

/**
 * The coupler point of the demo four-bar at crank angle θ, computed here on its own
 * (not with the app's linkage code): A on the crank circle, B at the intersection of the
 * coupler circle about A and the rocker circle about B0 on the left of A → B0, P fixed
 * in the coupler frame. Circle–circle intersection: theorem (plane geometry).
 */
function couplerPoint(thetaRad: number): { x: number; y: number } {
  const d = DEMO_FOUR_BAR;
  const ax = d.crankPivot.x + d.crankMm * Math.cos(thetaRad);
  const ay = d.crankPivot.y + d.crankMm * Math.sin(thetaRad);
  const bx0 = d.crankPivot.x + d.groundMm;
  const by0 = d.crankPivot.y;
  const ex = bx0 - ax;
  const ey = by0 - ay;
  const dist = Math.hypot(ex, ey);
  const a = (d.couplerMm ** 2 - d.rockerMm ** 2 + dist ** 2) / (2 * dist);
  const h = Math.sqrt(d.couplerMm ** 2 - a ** 2);
  const bx = ax + (a * ex - h * ey) / dist;
  const by = ay + (a * ey + h * ex) / dist;
  const ux = (bx - ax) / d.couplerMm;
  const uy = (by - ay) / d.couplerMm;
  return { x: ax + d.pointAlongMm * ux - d.pointLeftMm * uy, y: ay + d.pointAlongMm * uy + d.pointLeftMm * ux };
}

describe('the demo scenario', () => {
  const points = demoTargetPoints();

  it('is the coupler curve of its four-bar, rounded to 0.1 mm', () => {
    // Rounding each coordinate to 0.1 mm moves a point by at most 0.05·√2 mm (theorem).
    const roundingBoundMm = 0.05 * Math.SQRT2 + 1e-9;
    let sumSq = 0;
    for (const p of points) {
      const exact = couplerPoint(((p.driverDeg as number) * Math.PI) / 180);
      const e = Math.hypot(p.x - exact.x, p.y - exact.y);
      expect(e).toBeLessThanOrEqual(roundingBoundMm);
      sumSq += e * e;
      // Rounded to a tenth: ten times the coordinate is a whole number.
      expect(Math.abs(p.x * 10 - Math.round(p.x * 10))).toBeLessThan(1e-9);
      expect(Math.abs(p.y * 10 - Math.round(p.y * 10))).toBeLessThan(1e-9);
    }
    // So that four-bar follows the target to well under 1 mm RMS.
    expect(Math.sqrt(sumSq / points.length)).toBeLessThan(0.1);
  });

  it('its four-bar is a Grashof crank-rocker, so the crank turns fully', () => {
    // Grashof's criterion: s + l ≤ p + q, and with the shortest link as the crank, a
    // crank-rocker. Source: F. Grashof, Theoretische Maschinenlehre, 1883 (via any
    // kinematics text, e.g. Norton, Design of Machinery, section 2.12; from memory).
    const d = DEMO_FOUR_BAR;
    const links = [d.crankMm, d.couplerMm, d.rockerMm, d.groundMm];
    const s = Math.min(...links);
    const l = Math.max(...links);
    const pq = links.reduce((a, b) => a + b, 0) - s - l;
    expect(s + l).toBeLessThan(pq);
    expect(d.crankMm).toBe(s);
    // One sample every 15° over a whole turn.
    expect(points).toHaveLength(24);
    expect(points.map((p) => p.driverDeg)).toEqual(Array.from({ length: 24 }, (_, k) => 15 * k));
  });

  it('has a nearly straight stroke: the transfer motion it stands for', () => {
    // The points of the lower run (crank 90°…270°) lie within 2 mm of one horizontal line.
    const lower = points.filter((p) => (p.driverDeg as number) >= 90 && (p.driverDeg as number) <= 270);
    const ys = lower.map((p) => p.y);
    expect(Math.max(...ys) - Math.min(...ys)).toBeLessThan(2);
    const xs = lower.map((p) => p.x);
    expect(Math.max(...xs) - Math.min(...xs)).toBeGreaterThan(95);
  });

  it('opens as a valid target, closed, that survives a CSV round trip', () => {
    const project = createDemoProject();
    expect(project.target.closed).toBe(true);
    expect(targetProblem(project.target)).toBeNull();
    const table = parsePointsCsv(formatPointsCsv(project.target.points));
    expect(table.ok).toBe(true);
    if (table.ok) expect(table.points).toEqual(project.target.points.map((p) => ({ x: p.x, y: p.y })));
  });
});
