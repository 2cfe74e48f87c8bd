/**
 * The leg design file: Loci's own versioned JSON form of a walking leg, validated once
 * here at the boundary.
 *
 *   { "format": "loci-leg", "version": 1, "name"?: "…", "units": "mm",
 *     "linkage": { …a linkage file ("format": "loci-linkage"), drawn in its reference pose… },
 *     "foot": "P",
 *     "ground": { "kind": "level", "yMm" } | { "kind": "line", "point": { "x", "y" }, "direction": { "x", "y" } },
 *     "stanceToleranceMm": 1, "crankDirection": 1 | -1, "walkingDirection": 1 | -1,
 *     "footPath"?: [[x mm, y mm], …],
 *     "phased"?: { "legs": 3, "phasesDeg": [0, 120, 240] } }
 *
 * Reading runs stages that each stop on failure: length, JSON, envelope, the schema
 * (shapes and types), the linkage file (readLinkageFile: its own schema and compile,
 * its issues under `linkage.`), then validateLeg (the foot, the ground line, the
 * tolerance and directions, in the leg's words). The phases are checked by phasedLegs
 * when the figures are taken.
 */
import * as z from 'zod';
import { GAIT_CAUTION, MAX_PHASED_LEGS, validateLeg, type LegSpec } from '../gait';
import type { Linkage } from '../linkage';
import { parseJsonText } from './jsonText';
import { readLinkageFile, toLinkageFile, MAX_NAME_LENGTH } from './linkageFile';
import { crankDirectionSchema, groundSchema, walkingDirectionSchema } from './legProblemFile';
import { capIssues, envelopeIssue, expected, formatPath, isPlainObject, MAX_CAUTION_CHARS, strict } from './schemaMessages';

export const LEG_FILE_FORMAT = 'loci-leg';
/** The version this code writes, and the newest it reads. */
export const LEG_FILE_VERSION = 1;
/** Largest leg file, in characters: a linkage file's limit and room for a traced foot trajectory. */
export const MAX_LEG_FILE_CHARS = 12_000_000;

export interface LegFileIssue {
  readonly path: string;
  readonly message: string;
}

/** Several identical legs on one shaft, each crank ahead of the shaft by its phase (degrees, in the crank's direction). */
export interface LegPhasing {
  readonly legs: number;
  readonly phasesDeg: readonly number[];
}

export interface LegDesign {
  readonly name?: string;
  readonly linkage: Linkage;
  readonly leg: LegSpec;
  readonly phased?: LegPhasing;
}

export type ParseLegFileResult = { readonly ok: true; readonly design: LegDesign } | { readonly ok: false; readonly issues: readonly LegFileIssue[] };

const num = (what: string) => z.number({ error: expected(what) }).refine(Number.isFinite, { error: expected(what) });

const fileSchema = strict('a leg file', {
  format: z.literal(LEG_FILE_FORMAT),
  version: z.literal(LEG_FILE_VERSION),
  name: z.string({ error: expected(`a name string of at most ${MAX_NAME_LENGTH} characters`) }).max(MAX_NAME_LENGTH, { error: expected(`a name string of at most ${MAX_NAME_LENGTH} characters`) }).optional(),
  units: z.literal('mm', { error: expected('"mm" (lengths in millimetres; other units in the key names)') }),
  // Its own reader checks it, with its own messages.
  linkage: z.unknown(),
  foot: z.string({ error: expected('the id of a joint or point of the linkage') }),
  ground: groundSchema,
  stanceToleranceMm: num('a stance tolerance in mm'),
  crankDirection: crankDirectionSchema,
  walkingDirection: walkingDirectionSchema,
  footPath: z.array(z.tuple([num('a number of mm'), num('a number of mm')], { error: expected('a point [x mm, y mm]') }), { error: expected('an array of points [x mm, y mm]') }).optional(),
  phased: strict('phased legs { "legs", "phasesDeg" }', {
    legs: num(`a whole number of legs from 1 to ${MAX_PHASED_LEGS}`),
    phasesDeg: z.array(num('a phase in degrees'), { error: expected('an array of phases in degrees, one per leg') }),
  }).optional(),
  // Written with every file so the caution travels with the design; read and not kept.
  caution: z.string({ error: expected('the caution as a string') }).max(MAX_CAUTION_CHARS, { error: expected(`the caution, at most ${MAX_CAUTION_CHARS} characters`) }).optional(),
});

