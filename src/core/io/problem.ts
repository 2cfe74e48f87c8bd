/**
 * The problem file: Loci's own versioned JSON form of a path-synthesis problem,
 * validated once here at the boundary.
 *
 *   { "format": "loci-problem", "version": 1, "name": "…",
 *     "target": { "points": [[x, y], …], "closed": false, "weights"?: […] },
 *     "timing": { "mode": "prescribed", "driverValues": […], "unit"?: "rad" | "deg" }
 *             | { "mode": "free", "wrap": false, "refine"?: false }
 *             | { "mode": "unprescribed", "wrap"?: true, "samples"?: 180 },
 *     "placement": "fixed" | "free",
 *     "families": ["fourbar-lengths", …],
 *     "bounds"?: { "fourbar-lengths": { "r1": [5, 60], "theta2": [0, 6.283…], … } },
 *     "constraints"?: { "fullTurnCrank"?, "grashofTolerance"?, "minTransmissionRad"?,
 *                       "linkLengthMm"?, "keepOut"?, "branch"?, "maxSizeMm"? },
 *     "terms"?: { "sizeWeight"?, "transmissionWeight"?, "transmissionGuidelineRad"? },
 *     "measure"?: "sum-of-squares" | "rms" | "max",
 *     "searchMaps"?: { "fourbar-lengths": "fourbar-boundary" },
 *     "description"?: "…" }
 *
 * Lengths in mm, angles in rad (prescribed driver values may be given in degrees with
 * "unit": "deg"). Reading runs three stages, each stopping on failure: the envelope
 * (`format`, `version`), the schema (every field's type, unknown fields rejected), then
 * the meaning (createProblem: point counts, repeated points, weights, driver values;
 * then every bound names a variable of its family, and free timing stays within the
 * optimizers' dimension). Before the schema, a field named `__proto__` anywhere is
 * refused: a schema would drop it without a word. The limits each value must keep are
 * in src/core/synthesis/problem.ts; at most MAX_LISTED_ISSUES issues are listed.
 */
import * as z from 'zod';
import { MAX_DIM } from '../optimize/config';
import { capIssues, describeValue, expected, formatPath, quoteList, strict } from './schemaMessages';
import { FAMILY_IDS, SEARCH_MAP_KINDS, createProblem, createSuspensionProblem, objectiveVariableNames, type FamilyId, type Problem, type ProblemInput, type ProblemIssue, type SuspensionProblem, type SynthesisProblem } from '../synthesis';
import { suspensionProblemShape } from './suspensionProblemFile';
import { legProblemShape } from './legProblemFile';
import { createLegProblem } from '../synthesis/legProblem';
import { MAX_DRIVER_VALUE_RAD } from '../synthesis/problem';

export const PROBLEM_FILE_FORMAT = 'loci-problem';
/** The version this code writes, and the newest it reads. */
export const PROBLEM_FILE_VERSION = 1;

export type ParseProblemFileResult =
  | { readonly ok: true; readonly problem: Problem; readonly description?: string }
  /** At most MAX_LISTED_ISSUES issues, then one (path '') counting the rest. */
  | { readonly ok: false; readonly issues: ProblemIssue[] };

/** A problem file of either kind: a path problem (no "kind", or "path") or a suspension problem. */
export type ParseSynthesisProblemFileResult =
  | { readonly ok: true; readonly problem: SynthesisProblem; readonly description?: string }
  /** At most MAX_LISTED_ISSUES issues, then one (path '') counting the rest. */
  | { readonly ok: false; readonly issues: ProblemIssue[] };

/** A problem file longer than this (characters, about bytes) is refused before it is parsed: 5,000 points with timing and weights take under 1 MB. */
export const MAX_PROBLEM_FILE_CHARS = 4_000_000;

/** A key JSON.parse keeps as an own field but an object literal would take as its prototype: a schema would drop it without a word. */
const RESERVED_KEY = '__proto__';

const finite = (what: string) => z.number({ error: expected(what) }).refine(Number.isFinite, { error: expected(what) });
const pair = (what: string) => z.tuple([finite(what), finite(what)], { error: expected(`[lower, upper], two ${what}s`) });

const targetSchema = strict('a target { "points", "closed", "weights"? }', {
  points: z.array(z.array(z.number({ error: expected('a coordinate in mm') }), { error: expected('a point [x, y] in mm') }), {
    error: expected('an array of points [x, y] in mm'),
  }),
  closed: z.boolean({ error: expected('true (a closed path) or false (open)') }),
  weights: z.array(z.number({ error: expected('a weight ≥ 0') }), { error: expected('an array of weights, one per point') }).optional(),
});

