/**
 * The suspension design file: the example reads, every layout kind round-trips and
 * builds the same linkage as its builder called directly, and each kind of mistake is
 * reported once, at its field.
 */
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { MAX_LISTED_ISSUES } from '../../../src/core/io/schemaMessages';
import {
  MAX_SUSPENSION_FILE_CHARS,
  fileFormatOf,
  layoutLinkage,
  parseSuspensionFile,
  parseSuspensionFileText,
  toSuspensionFile,
  type SuspensionDesign,
} from '../../../src/core/io/suspensionFile';
import type { Linkage } from '../../../src/core/linkage';
import {
  DEMO_LAYOUTS,
  DEMO_TRAIL_BIKE,
  LAYOUT_KINDS,
  LAYOUT_PIVOTS,
  fourBarSeatStayAxle,
  linkageDrivenSinglePivot,
  shortLinkFourBar,
  singlePivot,
  stephensonSixBar,
  wattSixBar,
  type LayoutKind,
  SUSPENSION_CAUTION,
} from '../../../src/core/suspension';

const EXAMPLE = resolve(import.meta.dirname, '../../../public/examples/trail-bike-four-bar.json');
const exampleText = readFileSync(EXAMPLE, 'utf8');
type Json = Record<string, unknown>;
const example = (): Json => JSON.parse(exampleText) as Json;
const clone = <T>(v: T): T => JSON.parse(JSON.stringify(v)) as T;

/** Each demo layout built by its own builder, as the second route to the linkage a file describes. */
const DIRECT: Record<LayoutKind, Linkage> = {
  singlePivot: singlePivot(DEMO_LAYOUTS.singlePivot),
  linkageDrivenSinglePivot: linkageDrivenSinglePivot(DEMO_LAYOUTS.linkageDrivenSinglePivot),
  fourBarSeatStayAxle: fourBarSeatStayAxle(DEMO_LAYOUTS.fourBarSeatStayAxle),
  shortLinkFourBar: shortLinkFourBar(DEMO_LAYOUTS.shortLinkFourBar),
  wattSixBar: wattSixBar(DEMO_LAYOUTS.wattSixBar),
  stephensonSixBar: stephensonSixBar(DEMO_LAYOUTS.stephensonSixBar),
};

/** A design of a demo layout: its positions without the axle (the bicycle holds it) and without axleBody. */
function demoDesign(kind: LayoutKind): SuspensionDesign {
  const { axle: _axle, ...rest } = DEMO_LAYOUTS[kind] as unknown as Record<string, unknown>;
  const axleBody = rest.axleBody as 'chainStay' | 'seatStay' | undefined;
  delete rest.axleBody;
  return {
    name: `demo ${kind}`,
    bicycle: clone(DEMO_TRAIL_BIKE),
    layout: { kind, pivots: rest as Record<string, { x: number; y: number }>, ...(axleBody === undefined ? {} : { axleBody }) },
  };
}

function issuesOf(doc: unknown): { path: string; message: string }[] {
  const r = parseSuspensionFile(doc);
  if (r.ok) throw new Error('expected the file to be refused');
  return [...r.issues];
}

