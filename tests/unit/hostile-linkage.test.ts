/**
 * Hostile linkage files: the reproducers of the issue "Hostile input and faults", each
 * built from its text (tests/unit/hostileLinkages.ts), through the reader, the compiler,
 * the generated kernel and `loci analyze` run in process.
 *
 * What a refusal must look like: exit 2, one line per problem naming the file and the
 * field, the limit stated, at most a dozen lines, nothing unprintable. Source: common
 * practice for a command line (exit status 2 for bad input, as the sysexits and GNU
 * conventions use it; from memory), and the limits' own reasons in model.ts.
 */
import { mkdtempSync, rmSync, truncateSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { run as analyze } from '../../src/cli/analyze';
import type { CliIo } from '../../src/cli/command';
import { MAX_INPUT_FILE_BYTES, nodeIo } from '../../src/cli/nodeIo';
import { MAX_LINKAGE_FILE_CHARS, parseLinkageFile, parseLinkageFileText, readLinkageFile } from '../../src/core/io/linkageFile';
import { MAX_LISTED_ISSUES } from '../../src/core/io/schemaMessages';
import { fourBarLoops } from '../../src/core/linkage/analysis';
import { compile } from '../../src/core/linkage/compile';
import {
  MAX_COORDINATE_MM,
  MAX_JOINTS,
  MAX_POINTS,
  MAX_REACH_OVER_SHORTEST_LINK,
  type Linkage,
} from '../../src/core/linkage/model';
import { OP_DYAD, OP_RIGID, OP_STRIDE, type PlanInternal } from '../../src/core/linkage/plan';
import { run } from '../../src/core/linkage/run';
import { KERNEL_CHUNK_OPS, specialise } from '../../src/core/linkage/specialise';
import { crankRocker, dyadChain, invalidPointsText, pointsOnCoupler, unusedGroundJoints, type LinkageJson } from './hostileLinkages';

/**
 * The tests that build or compile very large inputs get more than Vitest's 5 s, on a
 * busy machine; a hang still fails (this is a guard, not a timing).
 */
const HEAVY_TIMEOUT_MS = 60_000;

async function analyzeText(text: string, ...flags: string[]): Promise<{ code: number; stdout: string; stderr: string }> {
  let stdout = '';
  let stderr = '';
  const io: CliIo = {
    stdout: (t) => { stdout += t; },
    stderr: (t) => { stderr += t; },
    readTextFile: () => Promise.resolve({ ok: true, text }),
  };
  const code = await analyze(['x.json', ...flags], io);
  return { code, stdout, stderr };
}

const analyzeFile = (file: LinkageJson, ...flags: string[]) => analyzeText(JSON.stringify(file), ...flags);

function bits(pose: Float64Array): number[] {
  return Array.from(new Uint8Array(pose.buffer, pose.byteOffset, pose.byteLength));
}

/** Kernel and interpreter on one plan at the same driver values: same result, failing operation and bits. */
function expectKernelMatchesInterpreter(plan: PlanInternal, values: readonly number[]): void {
  const interpreted: PlanInternal = { ...plan, kernel: null };
  for (const v of values) {
    const a = Float64Array.from(plan.reference);
    const b = Float64Array.from(plan.reference);
    expect(run(plan, v, a)).toBe(run(interpreted, v, b));
    expect(plan.failedOp).toBe(interpreted.failedOp);
    expect(bits(a)).toEqual(bits(b));
  }
}

describe('item 1: 20,000 points on one body', () => {
  it('is refused when read, naming the points and their limit (it used to overflow the stack in the generated kernel)', async () => {
    const r = await analyzeFile(pointsOnCoupler(20_000));
    expect(r.code).toBe(2);
    expect(r.stderr).toBe(`x.json: points: the file has 20000 points; the limit is ${MAX_POINTS}\n`);
  });

  // Source: a second, independent method: run.ts's interpreter, which generates no code.
  it('a kernel of 60,000 operations runs in chunks and gives the interpreter’s bits, and its failing operation', () => {
    const compiled = compile(pointsOnCoupler(1) as unknown as Linkage);
    if (!compiled.ok) throw new Error(JSON.stringify(compiled.issues));
    const base = compiled.plan as PlanInternal;
    // The plan's last operation places the point by body-local coordinates; repeat it
    // (a plan of 60,000 operations; 20,000 points overflowed the stack in one function), with one impossible dyad
    // (radii 1 mm between centres ≥ 30 mm apart) at 45,000, in the 44th chunk.
    const last = (base.opCount - 1) * OP_STRIDE;
    expect(base.ops[last]).toBe(OP_RIGID);
    const count = 60_000;
    const failAt = 45_000;
    const params = new Float64Array(base.params.length + 3);
    params.set(base.params);
    params.set([1, 1, 1], base.params.length);
    const ops = new Int32Array(count * OP_STRIDE);
    ops.set(base.ops);
    for (let op = base.opCount; op < count; op++) ops.set(base.ops.subarray(last, last + OP_STRIDE), op * OP_STRIDE);
    // OP_DYAD: c at radius 1 from O2 (slot 0) and 1 from A (slot 1), written into P's slot.
    ops.set([OP_DYAD, 0, 2, base.ops[last + 3], -1, base.params.length], failAt * OP_STRIDE);
    const long: PlanInternal = { ...base, ops, params, opCount: count, kernel: null };
    long.kernel = specialise(long);
    expect(long.kernel).not.toBeNull();
    expect(count).toBeGreaterThan(10 * KERNEL_CHUNK_OPS);
    const a = Float64Array.from(long.reference);
    expect(run(long, 1, a)).toBe(false);
    expect(long.failedOp).toBe(failAt);
    expectKernelMatchesInterpreter(long, [0, 1, 2.5, Number.NaN]);
  }, HEAVY_TIMEOUT_MS);

  // Source: the interpreter again, at the largest plan the limits accept.
  it('the largest accepted plan (1,249 dyads, 2,500 joints, 1,000 points) compiles to a chunked kernel that matches the interpreter', () => {
    const file = dyadChain(1249);
    expect(file.joints).toHaveLength(MAX_JOINTS);
    file.points = Array.from({ length: MAX_POINTS }, (_, i) => ({ id: `P${i}`, body: `L${1 + (i % 1249)}`, x: 60 * (1 + (i % 1249)) - 20, y: 40 }));
    const parsed = readLinkageFile(file);
    if (!parsed.ok) throw new Error(JSON.stringify(parsed.issues));
    const plan = parsed.plan as PlanInternal;
    expect(plan.opCount).toBeGreaterThan(KERNEL_CHUNK_OPS);
    expect(plan.kernel).not.toBeNull();
    const v0 = plan.driverReferenceValue;
    expectKernelMatchesInterpreter(plan, [v0, v0 + 0.01, v0 - 0.01, v0 + 3]);
  }, HEAVY_TIMEOUT_MS);
});

describe('item 2: a chain of 1,000 dyads, and unused ground joints', () => {
  it('finds the chain’s 1,000 four-bar loops, each dyad with the link before it and ground', () => {
    const parsed = readLinkageFile(dyadChain(1000));
    if (!parsed.ok) throw new Error(JSON.stringify(parsed.issues));
    // theorem: in this chain a 4-cycle of bodies through distinct pins closes only
    // through ground, the dyad's two links and the link it hangs from (see dyadChain).
    const expected = [['ground', 'crank', 'L1', 'R1'], ...Array.from({ length: 999 }, (_, i) => ['ground', `R${i + 1}`, `L${i + 2}`, `R${i + 2}`])];
    const found = fourBarLoops(parsed.plan).map((loop) => [...loop.bodyIds]);
    const key = (ids: string[]) => ids.join(' ');
    expect(found.map(key).sort()).toEqual(expected.map(key).sort());
  }, HEAVY_TIMEOUT_MS);

  it('600,000 unused ground joints are refused by count before anything is built from them', () => {
    const file = unusedGroundJoints(600_000);
    const parsed = parseLinkageFile(file);
    expect(parsed.ok).toBe(false);
    if (parsed.ok) return;
    expect(parsed.issues).toEqual([{ path: 'joints', message: `the file has 600004 joints; the limit is ${MAX_JOINTS}` }]);
    // As text (45 MB), the file is refused by its length before JSON.parse.
    const text = JSON.stringify(file);
    expect(text.length).toBeGreaterThan(MAX_LINKAGE_FILE_CHARS);
    const fromText = parseLinkageFileText(text);
    expect(fromText.ok).toBe(false);
    if (!fromText.ok) expect(fromText.issues[0].message).toMatch(`the limit for a linkage file is ${MAX_LINKAGE_FILE_CHARS}`);
  }, HEAVY_TIMEOUT_MS);

  it('a ground joint on no body is refused by name; a length driver’s ground mount is not', async () => {
    const r = await analyzeFile(unusedGroundJoints(2));
    expect(r.code).toBe(2);
    expect(r.stderr).toContain("x.json: joints[4]: ground joint 'U0' is on no body");
    expect(r.stderr).toContain("x.json: joints[5]: ground joint 'U1' is on no body");
    const shock = {
      format: 'loci-linkage', version: 1, units: 'mm',
      joints: [{ id: 'R0', x: 0, y: 0, ground: true }, { id: 'S0', x: 90, y: -10, ground: true }, { id: 'S', x: 30, y: 40 }],
      bodies: [{ id: 'rocker', joints: ['R0', 'S'] }],
      driver: { kind: 'length', from: 'S0', to: 'S' },
    };
    expect((await analyzeText(JSON.stringify(shock), '--steps', '5')).code).toBe(0);
  });
});

describe('item 3: a file of 2,000,000 invalid points', () => {
  it('is one line: its text is over the limit', async () => {
    const text = invalidPointsText(2_000_000);
    const r = await analyzeText(text);
    expect(r.code).toBe(2);
    expect(r.stderr).toBe(`x.json: the file has ${text.length} characters; the limit for a linkage file is ${MAX_LINKAGE_FILE_CHARS}\n`);
  }, HEAVY_TIMEOUT_MS);

  it('as parsed JSON, it is one issue: the count of points', () => {
    const parsed = parseLinkageFileText(invalidPointsText(MAX_POINTS + 1));
    expect(parsed.ok).toBe(false);
    if (!parsed.ok) expect(parsed.issues).toEqual([{ path: 'points', message: `the file has ${MAX_POINTS + 1} points; the limit is ${MAX_POINTS}` }]);
  });

  it('within the limits, 1,000 bad points (one id, no such body) list 12 problems and count the rest', async () => {
    const r = await analyzeText(invalidPointsText(MAX_POINTS));
    expect(r.code).toBe(2);
    const lines = r.stderr.trimEnd().split('\n');
    expect(lines).toHaveLength(MAX_LISTED_ISSUES + 1);
    expect(lines[0]).toBe("x.json: points[1].id: point id 'p' is used twice (also points[0]); expected unique ids");
    // 999 repeated ids and 1,000 unknown bodies
    expect(lines[MAX_LISTED_ISSUES]).toBe(`x.json: and ${2 * MAX_POINTS - 1 - MAX_LISTED_ISSUES} more problems`);
  });

  it('a list of ids in a message is cut at ten, with the count', () => {
    const file = dyadChain(20);
    file.bodies[0].joints[1] = 'nowhere';
    const parsed = parseLinkageFile(file);
    expect(parsed.ok).toBe(false);
    if (!parsed.ok) expect(parsed.issues[0].message).toMatch(/expected one of O, C0, C1, G1, C2, G2, C3, G3, C4, G4, … \(42 in all\)$/);
  });
});

describe('item 7: coordinates out of range', () => {
  it('a joint at y = 1e308 is refused when read, naming the field and the limit', async () => {
    const file = crankRocker();
    file.joints[1].y = 1e308;
    const r = await analyzeFile(file);
    expect(r.code).toBe(2);
    expect(r.stderr).toBe(`x.json: joints[1].y: expected a finite number in mm within ±${MAX_COORDINATE_MM} mm (1 km, the coordinate limit), got 1e+308\n`);
  });

  it('a joint just past the limit is refused, one at it is read', async () => {
    // The crank-rocker moved so one joint sits exactly at, then just past, the limit.
    const at = crankRocker();
    for (const j of at.joints) j.x += MAX_COORDINATE_MM - 90;
    expect(Math.max(...at.joints.map((j) => j.x))).toBe(MAX_COORDINATE_MM);
    expect((await analyzeFile(at, '--steps', '5')).code).toBe(0);
    const past = crankRocker();
    for (const j of past.joints) j.x += MAX_COORDINATE_MM - 89;
    const r = await analyzeFile(past);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/^x\.json: joints\[3\]\.x: expected a finite number in mm within ±1000000 mm/);
  });

  it('a linkage that reaches too far for its shortest link is refused, naming the link', async () => {
    // Source: IEEE 754-2019, binary64: a 53-bit significand, so a link's direction is
    // known to about 2^-53 × reach / link; the limit keeps that within the 1e-9 the
    // compiler's reproduction check allows (see MAX_REACH_OVER_SHORTEST_LINK).
    const file = crankRocker();
    for (const j of file.joints) j.y += 99_000;
    file.joints[1].y = file.joints[0].y + 0.5; // the crank: 0.5 mm at 99 km ÷ 1000 from the origin
    const r = await analyzeFile(file);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(new RegExp(`^x\\.json: bodies\\[0\\]\\.joints: the linkage reaches 99068 mm from the origin but the link from 'O2' to 'A' of body 'crank' is 0\\.5 mm long: a ratio of 198136, above the ${MAX_REACH_OVER_SHORTEST_LINK}`));
  });
});

