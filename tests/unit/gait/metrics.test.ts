import { describe, expect, it } from 'vitest';
import { compile, fourBar, run, type Linkage, type Plan } from '../../../src/core/linkage';
import { DEMO_TOY_LEG, DEMO_TOY_LEG_LINKAGE, GAIT_CAUTION, gaitFigures, type GaitFigures, type LegSpec } from '../../../src/core/gait';

const TWO_PI = 2 * Math.PI;

function figures(linkage: Linkage, leg: LegSpec, steps?: number): GaitFigures {
  const r = gaitFigures(linkage, leg, steps === undefined ? {} : { steps });
  if (!r.ok) throw new Error(r.reason);
  return r.figures;
}

/**
 * The second route, written here: the foot's height sampled from plain positions (run,
 * no rates) over the turn, band crossings bisected on those positions, stance wrapped
 * through the reference pose. Level ground only.
 */
function sampledRoute(linkage: Linkage, leg: LegSpec, n = 7200) {
  const plan = compile(linkage);
  if (!plan.ok) throw new Error('compile');
  const p: Plan = plan.plan;
  const pose = new Float64Array(2 * p.slotCount);
  const slot = p.slotIndex.get(leg.foot) as number;
  const groundY = leg.ground.kind === 'level' ? leg.ground.yMm : NaN;
  const tol = leg.stanceToleranceMm;
  const at = (t: number) => {
    pose.set(p.reference);
    if (!run(p, p.driverReferenceValue + leg.crankDirection * t, pose)) throw new Error('lock');
    return { x: pose[2 * slot], h: pose[2 * slot + 1] - groundY };
  };
  const inBand = (t: number) => Math.abs(at(t).h) <= tol;
  const bisect = (a: number, b: number, level: number) => {
    let lo = a;
    let hi = b;
    const loBelow = at(lo).h < level;
    for (let i = 0; i < 200 && hi - lo > 1e-14; i++) {
      const mid = 0.5 * (lo + hi);
      if (at(mid).h < level === loBelow) lo = mid;
      else hi = mid;
    }
    return 0.5 * (lo + hi);
  };
  const intervals: { from: number; to: number }[] = [];
  let open = inBand(0) ? 0 : NaN;
  for (let k = 0; k < n; k++) {
    const a = (TWO_PI * k) / n;
    const b = (TWO_PI * (k + 1)) / n;
    if (inBand(a) === inBand(b)) continue;
    const outside = inBand(a) ? at(b).h : at(a).h;
    const e = bisect(a, b, Math.sign(outside) * tol);
    if (inBand(b)) open = e;
    else {
      intervals.push({ from: open, to: e });
      open = NaN;
    }
  }
  if (!Number.isNaN(open)) intervals.push({ from: open, to: TWO_PI });
  if (intervals.length > 1 && intervals[0].from === 0 && intervals[intervals.length - 1].to === TWO_PI) {
    const first = intervals.shift() as { from: number; to: number };
    intervals[intervals.length - 1].to = TWO_PI + first.to;
  }
  const duty = intervals.reduce((s, r) => s + r.to - r.from, 0) / TWO_PI;
  const longest = intervals.reduce((a, b) => (b.to - b.from > a.to - a.from ? b : a));
  const xs = [at(longest.from).x, at(longest.to).x];
  for (let k = Math.ceil((longest.from / TWO_PI) * n); (TWO_PI * k) / n < longest.to; k++) xs.push(at((TWO_PI * k) / n).x);
  return { intervals, duty, stride: Math.max(...xs) - Math.min(...xs) };
}