describe('suspension file: reading and writing', () => {
  it('reads the example file and writes it back to the same JSON', () => {
    const r = parseSuspensionFileText(exampleText);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.design.layout.kind).toBe('fourBarSeatStayAxle');
    expect(fileFormatOf(exampleText)).toBe('loci-suspension');
    expect(fileFormatOf(`\ufeff${exampleText}`)).toBe('loci-suspension');
    expect(fileFormatOf('{"format": 3}')).toBeUndefined();
    expect(fileFormatOf('[1]')).toBeUndefined();
    expect(fileFormatOf('not json')).toBeUndefined();
    expect(toSuspensionFile(r.design)).toEqual(example());
  });

  // The mission's rule: every export of a frame design says Loci computes kinematics only.
  it('carries the caution in every file it writes, and reads files without it', () => {
    const r = parseSuspensionFileText(exampleText);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    const file = toSuspensionFile(r.design);
    expect(file.caution).toBe(SUSPENSION_CAUTION);
    const { caution: _dropped, ...without } = file;
    expect(parseSuspensionFileText(JSON.stringify(without)).ok).toBe(true);
  });

  for (const kind of LAYOUT_KINDS) {
    it(`${kind}: round-trips, and builds the linkage its builder builds from the same positions`, () => {
      const design = demoDesign(kind);
      expect(Object.keys(design.layout.pivots).sort()).toEqual([...LAYOUT_PIVOTS[kind]].sort());
      const text = JSON.stringify(toSuspensionFile(design), null, 2);
      const r = parseSuspensionFileText(text);
      if (!r.ok) throw new Error(r.issues.map((i) => `${i.path}: ${i.message}`).join('; '));
      expect(r.design).toEqual(design);
      expect(JSON.stringify(toSuspensionFile(r.design), null, 2)).toBe(text);
      // The file's route (pivots + the bicycle's axle) and the builder's own give the same linkage.
      expect(r.linkage).toEqual(DIRECT[kind]);
      expect(layoutLinkage(design.layout, DEMO_TRAIL_BIKE.rearAxleMm)).toEqual(DIRECT[kind]);
    });
  }

  it('copies what it keeps: changing the file object afterwards changes nothing', () => {
    const doc = example();
    const r = parseSuspensionFile(doc);
    if (!r.ok) throw new Error('example refused');
    ((doc.bicycle as Json).cogTeeth as number[])[0] = 99;
    ((doc.layout as Json).pivots as Record<string, Json>).mainPivot.x = 0;
    expect(r.design.bicycle.cogTeeth[0]).toBe(10);
    expect(r.design.layout.pivots.mainPivot.x).toBe(45);
  });

  it('keeps the optional bicycle fields and an air spring', () => {
    const design = demoDesign('singlePivot');
    const withAir: SuspensionDesign = {
      ...design,
      bicycle: {
        ...design.bicycle,
        wheelbaseMm: undefined,
        frontContactXMm: 790,
        chainPitchMm: undefined,
        spring: { kind: 'air', pressureKPa: 1400, volumeMm3: 250_000, pistonAreaMm2: 1000, gasLaw: 'adiabatic' },
      },
    };
    const file = toSuspensionFile(withAir);
    expect('wheelbaseMm' in file.bicycle).toBe(false);
    const r = parseSuspensionFileText(JSON.stringify(file));
    if (!r.ok) throw new Error(r.issues.map((i) => i.message).join('; '));
    expect(r.design.bicycle.frontContactXMm).toBe(790);
    expect(r.design.bicycle.spring).toEqual(withAir.bicycle.spring);
  });
});

