import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { CHANGE_POINT_REL_TOL, classifyFourBar } from '../../src/core/linkage/analysis/grashof';

type Lengths = readonly [ground: number, input: number, coupler: number, output: number];

const classify = (l: Lengths) => classifyFourBar(l[0], l[1], l[2], l[3]);

/**
 * Whether the joint between adjacent links x and y turns through a full revolution:
 * the diagonal across it, sqrt(x² + y² − 2xy cos φ), sweeps [|x − y|, x + y], and the
 * other two links z, w close it only while |z − w| ≤ diagonal ≤ z + w (triangle
 * inequality; theorem). `marginMm` > 0 asks for a strict fit.
 */
function jointRevolves(x: number, y: number, z: number, w: number, marginMm: number): boolean {
  return x + y <= z + w - marginMm && Math.abs(x - y) >= Math.abs(z - w) + marginMm;
}

/** Joints in loop order: ground–input, input–coupler, coupler–output, output–ground. */
function revolvingJoints(l: Lengths, marginMm: number): boolean[] {
  const out: boolean[] = [];
  for (let i = 0; i < 4; i++) {
    const x = l[i];
    const y = l[(i + 1) % 4];
    out.push(jointRevolves(x, y, l[(i + 2) % 4], l[(i + 3) % 4], marginMm));
  }
  return out;
}

describe('classifyFourBar: one case per Barker type', () => {
  // Barker, "A complete classification of planar four-bar linkages", Mech. Mach. Theory
  // 20(6), 1985, as tabulated in Norton, Design of Machinery (from memory): type numbers
  // and codes. The non-Grashof types follow the longest link: 5 RRR1 ground, 6 RRR2
  // input, 7 RRR3 coupler, 8 RRR4 output. The cases marked "ref" are the reference list's
  // (from memory there too). The other cases are ours, built so that the named link is
  // the shortest (Grashof, change point) or the longest (non-Grashof) and s + l − p − q
  // has the stated sign.
  const cases: { lengths: Lengths; type: number; code: string; grashof: string; name: RegExp; note: string }[] = [
    { lengths: [40, 100, 120, 80], type: 1, code: 'GCCC', grashof: 'grashof', name: /double crank/, note: 'ref, from memory' },
    { lengths: [100, 40, 120, 80], type: 2, code: 'GCRR', grashof: 'grashof', name: /^crank-rocker$/, note: 'ref, from memory' },
    { lengths: [100, 120, 40, 80], type: 3, code: 'GRCR', grashof: 'grashof', name: /double rocker/, note: 'ref, from memory' },
    { lengths: [100, 80, 120, 40], type: 4, code: 'GRRC', grashof: 'grashof', name: /^rocker-crank$/, note: 'ref, from memory' },
    { lengths: [100, 60, 50, 80], type: 5, code: 'RRR1', grashof: 'non-grashof', name: /triple rocker \(ground longest\)/, note: 'ref, from memory' },
    { lengths: [60, 100, 50, 80], type: 6, code: 'RRR2', grashof: 'non-grashof', name: /triple rocker \(input longest\)/, note: 'ref, from memory' },
    { lengths: [60, 50, 100, 80], type: 7, code: 'RRR3', grashof: 'non-grashof', name: /triple rocker \(coupler longest\)/, note: 'ours, type from memory' },
    { lengths: [60, 50, 80, 100], type: 8, code: 'RRR4', grashof: 'non-grashof', name: /triple rocker \(output longest\)/, note: 'ours, type from memory' },
    { lengths: [50, 100, 120, 70], type: 9, code: 'SCCC', grashof: 'change-point', name: /change-point double crank/, note: 'ours, type from memory' },
    { lengths: [100, 50, 120, 70], type: 10, code: 'SCRR', grashof: 'change-point', name: /change-point crank-rocker/, note: 'ref, from memory' },
    { lengths: [100, 120, 50, 70], type: 11, code: 'SRCR', grashof: 'change-point', name: /change-point double rocker/, note: 'ours, type from memory' },
    { lengths: [100, 70, 120, 50], type: 12, code: 'SRRC', grashof: 'change-point', name: /change-point rocker-crank/, note: 'ours, type from memory' },
    { lengths: [100, 40, 100, 40], type: 13, code: 'S2X', grashof: 'change-point', name: /parallelogram/, note: 'ref (parallelogram), from memory' },
    { lengths: [50, 50, 50, 50], type: 14, code: 'S3X', grashof: 'change-point', name: /triple change point/, note: 'ref (square), from memory' },
  ];
  for (const c of cases) {
    it(`(${c.lengths.join(', ')}) is type ${c.type} ${c.code} (${c.note})`, () => {
      const k = classify(c.lengths);
      expect(k.barkerType).toBe(c.type);
      expect(k.code).toBe(c.code);
      expect(k.grashof).toBe(c.grashof);
      expect(k.name).toMatch(c.name);
      const sorted = [...c.lengths].sort((a, b) => a - b);
      expect(k.slMinusPq).toBeCloseTo(sorted[0] + sorted[3] - sorted[1] - sorted[2], 12);
    });
  }

  it('tells a deltoid (equal adjacent links) from a parallelogram (equal opposite links) (theorem)', () => {
    expect(classify([40, 40, 100, 100]).name).toMatch(/deltoid/);
    expect(classify([100, 40, 40, 100]).name).toMatch(/deltoid/);
    expect(classify([40, 40, 100, 100]).barkerType).toBe(13);
  });
});