describe('gaitFigures on the demo toy leg', () => {
  const f = figures(DEMO_TOY_LEG_LINKAGE, DEMO_TOY_LEG);

  it('carries the tolerance with the duty factor, and the caution', () => {
    expect(f.dutyFactor.toleranceMm).toBe(DEMO_TOY_LEG.stanceToleranceMm);
    expect(f.notes[0]).toContain('stance tolerance of 1 mm');
    expect(f.caution).toBe(GAIT_CAUTION);
    // common practice: say what is not computed and defer to an engineer, testing and standards
    expect(GAIT_CAUTION).toMatch(/kinematics only/);
    expect(GAIT_CAUTION).toMatch(/qualified engineer/);
    expect(GAIT_CAUTION).toMatch(/physically tested/);
    expect(GAIT_CAUTION).toMatch(/standards/);
  });

  it('agrees with the sampled path and bisected crossings on stance, duty factor and stride', () => {
    // second method, written here (sampledRoute): positions only, 7,200 samples, bisection to 1e-14 rad
    const ref = sampledRoute(DEMO_TOY_LEG_LINKAGE, DEMO_TOY_LEG);
    expect(f.stance.intervals).toHaveLength(ref.intervals.length);
    ref.intervals.forEach((r, i) => {
      expect(f.stance.intervals[i].fromRad).toBeCloseTo(r.from, 9);
      expect(f.stance.intervals[i].toRad).toBeCloseTo(r.to, 9);
    });
    expect(f.dutyFactor.value).toBeCloseTo(ref.duty, 9);
    // the sampled extent misses only an extreme inside the stance between samples: 1e-6 mm allows for it
    expect(Math.abs((f.longestStance?.strideMm ?? NaN) - ref.stride)).toBeLessThan(1e-6);
  });

  it('shows the duty factor growing with the stance tolerance', () => {
    // second method as above at each tolerance; the band only widens, so the share cannot fall (theorem)
    const tols = [0.5, 1, 2];
    const duties = tols.map((t) => figures(DEMO_TOY_LEG_LINKAGE, { ...DEMO_TOY_LEG, stanceToleranceMm: t }).dutyFactor.value);
    tols.forEach((t, i) => expect(duties[i]).toBeCloseTo(sampledRoute(DEMO_TOY_LEG_LINKAGE, { ...DEMO_TOY_LEG, stanceToleranceMm: t }, 3600).duty, 9));
    expect(duties[0]).toBeLessThan(duties[1]);
    expect(duties[1]).toBeLessThan(duties[2]);
  });

  it('measures speed backwards relative to the body, its mean from the distance over the angle', () => {
    const s = f.longestStance;
    expect(s).not.toBeNull();
    if (s === null) return;
    // theorem: the mean over crank angle of −d(along)/dt is (along at start − along at end) / angle; the foot moves back, so it is the stride over the angle here
    expect(s.speed.meanMmPerRad).toBeCloseTo(s.strideMm / (s.interval.toRad - s.interval.fromRad), 9);
    expect(s.speed.minMmPerRad).toBeGreaterThan(0);
    expect(s.speed.variation).toBeCloseTo((s.speed.maxMmPerRad - s.speed.minMmPerRad) / s.speed.meanMmPerRad, 12);
  });

  it('finds the same figures with the crank reversed, and says the leg then walks the other way', () => {
    // theorem: the same closed path traced backwards spends the same crank angle in the band
    const r = figures(DEMO_TOY_LEG_LINKAGE, { ...DEMO_TOY_LEG, crankDirection: 1 });
    expect(r.dutyFactor.value).toBeCloseTo(f.dutyFactor.value, 9);
    expect(r.longestStance?.strideMm).toBeCloseTo(f.longestStance?.strideMm ?? NaN, 9);
    expect(r.stepHeightMm).toBeCloseTo(f.stepHeightMm, 9);
    expect(r.longestStance?.speed.variation).toBeNull();
    expect(r.notes.join(' ')).toContain('would walk the other way');
  });

  it('gives the same figures when the leg and its ground line are turned together', () => {
    // theorem: the figures depend only on the foot's path relative to the ground line
    const a = (10 * Math.PI) / 180;
    const c = Math.cos(a);
    const s = Math.sin(a);
    const turn = (p: { x: number; y: number }) => ({ x: c * p.x - s * p.y, y: s * p.x + c * p.y });
    const l = DEMO_TOY_LEG_LINKAGE;
    const turned: Linkage = { ...l, joints: l.joints.map((j) => ({ ...j, ...turn(j) })), points: l.points?.map((p) => ({ ...p, ...turn(p) })) };
    const g = figures(turned, { ...DEMO_TOY_LEG, ground: { kind: 'line', point: turn({ x: 0, y: -30.9 }), direction: { x: c, y: s } } });
    expect(g.dutyFactor.value).toBeCloseTo(f.dutyFactor.value, 9);
    expect(g.longestStance?.strideMm).toBeCloseTo(f.longestStance?.strideMm ?? NaN, 9);
    expect(g.stepHeightMm).toBeCloseTo(f.stepHeightMm, 9);
    expect(g.longestStance?.speed.variation).toBeCloseTo(f.longestStance?.speed.variation ?? NaN, 7);
    expect(g.longestStance?.flatness.peakToPeakMm).toBeCloseTo(f.longestStance?.flatness.peakToPeakMm ?? NaN, 9);
  });

  it('sizes the leg by the box of every joint over the turn', () => {
    // theorem: the crank pin sweeps a circle of 8 mm about (0, 0), and the hip pivot (24, −8) stays put
    expect(f.size.minXMm).toBeCloseTo(-8, 6);
    expect(f.size.maxXMm).toBeGreaterThanOrEqual(24);
    // the foot is the lowest part, and its lowest point is located between samples from its exact rate
    expect(f.size.minYMm).toBeCloseTo(-30.9 + f.lowestMm, 9);
  });
});

