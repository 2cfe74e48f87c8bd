import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  MAX_POINTS_CSV_CHARS,
  MAX_TARGET_POINTS,
  REPEATED_POINT_TOL_MM,
  firstRepeats,
  formatPointsCsv,
  parsePointsCsv,
  type PointsCsvResult,
} from '../../src/core/io/pointsCsv';
import { MAX_TARGET_COORDINATE_MM, minTargetSpanMm } from '../../src/core/synthesis/problem';

function ok(result: PointsCsvResult) {
  if (!result.ok) throw new Error(`expected ok, got ${JSON.stringify(result.issues)}`);
  return result;
}

function issues(result: PointsCsvResult) {
  if (result.ok) throw new Error('expected issues, got ok');
  return result.issues;
}

const SQUARE = [
  { x: 0, y: 0 },
  { x: 10, y: 0 },
  { x: 10, y: 10 },
  { x: 0, y: 10 },
];

describe('parsePointsCsv: what it accepts', () => {
  // Comma-separated values with or without a header line, and quoted fields:
  // Source: Y. Shafranovich, "Common Format and MIME Type for CSV Files", RFC 4180, 2005, section 2.
  it('reads x,y rows without a header', () => {
    const table = ok(parsePointsCsv('0,0\n10,0\n10,10\n0,10\n'));
    expect(table.points).toEqual(SQUARE);
    expect(table.header).toBeNull();
    expect(table.driverDeg).toBeNull();
    expect(table.delimiter).toBe(',');
  });

  it('reads a header row, in any column order, and ignores columns it does not know', () => {
    const table = ok(parsePointsCsv('id,y (mm),x (mm)\np1,0,0\np2,0,10\np3,10,10\np4,10,0\n'));
    expect(table.points).toEqual(SQUARE);
    expect(table.header).toEqual(['id', 'y (mm)', 'x (mm)']);
  });

  it('reads CRLF line ends and a quoted field', () => {
    const table = ok(parsePointsCsv('x,y\r\n"0",0\r\n10,"0"\r\n10,10\r\n0,10\r\n'));
    expect(table.points).toEqual(SQUARE);
  });

  // A spreadsheet in a decimal-comma locale writes semicolons between values.
  // Source: ISO 80000-1:2009, 7.3.2 (the decimal sign is a comma or a point on the line); common practice for the semicolon.
  it('reads semicolons with decimal commas', () => {
    const table = ok(parsePointsCsv('x;y\n0,5;1,25\n10;0\n-3,75;2\n'));
    expect(table.points).toEqual([
      { x: 0.5, y: 1.25 },
      { x: 10, y: 0 },
      { x: -3.75, y: 2 },
    ]);
    expect(table.delimiter).toBe(';');
    expect(table.decimalComma).toBe(true);
  });

  it('reads tabs (a paste from a spreadsheet) with decimal commas', () => {
    const table = ok(parsePointsCsv('1,5\t2\n3\t4,5\n6\t7\n'));
    expect(table.points).toEqual([
      { x: 1.5, y: 2 },
      { x: 3, y: 4.5 },
      { x: 6, y: 7 },
    ]);
    expect(table.delimiter).toBe('\t');
  });

  it('reads a quoted decimal comma in a comma-separated file', () => {
    const table = ok(parsePointsCsv('"1,5",2\n3,4\n5,"6,25"\n'));
    expect(table.points).toEqual([
      { x: 1.5, y: 2 },
      { x: 3, y: 4 },
      { x: 5, y: 6.25 },
    ]);
  });

  it('skips a byte-order mark and blank lines', () => {
    const table = ok(parsePointsCsv('\uFEFFx,y\n\n0,0\n10,0\n   \n10,10\n0,10\n\n'));
    expect(table.points).toEqual(SQUARE);
    expect(table.header).toEqual(['x', 'y']);
  });

  it('reads exponents and signs', () => {
    const table = ok(parsePointsCsv('1e1,-2.5E-1\n+3,.5\n-0.25,7.\n'));
    expect(table.points).toEqual([
      { x: 10, y: -0.25 },
      { x: 3, y: 0.5 },
      { x: -0.25, y: 7 },
    ]);
  });

  it('takes a third column without a header as the crank angle in degrees', () => {
    const table = ok(parsePointsCsv('0,0,0\n10,0,90\n10,10,180\n0,10,270\n'));
    expect(table.driverDeg).toEqual([0, 90, 180, 270]);
  });

  it('converts an angle column whose header says radians into degrees', () => {
    const table = ok(parsePointsCsv(`x,y,angle (rad)\n0,0,0\n10,0,${Math.PI / 2}\n10,10,${Math.PI}\n`));
    const deg = table.driverDeg ?? [];
    // 180° = π rad (definition of the radian).
    [0, 90, 180].forEach((d, i) => expect(deg[i]).toBeCloseTo(d, 12));
  });

  it('reads a weight column by its header', () => {
    const table = ok(parsePointsCsv('x,y,weight\n0,0,1\n10,0,2\n10,10,0.5\n'));
    expect(table.weights).toEqual([1, 2, 0.5]);
  });

  it('drops a last row that repeats the first and says the path is closed', () => {
    const table = ok(parsePointsCsv('0,0\n10,0\n10,10\n0,10\n0,0\n'));
    expect(table.points).toEqual(SQUARE);
    expect(table.closedByRepeat).toBe(true);
  });
});

