/**
 * The sign of a triad's block Jacobian from its reduced 4 × 4 system (triad.ts) is the
 * sign of the full 6 × 6 Jacobian's determinant times one factor fixed for the plan, at
 * any pose: the comparisons with the reference pose's sign that the search's curve and
 * the sweep make come out the same either way.
 *
 * Second method: the block's whole Jacobian as the Newton solver builds it
 * (`evaluateEquations`, every equation of the block differentiated), its determinant's
 * sign by a Gaussian elimination written here. Block elimination of the link's identity
 * columns is why the two agree (common practice: det [[A, B], [C, I]] = det(A − BC)).
 */
import { describe, expect, it } from 'vitest';
import { compile } from '../../src/core/linkage';
import { stephensonII, stephensonIII } from '../../src/core/linkage/families';
import { blockJacobianSign, evaluateEquations } from '../../src/core/linkage/newton';
import type { PlanInternal } from '../../src/core/linkage/plan';
import { Prng } from '../../src/core/optimize';

const POSES = 2_000;

function planOf(linkage: ReturnType<typeof stephensonII>): PlanInternal {
  const compiled = compile(linkage);
  if (!compiled.ok) throw new Error('the family does not compile');
  return compiled.plan as PlanInternal;
}

/** Sign of det of the block's full Jacobian at pose (0 where a pivot vanishes). */
function fullJacobianSign(p: PlanInternal, block: number, pose: Float64Array): number {
  const n = 2 * p.blockUnknownCount[block];
  const jac = new Float64Array(n * n);
  evaluateEquations(
    p.blockEqs, p.blockEqStart[block], p.blockEqCount[block], p.params, p.paramRates, pose,
    p.blockColumns, block * p.slotCount, n, new Float64Array(n), jac, null, new Float64Array(n),
  );
  let sign = 1;
  for (let k = 0; k < n; k++) {
    let q = k;
    for (let i = k + 1; i < n; i++) if (Math.abs(jac[i * n + k]) > Math.abs(jac[q * n + k])) q = i;
    const pivot = jac[q * n + k];
    if (pivot === 0) return 0;
    if (q !== k) {
      sign = -sign;
      for (let j = 0; j < n; j++) [jac[k * n + j], jac[q * n + j]] = [jac[q * n + j], jac[k * n + j]];
    }
    if (pivot < 0) sign = -sign;
    for (let i = k + 1; i < n; i++) {
      const f = jac[i * n + k] / pivot;
      for (let j = k; j < n; j++) jac[i * n + j] -= f * jac[k * n + j];
    }
  }
  return sign;
}

describe('a triad block\'s Jacobian sign from its reduced system', () => {
  for (const [name, linkage] of [['Stephenson II', stephensonII()], ['Stephenson III', stephensonIII()]] as const) {
    it(`${name}: the full determinant's sign times one factor of the plan, at ${POSES} random poses`, () => {
      const p = planOf(linkage);
      expect(p.blockCount).toBe(1);
      const factor = blockJacobianSign(p, 0, p.reference) * fullJacobianSign(p, 0, p.reference);
      expect(Math.abs(factor)).toBe(1);
      const prng = Prng.fromSeed(41);
      const pose = new Float64Array(p.reference.length);
      const scale = p.lengthScaleMm;
      let plus = 0;
      let minus = 0;
      let differ = 0;
      for (let k = 0; k < POSES; k++) {
        // Every coordinate moved, the block's joints far from any solution too: the identity holds at any pose.
        for (let i = 0; i < pose.length; i++) pose[i] = p.reference[i] + (prng.float() * 2 - 1) * 0.5 * scale;
        const reduced = blockJacobianSign(p, 0, pose);
        const full = fullJacobianSign(p, 0, pose);
        if (reduced !== factor * full) differ++;
        if (full > 0) plus++;
        else if (full < 0) minus++;
      }
      expect(differ).toBe(0);
      // Both signs were met: the check could fail either way.
      expect(plus).toBeGreaterThan(POSES / 10);
      expect(minus).toBeGreaterThan(POSES / 10);
    });
  }
});
