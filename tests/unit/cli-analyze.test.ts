/**
 * `loci analyze` end to end: the command line through its command table in this process
 * (tests/support/cli.ts), on the example files and on bad files in a temp dir; and once
 * as a child process (`node bin/loci.js …`, from another working directory), which
 * checks the launcher and the exit codes the shell sees.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { loci as lociInProcess } from '../support/cli';
import { parseLinkageFile, parseLinkageFileText, toLinkageFile } from '../../src/core/io/linkageFile';
import { fourBar, stephensonIII, wattII } from '../../src/core/linkage/families';

const ROOT = resolve(import.meta.dirname, '../..');
const BIN = join(ROOT, 'bin/loci.js');
const CRANK_ROCKER = join(ROOT, 'public/examples/crank-rocker.json');
const STEPHENSON_III = join(ROOT, 'public/examples/stephenson-iii.json');

let dir = '';
beforeAll(() => { dir = mkdtempSync(join(tmpdir(), 'loci-analyze-')); });
afterAll(() => { rmSync(dir, { recursive: true, force: true }); });

interface CliRun { status: number | null; stdout: string; stderr: string }

async function loci(...args: string[]): Promise<CliRun> {
  const r = await lociInProcess(...args);
  return { status: r.code, stdout: r.stdout, stderr: r.stderr };
}

function lociChild(...args: string[]): CliRun {
  const r = spawnSync(process.execPath, [BIN, ...args], { cwd: dir, encoding: 'utf8', timeout: 60_000 });
  return { status: r.status, stdout: r.stdout, stderr: r.stderr };
}

let fileCount = 0;
function writeDesign(content: unknown): string {
  const path = join(dir, `design-${fileCount++}.json`);
  writeFileSync(path, typeof content === 'string' ? content : JSON.stringify(content, null, 2));
  return path;
}

type Json = Record<string, unknown> & {
  joints: Record<string, unknown>[];
  bodies: { id: string; joints: string[] }[];
};
const example = (path: string): Json => JSON.parse(readFileSync(path, 'utf8')) as Json;

// Report shapes read by these tests (a subset of LinkageReport, as JSON).
type Xy = [number, number] | null;
interface Loop {
  bodies: string[]; joints: string[]; lengthsMm: number[]; grashof: string;
  barker: { type: number; code: string; name: string } | null;
  transmissionAngleDeg: { min: number; max: number; minAt: number; maxAt: number } | null;
}
interface Report {
  driver: { unit: string; reference: number; from: number; to: number; steps: number; rangeRule: string; fullTurn: boolean };
  mobility: { mobility: number; links: number; fullJoints: number };
  values: number[];
  assembled: boolean[];
  joints: { id: string; path: Xy[] }[];
  points: { id: string; path: Xy[] }[];
  fourBarLoops: Loop[];
  instantCentres: { body: string; kind: string[]; xy: Xy[] }[];
  defects: { locks: unknown[]; deadCentres: unknown[]; unassembledSteps: number };
  closureResidualMm: { max: number; reference: number };
}

async function analyze(...args: string[]): Promise<Report> {
  const r = await loci('analyze', ...args);
  expect(r.stderr).toBe('');
  expect(r.status).toBe(0);
  return JSON.parse(r.stdout) as Report;
}

const deg = (rad: number) => (rad * 180) / Math.PI;
const path = (report: Report, id: string) => report.joints.find((j) => j.id === id)!.path;

/**
 * Transmission angle of a four-bar from its input angle θ (from the ground line, at the
 * input pivot): cos μ = (b² + c² − a² − d² + 2ad cos θ)/(2bc), a input, b coupler,
 * c output, d ground (Balli and Chand, "Transmission angle in mechanisms", Mech. Mach.
 * Theory 37, 2002; formula from memory). Its extremes over a full turn are at θ = 0
 * (+2ad) and θ = π (−2ad).
 */