describe('gaitFigures refusals', () => {
  it('refuses a crank that cannot turn fully, saying where it locks', () => {
    // Source: Chang, Lin and Wu, "A note on Grashof's theorem", J. Marine Sci. Technol. 13(4), 2005:
    // ground 100, input 60, coupler 50, output 80 has s + l > p + q, so no link turns fully
    const A = { x: 30, y: 60 * Math.sin(Math.PI / 3) };
    const B0 = { x: 100, y: 0 };
    const dx = B0.x - A.x;
    const dy = B0.y - A.y;
    const d = Math.hypot(dx, dy);
    const along = (50 * 50 - 80 * 80 + d * d) / (2 * d);
    const h = Math.sqrt(50 * 50 - along * along);
    const B = { x: A.x + (along * dx) / d - (h * dy) / d, y: A.y + (along * dy) / d + (h * dx) / d };
    const rocker = fourBar({ A0: { x: 0, y: 0 }, B0, A, B, P: { x: (A.x + B.x) / 2, y: (A.y + B.y) / 2 - 20 } });
    const r = gaitFigures(rocker, { ...DEMO_TOY_LEG, ground: { kind: 'level', yMm: 0 } });
    expect(r.ok).toBe(false);
    expect(!r.ok && r.reason).toMatch(/^the crank cannot turn fully: the linkage does not assemble from .*° to .*° of the turn/);
  });

  it('refuses a bad leg or sample count with the reason', () => {
    const r = gaitFigures(DEMO_TOY_LEG_LINKAGE, { ...DEMO_TOY_LEG, stanceToleranceMm: 0 });
    expect(!r.ok && r.reason).toContain('stanceToleranceMm: the stance tolerance is 0');
    const s = gaitFigures(DEMO_TOY_LEG_LINKAGE, DEMO_TOY_LEG, { steps: 10 });
    expect(!s.ok && s.reason).toContain('steps is 10');
  });

  it('says when the foot passes through the ground line, beyond the tolerance', () => {
    const r = figures(DEMO_TOY_LEG_LINKAGE, { ...DEMO_TOY_LEG, ground: { kind: 'level', yMm: -30 }, stanceToleranceMm: 0.5 });
    expect(r.lowestMm).toBeLessThan(-0.5);
    expect(r.notes.join(' ')).toContain(`The foot passes ${String(Number((-r.lowestMm).toPrecision(4)))} mm below the ground line`);
  });

  it('reports no stance, rather than failing, when the foot never reaches the band', () => {
    const r = figures(DEMO_TOY_LEG_LINKAGE, { ...DEMO_TOY_LEG, ground: { kind: 'level', yMm: -60 } });
    expect(r.dutyFactor.value).toBe(0);
    expect(r.longestStance).toBeNull();
    expect(r.notes.join(' ')).toContain('there is no stance');
  });
});
