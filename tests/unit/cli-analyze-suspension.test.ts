/**
 * `loci analyze` of a suspension file, run in-process through analyzeSuspensionCommand
 * with an io that records what it prints: the example file against suspensionCurves
 * called directly, the single pivot against its closed-form leverage ratio, and the
 * messages and exit codes for bad files, bad bicycles and bad flags.
 */
import { spawnSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { analyzeSuspensionCommand } from '../../src/cli/analyzeSuspension';
import { parseCommandArgs } from '../../src/cli/args';
import { EXIT_OK, EXIT_USAGE, type CliIo } from '../../src/cli/command';
import { fourBarSeatStayAxle, stephensonSixBar } from '../../src/core/suspension';
import { DEMO_LAYOUTS, DEMO_TRAIL_BIKE, SUSPENSION_CAUTION, SUSPENSION_CONVENTIONS, suspensionCurves } from '../../src/core/suspension';

const FILE = 'trail-bike-four-bar.json';
const exampleText = readFileSync(resolve(import.meta.dirname, '../../public/examples', FILE), 'utf8');
type Json = Record<string, unknown>;

const OPTIONS = [
  { name: 'from', kind: 'value' },
  { name: 'to', kind: 'value' },
  { name: 'steps', kind: 'value' },
  { name: 'travel', kind: 'value' },
  { name: 'help', kind: 'flag' },
] as const;

interface Ran { code: number; stdout: string; stderr: string }

function analyze(text: string, ...argv: string[]): Ran {
  let stdout = '';
  let stderr = '';
  const io: CliIo = {
    stdout: (t) => { stdout += t; },
    stderr: (t) => { stderr += t; },
    readTextFile: () => Promise.reject(new Error('the command is given the text; it reads no file')),
  };
  const parsed = parseCommandArgs([FILE, ...argv], OPTIONS);
  if (!parsed.ok) throw new Error(parsed.message);
  const usageError = (message: string) => {
    stderr += `loci analyze: ${message}\n`;
    return EXIT_USAGE;
  };
  const code = analyzeSuspensionCommand({ file: FILE, text, args: parsed.args, io, usageError });
  return { code, stdout, stderr };
}

interface Output {
  name?: string;
  layout: string;
  bodies: { axle: string; shockEye: string; shockFrameEye: string };
  summary: Record<string, number | number[] | null>;
  curves: Record<string, unknown> & { steps: number; perCog: Record<string, number | number[]>[]; instantCentre: Record<string, unknown[]> };
  conventions: string[];
  caution: string;
}

function ok(text: string, ...argv: string[]): Output {
  const r = analyze(text, ...argv);
  expect(r.stderr).toBe('');
  expect(r.code).toBe(EXIT_OK);
  return JSON.parse(r.stdout) as Output;
}

/** NaN in a curve prints as null. */
const asJson = (a: ArrayLike<number>) => Array.from(a, (v) => (Number.isFinite(v) ? v : null));

describe('loci analyze, suspension file', () => {
  it('prints every curve and the summary exactly as suspensionCurves gives them, with the caution and conventions', () => {
    const out = ok(exampleText, '--steps', '21');
    const direct = suspensionCurves(fourBarSeatStayAxle(DEMO_LAYOUTS.fourBarSeatStayAxle), DEMO_TRAIL_BIKE, { steps: 21, floatingBrakeBody: 'chainStay' });
    if (!direct.ok) throw new Error(direct.reason);
    const r = direct.report;
    const c = r.curves;
    expect(out.layout).toBe('fourBarSeatStayAxle');
    expect(out.name).toContain('our own example');
    expect(out.curves.steps).toBe(21);
    // Every number in full: JSON reads back to the same doubles.
    expect(out.curves.travelMm).toEqual(asJson(c.travelMm));
    expect(out.curves.shockLengthMm).toEqual(asJson(c.shockLengthMm));
    expect(out.curves.axleXMm).toEqual(asJson(c.axleXMm));
    expect(out.curves.axleRearwardMm).toEqual(asJson(c.rearwardMm));
    expect(out.curves.leverageRatio).toEqual(asJson(c.leverageRatio));
    expect(out.curves.wheelRateNPerMm).toEqual(asJson(c.wheelRateNPerMm!));
    expect(out.curves.antiRiseFloatingBrakePct).toEqual(asJson(c.antiRiseFloatingPct!));
    expect(out.curves.perCog.map((p) => p.cogTeeth)).toEqual(DEMO_TRAIL_BIKE.cogTeeth);
    out.curves.perCog.forEach((p, i) => {
      expect(p.antiSquatPct).toEqual(asJson(c.antiSquatPct[i]));
      expect(p.kickbackDeg).toEqual(asJson(c.kickbackDeg[i]));
      expect(p.chainGrowthMm).toEqual(asJson(c.chainGrowthMm[i]));
    });
    const s = out.summary;
    expect(s.wheelTravelMm).toBe(r.totalTravelMm);
    expect(s.leverageRatioStart).toBe(r.leverageRatioStart);
    expect(s.leverageRatioEnd).toBe(r.leverageRatioEnd);
    expect(s.progressionPct).toBe(r.progressionPct);
    expect(s.antiSquatAtSagPct).toEqual(r.sagPoint.antiSquatPct);
    expect(s.kickbackAtFullTravelDeg).toEqual(c.kickbackDeg.map((a) => a[20]));
    expect(s.axleRearwardAtFullTravelMm).toBe(c.rearwardMm[20]);
    expect(s.axleRearwardMaxMm).toBe(Math.max(...c.rearwardMm));
    expect(out.conventions).toEqual(SUSPENSION_CONVENTIONS);
    expect(out.caution).toBe(SUSPENSION_CAUTION);
    for (const words of ['kinematics only', 'qualified engineer', 'physically tested', 'ISO 4210']) expect(out.caution).toContain(words);
  });

  it('reads the summary against its own definitions: progression from the ends, sag at its share of travel', () => {
    const out = ok(exampleText);
    const s = out.summary as Record<string, number>;
    const lr = out.curves.leverageRatio as number[];
    const travel = out.curves.travelMm as number[];
    // common practice: progression = (LR_start − LR_end) / LR_start
    expect(s.progressionPct).toBeCloseTo((100 * (lr[0] - lr[lr.length - 1])) / lr[0], 10);
    expect(s.sagWheelTravelMm).toBeCloseTo(DEMO_TRAIL_BIKE.sag * travel[travel.length - 1], 6);
    expect(s.wheelTravelMm).toBe(travel[travel.length - 1]);
  });

  it('single pivot: the leverage ratio is |axle_x − pivot_x| / (distance from the pivot to the shock line) at every step', () => {
    const sp = DEMO_LAYOUTS.singlePivot;
    const file = JSON.parse(exampleText) as Json;
    file.layout = { kind: 'singlePivot', pivots: { mainPivot: sp.mainPivot, shockEye: sp.shockEye, shockFrameEye: sp.shockFrameEye } };
    const out = ok(JSON.stringify(file), '--steps', '13');
    const lr = out.curves.leverageRatio as number[];
    const lengths = out.curves.shockLengthMm as number[];
    const axleX = out.curves.axleXMm as number[];
    const P = sp.mainPivot;
    const F = sp.shockFrameEye;
    const arm = Math.hypot(sp.shockEye.x - P.x, sp.shockEye.y - P.y);
    const toFrame = Math.hypot(F.x - P.x, F.y - P.y);
    // The side the eye is on, seen from the pivot towards the frame eye, is kept through the travel.
    const side = Math.sign((F.x - P.x) * (sp.shockEye.y - P.y) - (F.y - P.y) * (sp.shockEye.x - P.x));
    expect(lr).toHaveLength(13);
    for (let k = 0; k < 13; k++) {
      const s = lengths[k];
      // theorem: law of cosines in the triangle pivot – eye – frame eye places the eye at shock length s
      const gamma = Math.acos((arm * arm + toFrame * toFrame - s * s) / (2 * arm * toFrame));
      const a = Math.atan2(F.y - P.y, F.x - P.x) + side * gamma;
      const E = { x: P.x + arm * Math.cos(a), y: P.y + arm * Math.sin(a) };
      const turn = a - Math.atan2(sp.shockEye.y - P.y, sp.shockEye.x - P.x);
      const ax0 = DEMO_TRAIL_BIKE.rearAxleMm.x - P.x;
      const ay0 = DEMO_TRAIL_BIKE.rearAxleMm.y - P.y;
      const axleXByHand = P.x + ax0 * Math.cos(turn) - ay0 * Math.sin(turn);
      expect(axleX[k]).toBeCloseTo(axleXByHand, 9);
      // theorem (virtual work on a lever): LR = |A_x − P_x| / (distance from P to the line E–F)
      const distance = Math.abs((E.x - P.x) * (F.y - E.y) - (E.y - P.y) * (F.x - E.x)) / Math.hypot(F.x - E.x, F.y - E.y);
      expect(Math.abs(lr[k] - Math.abs(axleXByHand - P.x) / distance)).toBeLessThan(1e-9 * lr[k]);
    }
  });

  it('--travel stops the sweep at that wheel travel', () => {
    const out = ok(exampleText, '--travel', '100', '--steps', '5');
    expect(out.summary.wheelTravelMm as number).toBeCloseTo(100, 6);
    expect((out.curves.travelMm as number[])[4]).toBeCloseTo(100, 6);
    expect(out.summary.strokeWheelTravelMm as number).toBeGreaterThan(100);
  });

  it('exit 2 naming the field for a bad file or a bad bicycle', () => {
    const bad = JSON.parse(exampleText) as Json;
    (bad.bicycle as Json).sag = 30;
    (bad.layout as Json & { pivots: Json }).pivots.mainPivot = { x: 45 };
    const r = analyze(JSON.stringify(bad));
    expect(r.code).toBe(EXIT_USAGE);
    expect(r.stdout).toBe('');
    expect(r.stderr).toContain(`${FILE}: layout.pivots.mainPivot.y: missing; expected a number of mm`);
    const sag = JSON.parse(exampleText) as Json;
    (sag.bicycle as Json).sag = 30;
    expect(analyze(JSON.stringify(sag)).stderr).toBe(`${FILE}: bicycle.sag: sag 30 looks like a percentage; give it as a share of travel (0.3 for 30 %)\n`);
    expect(analyze('{"format": "loci-suspension", ').code).toBe(EXIT_USAGE);
  });

  it('exit 2 with suspensionCurves\' words when the shock cannot be fitted, and both fields named', () => {
    const long = JSON.parse(exampleText) as Json;
    (long.bicycle as Json).shock = { eyeToEyeMm: 260, strokeMm: 55 };
    const r = analyze(JSON.stringify(long));
    expect(r.code).toBe(EXIT_USAGE);
    expect(r.stderr).toContain(`${FILE}: the shock's eye-to-eye length 260 mm is longer than the layout allows`);
    expect(r.stderr).toContain('layout.pivots.shockEye and layout.pivots.shockFrameEye are drawn 210 mm apart; bicycle.shock.eyeToEyeMm is 260 mm');
    const travel = analyze(exampleText, '--travel', '500');
    expect(travel.code).toBe(EXIT_USAGE);
    expect(travel.stderr).toContain('the shock bottoms out before the travel asked');
  });

  it('exit 2 for bad flags, before reading the design', () => {
    for (const argv of [['--steps', '1'], ['--steps', '2.5'], ['--steps', 'many'], ['--travel', '-5'], ['--travel', '0'], ['--from', '0']]) {
      const r = analyze(exampleText, ...argv);
      expect(r.code).toBe(EXIT_USAGE);
      expect(r.stderr).toContain(`--${argv[0].slice(2)}`);
      expect(r.stdout).toBe('');
    }
  });
});

describe('loci analyze through the command line, by file format', () => {
  const bin = resolve(import.meta.dirname, '../../bin/loci.js');
  const example = resolve(import.meta.dirname, '../../public/examples/trail-bike-four-bar.json');
  const crankRocker = resolve(import.meta.dirname, '../../public/examples/crank-rocker.json');

  it('a suspension file is analysed over the wheel travel; a linkage file refuses --travel', () => {
    const suspension = spawnSync(process.execPath, [bin, 'analyze', example, '--steps', '5'], { encoding: 'utf8', timeout: 60_000 });
    expect(suspension.stderr).toBe('');
    expect(suspension.status).toBe(0);
    const report = JSON.parse(suspension.stdout) as { summary: unknown; curves: { travelMm: number[] }; caution: string };
    expect(report.curves.travelMm).toHaveLength(5);
    expect(report.caution).toBe(SUSPENSION_CAUTION);
    const linkage = spawnSync(process.execPath, [bin, 'analyze', crankRocker, '--travel', '5'], { encoding: 'utf8', timeout: 60_000 });
    expect(linkage.status).toBe(2);
    expect(linkage.stderr).toMatch(/--travel is for a suspension file/);
  });
});

describe('loci analyze, a six-bar with the shock between two moving bodies', () => {
  // The demo Stephenson six-bar with its shock from the bell crank to the chain stay (the other eye drawn 210 mm from the eye at 225°) and the axle on the seat stay.
  const S = DEMO_LAYOUTS.stephensonSixBar;
  const a = (5 * Math.PI) / 4;
  const shockFrameEye = { x: S.shockEye.x + 210 * Math.cos(a), y: S.shockEye.y + 210 * Math.sin(a) };
  const shock = { eye: 'bellCrank', frameEye: 'chainStay' } as const;

  it('names the bodies, and prints the curves suspensionCurves gives for the builder called directly', () => {
    const { axle: _axle, axleBody: _axleBody, ...pivots } = { ...S, shockFrameEye };
    const file = JSON.parse(exampleText) as Json;
    file.name = 'six-bar, shock between two moving bodies';
    file.layout = { kind: 'stephensonSixBar', pivots, axleBody: 'seatStay', shock };
    const out = ok(JSON.stringify(file), '--steps', '21');
    expect(out.layout).toBe('stephensonSixBar');
    expect(out.bodies).toEqual({ axle: 'seatStay', shockEye: 'bellCrank', shockFrameEye: 'chainStay' });
    const bike = (file as { bicycle: typeof DEMO_TRAIL_BIKE }).bicycle;
    const direct = suspensionCurves(stephensonSixBar({ ...S, shockFrameEye, axleBody: 'seatStay', shock }), bike, { steps: 21 });
    if (!direct.ok) throw new Error(direct.reason);
    expect(out.curves.leverageRatio).toEqual(asJson(direct.report.curves.leverageRatio));
    expect(out.curves.axleYMm).toEqual(asJson(direct.report.curves.axleYMm));
    expect(out.caution).toBe(SUSPENSION_CAUTION);
  });

  it('names the bodies of a layout with the shock on the front frame', () => {
    expect(ok(exampleText).bodies).toEqual({ axle: 'seatStay', shockEye: 'rocker', shockFrameEye: 'frontFrame' });
  });
});