function closedFormMuDeg(a: number, b: number, c: number, d: number, thetaRad: number): number {
  return deg(Math.acos((b * b + c * c - a * a - d * d + 2 * a * d * Math.cos(thetaRad)) / (2 * b * c)));
}

/** Barker's crank-rocker (ground, input, coupler, output) = (100, 40, 120, 80), in its reference pose at θ2 = 90°. */
function barkerCrankRocker(): Json {
  const a = 40, b = 120, c = 80, d = 100;
  const A = [0, a];
  // B: |B − A| = b, |B − O4| = c, above the ground line (circle–circle, written out here).
  const dx = d - A[0], dy = 0 - A[1], dist = Math.hypot(dx, dy);
  const along = (b * b - c * c + dist * dist) / (2 * dist);
  const h = Math.sqrt(b * b - along * along);
  const ux = dx / dist, uy = dy / dist;
  const B1 = [A[0] + along * ux - h * uy, A[1] + along * uy + h * ux];
  const B2 = [A[0] + along * ux + h * uy, A[1] + along * uy - h * ux];
  const B = B1[1] > B2[1] ? B1 : B2;
  return {
    format: 'loci-linkage', version: 1, units: 'mm',
    joints: [
      { id: 'O2', x: 0, y: 0, ground: true },
      { id: 'A', x: A[0], y: A[1] },
      { id: 'B', x: B[0], y: B[1] },
      { id: 'O4', x: d, y: 0, ground: true },
    ],
    bodies: [
      { id: 'crank', joints: ['O2', 'A'] },
      { id: 'coupler', joints: ['A', 'B'] },
      { id: 'rocker', joints: ['B', 'O4'] },
    ],
    driver: { kind: 'rotation', body: 'crank', pivot: 'O2', tip: 'A' },
  } as Json;
}

describe('loci analyze on a crank-rocker of Barker proportions (100, 40, 120, 80)', () => {
  let report: Report;
  beforeAll(async () => { report = await analyze(writeDesign(barkerCrankRocker())); });

  it('classes the loop as Grashof crank-rocker, Barker type 2 (GCRR)', () => {
    // Barker, "A complete classification of planar four-bar linkages", Mech. Mach. Theory
    // 20(6), 1985: (100, 40, 120, 80) is a crank-rocker (from memory; type number and
    // code from memory). Grashof: s + l = 140 < p + q = 200 (Grashof 1883, published).
    expect(report.fourBarLoops).toHaveLength(1);
    const loop = report.fourBarLoops[0];
    expect(loop.bodies).toEqual(['ground', 'crank', 'coupler', 'rocker']);
    loop.lengthsMm.forEach((l, i) => expect(l).toBeCloseTo([100, 40, 120, 80][i], 9));
    expect(loop.grashof).toBe('grashof');
    expect(loop.barker).toEqual({ type: 2, code: 'GCRR', name: 'crank-rocker' });
  });

  it('turns the crank a full turn by default, 1° steps, every step assembled', () => {
    expect(report.driver).toMatchObject({ unit: 'deg', rangeRule: 'full turn', fullTurn: true, steps: 361 });
    expect(report.driver.reference).toBeCloseTo(90, 9);
    expect(report.driver.to - report.driver.from).toBeCloseTo(360, 9);
    expect(report.assembled.every(Boolean)).toBe(true);
    expect(report.defects.locks).toEqual([]);
    expect(report.closureResidualMm.max).toBeLessThan(1e-9);
  });

  it('gives the transmission-angle range of the closed form, at θ2 = 0 and 180°', () => {
    // Balli and Chand 2002 (formula from memory): μ(0) = 26.38°, μ(π) = 86.42° here.
    const mu = report.fourBarLoops[0].transmissionAngleDeg!;
    const muMin = closedFormMuDeg(40, 120, 80, 100, 0);
    const muMax = closedFormMuDeg(40, 120, 80, 100, Math.PI);
    expect(mu.min).toBeCloseTo(muMin, 6);
    expect(mu.max).toBeCloseTo(muMax, 6);
    expect(((mu.minAt % 360) + 360) % 360).toBeCloseTo(0, 6);
    expect(mu.maxAt).toBeCloseTo(180, 6);
  });

  it('puts the crank centre at its pivot and the coupler centre where lines O2A and O4B meet', () => {
    // Instant centres (Aronhold–Kennedy; any kinematics text, theorem): a link pinned to
    // ground turns about the pin; the coupler's centre is where the two ground-pivoted
    // links' lines cross (the crank and the rocker are never parallel in this linkage).
    const crank = report.instantCentres.find((c) => c.body === 'crank')!;
    const coupler = report.instantCentres.find((c) => c.body === 'coupler')!;
    const A = path(report, 'A'), B = path(report, 'B');
    for (let k = 0; k < report.values.length; k += 10) {
      expect(crank.kind[k]).toBe('finite');
      expect(Math.hypot(crank.xy[k]![0], crank.xy[k]![1])).toBeLessThan(1e-6);
      const [ax, ay] = A[k]!, [bx, by] = B[k]!;
      // Intersection of O2 + s·A and O4 + t·(B − O4), solved here by Cramer's rule.
      const ex = bx - 100, ey = by;
      const det = ax * -ey - ay * -ex;
      const s = ((100) * -ey - 0 * -ex) / det;
      if (coupler.kind[k] === 'infinite') {
        expect(Math.abs(det) / (Math.hypot(ax, ay) * Math.hypot(ex, ey))).toBeLessThan(1e-6);
        continue;
      }
      expect(coupler.kind[k]).toBe('finite');
      const [cx, cy] = coupler.xy[k]!;
      const scale = Math.max(1, Math.hypot(s * ax, s * ay));
      expect(Math.hypot(cx - s * ax, cy - s * ay) / scale).toBeLessThan(1e-6);
    }
  });
});