describe("classifyFourBar: Grashof's criterion", () => {
  // Grashof 1883, as stated by Chang, Lin and Wu, "A note on Grashof's theorem",
  // J. Marine Sci. Technol. 13(4), 2005 (published): s + l < p + q, the shortest link
  // turns fully relative to the others; s + l > p + q, no link turns fully; s + l = p + q,
  // change point. Checked against the triangle inequality on the diagonal across each
  // joint (theorem), which knows nothing of s, l, p, q.
  const length = fc.double({ min: 1, max: 1000, noNaN: true });
  const lengths = fc.tuple(length, length, length, length);

  it('Grashof exactly when the two joints of the shortest link, and no others, turn fully', () => {
    fc.assert(
      fc.property(lengths, (l) => {
        const total = l[0] + l[1] + l[2] + l[3];
        const k = classify(l);
        fc.pre(Math.abs(k.slMinusPq) > 1e-6 * total);
        const revolving = revolvingJoints(l, 1e-9 * total);
        const shortest = l.indexOf(Math.min(...l));
        if (k.grashof === 'grashof') {
          // joints shortest−1 → shortest and shortest → shortest+1 in loop order
          const expected = [0, 1, 2, 3].map((j) => j === shortest || j === (shortest + 3) % 4);
          expect(revolving).toEqual(expected);
        } else {
          expect(k.grashof).toBe('non-grashof');
          expect(revolving).toEqual([false, false, false, false]);
        }
      }),
      { numRuns: 2000, seed: 1985 },
    );
  });

  it("the code's input and output letters say whether those links turn fully relative to ground", () => {
    fc.assert(
      fc.property(lengths, (l) => {
        const total = l[0] + l[1] + l[2] + l[3];
        const k = classify(l);
        fc.pre(k.grashof === 'grashof' && k.slMinusPq < -1e-6 * total);
        const revolving = revolvingJoints(l, 1e-9 * total);
        // Barker's G codes: G + (input, coupler, output) relative to ground, C or R.
        expect(k.code[1] === 'C').toBe(revolving[0]);
        expect(k.code[3] === 'C').toBe(revolving[3]);
      }),
      { numRuns: 2000, seed: 2005 },
    );
  });

  it(`a change point stays one within the named tolerance (${CHANGE_POINT_REL_TOL} of the total), and leaves it beyond`, () => {
    const onBoundary: Lengths = [100, 50, 120, 70];
    const total = 340;
    const nudge = (by: number): Lengths => [100, 50 + by * total, 120, 70];
    expect(classify(onBoundary).grashof).toBe('change-point');
    expect(classify(nudge(0.5 * CHANGE_POINT_REL_TOL)).barkerType).toBe(10);
    expect(classify(nudge(-0.5 * CHANGE_POINT_REL_TOL)).barkerType).toBe(10);
    expect(classify(nudge(-1e-6)).barkerType).toBe(2);
    expect(classify(nudge(1e-6)).grashof).toBe('non-grashof');
    // an explicit tolerance widens the band
    expect(classifyFourBar(100, 50 - 1e-6 * total, 120, 70, 1e-5).barkerType).toBe(10);
  });

  it('rejects lengths that are not finite and positive, and says which', () => {
    expect(() => classifyFourBar(100, 0, 120, 80)).toThrow(/input length is 0/);
    expect(() => classifyFourBar(100, 40, Number.NaN, 80)).toThrow(/coupler length is NaN/);
    expect(() => classifyFourBar(100, 40, 120, -1)).toThrow(/output length/);
    expect(() => classifyFourBar(100, 40, 120, 80, -1)).toThrow(/relTol/);
  });
});

