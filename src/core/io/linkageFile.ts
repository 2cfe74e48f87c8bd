/**
 * The linkage file: Loci's own versioned JSON form of one linkage (a `Linkage` of
 * src/core/linkage/model.ts plus a name), validated once here at the boundary.
 *
 *   { "format": "loci-linkage", "version": 1, "name": "…", "units": "mm",
 *     "joints": [...], "bodies": [...], "sliders": [...], "points": [...], "driver": {...} }
 *
 * Reading runs four stages, each stopping on failure so one mistake gives one message:
 * the envelope (`format`, `version`), forward migration to the current version, the
 * schema (every field's type), then `compile`, whose issues (unknown ids, a body with
 * one joint, mobility, a reference pose that breaks its own constraints) come back in
 * the same `{ path, message }` shape.
 */
import * as z from 'zod';
import { describeValue, expected, formatPath, strict } from './schemaMessages';
import { compile } from '../linkage/compile';
import type { DriverSpec, JointSpec, Linkage, PointSpec, SliderSpec } from '../linkage/model';

export const LINKAGE_FILE_FORMAT = 'loci-linkage';
/** The version this code writes, and the newest it reads. */
export const LINKAGE_FILE_VERSION = 1;

/** One problem with a linkage file: where (`joints[2].x`, or '' for the whole file) and what was expected. */
export interface LinkageFileIssue {
  readonly path: string;
  readonly message: string;
}

export type ParseLinkageFileResult =
  | { readonly ok: true; readonly linkage: Linkage; readonly name?: string }
  | { readonly ok: false; readonly issues: readonly LinkageFileIssue[] };

// ---------------------------------------------------------------------------------
// Schema, version 1

const mm = (what = 'a finite number in mm') => z.number({ error: expected(what) });
const id = (what: string) => z.string({ error: expected(what) }).min(1, { error: expected(what) });


const jointSchema = strict('a joint { "id", "x", "y", "ground"? }', {
  id: id('a non-empty joint id string'),
  x: mm(),
  y: mm(),
  ground: z.boolean({ error: expected('true or false') }).optional(),
});

const bodySchema = strict('a body { "id", "joints" }', {
  id: id('a non-empty body id string'),
  joints: z.array(id('a joint id string'), { error: expected('an array of joint ids') }),
});

const sliderSchema = strict('a slider { "joint", "body", "angle", "through"? }', {
  joint: id('a joint id string'),
  body: id('a body id string (or "ground")'),
  angle: z.number({ error: expected('a finite number in radians (the line direction)') }),
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
  name: z.string({ error: expected('a name string') }).optional(),
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

function isPlainObject(value: unknown): value is Doc {
  return typeof value === 'object' && value !== null && !Array.isArray(value);
}

/**
 * Brings a document of any version this code knows up to LINKAGE_FILE_VERSION. Rejects
 * a file that is not a linkage file, a version that is not a whole number ≥ 1, and a
 * version newer than this code reads.
 */
export function migrateLinkageFile(
  json: unknown,
): { readonly ok: true; readonly doc: Doc } | { readonly ok: false; readonly issues: readonly LinkageFileIssue[] } {
  if (!isPlainObject(json)) {
    return fail('', `expected a linkage file (a JSON object with "format": "${LINKAGE_FILE_FORMAT}"), got ${describeValue(json)}`);
  }
  if (json.format !== LINKAGE_FILE_FORMAT) {
    return fail('format', json.format === undefined
      ? `missing; expected "${LINKAGE_FILE_FORMAT}" (is this a linkage file?)`
      : `expected "${LINKAGE_FILE_FORMAT}", got ${describeValue(json.format)}`);
  }
  const version = json.version;
  if (!(typeof version === 'number' && Number.isInteger(version) && version >= 1)) {
    return fail('version', version === undefined
      ? `missing; expected a file format version (this Loci reads 1 to ${LINKAGE_FILE_VERSION})`
      : `expected a whole number ≥ 1, got ${describeValue(version)}`);
  }
  if (version > LINKAGE_FILE_VERSION) {
    return fail('version', `this file is version ${version}, newer than this Loci reads ` +
      `(up to version ${LINKAGE_FILE_VERSION}); open it with a newer Loci`);
  }
  let doc = json;
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
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  let json: unknown;
  try {
    json = JSON.parse(body);
  } catch (error) {
    const message = error instanceof Error ? error.message : String(error);
    return fail('', `not valid JSON: ${message}${lineAndColumn(body, message)}`);
  }
  return parseLinkageFile(json);
}

/** ` (line 3, column 7)` for a JSON.parse message that gives a character position, else ''. */
function lineAndColumn(text: string, message: string): string {
  const match = /position (\d+)/.exec(message);
  if (!match) return '';
  const before = text.slice(0, Number(match[1]));
  const lines = before.split('\n');
  return ` (line ${lines.length}, column ${lines[lines.length - 1].length + 1})`;
}

/**
 * Validates a parsed linkage file and compiles the linkage it describes. On success the
 * linkage is a fresh copy that compiles; on failure every issue names its field.
 */
export function parseLinkageFile(json: unknown): ParseLinkageFileResult {
  const migrated = migrateLinkageFile(json);
  if (!migrated.ok) return migrated;

  const parsed = linkageFileV1Schema.safeParse(migrated.doc);
  if (!parsed.success) {
    return {
      ok: false,
      issues: parsed.error.issues.map((issue) => ({ path: formatPath(issue.path), message: issue.message })),
    };
  }

  const linkage = linkageFromFile(parsed.data);
  const compiled = compile(linkage);
  if (!compiled.ok) {
    return { ok: false, issues: compiled.issues.map((issue) => ({ path: issue.where, message: issue.message })) };
  }
  return parsed.data.name === undefined ? { ok: true, linkage } : { ok: true, linkage, name: parsed.data.name };
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
