/**
 * The suspension design file: Loci's own versioned JSON form of a rear-suspension
 * design (a bicycle, a layout kind with its pivots drawn at full extension, and a name),
 * validated once here at the boundary.
 *
 *   { "format": "loci-suspension", "version": 1, "name": "…", "units": "mm",
 *     "bicycle": { …every field of Bicycle… },
 *     "layout": { "kind": "fourBarSeatStayAxle", "pivots": { "mainPivot": { "x", "y" }, … },
 *                 "axleBody"?: "seatStay", "shock"?: { "eye": "bellCrank", "frameEye": "frontFrame" },
 *                 "floatingBrakeBody"?: "chainStay" } }
 *
 * `axleBody` and `shock` are the six-bars' only: the axle on any moving body, the shock's
 * eye (`pivots.shockEye`) on a moving body and its other eye (`pivots.shockFrameEye`) on the
 * front frame or another moving body. A file without `shock` (every file written before it
 * existed) means the bell crank to the front frame; it is written only when it differs.
 *
 * The rear axle is the bicycle's `rearAxleMm`, not a pivot of the layout: one place
 * holds it. Reading runs stages that each stop on failure: length, JSON, envelope
 * (`format`, `version`), the schema (shapes and types), validateBicycle (every range,
 * in the bicycle's words), then the layout's builder and `compile` (the drawn linkage
 * must assemble). A list of issues is cut at MAX_LISTED_ISSUES with a count of the rest.
 */
import * as z from 'zod';
import { parseJsonText } from './jsonText';
import { capIssues, describeValue, envelopeIssue, expected, formatPath, isPlainObject, MAX_CAUTION_CHARS, strict } from './schemaMessages';
import type { Vec2 } from '../geometry';
import { compile } from '../linkage/compile';
import { UNPRINTABLE_ID_CHARS, type Linkage } from '../linkage/model';
import type { Plan } from '../linkage/plan';
import {
  BICYCLE_RANGES,
  DEFAULT_SHOCK_BODIES,
  LAYOUT_KINDS,
  SHOCK_END_BODIES,
  SIX_BAR_BODIES,
  SUSPENSION_CAUTION,
  shockBodiesIssue,
  LAYOUT_PIVOTS,
  buildLayout,
  validateBicycle,
  type Bicycle,
  type LayoutAxleBody,
  type LayoutKind,
  type ShockBodies,
  type SpringSpec,
} from '../suspension';

export const SUSPENSION_FILE_FORMAT = 'loci-suspension';
/** The version this code writes, and the newest it reads. */
export const SUSPENSION_FILE_VERSION = 1;
/** Largest suspension file, in characters: a design is a few kilobytes; this leaves room for any formatting. */
export const MAX_SUSPENSION_FILE_CHARS = 1_000_000;
/** Characters of the design's name. */
export const MAX_DESIGN_NAME_LENGTH = 200;
/** Every pivot lies within this distance (mm) of the bottom bracket along x and along y: beyond any pedal bicycle. */
export const MAX_PIVOT_COORDINATE_MM = 1500;

/** The six-bars carry the axle on any moving body; the other kinds on their one axle-carrying body. */
const AXLE_BODIES = SIX_BAR_BODIES satisfies readonly LayoutAxleBody[];
const quoted = (ids: readonly string[]) => ids.map((b) => `"${b}"`).join(', ');
const SIX_BARS: readonly LayoutKind[] = ['wattSixBar', 'stephensonSixBar'];

export interface SuspensionLayout {
  readonly kind: LayoutKind;
  /** Every pivot of the kind (LAYOUT_PIVOTS), mm, bicycle frame, at full extension. */
  readonly pivots: Readonly<Record<string, Vec2>>;
  /** The six-bars only: the body that carries the axle. */
  readonly axleBody?: LayoutAxleBody;
  /** The six-bars only: the bodies the shock joins; absent means DEFAULT_SHOCK_BODIES. */
  readonly shock?: ShockBodies;
  /** A moving body of the layout that holds a floating brake's caliper. */
  readonly floatingBrakeBody?: string;
}

export interface SuspensionDesign {
  readonly name?: string;
  readonly bicycle: Bicycle;
  readonly layout: SuspensionLayout;
}

/** One problem with a suspension file: where (`bicycle.shock.strokeMm`, or '' for the whole file) and what was expected. */
export interface SuspensionFileIssue {
  readonly path: string;
  readonly message: string;
}

export type ParseSuspensionFileResult =
  | { readonly ok: true; readonly design: SuspensionDesign; readonly linkage: Linkage; readonly plan: Plan }
  | { readonly ok: false; readonly issues: readonly SuspensionFileIssue[] };

