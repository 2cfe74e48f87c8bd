/**
 * The weighted, normalised terms the suspension and leg scores share, against sums worked
 * by hand: what each kind of term adds, and where, and which deviations cannot be scored.
 */
import { describe, expect, it } from 'vitest';
import { createWeightedTerms, reportTerms, sumWeightedTerms } from '../../../src/core/synthesis/objective/weightedTerms';

const UNDEFINED = 0;
const BAND = 1;

describe('weighted, normalised terms', () => {
  it('adds weight × (deviation / tolerance)² of targets and penalties, deviation / tolerance of constraints', () => {
    const terms = createWeightedTerms(
      [{ weight: 2, tolerance: 0.5, value: 10 }, undefined, { weight: 3, tolerance: 4, as: 'penalty' }, { weight: 7, tolerance: 2, as: 'constraint' }],
      { undefinedSlot: UNDEFINED, constraintSlot: BAND, undefinedWhen: 'nan' },
    );
    expect(Array.from(terms.target)).toEqual([10, 0, 0, 0]);
    terms.deviation.set([1, 99, 2, 3]);
    const parts = new Float64Array(2);
    // Worked by hand: 2 × (1 / 0.5)² + 3 × (2 / 4)² = 8 + 0.75; the left-out term costs nothing; the constraint adds 3 / 2.
    // Source: common practice (weighted sum of squared normalised residuals)
    expect(sumWeightedTerms(terms, parts)).toBe(8.75);
    expect(Array.from(parts)).toEqual([0, 1.5]);
    // The reports list the present terms only, each with what it adds where it counts.
    expect(reportTerms(terms, (i, deviation, contribution) => [i, deviation, contribution])).toEqual([
      [0, 1, 8],
      [2, 2, 0.75],
      [3, 3, 1.5],
    ]);
  });

  it('counts an unscorable deviation into the undefined slot, by the rule the problem kind states', () => {
    const specs = [{ weight: 1, tolerance: 1 }, { weight: 1, tolerance: 1 }, { weight: 1, tolerance: 1 }];
    const nanOnly = createWeightedTerms(specs, { undefinedSlot: UNDEFINED, undefinedWhen: 'nan' });
    nanOnly.deviation.set([Number.NaN, Infinity, 2]);
    const parts = new Float64Array(2);
    // An infinite deviation scores (and the value with it) where only NaN is undefined.
    expect(sumWeightedTerms(nanOnly, parts)).toBe(Infinity);
    expect(parts[UNDEFINED]).toBe(1);

    const finiteOnly = createWeightedTerms(specs, { undefinedSlot: UNDEFINED, undefinedWhen: 'non-finite' });
    finiteOnly.deviation.set([Number.NaN, Infinity, -1]);
    parts.fill(0);
    expect(sumWeightedTerms(finiteOnly, parts)).toBe(0);
    expect(parts[UNDEFINED]).toBe(3);
  });

  it('refuses a constraint term without a slot to count it in (a programmer error)', () => {
    expect(() => createWeightedTerms([{ weight: 1, tolerance: 1, as: 'constraint' }], { undefinedSlot: UNDEFINED, undefinedWhen: 'nan' })).toThrow(/constraint slot/);
  });
});
