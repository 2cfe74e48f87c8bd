/**
 * Generated hostile input (the issue "Hostile input and faults"): problem files through
 * `loci check`, run in this process through the command table, and CSV text through
 * parsePointsCsv. Whatever comes in, the answer is exit 0 with finite output, or exit 2
 * with one line per issue naming the file and the field; never exit 1 (an unexpected
 * failure), a throw, a hang or output without bound. Seeded, so a failure replays.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { main } from '../../src/cli/main';
import type { CliIo } from '../../src/cli/command';
import { MAX_LISTED_ISSUES, MAX_TARGET_POINTS, REPEATED_POINT_TOL_MM, parsePointsCsv } from '../../src/core/io/pointsCsv';

const SEED = 20261203;
const FILE = 'hostile.json';
/** More than any valid summary of a small file can print (every variable, one line each). */
const MAX_OUTPUT_CHARS = 200_000;

// Numbers chosen to sit on and across every limit, with ordinary ones among them.
const hostileNumber = fc.oneof(
  { weight: 4, arbitrary: fc.double({ min: -200, max: 200, noNaN: true, noDefaultInfinity: true }) },
  {
    weight: 3,
    arbitrary: fc.constantFrom(0, -0, 1, -1, 2e-9, 4e-9, 1e-3, 1e-300, 5e-324, 2e4, -2e4, 2e4 + 1, 1e5, 1e6, 1e6 + 1, 1e15, 1e15 + 2, 1e300, -1e308, 1e308, 1.7e308, 6.283185307179586, 100, 5729, 5730),
  },
  { weight: 1, arbitrary: fc.double() }, // also NaN and ±Infinity, which JSON writes as null
);
const familyName = fc.constantFrom('fourbar-lengths', 'fourbar', 'slider-crank', 'watt-i', 'watt-ii', 'stephenson-i', 'stephenson-ii', 'stephenson-iii', 'hexapod', '__proto__', '');
const variableName = fc.constantFrom('r1', 'r2', 'x0', 'theta2', 'theta2_1', 'A0.x', 'driver', 'r7', '__proto__', 'constructor', 'toString');
const point = fc.oneof({ weight: 8, arbitrary: fc.tuple(hostileNumber, hostileNumber) }, { weight: 1, arbitrary: fc.array(hostileNumber, { maxLength: 3 }) }, { weight: 1, arbitrary: fc.jsonValue({ maxDepth: 2 }) });
const smallPath = fc.array(fc.tuple(fc.integer({ min: -50, max: 50 }), fc.integer({ min: -50, max: 50 })), { minLength: 3, maxLength: 12 });

const target = fc.record(
  {
    points: fc.oneof(smallPath, fc.array(point, { maxLength: 14 })),
    closed: fc.oneof({ weight: 9, arbitrary: fc.boolean() }, { weight: 1, arbitrary: fc.jsonValue({ maxDepth: 1 }) }),
    weights: fc.array(fc.oneof(hostileNumber, fc.constant(0)), { maxLength: 14 }),
  },
  { requiredKeys: ['points', 'closed'] },
);
const timing = fc.oneof(
  fc.record({ mode: fc.constant('free'), wrap: fc.boolean(), refine: fc.boolean() }, { requiredKeys: ['mode', 'wrap'] }),
  fc.record({ mode: fc.constant('unprescribed'), wrap: fc.boolean(), samples: fc.oneof(fc.integer({ min: -5, max: 30000 }), hostileNumber) }, { requiredKeys: ['mode'] }),
  fc.record({ mode: fc.constant('prescribed'), driverValues: fc.array(hostileNumber, { maxLength: 14 }), unit: fc.constantFrom('rad', 'deg', 'grad') }, { requiredKeys: ['mode', 'driverValues'] }),
  fc.jsonValue({ maxDepth: 2 }),
);
const box = fc.oneof({ weight: 6, arbitrary: fc.tuple(hostileNumber, hostileNumber) }, { weight: 1, arbitrary: fc.jsonValue({ maxDepth: 1 }) });
const bounds = fc.dictionary(familyName, fc.dictionary(variableName, box, { maxKeys: 4 }), { maxKeys: 3 });
const constraints = fc.record(
  {
    fullTurnCrank: fc.boolean(),
    minTransmissionRad: hostileNumber,
    linkLengthMm: fc.tuple(hostileNumber, hostileNumber),
    keepOut: fc.array(fc.record({ x: hostileNumber, y: hostileNumber, r: hostileNumber }), { maxLength: 2 }),
    branch: fc.constantFrom('open', 'crossed', 'either', 'sideways'),
  },
  { requiredKeys: [] },
);
const problemFile = fc.record(
  {
    format: fc.constantFrom('loci-problem', 'loci-problem', 'loci-linkage'),
    version: fc.constantFrom(1, 1, 1, 2, 0, 1.5),
    name: fc.string({ maxLength: 20 }),
    target,
    timing,
    placement: fc.constantFrom('fixed', 'free', 'floating'),
    families: fc.array(familyName, { maxLength: 3 }),
    bounds,
    constraints,
    measure: fc.constantFrom('sum-of-squares', 'rms', 'max', 'mean'),
    searchMaps: fc.dictionary(familyName, fc.constantFrom('affine', 'fourbar-boundary', 'log', 'spiral'), { maxKeys: 2 }),
  },
  { requiredKeys: ['format', 'version', 'name', 'target', 'timing', 'placement', 'families'] },
);