describe('parsePointsCsv: bad input names the row and what is wrong', () => {
  it('text in a number column', () => {
    const found = issues(parsePointsCsv('x,y\n0,0\n10,abc\n10,10\n'));
    expect(found).toEqual([{ row: 3, message: expect.stringMatching(/row 3: y is "abc", which is not a number/) }]);
  });

  it('a first row that mixes numbers and text is a data row, not a header', () => {
    const found = issues(parsePointsCsv('1,abc\n2,3\n4,5\n'));
    expect(found[0].row).toBe(1);
    expect(found[0].message).toMatch(/y is "abc"/);
  });

  it('a ragged row', () => {
    const found = issues(parsePointsCsv('0,0\n10,0\n10,10,5\n0,10\n'));
    expect(found).toEqual([{ row: 3, message: 'row 3 has 3 values; the first row has 2' }]);
  });

  it('an empty cell', () => {
    const found = issues(parsePointsCsv('x,y\n0,0\n,5\n10,10\n'));
    expect(found[0]).toEqual({ row: 3, message: 'row 3: the x value is empty' });
  });

  it('row numbers count the header and blank lines, as a text editor shows them', () => {
    const found = issues(parsePointsCsv('x,y\n\n0,0\n\n10,zz\n1,1\n'));
    expect(found[0].row).toBe(5);
  });

  it('a repeated point names both rows', () => {
    const found = issues(parsePointsCsv('0,0\n10,0\n10,10\n10,0\n0,10\n'));
    expect(found).toEqual([{ row: 4, message: expect.stringContaining('row 4 repeats the point of row 2') }]);
  });

  it('too few points', () => {
    const found = issues(parsePointsCsv('x,y\n0,0\n1,1\n'));
    expect(found).toEqual([{ row: 0, message: 'there are 2 points; a target needs at least 3' }]);
  });

  it('nothing at all', () => {
    expect(issues(parsePointsCsv('\n\n  \n'))[0].message).toMatch(/no points/);
  });

  it('one value per row says which separators it reads', () => {
    expect(issues(parsePointsCsv('1 2\n3 4\n5 6\n'))[0].message).toMatch(/comma, semicolon or tab/);
  });

  it('four values in a comma file hints at the decimal comma', () => {
    expect(issues(parsePointsCsv('1,5,2,5\n3,5,4,5\n'))[0].message).toMatch(/decimal comma need a semicolon or a tab/);
  });

  it('a header without an x column', () => {
    const found = issues(parsePointsCsv('y,angle\n1,2\n3,4\n5,6\n'));
    expect(found[0]).toEqual({ row: 1, message: expect.stringMatching(/names no x column/) });
  });

  it('a negative weight', () => {
    expect(issues(parsePointsCsv('x,y,weight\n0,0,1\n1,0,-1\n1,1,1\n'))[0]).toEqual({ row: 3, message: 'row 3: the weight is -1; expected a number ≥ 0' });
  });

  it('an unclosed quote', () => {
    expect(issues(parsePointsCsv('0,0\n1,"1\n2,2\n')).some((i) => /quote/.test(i.message))).toBe(true);
  });

  it('a huge text is refused before parsing', () => {
    const huge = '1,1\n'.repeat(MAX_POINTS_CSV_CHARS / 4 + 1);
    const found = issues(parsePointsCsv(huge));
    expect(found).toHaveLength(1);
    expect(found[0].row).toBe(0);
    expect(found[0].message).toMatch(/at most 1000 kB/);
  });

  it('too many rows', () => {
    const rows = Array.from({ length: MAX_TARGET_POINTS + 1 }, (_, i) => `${i},${i % 7}`).join('\n');
    expect(issues(parsePointsCsv(rows))[0].message).toMatch(new RegExp(`at most ${MAX_TARGET_POINTS}`));
  });

  it('lists at most a dozen problems and counts the rest', () => {
    const rows = ['0,0', ...Array.from({ length: 30 }, (_, i) => `${i + 1},bad`)].join('\n');
    const found = issues(parsePointsCsv(rows));
    expect(found).toHaveLength(13);
    expect(found[12].message).toBe('and 18 more problems');
  });
});