describe('suspension file: mistakes, each at its field', () => {
  it('refuses text that is not JSON, too long, or another format, and a newer version', () => {
    expect(parseSuspensionFileText('{ "format": ').ok).toBe(false);
    const long = parseSuspensionFileText(' '.repeat(MAX_SUSPENSION_FILE_CHARS + 1));
    expect(!long.ok && long.issues[0].message).toContain(`limit for a suspension file is ${MAX_SUSPENSION_FILE_CHARS}`);
    expect(issuesOf({ ...example(), format: 'loci-linkage' })).toEqual([{ path: 'format', message: 'expected "loci-suspension", got "loci-linkage"' }]);
    expect(issuesOf({ ...example(), version: 2 })[0]).toMatchObject({ path: 'version', message: expect.stringContaining('newer than this Loci reads') });
    expect(issuesOf([1, 2])[0].message).toContain('got an array');
  });

  it('escapes control characters it echoes', () => {
    const [issue] = issuesOf({ ...example(), format: 'x\u001b[2Jy' });
    expect(issue.message).not.toContain('\u001b');
    expect(issue.message).toContain('\\u001b');
    const named = issuesOf({ ...example(), name: 'bad\u202ename' });
    expect(named[0].path).toBe('name');
    expect(named[0].message).not.toContain('\u202e');
  });

  it('names an unknown field, a wrong type, a missing pivot and a pivot out of range', () => {
    const doc = example();
    (doc.bicycle as Json).wheelRadiusMM = 370;
    (doc.bicycle as Json).comHeightMm = '1050';
    const pivots = (doc.layout as Json).pivots as Record<string, unknown>;
    delete pivots.rockerPivot;
    pivots.mainPivot = { x: 45, y: 2000 };
    const issues = issuesOf(doc);
    expect(issues).toContainEqual({ path: 'bicycle.comHeightMm', message: 'expected a number of mm, got "1050"' });
    expect(issues.find((i) => i.path === 'bicycle')?.message).toContain('unknown field "wheelRadiusMM"');
    expect(issues).toContainEqual({ path: 'layout.pivots.rockerPivot', message: 'missing; expected a pivot { "x", "y" } in mm' });
    expect(issues.find((i) => i.path === 'layout.pivots.mainPivot.y')?.message).toContain('within ±1500 mm of the bottom bracket, got 2000');
  });

  it('names an unknown layout kind with the known ones, and asks the six-bars (only) for the axle body', () => {
    expect(issuesOf({ ...example(), layout: { kind: 'fourBar', pivots: {} } })[0].message).toContain('"fourBarSeatStayAxle"');
    const watt = toSuspensionFile(demoDesign('wattSixBar')) as unknown as Json;
    delete (watt.layout as Json).axleBody;
    expect(issuesOf(watt)).toContainEqual({ path: 'layout.axleBody', message: 'missing; expected the body that carries the axle, one of "chainStay", "seatStay", "rocker", "link", "bellCrank"' });
    const four = example();
    (four.layout as Json).axleBody = 'seatStay';
    expect(issuesOf(four)[0].message).toContain('unknown field "axleBody"');
  });

  it('passes the bicycle\'s own messages on under bicycle.*', () => {
    const doc = example();
    (doc.bicycle as Json).sag = 30;
    (doc.bicycle as Json).shock = { eyeToEyeMm: 65, strokeMm: 80 };
    const issues = issuesOf(doc);
    expect(issues).toContainEqual({ path: 'bicycle.sag', message: 'sag 30 looks like a percentage; give it as a share of travel (0.3 for 30 %)' });
    expect(issues).toContainEqual({ path: 'bicycle.shock.strokeMm', message: 'stroke 80 mm is not shorter than the eye-to-eye length 65 mm' });
  });

  it('refuses an over-long cassette before looking at its cogs', () => {
    const doc = example();
    (doc.bicycle as Json).cogTeeth = Array.from({ length: 100_000 }, () => 'x');
    expect(issuesOf(doc)).toEqual([{ path: 'bicycle.cogTeeth', message: 'the cassette has 100000 cogs; expected 1 to 15' }]);
  });

  it(`lists at most ${MAX_LISTED_ISSUES} problems and counts the rest`, () => {
    const doc = example();
    const pivots = (doc.layout as Json).pivots as Record<string, unknown>;
    for (const name of Object.keys(pivots)) pivots[name] = { x: 'a', y: 'b' };
    (doc.bicycle as Json).cogTeeth = Array.from({ length: 12 }, () => 'z');
    const issues = issuesOf(doc);
    expect(issues).toHaveLength(MAX_LISTED_ISSUES + 1);
    expect(issues[MAX_LISTED_ISSUES]).toEqual({ path: '', message: `and ${12 + 12 - MAX_LISTED_ISSUES} more problems` });
  });

  it('names the pivot where the drawn linkage cannot be built, and an unknown floating brake body', () => {
    const doc = example();
    const pivots = (doc.layout as Json).pivots as Record<string, unknown>;
    // The rocker's pivot on its own stay pin: a link of no length.
    pivots.rockerStayPin = { ...(pivots.rockerPivot as Json) };
    const issues = issuesOf(doc);
    expect(issues.every((i) => i.path.startsWith('layout'))).toBe(true);
    const brake = example();
    (brake.layout as Json).floatingBrakeBody = 'swingArm';
    expect(issuesOf(brake)).toEqual([{
      path: 'layout.floatingBrakeBody',
      message: '"swingArm" is not a moving body of a fourBarSeatStayAxle layout; expected one of "chainStay", "seatStay", "rocker"',
    }]);
  });
});

