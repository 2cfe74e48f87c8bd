import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { CHANGE_POINT_REL_TOL } from '../../../src/core/linkage/analysis/grashof';
import { Prng, fromUnitBoxInto } from '../../../src/core/optimize';
import { createObjective, createProblem, type ProblemInput } from '../../../src/core/synthesis';

const TAU = 2 * Math.PI;
const POINTS = [
  [0.5, 1.1],
  [0.2, 1.0],
  [0.0, 0.5],
  [0.15, 0.2],
  [0.5, 0.7],
  [0.6, 1.0],
];
// The classifier's change-point band (grashof.ts): within it a four-bar is a change point, which does not turn fully.
const BAND = CHANGE_POINT_REL_TOL;

function objectiveOf(input: Partial<ProblemInput>, searchMap?: 'affine' | 'fourbar-boundary') {
  const made = createProblem({
    name: 'test',
    target: { points: POINTS, closed: true },
    placement: 'fixed',
    families: ['fourbar-lengths'],
    timing: { mode: 'free', wrap: false },
    constraints: { fullTurnCrank: true, branch: 'crossed' },
    bounds: {
      'fourbar-lengths': {
        r1: [0, 50],
        r2: [0, 50],
        r3: [0, 50],
        r4: [0, 50],
        rcx: [-50, 50],
        rcy: [-50, 50],
        x0: [-50, 50],
        y0: [-50, 50],
        theta0: [0, TAU],
        theta2: [0, TAU],
      },
    },
    ...(searchMap === undefined ? {} : { searchMaps: { 'fourbar-lengths': searchMap } }),
    ...input,
  });
  if (!made.ok) throw new Error(JSON.stringify(made.issues));
  return createObjective(made.problem, 'fourbar-lengths');
}

const unitPoint = (dim: number) => fc.array(fc.double({ min: 0, max: 1, noNaN: true }), { minLength: dim, maxLength: dim });