describe('driver range flags: finite and in a range the sweep can use', () => {
  it('refuses a rotation range past ten turns, and a length range past the farthest two joints can be', async () => {
    const far = await analyzeFile(crankRocker(), '--from', '0', '--to', '1e300');
    expect(far.code).toBe(2);
    expect(far.stderr).toBe('loci analyze: --to: expected a driver angle within ±3600° (ten turns either way), got 1e+300\n');
    expect((await analyzeFile(crankRocker(), '--from', '-3600', '--to', '3600', '--steps', '5')).code).toBe(0);
    const shock = {
      format: 'loci-linkage', version: 1, units: 'mm',
      joints: [{ id: 'R0', x: 0, y: 0, ground: true }, { id: 'S0', x: 90, y: -10, ground: true }, { id: 'S', x: 30, y: 40 }],
      bodies: [{ id: 'rocker', joints: ['R0', 'S'] }],
      driver: { kind: 'length', from: 'S0', to: 'S' },
    };
    const long = await analyzeText(JSON.stringify(shock), '--from', '50', '--to', '1e7');
    expect(long.code).toBe(2);
    expect(long.stderr).toMatch(/^loci analyze: --to: expected a driver length above 0 and at most 3000000 mm/);
  });
});

describe('item 9: ids with ESC, NUL and U+202E never reach the terminal raw', () => {
  const UNPRINTABLE = /[\u0000\u001b\u202e]/u; // eslint-disable-line no-control-regex -- what must not be printed

  it('the reader refuses them, and its message shows them escaped', async () => {
    const file = crankRocker();
    file.joints[2].id = 'B\u001b[2J';
    file.bodies[1].id = 'cou\u0000pler';
    file.bodies[2].id = 'rocker\u202eevil';
    const r = await analyzeFile(file);
    expect(r.code).toBe(2);
    expect(r.stderr).not.toMatch(UNPRINTABLE);
    expect(r.stderr).toContain('x.json: joints[2].id: expected a non-empty joint id string of at most 100 printable characters (no control or bidirectional-format characters), got "B\\u001b[2J"');
    expect(r.stderr).toContain('x.json: bodies[1].id:');
    expect(r.stderr).toContain('got "rocker\\u202eevil"');
  });

  it('compile, called directly, escapes them in every message', () => {
    const linkage = crankRocker() as unknown as { joints: { id: string }[]; bodies: { id: string; joints: string[] }[] };
    linkage.bodies[1].joints[1] = 'X\u001b[2J\u0000\u202e';
    const compiled = compile(linkage as unknown as Linkage);
    expect(compiled.ok).toBe(false);
    if (compiled.ok) return;
    const text = compiled.issues.map((i) => i.message).join('\n');
    expect(text).not.toMatch(UNPRINTABLE);
    expect(text).toContain("names joint 'X\\u001b[2J\\u0000\\u202e', which is not in joints");
  });

  it('a file that is not JSON does not echo its control characters', async () => {
    const r = await analyzeText('\u001b[2J{\u202e');
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/^x\.json: not valid JSON: /);
    expect(r.stderr.trimEnd()).not.toMatch(UNPRINTABLE);
    expect(r.stderr.trimEnd().split('\n')).toHaveLength(1);
  });
});