/** For each four-bar loop through ground, μ from the closed form at every step, from the report's own joint paths. */
function checkTransmissionAgainstClosedForm(report: Report): void {
  for (const loop of report.fourBarLoops.filter((l) => l.bodies[0] === 'ground')) {
    const [groundToInput, inputToCoupler, , outputToGround] = loop.joints;
    const [d, a, b, c] = loop.lengthsMm;
    const O = path(report, groundToInput), P = path(report, inputToCoupler), Q = path(report, outputToGround);
    let lo = Infinity, hi = -Infinity;
    for (let k = 0; k < report.values.length; k++) {
      if (!report.assembled[k]) continue;
      const groundAngle = Math.atan2(Q[k]![1] - O[k]![1], Q[k]![0] - O[k]![0]);
      const inputAngle = Math.atan2(P[k]![1] - O[k]![1], P[k]![0] - O[k]![0]);
      const mu = closedFormMuDeg(a, b, c, d, inputAngle - groundAngle);
      lo = Math.min(lo, mu);
      hi = Math.max(hi, mu);
    }
    expect(loop.transmissionAngleDeg!.min).toBeCloseTo(lo, 5);
    expect(loop.transmissionAngleDeg!.max).toBeCloseTo(hi, 5);
  }
}

describe('loci analyze on the example files', () => {
  it('crank-rocker.json: a Grashof crank-rocker, full turn, coupler point rigid on the coupler', async () => {
    const report = await analyze(CRANK_ROCKER);
    // Kutzbach–Grübler (theorem): 4 links, 4 pins: M = 3·3 − 2·4 = 1.
    expect(report.mobility).toMatchObject({ mobility: 1, links: 4, fullJoints: 4 });
    expect(report.fourBarLoops).toHaveLength(1);
    // Lengths (90, 30, 84.97, 69.43): s + l = 120 < 154.40, shortest the input (Barker 1985, from memory).
    expect(report.fourBarLoops[0].barker).toEqual({ type: 2, code: 'GCRR', name: 'crank-rocker' });
    expect(report.driver.rangeRule).toBe('full turn');
    checkTransmissionAgainstClosedForm(report);
    // A point of a rigid body keeps its distances to the body's joints (theorem).
    const P = report.points.find((p) => p.id === 'P')!.path, A = path(report, 'A'), B = path(report, 'B');
    const dA = Math.hypot(P[0]![0] - A[0]![0], P[0]![1] - A[0]![1]);
    const dB = Math.hypot(P[0]![0] - B[0]![0], P[0]![1] - B[0]![1]);
    for (let k = 0; k < P.length; k++) {
      expect(Math.hypot(P[k]![0] - A[k]![0], P[k]![1] - A[k]![1])).toBeCloseTo(dA, 6);
      expect(Math.hypot(P[k]![0] - B[k]![0], P[k]![1] - B[k]![1])).toBeCloseTo(dB, 6);
    }
  });

  it('stephenson-iii.json: mobility 1, one non-Grashof loop through ground, closes at every step', async () => {
    const report = await analyze(STEPHENSON_III, '--steps', '121');
    // Kutzbach–Grübler (theorem): 6 links, 7 pins: M = 3·5 − 2·7 = 1.
    expect(report.mobility).toMatchObject({ mobility: 1, links: 6, fullJoints: 7 });
    // The only four-link loop is ground–rockerA–coupler–rockerB, lengths (120, 70.71, 100.50,
    // 80.62): s + l = 190.71 > p + q = 181.12, non-Grashof with ground longest: Barker
    // type 5, RRR1 (Barker 1985, as tabulated in Norton, Design of Machinery; from memory).
    expect(report.fourBarLoops).toHaveLength(1);
    expect(report.fourBarLoops[0].grashof).toBe('non-grashof');
    expect(report.fourBarLoops[0].barker?.type).toBe(5);
    expect(report.fourBarLoops[0].barker?.code).toBe('RRR1');
    expect(report.driver.steps).toBe(121);
    expect(report.assembled.every(Boolean)).toBe(true);
    expect(report.closureResidualMm.max).toBeLessThan(1e-6);
    checkTransmissionAgainstClosedForm(report);
    expect(report.instantCentres.map((c) => c.body).sort()).toEqual(['connector', 'coupler', 'input', 'rockerA', 'rockerB']);
  });

  it('takes --from/--to in degrees for a rotation driver, negative values included', async () => {
    const report = await analyze(CRANK_ROCKER, '--from', '-90', '--to', '90', '--steps', '7');
    expect(report.driver).toMatchObject({ unit: 'deg', from: -90, to: 90, steps: 7, rangeRule: 'given', fullTurn: false });
    [-90, -60, -30, 0, 30, 60, 90].forEach((v, k) => expect(report.values[k]).toBeCloseTo(v, 9));
    // At 0° the crank pin lies on +x at the crank length (30 mm, from the file).
    const A0 = path(report, 'A')[3]!;
    expect(A0[0]).toBeCloseTo(30, 6);
    expect(A0[1]).toBeCloseTo(0, 6);
  });

  it('finds the assembly range of a triple rocker and stops inside its limits', async () => {
    // Barker's (100, 60, 50, 80) is a non-Grashof triple rocker (README, from memory): the
    // input cannot turn fully. Its input limits are where coupler and output are in line,
    // |A − O4| = b + c (theorem, triangle inequality): cos θ = (a² + d² − (b + c)²)/(2ad).
    const file = barkerCrankRocker();
    const a = 60, b = 50, c = 80, d = 100;
    const theta = (75 * Math.PI) / 180;
    const A = [a * Math.cos(theta), a * Math.sin(theta)];
    const dx = d - A[0], dy = -A[1], dist = Math.hypot(dx, dy);
    const along = (b * b - c * c + dist * dist) / (2 * dist);
    const h = Math.sqrt(b * b - along * along);
    const B = [A[0] + along * dx / dist - h * dy / dist, A[1] + along * dy / dist + h * dx / dist];
    file.joints = [
      { id: 'O2', x: 0, y: 0, ground: true }, { id: 'A', x: A[0], y: A[1] },
      { id: 'B', x: B[0], y: B[1] }, { id: 'O4', x: d, y: 0, ground: true },
    ];
    const report = await analyze(writeDesign(file), '--steps', '51');
    const limit = deg(Math.acos((a * a + d * d - (b + c) ** 2) / (2 * a * d)));
    expect(report.driver.rangeRule).toBe('assembly range');
    expect(report.fourBarLoops[0].grashof).toBe('non-grashof');
    expect(report.driver.from).toBeCloseTo(-limit, 4);
    expect(report.driver.to).toBeCloseTo(limit, 4);
    expect(report.assembled.every(Boolean)).toBe(true);
    // The limits are toggles of the dyad that places B (coupler and output in line).
    expect(report.defects.deadCentres).toHaveLength(2);
    const [low, high] = report.defects.deadCentres as { at: number; joint: string }[];
    expect(low.joint).toBe('B');
    expect(high.joint).toBe('B');
    expect(low.at).toBeCloseTo(-limit, 6);
    expect(high.at).toBeCloseTo(limit, 6);
  });
});