/** The layout's linkage: the kind's builder with the bicycle's rear axle. The pivots must be the kind's (as a parsed design's are). */
export function layoutLinkage(layout: SuspensionLayout, axle: Vec2): Linkage {
  return buildLayout(layout.kind, layout.pivots, axle, layout.axleBody, layout.shock);
}

// ---------------------------------------------------------------------------------
// Schema, version 1

const R = BICYCLE_RANGES;
/** A JSON number; its range is validateBicycle's (BICYCLE_RANGES), so the message states it in the bicycle's words. */
const num = (what: string) => z.number({ error: expected(what) });
const xy = (what: string) => strict(`${what} { "x", "y" } in mm`, { x: num('a number of mm'), y: num('a number of mm') });

const PIVOT_RANGE = `a number of mm within ±${MAX_PIVOT_COORDINATE_MM} mm of the bottom bracket`;
const pivotMm = () => z.number({ error: expected(PIVOT_RANGE) })
  .min(-MAX_PIVOT_COORDINATE_MM, { error: expected(PIVOT_RANGE) }).max(MAX_PIVOT_COORDINATE_MM, { error: expected(PIVOT_RANGE) });
const pivot = () => strict('a pivot { "x", "y" } in mm', { x: pivotMm(), y: pivotMm() });

const printable = (what: string, max: number) => {
  const message = `${what} of at most ${max} printable characters (no control or bidirectional-format characters)`;
  return z.string({ error: expected(message) }).max(max, { error: expected(message) })
    .refine((v) => !UNPRINTABLE_ID_CHARS.test(v), { error: expected(message) });
};

const springSchema = z.discriminatedUnion(
  'kind',
  [
    strict('a coil spring { "kind", "rateNPerMm", "preloadMm"? }', {
      kind: z.literal('coil'),
      rateNPerMm: num('a number of N/mm'),
      preloadMm: num('a number of mm').optional(),
    }),
    strict('an air spring { "kind", "pressureKPa", "volumeMm3", "pistonAreaMm2", "gasLaw" }', {
      kind: z.literal('air'),
      pressureKPa: num('a number of kPa (gauge)'),
      volumeMm3: num('a number of mm³'),
      pistonAreaMm2: num('a number of mm²'),
      gasLaw: z.enum(['isothermal', 'adiabatic'], { error: expected('"isothermal" or "adiabatic"') }),
    }),
  ],
  { error: expected('a spring kind, "coil" or "air"') },
);

/** A bicycle as the files hold it (the suspension design file and the suspension problem file). */
export const bicycleSchema = strict('a bicycle', {
  rearAxleMm: xy('the rear axle at full extension'),
  wheelRadiusMm: num('a number of mm'),
  frontContactXMm: num('a number of mm').optional(),
  wheelbaseMm: num('a number of mm').optional(),
  comHeightMm: num('a number of mm'),
  chainringTeeth: num('a whole number of teeth'),
  cogTeeth: z.array(num('a whole number of teeth'), { error: expected('an array of cog tooth counts') }),
  chainPitchMm: num('a number of mm').optional(),
  shock: strict('a shock { "eyeToEyeMm", "strokeMm" }', { eyeToEyeMm: num('a number of mm'), strokeMm: num('a number of mm') }),
  sag: num('a share of the wheel travel (0.3 for 30 %)'),
  spring: springSchema.optional(),
});

const kinds = `a layout kind, one of ${LAYOUT_KINDS.map((k) => `"${k}"`).join(', ')}`;
const bodyId = printable('a body id string', 64);

function layoutVariant<K extends LayoutKind>(kind: K) {
  const names = LAYOUT_PIVOTS[kind];
  const pivots = strict(`the pivots of a ${kind} layout`, Object.fromEntries(names.map((n) => [n, pivot()])));
  return SIX_BARS.includes(kind)
    ? strict(`a ${kind} layout { "kind", "pivots", "axleBody", "shock"?, "floatingBrakeBody"? }`, {
      kind: z.literal(kind, { error: expected(kinds) }),
      pivots,
      axleBody: z.enum(AXLE_BODIES, { error: expected(`the body that carries the axle, one of ${quoted(AXLE_BODIES)}`) }),
      shock: strict('the bodies the shock joins { "eye", "frameEye" }', {
        eye: z.enum(SIX_BAR_BODIES, { error: expected(`the moving body that carries pivots.shockEye, one of ${quoted(SIX_BAR_BODIES)}`) }),
        frameEye: z.enum(SHOCK_END_BODIES, { error: expected(`the body that carries pivots.shockFrameEye, one of ${quoted(SHOCK_END_BODIES)}`) }),
      }).optional(),
      floatingBrakeBody: bodyId.optional(),
    })
    : strict(`a ${kind} layout { "kind", "pivots", "floatingBrakeBody"? }`, {
      kind: z.literal(kind, { error: expected(kinds) }),
      pivots,
      floatingBrakeBody: bodyId.optional(),
    });
}