describe('search maps of the objective (searchMap.ts)', () => {
  it("'affine' is the default and is x = lower + u · (upper − lower) (box.ts)", () => {
    const objective = objectiveOf({});
    expect(objective.searchMap).toBe('affine');
    fc.assert(
      fc.property(unitPoint(objective.dim), (u) => {
        const x = objective.fromSearchBoxInto(u, new Float64Array(objective.dim));
        expect(Array.from(x)).toEqual(Array.from(fromUnitBoxInto(u, objective.lower, objective.upper, new Float64Array(objective.dim))));
      }),
      { numRuns: 100 },
    );
  });

  it("'fourbar-boundary' keeps every design in its box, the crank angles increasing and the crank Grashof whenever the other links admit one (property)", () => {
    // The constraints are the papers' (Cabrera, Simon and Prado, 2002): Grashof with the crank shortest (Grashof, 1883; as stated by Chang, Lin and Wu, 2005), strictly, outside the change-point band; θ2_i increasing.
    const objective = objectiveOf({}, 'fourbar-boundary');
    const d = objective.dim;
    fc.assert(
      fc.property(unitPoint(d), (u) => {
        const x = objective.fromSearchBoxInto(u, new Float64Array(d));
        for (let j = 0; j < d; j++) {
          expect(x[j]).toBeGreaterThanOrEqual(objective.lower[j]);
          expect(x[j]).toBeLessThanOrEqual(objective.upper[j]);
        }
        for (let i = 10; i < d; i++) expect(x[i]).toBeGreaterThanOrEqual(x[i - 1]);
        const [r1, r2, r3, r4] = [x[0], x[1], x[2], x[3]];
        const l = Math.max(r1, r3, r4);
        // The other links admit a crank that turns fully (past the change-point band, with r2 > 0 its box's lower end).
        if (r1 + r3 + r4 - 2 * l > 4 * BAND * (r1 + r3 + r4)) {
          expect(r2).toBeLessThanOrEqual(Math.min(r1, r3, r4));
          const rs = [r1, r2, r3, r4];
          const s = Math.min(...rs);
          const long = Math.max(...rs);
          expect(s + long - (r1 + r2 + r3 + r4 - s - long)).toBeLessThan(-BAND * (r1 + r2 + r3 + r4));
        }
      }),
      { numRuns: 500 },
    );
  });

  it("'fourbar-boundary' gives a crank on the Grashof boundary at u2 = 1, and the objective finds no crank or order defect", () => {
    const objective = objectiveOf({}, 'fourbar-boundary');
    const u = new Float64Array(objective.dim).fill(0.5);
    u[0] = 1; // r1 = 50, its upper bound
    u[1] = 1; // r2: the largest crank
    u[2] = 0.6; // r3 ≈ 1.36
    u[3] = 0.4; // r4 = r1 − 0.22
    const x = objective.fromSearchBoxInto(u, new Float64Array(objective.dim));
    expect(x[0]).toBe(50);
    expect(x[3]).toBeLessThan(50);
    // The offsets sit at their box centres at u = 0.5.
    expect(x[4]).toBe(0);
    expect(x[7]).toBe(0);
    // s + l − p − q with s = r2, l = r1: just inside the Grashof region, past the change-point band
    // (theorem: only then does the crank turn fully), and within a few bands of the boundary.
    const sum = x[0] + x[1] + x[2] + x[3];
    const excess = x[1] + x[0] - x[2] - x[3];
    expect(excess).toBeLessThan(-BAND * sum);
    expect(excess).toBeGreaterThan(-10 * BAND * sum);
    const report = objective.describe(x);
    expect(report.defects.filter((d) => d.includes('crank') || d.includes('order'))).toEqual([]);
  });

  it("'fourbar-boundary' spreads uniform box points as sorted uniforms: E θ2_(i) = 2π i / (n + 1)", () => {
    // Expected order statistics of n uniforms: E U_(i) = i / (n + 1) (David and Nagaraja, 2003, "Order Statistics", Wiley; from memory).
    const objective = objectiveOf({}, 'fourbar-boundary');
    const d = objective.dim;
    const n = d - 9;
    const rng = Prng.fromSeed(7);
    const u = new Float64Array(d);
    const x = new Float64Array(d);
    const sums = new Float64Array(n);
    const samples = 20_000;
    for (let k = 0; k < samples; k++) {
      rng.fillFloats(u, d);
      objective.fromSearchBoxInto(u, x);
      for (let i = 0; i < n; i++) sums[i] += x[9 + i];
    }
    for (let i = 0; i < n; i++) {
      // Standard error of each mean ≤ 2π · 0.5 / √samples ≈ 0.022; 0.07 is three of them.
      expect(Math.abs(sums[i] / samples - (TAU * (i + 1)) / (n + 1))).toBeLessThan(0.07);
    }
  });

  it('toSearchBoxInto undoes fromSearchBoxInto where the map is one to one, for both maps (property)', () => {
    // Common practice: a round trip through exp/log and powers loses a few ulps, amplified near the low end of the logarithmic scale.
    for (const kind of ['affine', 'fourbar-boundary'] as const) {
      const objective = objectiveOf({}, kind);
      const d = objective.dim;
      fc.assert(
        fc.property(unitPoint(d), (raw) => {
          // Keep u away from the clamps of r4 (u4 near 0 or 1) and the box faces, where the map is not one to one.
          const u = raw.map((v) => 0.05 + 0.9 * v);
          if (kind === 'fourbar-boundary') u[3] = 0.4 + 0.2 * raw[3];
          const x = objective.fromSearchBoxInto(u, new Float64Array(d));
          const back = objective.toSearchBoxInto(x, new Float64Array(d));
          // r2 is a share of the largest crank: not one to one when r1, r3, r4 admit none (it is then its lower bound).
          const l = Math.max(x[0], x[2], x[3]);
          const noCrank = kind === 'fourbar-boundary' && !(x[0] + x[2] + x[3] - 2 * l > 0);
          // r4 = r1 + offset is clamped to its box: not one to one at its bounds.
          const clamped = kind === 'fourbar-boundary' && (x[3] === objective.lower[3] || x[3] === objective.upper[3]);
          for (let j = 0; j < d; j++) {
            if ((noCrank && j === 1) || (clamped && j === 3)) continue;
            expect(Math.abs(back[j] - u[j])).toBeLessThan(1e-7);
          }
        }),
        { numRuns: 300 },
      );
    }
  });

  it("'fourbar-boundary' asks for the fixed-placement literature encoding", () => {
    expect(() => objectiveOf({ placement: 'free', bounds: {} }, 'fourbar-boundary')).toThrow(/fixed placement/);
  });
});