describe('loci analyze: a length driver and a translating coupler', () => {
  it('moves a length driver over its reference length ± 10 % by default', async () => {
    const file = barkerCrankRocker();
    file.driver = { kind: 'length', from: 'A', to: 'O4' };
    const report = await analyze(writeDesign(file), '--steps', '21');
    const reference = Math.hypot(100, 40); // |A − O4| with A = (0, 40), O4 = (100, 0)
    expect(report.driver).toMatchObject({ unit: 'mm', rangeRule: 'share of reference length', steps: 21 });
    expect(report.driver.reference).toBeCloseTo(reference, 6);
    expect(report.driver.from).toBeCloseTo(0.9 * reference, 6);
    expect(report.driver.to).toBeCloseTo(1.1 * reference, 6);
    // The driver value is the distance it prescribes (definition), at every step.
    const A = path(report, 'A'), O4 = path(report, 'O4');
    report.values.forEach((v, k) => expect(Math.hypot(A[k]![0] - O4[k]![0], A[k]![1] - O4[k]![1])).toBeCloseTo(v, 6));
  });

  it('reports the centre of a parallelogram coupler at infinity, along the cranks', async () => {
    // A parallelogram four-bar's coupler translates, so its centre relative to ground is
    // at infinity in the direction of the parallel cranks (theorem). Barker's
    // (100, 40, 100, 40) is a parallelogram (README, from memory); the range keeps clear
    // of its flat change points at 0° and 180°.
    const file = barkerCrankRocker();
    file.joints = [
      { id: 'O2', x: 0, y: 0, ground: true }, { id: 'A', x: 0, y: 40 },
      { id: 'B', x: 100, y: 40 }, { id: 'O4', x: 100, y: 0, ground: true },
    ];
    const report = await analyze(writeDesign(file), '--from', '30', '--to', '150', '--steps', '13');
    expect(report.fourBarLoops[0].grashof).toBe('change-point');
    const coupler = report.instantCentres.find((c) => c.body === 'coupler')!;
    const A = path(report, 'A');
    for (let k = 0; k < report.values.length; k++) {
      expect(coupler.kind[k]).toBe('infinite');
      const [dx, dy] = coupler.xy[k]!;
      const [ax, ay] = A[k]!;
      expect(Math.abs(dx * ay - dy * ax) / Math.hypot(ax, ay)).toBeLessThan(1e-6);
    }
  });
});

