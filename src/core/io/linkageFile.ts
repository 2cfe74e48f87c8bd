/**
 * The linkage file: Loci's own versioned JSON form of one linkage (a `Linkage` of
 * src/core/linkage/model.ts plus a name), validated once here at the boundary.
 *
 *   { "format": "loci-linkage", "version": 1, "name": "…", "units": "mm",
 *     "joints": [...], "bodies": [...], "sliders": [...], "points": [...], "driver": {...} }
 *
 * Reading runs four stages, each stopping on failure so one mistake gives one message:
 * the envelope (`format`, `version`), forward migration to the current version, the
 * schema (every field's type and range), then `compile`, whose issues (unknown ids, a
 * body with one joint, mobility, a reference pose that breaks its own constraints) come
 * back in the same `{ path, message }` shape. Before them the text's length, and before
 * the schema the number of joints, bodies, points and sliders, are held to their limits
 * (model.ts), so a huge file is refused before anything is built from it; a list of
 * issues is cut at MAX_LISTED_ISSUES, with a count of the rest.
 */
import * as z from 'zod';
import { parseJsonText } from './jsonText';
import { capIssues, envelopeIssue, expected, formatPath, strict } from './schemaMessages';
import { compile } from '../linkage/compile';
import {
  MAX_BODIES,
  MAX_COORDINATE_MM,
  MAX_ID_LENGTH,
  MAX_JOINTS,
  MAX_POINTS,
  MAX_SLIDER_ANGLE_RAD,
  MAX_SLIDERS,
  UNPRINTABLE_ID_CHARS,
  type DriverSpec,
  type JointSpec,
  type Linkage,
  type PointSpec,
  type SliderSpec,
} from '../linkage/model';
import type { Plan } from '../linkage/plan';

export const LINKAGE_FILE_FORMAT = 'loci-linkage';
/** The version this code writes, and the newest it reads. */
export const LINKAGE_FILE_VERSION = 1;

/** One problem with a linkage file: where (`joints[2].x`, or '' for the whole file) and what was expected. */
export interface LinkageFileIssue {
  readonly path: string;
  readonly message: string;
}

/**
 * Largest linkage file, in characters: a linkage at every count limit of model.ts, with
 * ids of full length and pretty-printed, takes about 2 M. The text is refused before
 * JSON.parse builds anything from it.
 */
export const MAX_LINKAGE_FILE_CHARS = 8_000_000;
/** Characters of the file's name, which the report prints. */
export const MAX_NAME_LENGTH = 200;

export type ParseLinkageFileResult =
  | { readonly ok: true; readonly linkage: Linkage; readonly name?: string }
  | { readonly ok: false; readonly issues: readonly LinkageFileIssue[] };

/** As ParseLinkageFileResult, with the plan the check compiled, for a caller that runs it. */
export type ReadLinkageFileResult =
  | { readonly ok: true; readonly linkage: Linkage; readonly name?: string; readonly plan: Plan }
  | { readonly ok: false; readonly issues: readonly LinkageFileIssue[] };

// ---------------------------------------------------------------------------------
// Schema, version 1

const COORDINATE_RANGE = `a finite number in mm within ±${MAX_COORDINATE_MM} mm (1 km, the coordinate limit)`;
const mm = () => z.number({ error: expected('a finite number in mm') })
  .min(-MAX_COORDINATE_MM, { error: expected(COORDINATE_RANGE) }).max(MAX_COORDINATE_MM, { error: expected(COORDINATE_RANGE) });
/** A string of `min` to `max` characters, none of them unprintable (model.ts). */
const text = (what: string, min: number, max: number) => {
  const message = `${what} of at most ${max} printable characters (no control or bidirectional-format characters)`;
  return z.string({ error: expected(message) }).min(min, { error: expected(message) }).max(max, { error: expected(message) })
    .refine((v) => !UNPRINTABLE_ID_CHARS.test(v), { error: expected(message) });
};
const id = (what: string) => text(what, 1, MAX_ID_LENGTH);


const jointSchema = strict('a joint { "id", "x", "y", "ground"? }', {
  id: id('a non-empty joint id string'),
  x: mm(),
  y: mm(),
  ground: z.boolean({ error: expected('true or false') }).optional(),
});

const bodySchema = strict('a body { "id", "joints" }', {
  id: id('a non-empty body id string'),
  joints: z.array(id('a joint id string'), { error: expected('an array of joint ids') })
    .max(MAX_JOINTS, { error: expected(`an array of at most ${MAX_JOINTS} joint ids (the most joints a linkage has)`) }),
});