const timingModes = 'a timing mode, "prescribed", "free" or "unprescribed"';
const timingSchema = z.discriminatedUnion(
  'mode',
  [
    strict('prescribed timing { "mode", "driverValues", "unit"? }', {
      mode: z.literal('prescribed', { error: expected(timingModes) }),
      driverValues: z.array(z.number({ error: expected('a driver value') }), { error: expected('an array of driver values, one per point') }),
      unit: z.enum(['rad', 'deg'], { error: expected('"rad" or "deg"') }).optional(),
    }),
    strict('free timing { "mode", "wrap", "refine"? }', {
      mode: z.literal('free', { error: expected(timingModes) }),
      wrap: z.boolean({ error: expected('true (the driver values may pass once through 2π) or false') }),
      refine: z.boolean({ error: expected('true or false') }).optional(),
    }),
    strict('unprescribed timing { "mode", "wrap"?, "samples"? }', {
      mode: z.literal('unprescribed', { error: expected(timingModes) }),
      wrap: z.boolean({ error: expected('true or false') }).optional(),
      samples: z.number({ error: expected('a whole number of curve samples') }).int({ error: expected('a whole number of curve samples') }).optional(),
    }),
  ],
  { error: expected(timingModes) },
);

const familyEnum = z.enum(FAMILY_IDS as [FamilyId, ...FamilyId[]], { error: expected(`a family, one of ${quoteList(FAMILY_IDS)}`) });

const constraintsSchema = strict('constraints', {
  fullTurnCrank: z.boolean({ error: expected('true or false') }).optional(),
  minTransmissionRad: finite('an angle in rad').optional(),
  linkLengthMm: pair('length in mm').optional(),
  keepOut: z
    .array(strict('a keep-out circle { "x", "y", "r" } in mm', { x: finite('a number in mm'), y: finite('a number in mm'), r: finite('a radius in mm') }), {
      error: expected('an array of keep-out circles'),
    })
    .optional(),
  branch: z.enum(['open', 'crossed', 'either'], { error: expected('"open", "crossed" or "either"') }).optional(),
  maxSizeMm: finite('a size in mm').optional(),
});

const termsSchema = strict('objective terms { "sizeWeight"?, "transmissionWeight"?, "transmissionGuidelineRad"? }', {
  sizeWeight: finite('a weight ≥ 0').optional(),
  transmissionWeight: finite('a weight ≥ 0').optional(),
  transmissionGuidelineRad: finite('an angle in rad').optional(),
});

const fileShape = {
  format: z.literal(PROBLEM_FILE_FORMAT, { error: expected(`"${PROBLEM_FILE_FORMAT}"`) }),
  version: z.literal(PROBLEM_FILE_VERSION, { error: expected(`${PROBLEM_FILE_VERSION}`) }),
  kind: z.literal('path', { error: expected('"path", "suspension" or "leg"') }).optional(),
  name: z.string({ error: expected('a name string') }),
  description: z.string({ error: expected('a description string') }).optional(),
  target: targetSchema,
  timing: timingSchema,
  placement: z.enum(['fixed', 'free'], { error: expected('"fixed" or "free"') }),
  families: z.array(familyEnum, { error: expected('an array of families') }),
  bounds: z
    .partialRecord(familyEnum, z.record(z.string(), pair('number'), { error: expected('an object of variable name → [lower, upper]') }), {
      error: expected('an object of family → bounds'),
    })
    .optional(),
  constraints: constraintsSchema.optional(),
  terms: termsSchema.optional(),
  measure: z.enum(['sum-of-squares', 'rms', 'max'], { error: expected('"sum-of-squares", "rms" or "max"') }).optional(),
  searchMaps: z
    .partialRecord(familyEnum, z.enum(SEARCH_MAP_KINDS, { error: expected(`a search map, one of ${quoteList(SEARCH_MAP_KINDS)}`) }), {
      error: expected('an object of family → search map'),
    })
    .optional(),
};
const problemFileV1Schema = strict('a problem file', fileShape);
const suspensionProblemFileSchema = strict('a suspension problem file', {
  format: fileShape.format,
  version: fileShape.version,
  name: fileShape.name,
  description: fileShape.description,
  ...suspensionProblemShape,
});

const legProblemFileSchema = strict('a leg problem file', {
  format: fileShape.format,
  version: fileShape.version,
  name: fileShape.name,
  description: fileShape.description,
  ...legProblemShape,
});

/** A problem file of the current version. */
export type ProblemFileV1 = z.infer<typeof problemFileV1Schema>;


function isPlainObject(value: unknown): value is Record<string, unknown> {
  return typeof value === 'object' && value !== null && !Array.isArray(value);
}