describe('formatPointsCsv and parsePointsCsv', () => {
  // Identity: what we write, we read back exactly (JSON-style shortest round-trip of doubles, ECMA-262 Number::toString).
  it('round-trips any distinct points within the target limits', () => {
    const coordinate = fc.double({ min: -MAX_TARGET_COORDINATE_MM, max: MAX_TARGET_COORDINATE_MM, noNaN: true, noDefaultInfinity: true });
    fc.assert(
      fc.property(fc.uniqueArray(fc.tuple(coordinate, coordinate), { minLength: 3, maxLength: 40, selector: ([x, y]) => `${Math.round(x)},${Math.round(y)}` }), (pairs) => {
        // A target too small for its distance from the origin is refused (the span rule), not a round-trip question.
        const largest = Math.max(...pairs.flat().map(Math.abs));
        const span = Math.max(...pairs.map(([x]) => x)) - Math.min(...pairs.map(([x]) => x));
        const spanY = Math.max(...pairs.map(([, y]) => y)) - Math.min(...pairs.map(([, y]) => y));
        fc.pre(Math.max(span, spanY) >= minTargetSpanMm(largest));
        const points = pairs.map(([x, y]) => ({ x: Object.is(x, -0) ? 0 : x, y: Object.is(y, -0) ? 0 : y }));
        const table = ok(parsePointsCsv(formatPointsCsv(points)));
        expect(table.points).toEqual(points);
        expect(table.closedByRepeat).toBe(false);
      }),
    );
  });

  it('writes the angle column only when every point has one', () => {
    expect(formatPointsCsv([{ x: 1, y: 2, driverDeg: 3 }])).toBe('x_mm,y_mm,angle_deg\n1,2,3\n');
    expect(formatPointsCsv([{ x: 1, y: 2, driverDeg: 3 }, { x: 4, y: 5, driverDeg: null }])).toBe('x_mm,y_mm\n1,2\n4,5\n');
  });
});