describe('classifyFourBar: invariants', () => {
  const length = fc.double({ min: 1, max: 1000, noNaN: true });
  /** Random lengths, a third of them placed exactly on the change-point boundary. */
  const anyFourBar = fc.oneof(
    fc.tuple(length, length, length, length),
    fc.tuple(length, length, length, fc.integer({ min: 0, max: 3 })).map(([a, b, c, turn]): Lengths => {
      // s + l = p + q exactly: the longest is p + q − s, and the loop is turned so that
      // the shortest link takes any of the four places
      const [s, p, q] = [a, b, c].sort((x, y) => x - y);
      const loop = [s, p, p + q - s, q];
      return [loop[turn], loop[(turn + 1) % 4], loop[(turn + 2) % 4], loop[(turn + 3) % 4]];
    }),
    fc.tuple(length, length).map(([a, b]): Lengths => [a, b, a, b]),
  );

  // Swapping input and output exchanges crank-rocker (2) with rocker-crank (4) and the
  // classes that mirror them; the rest map to themselves (the table's symmetry).
  const mirror: Record<number, number> = { 1: 1, 2: 4, 3: 3, 4: 2, 5: 5, 6: 8, 7: 7, 8: 6, 9: 9, 10: 12, 11: 11, 12: 10, 13: 13, 14: 14 };

  it('does not change under uniform scaling (theorem: the class is a property of shape)', () => {
    fc.assert(
      fc.property(anyFourBar, fc.double({ min: 1e-3, max: 1e3, noNaN: true }), (l, k) => {
        const a = classify(l);
        const b = classifyFourBar(l[0] * k, l[1] * k, l[2] * k, l[3] * k);
        expect(b.barkerType).toBe(a.barkerType);
        expect(b.slMinusPq).toBeCloseTo(a.slMinusPq * k, 6);
      }),
      { numRuns: 1000, seed: 7 },
    );
  });

  it('swapping input and output swaps crank-rocker with rocker-crank (and mirrors the rest)', () => {
    fc.assert(
      fc.property(anyFourBar, (l) => {
        const a = classify(l);
        const b = classifyFourBar(l[0], l[3], l[2], l[1]);
        expect(b.barkerType).toBe(mirror[a.barkerType]);
        if (a.name === 'crank-rocker') expect(b.name).toBe('rocker-crank');
      }),
      { numRuns: 1000, seed: 11 },
    );
    expect(classifyFourBar(100, 80, 120, 40).name).toBe('rocker-crank');
    expect(classifyFourBar(100, 40, 120, 80).name).toBe('crank-rocker');
  });
});