// A valid file, then up to two of its fields replaced by hostile ones: so that both sides,
// accepted and refused, are reached, and a refusal is often for one field only.
const FAMILIES = ['fourbar-lengths', 'fourbar', 'slider-crank', 'watt-i', 'watt-ii', 'stephenson-i', 'stephenson-ii', 'stephenson-iii'];
const validFile = fc
  .tuple(
    fc.uniqueArray(fc.tuple(fc.integer({ min: -40, max: 40 }), fc.integer({ min: -40, max: 40 })), { minLength: 3, maxLength: 10, selector: ([x, y]) => `${x},${y}` }),
    fc.constantFrom(1, 0.05, 25, 1000),
    fc.boolean(),
    fc.constantFrom('free', 'unprescribed', 'prescribed'),
    fc.subarray(FAMILIES, { minLength: 1, maxLength: 2 }),
    fc.constantFrom('fixed', 'free'),
  )
  .map(([pts, scale, closed, mode, families, placement]) => {
    const points = pts.map(([x, y]) => [x * scale, y * scale]);
    const timing = mode === 'prescribed' ? { mode, driverValues: points.map((_, i) => i * 20), unit: 'deg' } : mode === 'free' ? { mode, wrap: closed } : { mode };
    return { format: 'loci-problem', version: 1, name: 'generated', target: { points, closed }, timing, placement, families } as Record<string, unknown>;
  });
const mutation = fc.oneof(
  fc.record({ key: fc.constant('target'), value: target }),
  fc.record({ key: fc.constant('weights'), value: fc.array(fc.oneof(hostileNumber, fc.constant(0), fc.constant(1)), { maxLength: 14 }) }),
  fc.record({ key: fc.constant('timing'), value: timing }),
  fc.record({ key: fc.constant('families'), value: fc.array(familyName, { maxLength: 3 }) }),
  fc.record({ key: fc.constant('bounds'), value: bounds }),
  fc.record({ key: fc.constant('constraints'), value: constraints }),
  fc.record({ key: fc.constant('searchMaps'), value: problemFile.map((f) => f.searchMaps) }),
  fc.record({ key: fc.constantFrom('format', 'version', 'placement', 'measure', 'name'), value: fc.oneof(fc.jsonValue({ maxDepth: 1 }), fc.constantFrom('rms', 'free')) }),
);
const mutatedFile = fc.tuple(validFile, fc.array(mutation, { maxLength: 2 })).map(([file, changes]) => {
  for (const { key, value } of changes) {
    if (key === 'weights') file.target = { ...(file.target as object), weights: value };
    else file[key] = value;
  }
  return file;
});