// Hostile input (the issue "Hostile input and faults"): each value is held to a
// problem's limits, with the row it came from.
describe('parsePointsCsv: limits and the rows it names', () => {
  it('a crank angle of 1.7e308 rad is refused, not read as Infinity', () => {
    // 1.7e308 × 180 overflows binary64 (largest finite ≈ 1.798e308; IEEE 754).
    const found = issues(parsePointsCsv('x,y,angle_rad\n0,0,1.7e308\n1,1,1\n2,0,2\n'));
    expect(found).toEqual([{ row: 2, message: 'row 2: the crank angle is 1.7e+308 rad; expected an angle from −100 to 100 rad' }]);
    expect(issues(parsePointsCsv('0,0,0\n1,1,6000\n2,0,2\n'))[0]).toEqual({ row: 2, message: 'row 2: the crank angle is 6000°; expected an angle from −5729 to 5729°' });
  });

  it('an all-zero weight column is refused; a weight above 1e6 names its row', () => {
    expect(issues(parsePointsCsv('x,y,weight\n0,0,0\n1,1,0\n2,0,0\n'))).toEqual([{ row: 0, message: 'every weight is 0; expected at least one point with a weight above 0' }]);
    expect(issues(parsePointsCsv('x,y,weight\n0,0,1\n1,1,1e308\n2,0,0\n'))[0]).toEqual({ row: 3, message: expect.stringMatching(/^row 3: the weight is 1e\+308; expected a number ≥ 0 and at most 1000000/) });
    expect(ok(parsePointsCsv('x,y,weight\n0,0,0\n1,1,1e6\n2,0,0\n')).weights).toEqual([0, 1e6, 0]);
  });

  it('a quoted value with a line break: rows are the lines where they start, as a text editor shows them', () => {
    // Line breaks inside quotes belong to the value. Source: Y. Shafranovich, RFC 4180, 2005, section 2, rule 6.
    const found = issues(parsePointsCsv('x,y,note\n0,0,a\n1,1,"two\nlines"\n2,x,c\n3,1,d\n'));
    expect(found).toEqual([{ row: 5, message: 'row 5: y is "x", which is not a number' }]);
    const crlf = issues(parsePointsCsv('x,y,note\r\n0,0,"a\r\nb"\r\n1,1,c\r\n2,zz,d\r\n'));
    expect(crlf[0].row).toBe(5);
  });

  it('reads a header with spaces after the commas around quoted names', () => {
    const table = ok(parsePointsCsv('"x", "y"\n0, 0\n10, "0"\n10,10\n0,10\n'));
    expect(table.header).toEqual(['x', 'y']);
    expect(table.points).toEqual(SQUARE);
  });

  it('an unclosed quote names the row where it opens', () => {
    expect(issues(parsePointsCsv('0,0\n1,1\n2,"2\n3,3\n'))[0]).toEqual({ row: 3, message: 'row 3 has a quote that is never closed' });
  });

  it('refuses points far from the origin, and a target too small for its distance', () => {
    expect(issues(parsePointsCsv('0,0\n1,1\n2e15,0\n'))[0]).toEqual({ row: 3, message: 'row 3: the point (2000000000000000, 0) has a coordinate beyond ±20000 mm; move the target nearer the origin' });
    expect(issues(parsePointsCsv('0,0\n1e-4,0\n2e-4,1e-4\n'))).toEqual([{ row: 0, message: expect.stringMatching(/span 0\.0002 mm; a target must span at least 0\.001 mm/) }]);
    expect(issues(parsePointsCsv('19990,19990\n19995,19991\n19999,19990\n'))).toEqual([{ row: 0, message: expect.stringMatching(/span 9 mm; a target must span at least 19\.999 mm/) }]);
  });

  it('the repeated-point check finds what comparing every pair finds', () => {
    // Independent method: the definition, every pair compared (O(n²)), written here.
    const near = fc.integer({ min: -4, max: 4 }).map((k) => k * REPEATED_POINT_TOL_MM * 0.6);
    fc.assert(
      fc.property(fc.array(fc.tuple(fc.integer({ min: 0, max: 3 }), fc.integer({ min: 0, max: 3 }), near, near), { maxLength: 60 }), (raw) => {
        const xs = raw.map(([i, , dx]) => 1000 + i * 2e-6 + dx);
        const ys = raw.map(([, j, , dy]) => -500 + j * 2e-6 + dy);
        const got = firstRepeats(xs, ys, xs.length, REPEATED_POINT_TOL_MM);
        for (let i = 0; i < xs.length; i++) {
          let first = -1;
          for (let j = 0; j < i && first === -1; j++) if (Math.hypot(xs[i] - xs[j], ys[i] - ys[j]) <= REPEATED_POINT_TOL_MM) first = j;
          expect(got[i]).toBe(first);
        }
      }),
      { seed: 20261203, numRuns: 300 },
    );
  });

  it('5,000 points on one vertical line (a sort by x alone would compare every pair) are read', () => {
    const rows = Array.from({ length: MAX_TARGET_POINTS }, (_, i) => `0,${i * 0.01}`).join('\n');
    expect(ok(parsePointsCsv(rows)).points).toHaveLength(MAX_TARGET_POINTS);
  });
});
