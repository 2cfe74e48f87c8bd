import { describe, expect, it } from 'vitest';
import { compile, run } from '../../../src/core/linkage';
import { DEMO_TOY_LEG, DEMO_TOY_LEG_LINKAGE, gaitFigures, phasedLegs, PHASED_MODEL } from '../../../src/core/gait';

const TWO_PI = 2 * Math.PI;

function demoFigures() {
  const r = gaitFigures(DEMO_TOY_LEG_LINKAGE, DEMO_TOY_LEG);
  if (!r.ok) throw new Error(r.reason);
  return r.figures;
}

/** The demo foot's height above its ground line at turn angle t, from plain positions (the second route). */
function heightAt(): (t: number) => number {
  const c = compile(DEMO_TOY_LEG_LINKAGE);
  if (!c.ok) throw new Error('compile');
  const plan = c.plan;
  const pose = new Float64Array(2 * plan.slotCount);
  const slot = plan.slotIndex.get('P') as number;
  const groundY = DEMO_TOY_LEG.ground.kind === 'level' ? DEMO_TOY_LEG.ground.yMm : NaN;
  return (t) => {
    pose.set(plan.reference);
    run(plan, plan.driverReferenceValue + DEMO_TOY_LEG.crankDirection * t, pose);
    return pose[2 * slot + 1] - groundY;
  };
}

describe('phasedLegs', () => {
  const f = demoFigures();
  const phases = [0, TWO_PI / 3, (2 * TWO_PI) / 3];

  it('counts the feet in stance as a fine sampling of every foot does', () => {
    // second method, written here: each foot's height from plain positions on 36,000 shaft angles
    const p = phasedLegs(f, { legs: 3, phasesRad: phases });
    expect(p.ok).toBe(true);
    if (!p.ok) return;
    const h = heightAt();
    const n = 36_000;
    const share = [0, 0, 0, 0];
    let minFeet = Infinity;
    let maxFeet = -Infinity;
    for (let k = 0; k < n; k++) {
      const t = (TWO_PI * (k + 0.5)) / n;
      const feet = phases.filter((ph) => Math.abs(h(t + ph)) <= DEMO_TOY_LEG.stanceToleranceMm).length;
      share[feet] += 1 / n;
      minFeet = Math.min(minFeet, feet);
      maxFeet = Math.max(maxFeet, feet);
    }
    expect(p.figures.minFeet).toBe(minFeet);
    expect(p.figures.maxFeet).toBe(maxFeet);
    // each of the stance's edges shifts a sampled share by at most one sample
    p.figures.shareByFeet.forEach((s, i) => expect(Math.abs(s - share[i])).toBeLessThan(12 / n));
    // theorem: the shares add to one turn, and the feet spend legs × duty factor turns in stance
    expect(p.figures.shareByFeet.reduce((a, b) => a + b, 0)).toBeCloseTo(1, 12);
    expect(p.figures.shareByFeet.reduce((a, s, i) => a + i * s, 0)).toBeCloseTo(3 * f.dutyFactor.value, 9);
    expect(p.figures.model).toBe(PHASED_MODEL);
  });

  it('gives the body ripple of the lowest foot as a fine sampling does', () => {
    // second method, written here: the lowest of the three feet on 200,000 shaft angles; a
    // corner of the lowest-foot curve falls between samples by at most slope × spacing / 2
    const p = phasedLegs(f, { legs: 3, phasesRad: phases });
    if (!p.ok) throw new Error(p.reason);
    const h = heightAt();
    const n = 200_000;
    let lo = Infinity;
    let hi = -Infinity;
    for (let k = 0; k < n; k++) {
      const t = (TWO_PI * k) / n;
      const low = Math.min(h(t), h(t + phases[1]), h(t + phases[2]));
      lo = Math.min(lo, low);
      hi = Math.max(hi, low);
    }
    expect(Math.abs(p.figures.lowestFootMinMm - lo)).toBeLessThan(1e-3);
    expect(Math.abs(p.figures.lowestFootMaxMm - hi)).toBeLessThan(1e-3);
    expect(p.figures.bodyHeightRippleMm).toBeCloseTo(p.figures.lowestFootMaxMm - p.figures.lowestFootMinMm, 12);
    // theorem: the lowest foot is never below the leg's lowest point
    expect(p.figures.lowestFootMinMm).toBeCloseTo(f.lowestMm, 9);
  });

  it('gives one leg its own stance and a ripple of its whole rise', () => {
    const p = phasedLegs(f, { legs: 1, phasesRad: [0] });
    if (!p.ok) throw new Error(p.reason);
    // theorem: with one leg, the share of one foot down is the duty factor
    expect(p.figures.shareByFeet[1]).toBeCloseTo(f.dutyFactor.value, 12);
    expect(p.figures.bodyHeightRippleMm).toBeCloseTo(f.stepHeightMm - f.lowestMm, 9);
  });

  it('refuses phases that do not match the legs', () => {
    const r = phasedLegs(f, { legs: 2, phasesRad: [0] });
    expect(!r.ok && r.reason).toBe('2 legs need one phase each (rad); got 1');
    const z = phasedLegs(f, { legs: 0, phasesRad: [] });
    expect(!z.ok && z.reason).toContain('legs is 0');
    const n = phasedLegs(f, { legs: 2, phasesRad: [0, Number.NaN] });
    expect(!n.ok && n.reason).toContain('leg 2');
  });
});