/** A problem file as text: mostly JSON of a generated file (a key `__proto__` kept as written), sometimes mangled. */
const problemText = fc.oneof(
  { weight: 12, arbitrary: mutatedFile.map((f) => JSON.stringify(f)) },
  { weight: 4, arbitrary: problemFile.map((f) => JSON.stringify(f)) },
  { weight: 2, arbitrary: fc.tuple(problemFile, fc.nat()).map(([f, k]) => JSON.stringify(f).replace('"bounds":{', `"bounds":{"__proto__":{"r${k % 3}":[1,2]},`)) },
  { weight: 1, arbitrary: fc.tuple(problemFile, fc.nat()).map(([f, k]) => { const t = JSON.stringify(f); return t.slice(0, k % (t.length + 1)); }) },
  { weight: 1, arbitrary: fc.jsonValue({ maxDepth: 3 }).map((v) => JSON.stringify(v)) },
  { weight: 1, arbitrary: fc.string({ maxLength: 40 }) },
);

function memoryIo(text: string): { io: CliIo; out: { stdout: string; stderr: string } } {
  const out = { stdout: '', stderr: '' };
  const io: CliIo = {
    stdout: (t) => { out.stdout += t; },
    stderr: (t) => { out.stderr += t; },
    readTextFile: (path) => Promise.resolve(path === FILE ? { ok: true, text } : { ok: false, message: `cannot read ${path}: no such file` }),
  };
  return { io, out };
}

/** Every number in a JSON value, for the check that all are finite. */
function numbersIn(value: unknown, into: number[] = []): number[] {
  if (typeof value === 'number') into.push(value);
  else if (Array.isArray(value)) for (const v of value) numbersIn(v, into);
  else if (typeof value === 'object' && value !== null) for (const v of Object.values(value)) numbersIn(v, into);
  return into;
}

// A line of a refusal: the file, then a field path (`target.points[2]`, `bounds.fourbar.A0.x`,
// `families[1]`), or a whole-file message (not JSON, not a problem file, the count of the rest).
const ISSUE_LINE = /^hostile\.json: (?:[A-Za-z_$-][\w$.\-[\]]*: \S|not valid JSON: |expected a problem file|and \d+ more issues?$)/;

describe('loci check on generated problem files', () => {
  it('exits 0 with finite output or 2 naming the field; never 1, a throw or unbounded output', async () => {
    let accepted = 0;
    await fc.assert(
      fc.asyncProperty(problemText, fc.boolean(), async (text, json) => {
        const { io, out } = memoryIo(text);
        const code = await main(json ? ['check', '--json', FILE] : ['check', FILE], io);
        expect([0, 2], `exit ${code}; stderr: ${out.stderr.slice(0, 400)}`).toContain(code);
        expect(out.stdout.length + out.stderr.length).toBeLessThan(MAX_OUTPUT_CHARS);
        if (code === 0) {
          accepted++;
          expect(out.stderr).toBe('');
          if (json) {
            const summary = JSON.parse(out.stdout) as unknown;
            for (const v of numbersIn(summary)) expect(Number.isFinite(v)).toBe(true);
          } else {
            expect(out.stdout).not.toMatch(/NaN|Infinity/);
          }
        } else {
          expect(out.stdout).toBe('');
          const lines = out.stderr.trimEnd().split('\n');
          expect(lines.length).toBeLessThanOrEqual(MAX_LISTED_ISSUES + 1);
          for (const line of lines) expect(line).toMatch(ISSUE_LINE);
        }
      }),
      { seed: SEED, numRuns: 1000 },
    );
    // The generator must reach the valid side too, or the property says little.
    expect(accepted).toBeGreaterThan(20);
  }, 60_000);
});

