/**
 * Plain-JSON encoding of optimizer state, and the checks that read it back.
 *
 * JSON has no Infinity: a ranked value or violation of +Infinity is written as null.
 * Readers throw `InvalidInput`; the public factories catch it and return
 * `{ ok: false, reason }`, so a corrupt checkpoint is an expected failure, not a crash.
 */

export class InvalidInput extends Error {}

/** A number as JSON keeps it: +Infinity as null. */
export type JsonReal = number | null;

export function encodeReal(x: number): JsonReal {
  return x < Infinity ? x : null;
}

export function encodeReals(a: Float64Array, count: number): JsonReal[] {
  const out: JsonReal[] = new Array<JsonReal>(count);
  for (let i = 0; i < count; i++) out[i] = encodeReal(a[i]);
  return out;
}

export function encodeNumbers(a: Float64Array | Int32Array, count: number): number[] {
  return Array.from(a.subarray(0, count));
}

function describe(v: unknown): string {
  if (v === undefined) return 'missing';
  if (typeof v === 'number') return String(v);
  if (Array.isArray(v)) return `an array of ${v.length}`;
  if (typeof v === 'object') return v === null ? 'null' : 'an object';
  const text = JSON.stringify(v);
  return text.length > 40 ? `${text.slice(0, 40)}…` : text;
}

export function fail(where: string, got: unknown, expected: string): never {
  throw new InvalidInput(`${where} is ${describe(got)}; expected ${expected}`);
}

export function readObject(v: unknown, where: string): Record<string, unknown> {
  if (typeof v !== 'object' || v === null || Array.isArray(v)) fail(where, v, 'an object');
  return v as Record<string, unknown>;
}

export function readInteger(v: unknown, where: string, min: number, max: number): number {
  if (!(typeof v === 'number' && Number.isInteger(v) && v >= min && v <= max)) fail(where, v, `an integer in [${min}, ${max}]`);
  return v;
}

/** A finite number with min ≤ v ≤ max; `minExclusive` makes it min < v. */
export function readNumber(v: unknown, where: string, min: number, max: number, minExclusive = false): number {
  const ok = typeof v === 'number' && (minExclusive ? v > min : v >= min) && v <= max;
  if (!ok) fail(where, v, `a number in ${minExclusive ? '(' : '['}${min}, ${max}]`);
  return v;
}

/** A finite number or null (absent). */
export function readOptionalNumber(v: unknown, where: string): number | null {
  if (v === undefined || v === null) return null;
  if (!(typeof v === 'number' && Number.isFinite(v))) fail(where, v, 'a finite number or null');
  return v;
}

/** A ranked value or violation: a finite number, or null for +Infinity. */
export function readReal(v: unknown, where: string): number {
  if (v === null) return Infinity;
  if (!(typeof v === 'number' && Number.isFinite(v))) fail(where, v, 'a finite number or null');
  return v;
}

export function readLiteral<T extends string>(v: unknown, where: string, allowed: readonly T[]): T {
  if (!(typeof v === 'string' && (allowed as readonly string[]).includes(v))) {
    fail(where, v, allowed.map((a) => JSON.stringify(a)).join(' or '));
  }
  return v as T;
}

export function readBoolean(v: unknown, where: string): boolean {
  if (typeof v !== 'boolean') fail(where, v, 'true or false');
  return v;
}

function readArray(v: unknown, where: string, length: number): unknown[] {
  if (!Array.isArray(v) || v.length !== length) fail(where, v, `an array of ${length}`);
  return v;
}

/** An array of `length` finite numbers in [min, max], copied into `out` (or a new array). */
export function readNumbers(
  v: unknown,
  where: string,
  length: number,
  min = -Number.MAX_VALUE,
  max = Number.MAX_VALUE,
  out: Float64Array = new Float64Array(length),
): Float64Array {
  const a = readArray(v, where, length);
  for (let i = 0; i < length; i++) {
    const x = a[i];
    if (!(typeof x === 'number' && x >= min && x <= max)) fail(`${where}[${i}]`, x, `a number in [${min}, ${max}]`);
    out[i] = x;
  }
  return out;
}

/** An array of `length` ranked values (numbers, null for +Infinity), into `out`. */
export function readReals(v: unknown, where: string, length: number, out: Float64Array): Float64Array {
  const a = readArray(v, where, length);
  for (let i = 0; i < length; i++) out[i] = readReal(a[i], `${where}[${i}]`);
  return out;
}

/** Violations: like `readReals`, each ≥ 0 (canonical form). */
export function readViolations(v: unknown, where: string, length: number, out: Float64Array): Float64Array {
  readReals(v, where, length, out);
  for (let i = 0; i < length; i++) if (!(out[i] >= 0)) fail(`${where}[${i}]`, out[i], 'a violation ≥ 0');
  return out;
}

export function readIntegers(v: unknown, where: string, length: number, min: number, max: number, out: Int32Array): Int32Array {
  const a = readArray(v, where, length);
  for (let i = 0; i < length; i++) out[i] = readInteger(a[i], `${where}[${i}]`, min, max);
  return out;
}

/** The length of an array field, to size what is read next. */
export function readLength(v: unknown, where: string, max: number): number {
  if (!Array.isArray(v)) fail(where, v, 'an array');
  if (v.length > max) fail(where, v, `at most ${max} entries`);
  return v.length;
}