function fail(path: string, message: string): { ok: false; issues: ProblemIssue[] } {
  return { ok: false, issues: [{ path, message }] };
}

function failWith(issues: readonly ProblemIssue[]): { ok: false; issues: ProblemIssue[] } {
  return { ok: false, issues: capIssues(issues, (rest) => ({ path: '', message: `and ${rest} more issue${rest === 1 ? '' : 's'}` })) };
}

/** Every field named `__proto__`, anywhere in the file, shallowest first (walked without recursion, so any depth is safe). */
function reservedKeyIssues(json: unknown): ProblemIssue[] {
  const issues: ProblemIssue[] = [];
  // Each node keeps its parent's index and its own key; a path is built only for an issue.
  const queue: { value: unknown; parent: number; key: PropertyKey }[] = [{ value: json, parent: -1, key: '' }];
  const pathOf = (index: number, last: PropertyKey): string => {
    const path: PropertyKey[] = [last];
    for (let k = index; k > 0; k = queue[k].parent) path.unshift(queue[k].key);
    return formatPath(path);
  };
  for (let head = 0; head < queue.length; head++) {
    const value = queue[head].value;
    if (Array.isArray(value)) {
      value.forEach((item, i) => {
        if (typeof item === 'object' && item !== null) queue.push({ value: item, parent: head, key: i });
      });
    } else if (typeof value === 'object' && value !== null) {
      for (const key of Object.keys(value)) {
        if (key === RESERVED_KEY) {
          issues.push({ path: pathOf(head, key), message: `"${RESERVED_KEY}" is not a name Loci reads (JavaScript reserves it); remove the field or rename it` });
          continue;
        }
        const item = (value as Record<string, unknown>)[key];
        if (typeof item === 'object' && item !== null) queue.push({ value: item, parent: head, key });
      }
    }
  }
  return issues;
}

/** Prescribed driver values within MAX_DRIVER_VALUE_RAD, checked in the file's own unit before any conversion. */
function driverValueIssues(values: readonly number[], unit: 'rad' | 'deg'): ProblemIssue[] {
  const limit = unit === 'deg' ? Math.floor((MAX_DRIVER_VALUE_RAD * 180) / Math.PI) : MAX_DRIVER_VALUE_RAD;
  const issues: ProblemIssue[] = [];
  values.forEach((v, i) => {
    if (!(Math.abs(v) <= limit)) issues.push({ path: `timing.driverValues[${i}]`, message: `is ${v} ${unit}; expected a driver value from −${limit} to ${limit} ${unit}` });
  });
  return issues;
}

/**
 * Free timing makes each point's driver value a variable: the family's own variables
 * and the points together must stay within the optimizers' MAX_DIM.
 */
function dimensionIssues(problem: Problem): ProblemIssue[] {
  if (problem.timing.mode !== 'free') return [];
  const n = problem.target.points.length / 2;
  const issues: ProblemIssue[] = [];
  for (const family of problem.families) {
    const dim = objectiveVariableNames(problem, family).length;
    if (dim > MAX_DIM) {
      const most = MAX_DIM - (dim - n);
      issues.push({
        path: 'target.points',
        message: `has ${n} points; with free timing each point's driver value is a variable, so ${family} would have ${dim} variables, and a search takes at most ${MAX_DIM}: at most ${most} points for ${family} (or use prescribed or unprescribed timing)`,
      });
    }
  }
  return issues;
}

/** Reads a path problem file (already parsed from JSON text); a suspension problem is refused with a pointer to parseSynthesisProblemFile. */
export function parseProblemFile(json: unknown): ParseProblemFileResult {
  const read = parseSynthesisProblemFile(json);
  if (!read.ok) return read;
  if (read.problem.kind !== 'path') return fail('kind', `is "${read.problem.kind}"; expected a path problem here (a ${read.problem.kind} problem is searched with loci fit)`);
  return read.description === undefined ? { ok: true, problem: read.problem } : { ok: true, problem: read.problem, description: read.description };
}

/** Reads a suspension problem file after its envelope: the schema, then createSuspensionProblem. */
function parseSuspensionProblem(json: Record<string, unknown>): ParseSynthesisProblemFileResult {
  const parsed = suspensionProblemFileSchema.safeParse(json);
  if (!parsed.success) return failWith(parsed.error.issues.map((i) => ({ path: formatPath(i.path), message: i.message })));
  const { format: _format, version: _version, description, ...input } = parsed.data;
  const created = createSuspensionProblem(input);
  if (!created.ok) return failWith(created.issues);
  const problem: SuspensionProblem = created.problem;
  return description === undefined ? { ok: true, problem } : { ok: true, problem, description };
}

