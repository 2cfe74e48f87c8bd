import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { canonicalValue, canonicalViolation, precedes, precedesRawAt } from '../../src/core/optimize';
import { rankInto } from '../../src/core/optimize/ranking';

/** Canonical (value, violation) of a raw pair, as the optimizers store it. */
function ranked(value: number, violation: number): [number, number] {
  const v = canonicalValue(value);
  return [v, canonicalViolation(violation, v)];
}

function before(a: [number, number], b: [number, number]): boolean {
  return precedes(a[0], a[1], b[0], b[1]);
}

describe("Deb's feasibility rules (Deb, 2000, 'An efficient constraint handling method for genetic algorithms')", () => {
  it('a feasible point beats any infeasible one, whatever the values', () => {
    expect(before(ranked(1e9, 0), ranked(-1e9, 1e-9))).toBe(true);
    expect(before(ranked(-1e9, 1e-9), ranked(1e9, 0))).toBe(false);
  });

  it('two infeasible points compare by violation, two feasible ones by value', () => {
    expect(before(ranked(100, 0.5), ranked(-100, 2))).toBe(true);
    expect(before(ranked(-100, 2), ranked(100, 0.5))).toBe(false);
    expect(before(ranked(1, 0), ranked(2, -3))).toBe(true); // a violation ≤ 0 is feasible
    expect(before(ranked(2, -3), ranked(1, 0))).toBe(false);
  });

  it('ranks failed evaluations (NaN, ±Infinity) and NaN violations worst', () => {
    for (const failed of [Number.NaN, Infinity, -Infinity]) {
      const [v, c] = ranked(failed, 0);
      expect(v).toBe(Infinity);
      expect(c).toBe(Infinity);
      expect(before(ranked(1e300, 1e300), [v, c])).toBe(true);
      expect(before([v, c], ranked(1e300, 1e300))).toBe(false);
    }
    expect(ranked(1, Number.NaN)[1]).toBe(Infinity);
    expect(Object.is(canonicalValue(-0), 0)).toBe(true);
  });

  it('is a strict weak order on canonical pairs (property test)', () => {
    const raw = fc.oneof(fc.double(), fc.constantFrom(0, -0, 1, Number.NaN, Infinity, -Infinity));
    const pair = fc.tuple(raw, fc.oneof(raw, fc.constant(0))).map(([v, c]) => ranked(v, c));
    fc.assert(
      fc.property(pair, pair, pair, (a, b, c) => {
        expect(before(a, a)).toBe(false); // irreflexive
        if (before(a, b)) expect(before(b, a)).toBe(false); // asymmetric
        if (before(a, b) && before(b, c)) expect(before(a, c)).toBe(true); // transitive
      }),
      { numRuns: 2000 },
    );
  });
});

describe('precedesRawAt', () => {
  it('ranks two raw pairs as canonicalValue, canonicalViolation and precedes do (property test)', () => {
    const raw = fc.oneof(fc.double(), fc.constantFrom(Number.NaN, Infinity, -Infinity, 0, -0));
    fc.assert(
      fc.property(raw, raw, raw, raw, (va, wa, vb, wb) => {
        const values = Float64Array.of(va, vb);
        const violations = Float64Array.of(wa, wb);
        expect(precedesRawAt(values, violations, 0, 1)).toBe(before(ranked(va, wa), ranked(vb, wb)));
        expect(precedesRawAt(values, violations, 1, 0)).toBe(before(ranked(vb, wb), ranked(va, wa)));
      }),
      { numRuns: 2000, seed: 20261205 },
    );
  });
});

describe('rankInto', () => {
  it('sorts like the stable Array.prototype.sort of ECMAScript 2019 with the same comparator', () => {
    const raw = fc.oneof(fc.double({ min: -10, max: 10 }), fc.constantFrom(0, 1, Number.NaN, Infinity));
    fc.assert(
      fc.property(fc.array(fc.tuple(raw, raw), { minLength: 1, maxLength: 70 }), (pairs) => {
        const n = pairs.length;
        const values = new Float64Array(n);
        const violations = new Float64Array(n);
        pairs.forEach(([v, c], i) => {
          [values[i], violations[i]] = ranked(Math.round(v), Math.round(c) > 5 ? c : 0);
        });
        const order = new Int32Array(n);
        rankInto(order, new Int32Array(n), n, values, violations);
        const reference = Array.from({ length: n }, (_, i) => i).sort((a, b) =>
          precedes(values[a], violations[a], values[b], violations[b]) ? -1 : precedes(values[b], violations[b], values[a], violations[a]) ? 1 : 0,
        );
        expect(Array.from(order)).toEqual(reference);
      }),
      { numRuns: 500 },
    );
  });
});