describe('reading a file from disk: a size limit', () => {
  let dir = '';
  beforeAll(() => { dir = mkdtempSync(join(tmpdir(), 'loci-hostile-')); });
  afterAll(() => { rmSync(dir, { recursive: true, force: true }); });

  it('refuses a file larger than the limit without reading it, and names the limit', async () => {
    const path = join(dir, 'big.json');
    writeFileSync(path, '');
    truncateSync(path, MAX_INPUT_FILE_BYTES + 1); // sparse: nothing written
    const r = await nodeIo.readTextFile(path);
    expect(r).toEqual({ ok: false, message: `cannot read ${path}: it is 32.0 MiB; the limit for a file loci reads is 32 MiB` });
  });

  it('stops a device with no end at the limit', async () => {
    const r = await nodeIo.readTextFile('/dev/zero');
    expect(r).toEqual({ ok: false, message: 'cannot read /dev/zero: it is more than 32 MiB; the limit for a file loci reads is 32 MiB' });
  });

  it('reads a file at the limit', async () => {
    const path = join(dir, 'ok.json');
    writeFileSync(path, '{"a": "\u00e9"}');
    expect(await nodeIo.readTextFile(path)).toEqual({ ok: true, text: '{"a": "\u00e9"}' });
  });
});

describe('unknown fields: named escaped, and counted past twenty', () => {
  it('an object with 10,000 unknown fields, one of them ESC, gives one short line', async () => {
    const file = crankRocker() as unknown as Record<string, unknown> & { joints: Record<string, unknown>[] };
    for (let i = 0; i < 10_000; i++) file.joints[0][`k${i}`] = 0;
    file.joints[0]['\u001b[2J'] = 0;
    const r = await analyzeText(JSON.stringify(file));
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/^x\.json: joints\[0\]: unknown fields "k0", "k1", .*"k19", … \(10001 in all\) in a joint/);
    expect(r.stderr.length).toBeLessThan(1000);
    const escape = crankRocker() as unknown as Record<string, unknown>;
    escape['\u001b[2J\u202e'] = 1;
    const e = await analyzeText(JSON.stringify(escape));
    expect(e.stderr).toContain('unknown field "\\u001b[2J\\u202e" in a linkage file');
  }, HEAVY_TIMEOUT_MS);
});