/** Reads a leg problem file after its envelope: the schema, then createLegProblem. */
function parseLegProblem(json: Record<string, unknown>): ParseSynthesisProblemFileResult {
  const parsed = legProblemFileSchema.safeParse(json);
  if (!parsed.success) return failWith(parsed.error.issues.map((i) => ({ path: formatPath(i.path), message: i.message })));
  const { format: _format, version: _version, description, ...input } = parsed.data;
  const created = createLegProblem(input);
  if (!created.ok) return failWith(created.issues);
  return description === undefined ? { ok: true, problem: created.problem } : { ok: true, problem: created.problem, description };
}

/** Reads a problem file of any kind (already parsed from JSON text). */
export function parseSynthesisProblemFile(json: unknown): ParseSynthesisProblemFileResult {
  if (!isPlainObject(json)) return fail('', `expected a problem file (a JSON object with "format": "${PROBLEM_FILE_FORMAT}"), got ${describeValue(json)}`);
  if (json.format !== PROBLEM_FILE_FORMAT) {
    return fail('format', json.format === undefined
      ? `missing; expected "${PROBLEM_FILE_FORMAT}" (is this a problem file?)`
      : `expected "${PROBLEM_FILE_FORMAT}", got ${describeValue(json.format)}`);
  }
  const version = json.version;
  if (!(typeof version === 'number' && Number.isInteger(version) && version >= 1)) {
    return fail('version', `expected a whole number from 1 to ${PROBLEM_FILE_VERSION}, got ${describeValue(version)}`);
  }
  if (version > PROBLEM_FILE_VERSION) {
    return fail('version', `this file is version ${version}, newer than this Loci reads (up to version ${PROBLEM_FILE_VERSION}); open it with a newer Loci`);
  }
  const reserved = reservedKeyIssues(json);
  if (reserved.length > 0) return failWith(reserved);
  if (json.kind === 'suspension') return parseSuspensionProblem(json);
  if (json.kind === 'leg') return parseLegProblem(json);
  const parsed = problemFileV1Schema.safeParse(json);
  if (!parsed.success) {
    return failWith(parsed.error.issues.map((i) => ({ path: formatPath(i.path), message: i.message })));
  }
  const file = parsed.data;
  const t = file.timing;
  if (t.mode === 'prescribed') {
    const driverIssues = driverValueIssues(t.driverValues, t.unit ?? 'rad');
    if (driverIssues.length > 0) return failWith(driverIssues);
  }
  const timing: ProblemInput['timing'] =
    t.mode === 'prescribed'
      ? { mode: 'prescribed', driverValues: t.unit === 'deg' ? t.driverValues.map((d) => (d * Math.PI) / 180) : t.driverValues }
      : t.mode === 'free'
        ? { mode: 'free', wrap: t.wrap, ...(t.refine === undefined ? {} : { refine: t.refine }) }
        : { mode: 'unprescribed', ...(t.wrap === undefined ? {} : { wrap: t.wrap }), ...(t.samples === undefined ? {} : { samples: t.samples }) };
  const created = createProblem({
    name: file.name,
    target: file.target,
    timing,
    placement: file.placement,
    families: file.families,
    ...(file.bounds === undefined ? {} : { bounds: file.bounds }),
    ...(file.constraints === undefined ? {} : { constraints: file.constraints }),
    ...(file.terms === undefined ? {} : { terms: file.terms }),
    ...(file.measure === undefined ? {} : { measure: file.measure }),
    ...(file.searchMaps === undefined ? {} : { searchMaps: file.searchMaps }),
  });
  if (!created.ok) return failWith(created.issues);
  const problem = created.problem;
  const issues: ProblemIssue[] = [];
  for (const [family, boxes] of Object.entries(problem.bounds)) {
    const names = objectiveVariableNames(problem, family as FamilyId);
    const groups = names.filter((n) => /_\d+$/.test(n)).map((n) => n.replace(/_\d+$/, ''));
    for (const name of Object.keys(boxes ?? {})) {
      if (!names.includes(name) && !groups.includes(name)) {
        const groupNote = groups.length > 0 ? ` (or "${groups[0]}" for every per-point driver value)` : '';
        issues.push({ path: `bounds.${family}.${name}`, message: `"${name}" is not a variable of ${family} here; expected one of ${quoteList(names)}${groupNote}` });
      }
    }
  }
  if (issues.length > 0) return failWith(issues);
  const dimension = dimensionIssues(problem);
  if (dimension.length > 0) return failWith(dimension);
  return file.description === undefined ? { ok: true, problem } : { ok: true, problem, description: file.description };
}