describe('linkage file: writing and reading back', () => {
  it.each([
    ['fourBar', fourBar()],
    ['wattII', wattII()],
    ['stephensonIII', stephensonIII()],
  ])('%s survives toLinkageFile → JSON text → parseLinkageFileText unchanged', (_name, linkage) => {
    const text = JSON.stringify(toLinkageFile(linkage, 'round trip'));
    const back = parseLinkageFileText(text);
    expect(back).toEqual({ ok: true, linkage, name: 'round trip' });
  });

  it('the example files read back to the file they came from', () => {
    for (const file of [CRANK_ROCKER, STEPHENSON_III]) {
      const json = example(file);
      const read = parseLinkageFile(json);
      if (!read.ok) throw new Error(JSON.stringify(read.issues));
      expect(toLinkageFile(read.linkage, read.name)).toEqual(json);
    }
  });

  it('rejects a version that is not a whole number ≥ 1', () => {
    for (const version of [0, 1.5, '1']) {
      const read = parseLinkageFile({ ...example(CRANK_ROCKER), version });
      expect(read.ok).toBe(false);
      if (!read.ok) expect(read.issues[0]).toMatchObject({ path: 'version', message: expect.stringMatching(/expected a whole number ≥ 1/) });
    }
  });
});

describe('loci analyze rejects bad input with exit code 2 and a message naming the problem', () => {
  const good = () => example(CRANK_ROCKER);

  async function rejects(content: unknown, ...expected: RegExp[]): Promise<void> {
    const r = await loci('analyze', writeDesign(content));
    expect(r.status).toBe(2);
    expect(r.stdout).toBe('');
    for (const pattern of expected) expect(r.stderr).toMatch(pattern);
  }

  it('not JSON', () => rejects('{"format": "loci-linkage", "version": 1,', /not valid JSON/));

  it('not a linkage file', () => rejects({ format: 'something-else' }, /format: expected "loci-linkage", got "something-else"/));

  it('a missing field', async () => {
    const f: Partial<Json> = good();
    delete f.joints;
    await rejects(f, /joints: missing; expected an array of joints/);
  });

  it('a wrong type, naming the field and the value', async () => {
    const f = good();
    f.joints[2].x = 'abc';
    await rejects(f, /joints\[2\]\.x: expected a finite number in mm, got "abc"/);
  });

  it('a misspelt field', async () => {
    const f = good();
    (f.joints[1] as Record<string, unknown>).grund = true;
    await rejects(f, /joints\[1\]: unknown field "grund"/);
  });

  it('an unknown driver kind', async () => {
    const f = good();
    f.driver = { kind: 'spin', body: 'crank' };
    await rejects(f, /driver\.kind: expected a driver kind, "rotation" or "length", got "spin"/);
  });

  it('an unknown joint id in a body', async () => {
    const f = good();
    f.bodies[1].joints = ['A', 'Z'];
    await rejects(f, /bodies\[1\]/, /"?Z"?/);
  });

  it('a body with fewer than two joints', async () => {
    const f = good();
    f.bodies.push({ id: 'stub', joints: ['B'] });
    await rejects(f, /bodies\[3\]/);
  });

  it('a joint on no body', async () => {
    const f = good();
    f.joints.push({ id: 'X', x: 50, y: 50 });
    await rejects(f, /joints\[4\]|"X"|\bX\b/);
  });

  it('mobility other than 1 (a five-bar has 2)', async () => {
    await rejects({
      format: 'loci-linkage', version: 1, units: 'mm',
      joints: [
        { id: 'O1', x: 0, y: 0, ground: true }, { id: 'A', x: 0, y: 30 }, { id: 'B', x: 50, y: 60 },
        { id: 'C', x: 100, y: 30 }, { id: 'O5', x: 100, y: 0, ground: true },
      ],
      bodies: [
        { id: 'l1', joints: ['O1', 'A'] }, { id: 'l2', joints: ['A', 'B'] },
        { id: 'l3', joints: ['B', 'C'] }, { id: 'l4', joints: ['C', 'O5'] },
      ],
      driver: { kind: 'rotation', body: 'l1', pivot: 'O1', tip: 'A' },
    }, /mobility/i, /2/);
  });

  it('a reference pose that violates its own constraints (a slider off its line)', async () => {
    await rejects({
      format: 'loci-linkage', version: 1, units: 'mm',
      joints: [
        { id: 'O2', x: 0, y: 0, ground: true }, { id: 'A', x: 0, y: 30 }, { id: 'B', x: 90, y: 10 },
      ],
      bodies: [{ id: 'crank', joints: ['O2', 'A'] }, { id: 'rod', joints: ['A', 'B'] }],
      // The slide line passes through (0, 0) along +x, but B is 10 mm above it.
      sliders: [{ joint: 'B', body: 'ground', angle: 0, through: { x: 0, y: 0 } }],
      driver: { kind: 'rotation', body: 'crank', pivot: 'O2', tip: 'A' },
    }, /sliders\[0\]/);
  });

  it('an unknown (future) version', async () => {
    await rejects({ ...good(), version: 2 }, /version: this file is version 2, newer than this Loci reads \(up to version 1\)/);
  });

  it('a file that cannot be read', async () => {
    const r = await loci('analyze', join(dir, 'no-such-file.json'));
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/cannot read .*no-such-file\.json: no such file/);
  });

  it.each([
    [['--steps', '1'], /--steps: expected a whole number of steps from 2 to 20000, got 1/],
    [['--steps', '2.5'], /--steps: expected a whole number of steps/],
    [['--steps', 'many'], /--steps: expected a whole number from 2 to 20000, got "many"/],
    [['--from', 'abc', '--to', '10'], /--from: expected a number/],
    [['--from', '10'], /--from and --to go together/],
    [['--from', '10', '--to', '10'], /--to: expected a driver value different from --from/],
    [['--speed', '3'], /unknown option --speed/],
    [['--steps'], /--steps needs a value/],
  ])('bad flags %j', async (flags, pattern) => {
    const r = await loci('analyze', CRANK_ROCKER, ...flags);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(pattern);
    expect(r.stdout).toBe('');
  });

  it('no file, and two files', async () => {
    expect((await loci('analyze')).stderr).toMatch(/no linkage file given/);
    const two = await loci('analyze', CRANK_ROCKER, STEPHENSON_III);
    expect(two.status).toBe(2);
    expect(two.stderr).toMatch(/one linkage file expected, got 2/);
  });
});

