/**
 * Messages for the file schemas: each zod issue becomes a path such as `joints[2].x`
 * and a sentence saying what the field should have held and what it held.
 */
import * as z from 'zod';
import { escapeUnprintable } from '../linkage/model';

/** A short, quoted rendering of a wrong value for a message: `"abc"`, `12`, `null`, `an array`. */
export function describeValue(value: unknown): string {
  if (value === null) return 'null';
  if (Array.isArray(value)) return 'an array';
  switch (typeof value) {
    case 'string':
      // JSON escapes the C0 controls; the rest that could steer a terminal are escaped here.
      return escapeUnprintable(JSON.stringify(value.length > 40 ? `${value.slice(0, 40)}…` : value));
    case 'number':
    case 'boolean':
      return String(value);
    case 'object':
      return 'an object';
    default:
      return typeof value;
  }
}

/** Words a list in a message quotes; the rest are counted (a file may hold any number of unknown fields). */
const MAX_QUOTED_WORDS = 20;

/** `"a", "b", "c"`: each word quoted and escaped as describeValue does, at most MAX_QUOTED_WORDS of them. */
export function quoteList(words: readonly string[]): string {
  const shown = words.slice(0, MAX_QUOTED_WORDS).map(describeValue).join(', ');
  return words.length > MAX_QUOTED_WORDS ? `${shown}, … (${words.length} in all)` : shown;
}

/**
 * A zod error function saying what the field should have held. `fields` lists the
 * known fields of an object, for the message about a misspelt one.
 */
export function expected(what: string, fields?: readonly string[]): z.core.$ZodErrorMap {
  return (issue) => {
    if (issue.code === 'unrecognized_keys') {
      const known = fields ? `; the known fields are ${quoteList(fields)}` : '';
      return `unknown field${issue.keys.length > 1 ? 's' : ''} ${quoteList(issue.keys)} in ${what}${known}`;
    }
    if (issue.code === 'invalid_union' && issue.discriminator !== undefined) {
      const input = issue.input as Record<string, unknown> | undefined;
      const got = input?.[issue.discriminator];
      return got === undefined ? `missing; expected ${what}` : `expected ${what}, got ${describeValue(got)}`;
    }
    if (issue.input === undefined) return `missing; expected ${what}`;
    return `expected ${what}, got ${describeValue(issue.input)}`;
  };
}

/** An object schema that rejects unknown fields, naming the known ones. */
export function strict<T extends z.core.$ZodLooseShape>(what: string, shape: T) {
  return z.strictObject(shape, { error: expected(what, Object.keys(shape)) });
}

/** `['joints', 2, 'x']` → `joints[2].x`. */
export function formatPath(path: readonly PropertyKey[]): string {
  let out = '';
  for (const key of path) {
    if (typeof key === 'number') out += `[${key}]`;
    else out += out === '' ? String(key) : `.${String(key)}`;
  }
  return out;
}

/** A reader lists at most this many issues and counts the rest, so a bad file gives a readable answer. */
export const MAX_LISTED_ISSUES = 12;

/** Longest caution a design file may carry (characters): the file's own caution is a few hundred. */
export const MAX_CAUTION_CHARS = 2000;

/** The first MAX_LISTED_ISSUES of `issues`, then one more saying how many were left out. */
export function capIssues<T>(issues: readonly T[], more: (count: number) => T): T[] {
  if (issues.length <= MAX_LISTED_ISSUES) return [...issues];
  const rest = issues.length - MAX_LISTED_ISSUES;
  return [...issues.slice(0, MAX_LISTED_ISSUES), more(rest)];
}

/** A JSON object, as a file's top level or a nested record is read. */
export function isPlainObject(value: unknown): value is Record<string, unknown> {
  return typeof value === 'object' && value !== null && !Array.isArray(value);
}

/**
 * The envelope of one of Loci's own files: a JSON object with `format` (this file's
 * name) and a whole-number `version` from 1 to `latest`. The first thing wrong with it,
 * as a path and a message, or null when it is whole. `kind` names the file in words
 * ("linkage file", "suspension file").
 */
export function envelopeIssue(json: unknown, format: string, kind: string, latest: number): { readonly path: string; readonly message: string } | null {
  if (!isPlainObject(json)) {
    return { path: '', message: `expected a ${kind} (a JSON object with "format": "${format}"), got ${describeValue(json)}` };
  }
  if (json.format !== format) {
    return {
      path: 'format',
      message: json.format === undefined ? `missing; expected "${format}" (is this a ${kind}?)` : `expected "${format}", got ${describeValue(json.format)}`,
    };
  }
  const version = json.version;
  if (!(typeof version === 'number' && Number.isInteger(version) && version >= 1)) {
    return {
      path: 'version',
      message: version === undefined
        ? `missing; expected a file format version (this Loci reads 1 to ${latest})`
        : `expected a whole number ≥ 1, got ${describeValue(version)}`,
    };
  }
  if (version > latest) {
    return { path: 'version', message: `this file is version ${version}, newer than this Loci reads (up to version ${latest}); open it with a newer Loci` };
  }
  return null;
}