// CSV text from fragments a file might hold: numbers across the limits, names, quotes
// (with separators and line breaks inside), blank cells and lines, every line end.
const csvCell = fc.oneof(
  { weight: 6, arbitrary: fc.integer({ min: -100, max: 100 }).map(String) },
  { weight: 3, arbitrary: hostileNumber.map((v) => String(v)) },
  { weight: 1, arbitrary: fc.constantFrom('1,5', '-2,25', '1e400', '-1e400', '.5', '7.', '+3', '1e-320', 'NaN', 'Infinity', '0x10', '') },
  { weight: 1, arbitrary: fc.constantFrom('x', 'y', 'x (mm)', 'Y [mm]', 'angle', 'angle (rad)', 'theta_rad', 'weight', 'w', 'note', 'id') },
  { weight: 1, arbitrary: fc.string({ maxLength: 6 }).map((s) => `"${s.replace(/"/g, '""')}"`) },
  { weight: 1, arbitrary: fc.constantFrom('"a\nb"', '"1\r\n"', ' "x"', '"y" ', '"unclosed', 'a"b', '"1";"2"', '\t', ' ') },
);
const randomRows = fc.array(fc.array(csvCell, { minLength: 0, maxLength: 4 }), { minLength: 0, maxLength: 12 });
// Valid rows (distinct points, an angle and a weight column by choice, a header by
// choice), then up to three cells replaced by hostile ones and blank lines put in.
const validRows = fc
  .tuple(
    fc.uniqueArray(fc.tuple(fc.integer({ min: -99, max: 99 }), fc.integer({ min: -99, max: 99 })), { minLength: 3, maxLength: 15, selector: ([x, y]) => `${x},${y}` }),
    fc.constantFrom('none', 'angle', 'angle (rad)', 'weight'),
    fc.constantFrom('none', 'plain', 'quoted'),
    fc.array(fc.tuple(fc.nat(), fc.nat(), csvCell), { maxLength: 3 }),
    fc.array(fc.nat(), { maxLength: 2 }),
  )
  .map(([pts, extra, header, changes, blanks]) => {
    const rows = pts.map(([x, y], i) => (extra === 'none' ? [String(x), String(y)] : [String(x), String(y), String(extra === 'weight' ? (i % 3) + 1 : i * 10)]));
    for (const [r, c, cell] of changes) rows[r % rows.length][c % rows[0].length] = cell;
    for (const b of blanks) rows.splice(b % (rows.length + 1), 0, ['']);
    const names = extra === 'none' ? ['x', 'y'] : ['x', 'y', extra];
    if (header === 'plain') rows.unshift(names);
    if (header === 'quoted') rows.unshift(names.map((n) => ` "${n}"`));
    return rows;
  });
const csvText = fc
  .tuple(fc.constantFrom(',', ';', '\t'), fc.constantFrom('\n', '\r\n', '\r'), fc.oneof({ weight: 3, arbitrary: validRows }, { weight: 1, arbitrary: randomRows }), fc.boolean())
  .map(([sep, eol, rows, bom]) => (bom ? '\uFEFF' : '') + rows.map((r) => r.join(sep)).join(eol));

describe('parsePointsCsv on generated text', () => {
  it('never throws: finite values within the limits, or issues with a row number', () => {
    let accepted = 0;
    fc.assert(
      fc.property(csvText, (text) => {
        const result = parsePointsCsv(text);
        const lines = text.split(/\r\n|\n|\r/).length;
        if (result.ok) {
          accepted++;
          const n = result.points.length;
          expect(n).toBeGreaterThanOrEqual(3);
          expect(n).toBeLessThanOrEqual(MAX_TARGET_POINTS);
          for (const p of result.points) expect(Number.isFinite(p.x) && Number.isFinite(p.y)).toBe(true);
          for (const d of result.driverDeg ?? []) expect(Number.isFinite(d)).toBe(true);
          if (result.weights !== null) {
            for (const w of result.weights) expect(Number.isFinite(w) && w >= 0).toBe(true);
            expect(result.weights.some((w) => w > 0)).toBe(true);
          }
          // Independent check of distinct points: every pair (the definition).
          for (let i = 0; i < n; i++) {
            for (let j = 0; j < i; j++) {
              expect(Math.hypot(result.points[i].x - result.points[j].x, result.points[i].y - result.points[j].y)).toBeGreaterThan(REPEATED_POINT_TOL_MM);
            }
          }
        } else {
          expect(result.issues.length).toBeGreaterThanOrEqual(1);
          expect(result.issues.length).toBeLessThanOrEqual(MAX_LISTED_ISSUES + 1);
          for (const issue of result.issues) {
            expect(Number.isInteger(issue.row) && issue.row >= 0 && issue.row <= lines).toBe(true);
            expect(issue.message.length).toBeGreaterThan(0);
            if (issue.row > 0) expect(issue.message).toContain(`row ${issue.row}`);
          }
        }
      }),
      { seed: SEED, numRuns: 1000 },
    );
    expect(accepted).toBeGreaterThan(20);
  });
});