const layoutSchema = z.discriminatedUnion(
  'kind',
  [
    layoutVariant('singlePivot'),
    layoutVariant('linkageDrivenSinglePivot'),
    layoutVariant('fourBarSeatStayAxle'),
    layoutVariant('shortLinkFourBar'),
    layoutVariant('wattSixBar'),
    layoutVariant('stephensonSixBar'),
  ],
  { error: expected(kinds) },
);

const fileSchema = strict('a suspension file', {
  format: z.literal(SUSPENSION_FILE_FORMAT),
  version: z.literal(SUSPENSION_FILE_VERSION),
  name: printable('a name string', MAX_DESIGN_NAME_LENGTH).optional(),
  units: z.literal('mm', { error: expected('"mm" (lengths in millimetres; `sag` a share of travel; other units in the key names)') }),
  bicycle: bicycleSchema,
  layout: layoutSchema,
  // Written with every file so the caution travels with the design; read and not kept.
  caution: z.string({ error: expected('the caution as a string') }).max(MAX_CAUTION_CHARS, { error: expected(`the caution, at most ${MAX_CAUTION_CHARS} characters`) }).optional(),
});

/** A suspension file of the current version, as written by `toSuspensionFile`. */
export type SuspensionFileV1 = z.infer<typeof fileSchema>;

// ---------------------------------------------------------------------------------
// Reading

function fail(path: string, message: string): { ok: false; issues: SuspensionFileIssue[] } {
  return { ok: false, issues: [{ path, message }] };
}

function listed(issues: readonly SuspensionFileIssue[]): { ok: false; issues: SuspensionFileIssue[] } {
  return { ok: false, issues: capIssues(issues, (rest) => ({ path: '', message: `and ${rest} more problem${rest === 1 ? '' : 's'}` })) };
}

/** The `format` of a JSON text, when it is an object that names one; for a caller choosing a reader. */
export function fileFormatOf(text: string): string | undefined {
  const read = parseJsonText(text);
  return read.ok && isPlainObject(read.json) && typeof read.json.format === 'string' ? read.json.format : undefined;
}

/** Parses the text of a suspension file: length, JSON, then as `parseSuspensionFile`. */
export function parseSuspensionFileText(text: string): ParseSuspensionFileResult {
  if (text.length > MAX_SUSPENSION_FILE_CHARS) {
    return fail('', `the file has ${text.length} characters; the limit for a suspension file is ${MAX_SUSPENSION_FILE_CHARS}`);
  }
  const read = parseJsonText(text);
  return read.ok ? parseSuspensionFile(read.json) : fail('', read.message);
}

/** Validates a parsed suspension file and builds its layout. On success the design is a fresh copy whose linkage compiles. */
export function parseSuspensionFile(json: unknown): ParseSuspensionFileResult {
  const wrong = envelopeIssue(json, SUSPENSION_FILE_FORMAT, 'suspension file', SUSPENSION_FILE_VERSION);
  if (wrong !== null) return fail(wrong.path, wrong.message);
  // The cassette's length is held to its limit before the schema looks at an element.
  const bicycleJson = (json as Record<string, unknown>).bicycle;
  const cogs = isPlainObject(bicycleJson) ? bicycleJson.cogTeeth : undefined;
  if (Array.isArray(cogs) && cogs.length > R.cogCount[1]) {
    return fail('bicycle.cogTeeth', `the cassette has ${cogs.length} cogs; expected ${R.cogCount[0]} to ${R.cogCount[1]}`);
  }

  const parsed = fileSchema.safeParse(json);
  if (!parsed.success) return listed(parsed.error.issues.map((issue) => ({ path: formatPath(issue.path), message: issue.message })));
  const design = designFromFile(parsed.data);

  const bicycle = validateBicycle(design.bicycle);
  if (!bicycle.ok) return listed(bicycle.issues.map((i) => ({ path: i.path === '' ? 'bicycle' : `bicycle.${i.path}`, message: i.message })));

  const shockIssue = design.layout.shock === undefined ? null : shockBodiesIssue(design.layout.shock);
  if (shockIssue !== null) return fail('layout.shock', shockIssue);

  const linkage = layoutLinkage(design.layout, design.bicycle.rearAxleMm);
  const compiled = compile(linkage);
  if (!compiled.ok) {
    return listed(compiled.issues.map((issue) => ({ path: layoutPath(linkage, issue.where), message: issue.message })));
  }
  const plan = compiled.plan;
  const brake = design.layout.floatingBrakeBody;
  if (brake !== undefined && !((plan.bodyIndex.get(brake) ?? 0) > 0)) {
    const moving = plan.bodies.slice(1).map((b) => `"${b.id}"`).join(', ');
    return fail('layout.floatingBrakeBody', `${describeValue(brake)} is not a moving body of a ${design.layout.kind} layout; expected one of ${moving}`);
  }
  return { ok: true, design, linkage, plan };
}