describe('suspension file: a six-bar with the axle and the shock on chosen bodies', () => {
  // The Watt six-bar of the demo with its shock from the bell crank to the rocker, the other eye drawn 210 mm (the eye-to-eye length) above the eye, and the axle on the chain stay.
  const W = DEMO_LAYOUTS.wattSixBar;
  const frameEye = { x: W.shockEye.x, y: W.shockEye.y + 210 };
  const shock = { eye: 'bellCrank', frameEye: 'rocker' } as const;
  const design = (): SuspensionDesign => {
    const d = demoDesign('wattSixBar');
    return { ...d, layout: { ...d.layout, pivots: { ...d.layout.pivots, shockFrameEye: frameEye }, axleBody: 'chainStay', shock } };
  };

  it('round-trips through JSON text and builds the linkage its builder builds', () => {
    const text = JSON.stringify(toSuspensionFile(design()));
    expect(JSON.parse(text).layout.shock).toEqual(shock);
    const r = parseSuspensionFileText(text);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.design).toEqual(design());
    expect(JSON.stringify(toSuspensionFile(r.design))).toBe(text);
    // Second route: the builder called directly with the same positions and bodies.
    expect(r.linkage).toEqual(wattSixBar({ ...W, shockFrameEye: frameEye, axleBody: 'chainStay', shock }));
    expect(r.linkage.joints.find((j) => j.id === 'shockFrameEye')?.ground).toBeUndefined();
    expect(r.linkage.bodies.find((b) => b.id === 'rocker')?.joints).toContain('shockFrameEye');
  });

  it('reads a file without "shock" (as every older file) as the bell crank to the front frame, and writes the default without it', () => {
    const older = toSuspensionFile(demoDesign('wattSixBar')) as unknown as Json;
    expect((older.layout as Json).shock).toBeUndefined();
    const r = parseSuspensionFile(older);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.design.layout.shock).toBeUndefined();
    expect(r.linkage).toEqual(DIRECT.wattSixBar);
    const d = demoDesign('wattSixBar');
    const explicit = toSuspensionFile({ ...d, layout: { ...d.layout, shock: { eye: 'bellCrank', frameEye: 'frontFrame' } } }) as unknown as Json;
    expect(explicit).toEqual(older);
  });

  it('refuses a shock with both eyes on one body, an unknown body, and "shock" on a four-bar', () => {
    const same = toSuspensionFile(design()) as unknown as Json;
    (same.layout as Json).shock = { eye: 'rocker', frameEye: 'rocker' };
    const sameIssues = issuesOf(same);
    expect(sameIssues).toHaveLength(1);
    expect(sameIssues[0].path).toBe('layout.shock');
    expect(sameIssues[0].message).toContain('both on the rocker');
    const unknown = toSuspensionFile(design()) as unknown as Json;
    (unknown.layout as Json).shock = { eye: 'bellCrank', frameEye: 'swingArm' };
    expect(issuesOf(unknown)[0]).toMatchObject({ path: 'layout.shock.frameEye' });
    expect(issuesOf(unknown)[0].message).toContain('"frontFrame"');
    const four = example();
    (four.layout as Json).shock = shock;
    expect(issuesOf(four)[0].message).toContain('unknown field "shock"');
  });
});
