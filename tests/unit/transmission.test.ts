import { describe, expect, it } from 'vitest';
import { fourBarLoops, transmissionAngleRad, transmissionAngleRange } from '../../src/core/linkage/analysis';
import { compile } from '../../src/core/linkage/compile';
import { sweep } from '../../src/core/linkage/sweep';
import { closedFormFourBar } from '../support/closedFormFourBar';

/**
 * cos μ = (b² + c² − a² − d² + 2ad cos θ2) / (2bc), input a, coupler b, output c,
 * ground d, θ2 the input angle from the ground line (Balli and Chand, "Transmission
 * angle in mechanisms", Mech. Mach. Theory 37, 2002; formula from memory, and it is the
 * law of cosines in the triangle A, B, B0: theorem).
 */
function closedFormMuRad(d: number, a: number, b: number, c: number, theta2: number): number {
  return Math.acos((b * b + c * c - a * a - d * d + 2 * a * d * Math.cos(theta2)) / (2 * b * c));
}

describe('transmissionAngleRad', () => {
  const designs: [number, number, number, number][] = [
    [100, 40, 120, 80], // crank-rocker
    [40, 100, 120, 80], // double crank
    [100, 60, 50, 80], // triple rocker
  ];

  it('matches the closed form at hand-solved poses, on both assemblies', () => {
    let checked = 0;
    for (const [d, a, b, c] of designs) {
      for (let i = 0; i < 36; i++) {
        const theta2 = (i * 2 * Math.PI) / 36 + 0.05;
        for (const branch of [1, -1] as const) {
          const m = closedFormFourBar({ ground: d, input: a, coupler: b, output: c, theta2, branch, origin: [5, 7], groundAngle: -0.3 });
          if (m === null) continue;
          const [loop] = fourBarLoops(m.plan, m.pose);
          expect(transmissionAngleRad(loop, m.pose)).toBeCloseTo(closedFormMuRad(d, a, b, c, theta2), 10);
          checked++;
        }
      }
    }
    expect(checked).toBeGreaterThan(150);
  });

  it('is NaN where the pose is not solved', () => {
    const m = closedFormFourBar({ ground: 100, input: 40, coupler: 120, output: 80, theta2: 1, branch: 1 });
    if (m === null) throw new Error('does not assemble');
    const [loop] = fourBarLoops(m.plan);
    const pose = Float64Array.from(m.pose);
    pose[4] = Number.NaN; // joint B
    expect(transmissionAngleRad(loop, pose)).toBeNaN();
  });
});

describe('transmissionAngleRange', () => {
  it("over a crank-rocker's full turn, spans the closed-form extremes at θ2 = 0 and π", () => {
    // With the input along the ground line the diagonal A–B0 is shortest (θ2 = 0) and
    // longest (θ2 = π), so μ is least and greatest there (theorem, from the closed form).
    const [d, a, b, c] = [100, 40, 120, 80];
    const steps = 720;
    const values = new Float64Array(steps);
    const poses = new Float64Array(steps * 10);
    const assembled = new Uint8Array(steps);
    let loop = null;
    for (let k = 0; k < steps; k++) {
      values[k] = (k * 2 * Math.PI) / steps;
      const m = closedFormFourBar({ ground: d, input: a, coupler: b, output: c, theta2: values[k], branch: 1 });
      if (m === null) continue;
      loop ??= fourBarLoops(m.plan)[0];
      poses.set(m.pose, k * 10);
      assembled[k] = 1;
    }
    if (loop === null) throw new Error('never assembled');
    const r = transmissionAngleRange(loop, { values, poses, assembled });
    if (!r.ok) throw new Error(r.reason);
    expect(r.samples).toBe(steps);
    expect(r.minRad).toBeCloseTo(closedFormMuRad(d, a, b, c, 0), 10);
    expect(r.maxRad).toBeCloseTo(closedFormMuRad(d, a, b, c, Math.PI), 10);
    expect(r.minAt).toBe(0);
    expect(r.maxAt).toBeCloseTo(Math.PI, 12);
    expect(r.worstRad).toBeCloseTo(Math.min(r.minRad, Math.PI - r.maxRad), 12);
  });

  it('reports a sweep with no assembled pose as a value, not a throw', () => {
    const m = closedFormFourBar({ ground: 100, input: 40, coupler: 120, output: 80, theta2: 1, branch: 1 });
    if (m === null) throw new Error('does not assemble');
    const [loop] = fourBarLoops(m.plan);
    const r = transmissionAngleRange(loop, { values: new Float64Array(3), poses: new Float64Array(30), assembled: new Uint8Array(3) });
    expect(r.ok).toBe(false);
    expect(() => transmissionAngleRange(loop, { values: new Float64Array(3), poses: new Float64Array(31), assembled: new Uint8Array(3) })).toThrow(/expected one pose/);
  });
});

describe('transmission angle through compile and sweep', () => {
  it("a compiled crank-rocker's range over a full turn spans the closed-form extremes", () => {
    const [d, a, b, c] = [100, 40, 120, 80];
    const m = closedFormFourBar({ ground: d, input: a, coupler: b, output: c, theta2: 0.9, branch: 1, origin: [-40, 15], groundAngle: 0.25 });
    if (m === null) throw new Error('does not assemble');
    const compiled = compile(m.plan.linkage);
    if (!compiled.ok) throw new Error(JSON.stringify(compiled.issues));
    const plan = compiled.plan;
    const [loop] = fourBarLoops(plan);
    expect(loop.bodyIds).toEqual(['ground', 'input', 'coupler', 'output']);
    // 0.25 rad is the ground line's direction, so θ2 = 0 and π fall on samples 0 and 180
    const result = sweep(plan, { from: 0.25, to: 0.25 + 2 * Math.PI, steps: 361 });
    expect(result.fullTurn).toBe(true);
    const r = transmissionAngleRange(loop, result);
    if (!r.ok) throw new Error(r.reason);
    expect(r.minRad).toBeCloseTo(closedFormMuRad(d, a, b, c, 0), 9);
    expect(r.maxRad).toBeCloseTo(closedFormMuRad(d, a, b, c, Math.PI), 9);
  });
});