/** `joints[3]` of the built linkage → `layout.pivots.rockerStayPin` (or `bicycle.rearAxleMm` for the axle). */
function layoutPath(linkage: Linkage, where: string): string {
  const match = /^joints\[(\d+)\]$/.exec(where);
  const id = match === null ? undefined : linkage.joints[Number(match[1])]?.id;
  return id === undefined ? 'layout' : `layout.pivots.${id}`;
}

// ---------------------------------------------------------------------------------
// Copies, both ways

function isDefaultShock(s: ShockBodies): boolean {
  return s.eye === DEFAULT_SHOCK_BODIES.eye && s.frameEye === DEFAULT_SHOCK_BODIES.frameEye;
}

function copyXy(p: Vec2): { x: number; y: number } {
  return { x: p.x, y: p.y };
}

function copySpring(s: SpringSpec): SpringSpec {
  if (s.kind === 'coil') return s.preloadMm === undefined ? { kind: 'coil', rateNPerMm: s.rateNPerMm } : { kind: 'coil', rateNPerMm: s.rateNPerMm, preloadMm: s.preloadMm };
  return { kind: 'air', pressureKPa: s.pressureKPa, volumeMm3: s.volumeMm3, pistonAreaMm2: s.pistonAreaMm2, gasLaw: s.gasLaw };
}

function copyBicycle(b: Bicycle): Bicycle {
  return {
    rearAxleMm: copyXy(b.rearAxleMm),
    wheelRadiusMm: b.wheelRadiusMm,
    ...(b.frontContactXMm === undefined ? {} : { frontContactXMm: b.frontContactXMm }),
    ...(b.wheelbaseMm === undefined ? {} : { wheelbaseMm: b.wheelbaseMm }),
    comHeightMm: b.comHeightMm,
    chainringTeeth: b.chainringTeeth,
    cogTeeth: [...b.cogTeeth],
    ...(b.chainPitchMm === undefined ? {} : { chainPitchMm: b.chainPitchMm }),
    shock: { eyeToEyeMm: b.shock.eyeToEyeMm, strokeMm: b.shock.strokeMm },
    sag: b.sag,
    ...(b.spring === undefined ? {} : { spring: copySpring(b.spring) }),
  };
}

function copyLayout(l: SuspensionLayout): SuspensionLayout {
  return {
    kind: l.kind,
    pivots: Object.fromEntries(LAYOUT_PIVOTS[l.kind].map((n) => [n, copyXy(l.pivots[n])])),
    ...(l.axleBody === undefined ? {} : { axleBody: l.axleBody }),
    ...(l.shock === undefined || isDefaultShock(l.shock) ? {} : { shock: { eye: l.shock.eye, frameEye: l.shock.frameEye } }),
    ...(l.floatingBrakeBody === undefined ? {} : { floatingBrakeBody: l.floatingBrakeBody }),
  };
}

function designFromFile(file: SuspensionFileV1): SuspensionDesign {
  // The schema admits axleBody and shock on the six-bars only.
  const { axleBody, shock } = file.layout as { readonly axleBody?: LayoutAxleBody; readonly shock?: ShockBodies };
  const layout: SuspensionLayout = {
    kind: file.layout.kind,
    pivots: file.layout.pivots,
    ...(axleBody === undefined ? {} : { axleBody }),
    ...(shock === undefined ? {} : { shock }),
    ...(file.layout.floatingBrakeBody === undefined ? {} : { floatingBrakeBody: file.layout.floatingBrakeBody }),
  };
  return {
    ...(file.name === undefined ? {} : { name: file.name }),
    bicycle: copyBicycle(file.bicycle),
    layout: copyLayout(layout),
  };
}

/**
 * The suspension file of a design, ready for `JSON.stringify`. Copies everything it
 * keeps; writes the kind's pivots (LAYOUT_PIVOTS) and throws if one is missing, a
 * programmer's error (a parsed design always has them).
 */
export function toSuspensionFile(design: SuspensionDesign): SuspensionFileV1 {
  const missing = LAYOUT_PIVOTS[design.layout.kind].filter((n) => design.layout.pivots[n] === undefined);
  if (missing.length > 0) throw new Error(`toSuspensionFile: the ${design.layout.kind} layout has no ${missing.join(', ')}`);
  return {
    format: SUSPENSION_FILE_FORMAT,
    version: SUSPENSION_FILE_VERSION,
    ...(design.name === undefined ? {} : { name: design.name }),
    units: 'mm',
    bicycle: copyBicycle(design.bicycle),
    layout: copyLayout(design.layout),
    caution: SUSPENSION_CAUTION,
  } as SuspensionFileV1;
}