describe('loci dispatcher', () => {
  it('--help prints the commands and exits 0', async () => {
    const r = await loci('--help');
    expect(r.status).toBe(0);
    expect(r.stdout).toMatch(/usage: loci COMMAND/);
    expect(r.stdout).toMatch(/analyze/);
  });

  it('analyze --help prints the analyze usage and exits 0', async () => {
    const r = await loci('analyze', '--help');
    expect(r.status).toBe(0);
    expect(r.stdout).toMatch(/usage: loci analyze DESIGN\.json/);
  });

  it('an unknown command prints the usage and exits 2', async () => {
    const r = await loci('frobnicate');
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/unknown command "frobnicate"/);
    expect(r.stderr).toMatch(/usage: loci COMMAND/);
  });

  it('no command prints the usage and exits 2', async () => {
    const r = await loci();
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/usage: loci COMMAND/);
  });
});

describe('loci as a shell runs it', () => {
  it('analyzes an example from another working directory with exit code 0, and refuses a bad flag with 2 and the message on stderr', () => {
    const ok = lociChild('analyze', CRANK_ROCKER, '--steps', '7');
    expect(ok.stderr).toBe('');
    expect(ok.status).toBe(0);
    expect((JSON.parse(ok.stdout) as Report).joints.length).toBeGreaterThan(0);
    const bad = lociChild('analyze', CRANK_ROCKER, '--steps', '1');
    expect(bad.status).toBe(2);
    expect(bad.stdout).toBe('');
    expect(bad.stderr).toMatch(/--steps: expected a whole number of steps from 2 to 20000, got 1/);
  });
});