const sliderSchema = strict('a slider { "joint", "body", "angle", "through"? }', {
  joint: id('a joint id string'),
  body: id('a body id string (or "ground")'),
  angle: z.number({ error: expected('a finite number in radians within ±2π (the line direction)') })
    .min(-MAX_SLIDER_ANGLE_RAD).max(MAX_SLIDER_ANGLE_RAD),
  through: strict('a point { "x", "y" } in mm', { x: mm(), y: mm() }).optional(),
});

const pointSchema = strict('a point { "id", "body", "x", "y" }', {
  id: id('a non-empty point id string'),
  body: id('a body id string'),
  x: mm(),
  y: mm(),
});

const driverKinds = 'a driver kind, "rotation" or "length"';
const driverSchema = z.discriminatedUnion(
  'kind',
  [
    strict('a rotation driver { "kind", "body", "pivot", "tip" }', {
      kind: z.literal('rotation', { error: expected(driverKinds) }),
      body: id('the id of the driven body'),
      pivot: id('the id of the ground joint it turns about'),
      tip: id('the id of another joint of the driven body'),
    }),
    strict('a length driver { "kind", "from", "to" }', {
      kind: z.literal('length', { error: expected(driverKinds) }),
      from: id('a joint id string'),
      to: id('a joint id string'),
    }),
  ],
  { error: expected(driverKinds) },
);

const fileShape = {
  format: z.literal(LINKAGE_FILE_FORMAT, { error: expected(`"${LINKAGE_FILE_FORMAT}"`) }),
  version: z.literal(LINKAGE_FILE_VERSION, { error: expected(`${LINKAGE_FILE_VERSION}`) }),
  name: text('a name string', 0, MAX_NAME_LENGTH).optional(),
  units: z.literal('mm', { error: expected('"mm" (lengths are in millimetres; angles in radians)') }),
  joints: z.array(jointSchema, { error: expected('an array of joints') }),
  bodies: z.array(bodySchema, { error: expected('an array of bodies') }),
  sliders: z.array(sliderSchema, { error: expected('an array of sliders') }).optional(),
  points: z.array(pointSchema, { error: expected('an array of points') }).optional(),
  driver: driverSchema,
};
const linkageFileV1Schema = strict('a linkage file', fileShape);

/** A linkage file of the current version, as written by `toLinkageFile`. */
export type LinkageFileV1 = z.infer<typeof linkageFileV1Schema>;

// ---------------------------------------------------------------------------------
// Envelope and migration

type Doc = Record<string, unknown>;

/**
 * Forward migrations keyed on the version they read: `MIGRATIONS[v]` turns a version-v
 * document into version v + 1. Version 1 is the first, so there are none yet; a
 * version 2 adds `1: (doc) => …` here and bumps LINKAGE_FILE_VERSION.
 */
const MIGRATIONS: Readonly<Partial<Record<number, (doc: Doc) => Doc>>> = {};

/**
 * Brings a document of any version this code knows up to LINKAGE_FILE_VERSION. Rejects
 * a file that is not a linkage file, a version that is not a whole number ≥ 1, and a
 * version newer than this code reads.
 */
export function migrateLinkageFile(
  json: unknown,
): { readonly ok: true; readonly doc: Doc } | { readonly ok: false; readonly issues: readonly LinkageFileIssue[] } {
  const wrong = envelopeIssue(json, LINKAGE_FILE_FORMAT, 'linkage file', LINKAGE_FILE_VERSION);
  if (wrong !== null) return fail(wrong.path, wrong.message);
  const version = (json as Doc).version as number;
  let doc = json as Doc;
  for (let v = version; v < LINKAGE_FILE_VERSION; v++) {
    const step = MIGRATIONS[v];
    if (!step) throw new Error(`linkage file: no migration from version ${v}`);
    doc = step(doc);
  }
  return { ok: true, doc };
}

function fail(path: string, message: string): { ok: false; issues: LinkageFileIssue[] } {
  return { ok: false, issues: [{ path, message }] };
}

// ---------------------------------------------------------------------------------
// Reading and writing

/** Parses the text of a linkage file: JSON first, then as `parseLinkageFile`. */
export function parseLinkageFileText(text: string): ParseLinkageFileResult {
  return withoutPlan(readLinkageFileText(text));
}

/** As parseLinkageFileText, keeping the compiled plan (`loci analyze` runs it). */
export function readLinkageFileText(text: string): ReadLinkageFileResult {
  if (text.length > MAX_LINKAGE_FILE_CHARS) {
    return fail('', `the file has ${text.length} characters; the limit for a linkage file is ${MAX_LINKAGE_FILE_CHARS}`);
  }
  const read = parseJsonText(text);
  return read.ok ? readLinkageFile(read.json) : fail('', read.message);
}