export type LegFileV1 = z.infer<typeof fileSchema>;

function fail(path: string, message: string): { ok: false; issues: LegFileIssue[] } {
  return { ok: false, issues: [{ path, message }] };
}

function listed(issues: readonly LegFileIssue[]): { ok: false; issues: LegFileIssue[] } {
  return { ok: false, issues: capIssues(issues, (rest) => ({ path: '', message: `and ${rest} more problem${rest === 1 ? '' : 's'}` })) };
}

/** Parses the text of a leg file: length, JSON, then as `parseLegFile`. */
export function parseLegFileText(text: string): ParseLegFileResult {
  if (text.length > MAX_LEG_FILE_CHARS) return fail('', `the file has ${text.length} characters; the limit for a leg file is ${MAX_LEG_FILE_CHARS}`);
  const read = parseJsonText(text);
  return read.ok ? parseLegFile(read.json) : fail('', read.message);
}

/** Validates a parsed leg file. On success the design is a fresh copy whose linkage compiles and whose leg checks. */
export function parseLegFile(json: unknown): ParseLegFileResult {
  const wrong = envelopeIssue(json, LEG_FILE_FORMAT, 'leg file', LEG_FILE_VERSION);
  if (wrong !== null) return fail(wrong.path, wrong.message);
  const parsed = fileSchema.safeParse(json);
  if (!parsed.success) return listed(parsed.error.issues.map((issue) => ({ path: formatPath(issue.path), message: issue.message })));
  const file = parsed.data;
  if (!isPlainObject(file.linkage)) return fail('linkage', 'expected a linkage file (an object with "format": "loci-linkage")');
  const read = readLinkageFile(file.linkage);
  if (!read.ok) return listed(read.issues.map((i) => ({ path: i.path === '' ? 'linkage' : `linkage.${i.path}`, message: i.message })));
  const leg: LegSpec = {
    foot: file.foot,
    ground: file.ground.kind === 'level' ? { kind: 'level', yMm: file.ground.yMm } : { kind: 'line', point: { ...file.ground.point }, direction: { ...file.ground.direction } },
    stanceToleranceMm: file.stanceToleranceMm,
    crankDirection: file.crankDirection,
    walkingDirection: file.walkingDirection,
    ...(file.footPath === undefined ? {} : { footPath: file.footPath.map(([x, y]) => ({ x, y })) }),
  };
  const checked = validateLeg(leg, read.linkage);
  if (!checked.ok) return listed(checked.issues);
  return {
    ok: true,
    design: {
      ...(file.name === undefined ? {} : { name: file.name }),
      linkage: read.linkage,
      leg,
      ...(file.phased === undefined ? {} : { phased: { legs: file.phased.legs, phasesDeg: [...file.phased.phasesDeg] } }),
    },
  };
}

/** The leg file of a design, ready for `JSON.stringify`. Copies everything it keeps. */
export function toLegFile(design: LegDesign): LegFileV1 {
  const g = design.leg.ground;
  return {
    format: LEG_FILE_FORMAT,
    version: LEG_FILE_VERSION,
    ...(design.name === undefined ? {} : { name: design.name }),
    units: 'mm',
    linkage: toLinkageFile(design.linkage),
    foot: design.leg.foot,
    ground: g.kind === 'level' ? { kind: 'level', yMm: g.yMm } : { kind: 'line', point: { x: g.point.x, y: g.point.y }, direction: { x: g.direction.x, y: g.direction.y } },
    stanceToleranceMm: design.leg.stanceToleranceMm,
    crankDirection: design.leg.crankDirection,
    walkingDirection: design.leg.walkingDirection,
    ...(design.leg.footPath === undefined ? {} : { footPath: design.leg.footPath.map((p) => [p.x, p.y] as [number, number]) }),
    ...(design.phased === undefined ? {} : { phased: { legs: design.phased.legs, phasesDeg: [...design.phased.phasesDeg] } }),
    caution: GAIT_CAUTION,
  };
}
