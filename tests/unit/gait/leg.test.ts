import { describe, expect, it } from 'vitest';
import { fourBar } from '../../../src/core/linkage';
import { validateLeg, type LegSpec } from '../../../src/core/gait';

const LINKAGE = fourBar();
const LEG: LegSpec = { foot: 'P', ground: { kind: 'level', yMm: -10 }, stanceToleranceMm: 0.5, crankDirection: 1, walkingDirection: 1 };

function issues(spec: unknown, linkage = LINKAGE): { path: string; message: string }[] {
  const v = validateLeg(spec as LegSpec, linkage);
  return v.ok ? [] : v.issues;
}

describe('validateLeg', () => {
  it('accepts a level ground line and states it as origin, along and up', () => {
    const v = validateLeg(LEG, LINKAGE);
    expect(v.ok).toBe(true);
    if (!v.ok) return;
    expect(v.leg.originMm).toEqual({ x: 0, y: -10 });
    expect(v.leg.along).toEqual({ x: 1, y: 0 });
    expect(v.leg.up).toEqual({ x: -0, y: 1 });
  });

  it('turns a sloping line into unit vectors: along where the body walks, up on the +y side', () => {
    const v = validateLeg({ ...LEG, ground: { kind: 'line', point: { x: 1, y: 2 }, direction: { x: -2, y: -1 } }, walkingDirection: 1 }, LINKAGE);
    expect(v.ok).toBe(true);
    if (!v.ok) return;
    // theorem: (−2, −1)/√5 turned to point towards +x, and its normal on the +y side
    const r5 = Math.sqrt(5);
    expect(v.leg.along.x).toBeCloseTo(2 / r5, 15);
    expect(v.leg.along.y).toBeCloseTo(1 / r5, 15);
    expect(v.leg.up.x).toBeCloseTo(-1 / r5, 15);
    expect(v.leg.up.y).toBeCloseTo(2 / r5, 15);
    const back = validateLeg({ ...LEG, ground: { kind: 'line', point: { x: 1, y: 2 }, direction: { x: -2, y: -1 } }, walkingDirection: -1 }, LINKAGE);
    expect(back.ok && back.leg.along.x).toBeCloseTo(-2 / r5, 15);
    expect(back.ok && back.leg.up.y).toBeCloseTo(2 / r5, 15);
  });

  it('says what is wrong with each field, in the user’s words', () => {
    expect(issues({ ...LEG, foot: 'Q' })).toEqual([{ path: 'foot', message: "the foot 'Q' is not a joint or point of the linkage" }]);
    expect(issues({ ...LEG, foot: 'A0' })[0].message).toContain('ground pivot');
    expect(issues({ ...LEG, stanceToleranceMm: 0 })[0]).toEqual({
      path: 'stanceToleranceMm',
      message: 'the stance tolerance is 0; expected a distance in mm greater than 0 (the duty factor means nothing without it)',
    });
    expect(issues({ ...LEG, stanceToleranceMm: Number.NaN })[0].path).toBe('stanceToleranceMm');
    expect(issues({ ...LEG, ground: { kind: 'line', point: { x: 0, y: 0 }, direction: { x: 0, y: 3 } } })[0].message).toContain('vertical');
    expect(issues({ ...LEG, ground: { kind: 'line', point: { x: 0, y: 0 }, direction: { x: 0, y: 0 } } })[0].path).toBe('ground.direction');
    expect(issues({ ...LEG, ground: { kind: 'slope' } })[0].path).toBe('ground.kind');
    expect(issues({ ...LEG, crankDirection: 2 })[0].path).toBe('crankDirection');
    expect(issues({ ...LEG, walkingDirection: 0 })[0].path).toBe('walkingDirection');
    expect(issues({ ...LEG, footPath: [{ x: 0, y: 0 }, { x: 1, y: 0 }] })[0].message).toContain('has 2 points');
    expect(issues({ ...LEG, footPath: [{ x: 0, y: 0 }, { x: 1, y: 0 }, { x: 1, y: Infinity }] })[0].path).toBe('footPath[2]');
  });

  it('reports every problem at once', () => {
    expect(issues({ ...LEG, foot: 'Q', stanceToleranceMm: -1, crankDirection: 0 }).map((i) => i.path)).toEqual(['foot', 'stanceToleranceMm', 'crankDirection']);
  });

  it('refuses a linkage driven by a length: a leg needs a crank', () => {
    const driven = { ...LINKAGE, driver: { kind: 'length' as const, from: 'A', to: 'B0' } };
    expect(issues(LEG, driven)[0].path).toBe('linkage.driver');
  });

  it('copies the foot trajectory it keeps', () => {
    const pts = [{ x: 0, y: 0 }, { x: 10, y: 0 }, { x: 5, y: 5 }];
    const v = validateLeg({ ...LEG, footPath: pts }, LINKAGE);
    pts[0] = { x: 99, y: 99 };
    expect(v.ok && v.leg.footPath[0]).toEqual({ x: 0, y: 0 });
  });
});