function withoutPlan(read: ReadLinkageFileResult): ParseLinkageFileResult {
  if (!read.ok) return read;
  return read.name === undefined ? { ok: true, linkage: read.linkage } : { ok: true, linkage: read.linkage, name: read.name };
}

/**
 * Validates a parsed linkage file and compiles the linkage it describes. On success the
 * linkage is a fresh copy that compiles; on failure every issue names its field.
 */
export function parseLinkageFile(json: unknown): ParseLinkageFileResult {
  return withoutPlan(readLinkageFile(json));
}

/** As parseLinkageFile, keeping the compiled plan. */
export function readLinkageFile(json: unknown): ReadLinkageFileResult {
  const migrated = migrateLinkageFile(json);
  if (!migrated.ok) return migrated;
  const tooMany = countIssues(migrated.doc);
  if (tooMany.length > 0) return { ok: false, issues: tooMany };

  const parsed = linkageFileV1Schema.safeParse(migrated.doc);
  if (!parsed.success) {
    return listed(parsed.error.issues.map((issue) => ({ path: formatPath(issue.path), message: issue.message })));
  }

  const linkage = linkageFromFile(parsed.data);
  const compiled = compile(linkage);
  if (!compiled.ok) return listed(compiled.issues.map((issue) => ({ path: issue.where, message: issue.message })));
  const plan = compiled.plan;
  return parsed.data.name === undefined ? { ok: true, linkage, plan } : { ok: true, linkage, name: parsed.data.name, plan };
}

/** The count limits, checked before the schema looks at a single element. */
function countIssues(doc: Doc): LinkageFileIssue[] {
  const issues: LinkageFileIssue[] = [];
  const limits = [['joints', MAX_JOINTS], ['bodies', MAX_BODIES], ['points', MAX_POINTS], ['sliders', MAX_SLIDERS]] as const;
  for (const [field, max] of limits) {
    const value = doc[field];
    if (Array.isArray(value) && value.length > max) {
      issues.push({ path: field, message: `the file has ${value.length} ${field}; the limit is ${max}` });
    }
  }
  return issues;
}

/** An issue list of readable length. */
function listed(issues: readonly LinkageFileIssue[]): { ok: false; issues: LinkageFileIssue[] } {
  return { ok: false, issues: capIssues(issues, (rest) => ({ path: '', message: `and ${rest} more problem${rest === 1 ? '' : 's'}` })) };
}

/** The linkage file of a linkage, ready for `JSON.stringify`. Copies everything it keeps. */
export function toLinkageFile(linkage: Linkage, name?: string): LinkageFileV1 {
  const file: LinkageFileV1 = {
    format: LINKAGE_FILE_FORMAT,
    version: LINKAGE_FILE_VERSION,
    ...(name === undefined ? {} : { name }),
    units: 'mm',
    joints: linkage.joints.map(copyJoint),
    bodies: linkage.bodies.map((b) => ({ id: b.id, joints: [...b.joints] })),
    ...(linkage.sliders && linkage.sliders.length > 0 ? { sliders: linkage.sliders.map(copySlider) } : {}),
    ...(linkage.points && linkage.points.length > 0 ? { points: linkage.points.map(copyPoint) } : {}),
    driver: copyDriver(linkage.driver),
  };
  return file;
}

function linkageFromFile(file: LinkageFileV1): Linkage {
  return {
    joints: file.joints.map(copyJoint),
    bodies: file.bodies.map((b) => ({ id: b.id, joints: [...b.joints] })),
    ...(file.sliders ? { sliders: file.sliders.map(copySlider) } : {}),
    ...(file.points ? { points: file.points.map(copyPoint) } : {}),
    driver: copyDriver(file.driver),
  };
}

function copyJoint(j: JointSpec): JointSpec {
  return j.ground === undefined ? { id: j.id, x: j.x, y: j.y } : { id: j.id, x: j.x, y: j.y, ground: j.ground };
}

function copySlider(s: SliderSpec): SliderSpec {
  return s.through === undefined
    ? { joint: s.joint, body: s.body, angle: s.angle }
    : { joint: s.joint, body: s.body, angle: s.angle, through: { x: s.through.x, y: s.through.y } };
}

function copyPoint(p: PointSpec): PointSpec {
  return { id: p.id, body: p.body, x: p.x, y: p.y };
}

function copyDriver(d: DriverSpec): DriverSpec {
  return d.kind === 'rotation'
    ? { kind: 'rotation', body: d.body, pivot: d.pivot, tip: d.tip }
    : { kind: 'length', from: d.from, to: d.to };
}
