/**
 * Gait figures of a leg of Chebyshev–Hoeken proportions, checked against values that
 * follow exactly from those proportions and against a second route written here: the
 * foot's path in closed form (circle intersection), sampled, with its band crossings
 * bisected. Neither uses Loci's kinematics.
 *
 * Proportions (tests/reference/data/README.md; from memory, verify against a mechanism
 * handbook): crank 1, ground 2, rocker 2.5, coupler 2.5 from crank pin to rocker joint,
 * tracing point on the coupler extended to 5 from the crank pin. Crank pivot (0, 0),
 * rocker pivot (−2, 0), rocker joint above the frame line: the flat part of the path
 * lies on y = 4 and is its lowest stretch (the arc rises to 2√6 at 180°), so the ground
 * line is y = 4 with up = +y as given, no mirroring needed. Here the pivots lie below
 * the flat stretch; the gait figures depend only on the foot's path relative to the
 * ground line and the crank's turn. Units: crank radii (read as mm).
 *
 * With the crank counter-clockwise the foot runs along the flat part towards −x, so the
 * body walks towards +x.
 */
import { describe, expect, it } from 'vitest';
import { fourBar } from '../../src/core/linkage';
import { gaitFigures, phasedLegs, type GaitFigures, type LegSpec } from '../../src/core/gait';

const HOEKEN = fourBar({
  A0: { x: 0, y: 0 },
  B0: { x: -2, y: 0 },
  A: { x: 1, y: 0 },
  B: { x: -0.5, y: 2 },
  P: { x: -2, y: 4 },
});
const GROUND_Y = 4;
const TWO_PI = 2 * Math.PI;

function leg(stanceToleranceMm: number): LegSpec {
  return { foot: 'P', ground: { kind: 'level', yMm: GROUND_Y }, stanceToleranceMm, crankDirection: 1, walkingDirection: 1 };
}

function figures(tol: number, steps?: number): GaitFigures {
  const r = gaitFigures(HOEKEN, leg(tol), steps === undefined ? {} : { steps });
  if (!r.ok) throw new Error(r.reason);
  return r.figures;
}

/** The foot at crank angle theta in closed form: the rocker joint on the right of crank pin → rocker pivot. */
function foot(theta: number): { x: number; y: number } {
  const ax = Math.cos(theta);
  const ay = Math.sin(theta);
  const dx = -2 - ax;
  const dy = 0 - ay;
  const d = Math.hypot(dx, dy);
  const h = Math.sqrt(2.5 * 2.5 - (d / 2) * (d / 2));
  const bx = ax + dx / 2 + (h * dy) / d;
  const by = ay + dy / 2 - (h * dx) / d;
  return { x: 2 * bx - ax, y: 2 * by - ay };
}

/** Plain bisection of g between a and b (g(a), g(b) of opposite signs). */
function bisect(g: (t: number) => number, a: number, b: number): number {
  let lo = a;
  let hi = b;
  const gLo = g(lo);
  for (let i = 0; i < 200 && hi - lo > 1e-14; i++) {
    const mid = 0.5 * (lo + hi);
    if (g(mid) < 0 === gLo < 0) lo = mid;
    else hi = mid;
  }
  return 0.5 * (lo + hi);
}

/** Stance intervals of the closed-form path: sampled band membership, edges bisected; wrapped through 0. */
function sampledStance(tol: number, n = 7200): { from: number; to: number }[] {
  const inBand = (t: number) => Math.abs(foot(t).y - GROUND_Y) <= tol;
  const edge = (a: number, b: number) => {
    const level = Math.abs(foot(a).y - GROUND_Y) > tol ? Math.sign(foot(a).y - GROUND_Y) * tol : Math.sign(foot(b).y - GROUND_Y) * tol;
    return bisect((t) => foot(t).y - GROUND_Y - level, a, b);
  };
  const out: { from: number; to: number }[] = [];
  let open = inBand(0) ? 0 : NaN;
  for (let k = 0; k < n; k++) {
    const a = (TWO_PI * k) / n;
    const b = (TWO_PI * (k + 1)) / n;
    if (inBand(a) === inBand(b)) continue;
    const e = edge(a, b);
    if (inBand(b)) open = e;
    else {
      out.push({ from: open, to: e });
      open = NaN;
    }
  }
  if (!Number.isNaN(open)) out.push({ from: open, to: TWO_PI });
  if (out.length > 1 && out[0].from === 0 && out[out.length - 1].to === TWO_PI) {
    const first = out.shift() as { from: number; to: number };
    out[out.length - 1].to = TWO_PI + first.to;
  }
  return out;
}

function sampledStride(r: { from: number; to: number }, n = 7200): number {
  const xs = [foot(r.from).x, foot(r.to).x];
  for (let k = Math.ceil((r.from / TWO_PI) * n); (TWO_PI * k) / n < r.to; k++) xs.push(foot((TWO_PI * k) / n).x);
  return Math.max(...xs) - Math.min(...xs);
}

describe('gait figures of the Chebyshev–Hoeken leg', () => {
  it('has step height 2√6 − 4 crank radii, found between samples too', () => {
    // theorem (from these proportions): the arc's top at 180° is (−2, 2√6), the flat part on y = 4
    expect(figures(0.01).stepHeightMm).toBeCloseTo(2 * Math.sqrt(6) - 4, 9);
    // 719 samples: 180° falls between two, so the top is found from the exact rate's sign change
    expect(figures(0.01, 719).stepHeightMm).toBeCloseTo(2 * Math.sqrt(6) - 4, 9);
    const f = figures(0.01);
    // theorem: at 180° the foot is at (−2, 2√6)
    expect(f.path.xMm[f.steps / 2]).toBeCloseTo(-2, 9);
    expect(f.path.yMm[f.steps / 2]).toBeCloseTo(2 * Math.sqrt(6), 9);
  });

  it('moves the foot at 4/3 crank radii per radian at crank angle 0, backwards along the ground', () => {
    const f = figures(0.001);
    // theorem (from these proportions): at crank angle 0 the foot is at (−2, 4) moving at 4/3 per rad, along the flat part
    expect(f.path.xMm[0]).toBeCloseTo(-2, 12);
    expect(f.path.yMm[0]).toBeCloseTo(4, 12);
    expect(f.path.vxMmPerRad[0]).toBeCloseTo(-4 / 3, 9);
    expect(f.path.vyMmPerRad[0]).toBeCloseTo(0, 9);
    expect(f.path.alongRateMmPerRad[0]).toBeCloseTo(-4 / 3, 9);
    // The stance around angle 0 is symmetric about it, so 0 is an extreme of the speed; the
    // closed form (differenced here) shows it is the least: the speed is higher at ±10°.
    const speed = (t: number) => Math.abs(foot(t + 1e-6).x - foot(t - 1e-6).x) / 2e-6;
    expect(speed(0.17)).toBeGreaterThan(4 / 3 + 1e-4);
    expect(speed(-0.17)).toBeGreaterThan(4 / 3 + 1e-4);
    const s = f.longestStance;
    expect(s?.interval.fromRad).toBeLessThan(TWO_PI);
    expect(s?.interval.toRad).toBeGreaterThan(TWO_PI);
    // theorem: the least backward speed in the stance about angle 0 is 4/3 per rad
    expect(s?.speed.minMmPerRad).toBeCloseTo(4 / 3, 9);
  });

  it('gives the duty factor and stride of the sampled closed-form path with bisected crossings', () => {
    // second method, written here: closed-form path, 7,200 samples, crossings bisected to 1e-14 rad
    const tol = 0.01;
    const f = figures(tol);
    const ref = sampledStance(tol);
    expect(ref).toHaveLength(1);
    expect(f.stance.intervals).toHaveLength(1);
    expect(f.stance.intervals[0].fromRad).toBeCloseTo(ref[0].from, 9);
    expect(f.stance.intervals[0].toRad).toBeCloseTo(ref[0].to, 9);
    expect(f.dutyFactor.value).toBeCloseTo((ref[0].to - ref[0].from) / TWO_PI, 9);
    expect(f.dutyFactor.toleranceMm).toBe(tol);
    // the foot moves one way all through this stance, so the sampled extent is the ends' distance
    expect(f.longestStance?.strideMm).toBeCloseTo(sampledStride(ref[0]), 9);
    // the flat part stays within the band: peak-to-peak is the band's upper edge
    expect(f.longestStance?.flatness.peakToPeakMm).toBeCloseTo(tol, 9);
  });

  it('finds the three separate touches of the flat part within a tight tolerance', () => {
    // second method, as above. The flat part touches y = 4 at 0 and ±90° and rises about
    // 0.0097 between (closed form), so a 0.001 band holds three separate stances.
    const f = figures(0.001);
    const ref = sampledStance(0.001);
    expect(ref).toHaveLength(3);
    expect(f.stance.intervals).toHaveLength(3);
    for (let i = 0; i < 3; i++) {
      expect(f.stance.intervals[i].fromRad).toBeCloseTo(ref[i].from, 9);
      expect(f.stance.intervals[i].toRad).toBeCloseTo(ref[i].to, 9);
    }
  });

  it('shows the duty factor growing with the tolerance it depends on', () => {
    // second method, as above, at each tolerance
    const tols = [0.001, 0.01, 0.05];
    const duties = tols.map((t) => figures(t).dutyFactor.value);
    tols.forEach((t, i) => {
      const ref = sampledStance(t).reduce((sum, r) => sum + r.to - r.from, 0) / TWO_PI;
      expect(duties[i]).toBeCloseTo(ref, 9);
    });
    expect(duties[0]).toBeLessThan(duties[1]);
    expect(duties[1]).toBeLessThan(duties[2]);
    // the band catches the flat part only in part at 0.001 and all of it (and more) at 0.01
    expect(duties[0]).toBeLessThan(0.2);
    expect(duties[1]).toBeGreaterThan(0.5);
  });

  it('finds the stance speed extremes between coarse samples', () => {
    // second method, written here: the closed-form foot's backward speed by central differences on 100,000 angles over the stance
    const speed = (t: number) => -(foot(t + 1e-5).x - foot(t - 1e-5).x) / 2e-5;
    const f = figures(0.01, 72); // samples 5° apart
    const r = f.stance.intervals[0];
    let lo = Infinity;
    let hi = -Infinity;
    const n = 100_000;
    for (let k = 0; k <= n; k++) {
      const u = speed(r.fromRad + ((r.toRad - r.fromRad) * k) / n);
      lo = Math.min(lo, u);
      hi = Math.max(hi, u);
    }
    expect(f.longestStance?.speed.maxMmPerRad).toBeCloseTo(hi, 8);
    expect(f.longestStance?.speed.minMmPerRad).toBeCloseTo(lo, 8);
  });

  it('reports the crank ranges in stance where the transmission angle leaves 40°–140°', () => {
    // Source: Balli and Chand, "Transmission angle in mechanisms", Mech. Mach. Theory 37, 2002 (concept);
    // cos μ = (b² + c² − a² − d² + 2ad cos θ2)/(2bc) from memory, θ2 from the line A0 → B0 (here −x,
    // so θ2 = θ − π); the 40°–140° guideline is common practice.
    const mu = (t: number) => Math.acos((2.5 * 2.5 + 2.5 * 2.5 - 1 - 4 + 2 * 1 * 2 * Math.cos(t - Math.PI)) / (2 * 2.5 * 2.5));
    const tol = 0.3;
    const f = figures(tol);
    const stance = sampledStance(tol)[0];
    const bad = (t: number) => mu(t) < (40 * Math.PI) / 180 || mu(t) > (140 * Math.PI) / 180;
    const ranges: { from: number; to: number }[] = [];
    const n = 7200;
    let open = bad(stance.from) ? stance.from : NaN;
    for (let k = 0; k < n; k++) {
      const a = stance.from + ((stance.to - stance.from) * k) / n;
      const b = stance.from + ((stance.to - stance.from) * (k + 1)) / n;
      if (bad(a) === bad(b)) continue;
      const bound = ((mu(bad(a) ? a : b) < 1 ? 40 : 140) * Math.PI) / 180;
      const e = bisect((t) => mu(t) - bound, a, b);
      if (bad(b)) open = e;
      else {
        ranges.push({ from: open, to: e });
        open = NaN;
      }
    }
    if (!Number.isNaN(open)) ranges.push({ from: open, to: stance.to });
    expect(ranges.length).toBeGreaterThan(0);
    const loops = f.transmission.loops;
    expect(loops).toHaveLength(1);
    expect(loops[0].outside).toHaveLength(ranges.length);
    ranges.forEach((r, i) => {
      expect(loops[0].outside[i].fromRad).toBeCloseTo(r.from, 9);
      expect(loops[0].outside[i].toRad).toBeCloseTo(r.to, 9);
    });
    // within the 0.01 band the linkage stays inside the guideline
    expect(figures(0.01).transmission.loops[0].outside).toEqual([]);
  });

  it('gives two opposed legs a body ripple equal to the flat part’s rise', () => {
    // second method, written here: the lowest of the two closed-form feet on a fine grid
    const f = figures(0.01);
    const p = phasedLegs(f, { legs: 2, phasesRad: [0, Math.PI] });
    expect(p.ok).toBe(true);
    if (!p.ok) return;
    let lo = Infinity;
    let hi = -Infinity;
    const n = 200_000;
    for (let k = 0; k < n; k++) {
      const t = (TWO_PI * k) / n;
      const low = Math.min(foot(t).y, foot(t + Math.PI).y) - GROUND_Y;
      lo = Math.min(lo, low);
      hi = Math.max(hi, low);
    }
    expect(p.figures.bodyHeightRippleMm).toBeCloseTo(hi - lo, 7);
    // one foot always down, two while both are in the band
    expect(p.figures.minFeet).toBe(1);
    expect(p.figures.maxFeet).toBe(2);
    const d = f.dutyFactor.value;
    // theorem (counting): one or two feet are always down and the feet spend 2d turns in stance, so both are down for 2d − 1
    expect(p.figures.shareByFeet[2]).toBeCloseTo(2 * d - 1, 9);
  });
});
