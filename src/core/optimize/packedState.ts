/**
 * The compact form of an optimizer state, for checkpoints. It is the state's JSON tree
 * with two changes, both exact:
 * - each array of at least PACK_MIN_LENGTH numbers, not all integers, is
 *   `{ "f64": base64 }` of its doubles (base64.ts), +Infinity standing for the null of a
 *   ranked value (JsonReal);
 * - the pending trials of a differential evolution are `{ "f64", "sameAsParent" }`: a
 *   bit per coordinate, set where the trial holds its parent's coordinate (the
 *   population row of the same index), and the doubles of the other coordinates only.
 *   Binomial crossover takes about 1 − CR of a trial's coordinates from its parent.
 * `unpackState` turns any state, packed or not, into the plain form `exportState()`
 * writes, for `restoreOptimizer`, which checks it.
 */
import { base64ToBytes, base64ToDoubles, bytesToBase64, doublesToBase64, float64ToBase64 } from './base64';
import type { JsonReal } from './codec';
import type { OptimizerState } from './types';
import { STATE_FORMAT } from './types';

/** Shorter arrays stay decimal: short arrays are mostly counts and indices, which decimal writes shorter. */
export const PACK_MIN_LENGTH = 16;

/** A packed array of numbers; with `sameAsParent`, a differential evolution's trials. */
export interface PackedNumbers {
  readonly f64: string;
  readonly sameAsParent?: string;
}

/** A state with any of its arrays of numbers packed. */
export type Packed<T> = T extends readonly (number | null)[]
  ? T | PackedNumbers
  : T extends readonly (infer E)[]
    ? readonly Packed<E>[]
    : T extends object
      ? { readonly [K in keyof T]: Packed<T[K]> }
      : T;

export type PackedOptimizerState = Packed<OptimizerState>;

export type UnpackResult = { readonly ok: true; readonly state: unknown } | { readonly ok: false; readonly reason: string };

const BITS = 8;

function isObject(v: unknown): v is Record<string, unknown> {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}

/** Whether `v` is the state of a differential evolution (whose `trials` pack against `population`). */
function isDeState(v: Record<string, unknown>): boolean {
  return v.format === STATE_FORMAT && (v.kind === 'lshade' || v.kind === 'de-rand-1-bin');
}

/**
 * How an array packs: 'no' when it is short, holds anything but numbers and null, or
 * only integers (decimal is as short); 'numbers' when it holds numbers only; 'reals'
 * when some are null.
 */
function packing(a: readonly unknown[]): 'no' | 'numbers' | 'reals' {
  if (a.length < PACK_MIN_LENGTH) return 'no';
  let fraction = false;
  let nulls = false;
  for (const x of a) {
    if (x === null) nulls = true;
    else if (typeof x !== 'number') return 'no';
    else if (!fraction && !Number.isInteger(x)) fraction = true;
  }
  return !fraction ? 'no' : nulls ? 'reals' : 'numbers';
}

const asDouble = (x: unknown): number => (x === null ? Infinity : (x as number));

function packTrials(trials: readonly number[], population: readonly number[]): PackedNumbers {
  const n = trials.length;
  const mask = new Uint8Array(Math.ceil(n / BITS));
  const differing: number[] = [];
  for (let k = 0; k < n; k++) {
    if (k < population.length && Object.is(trials[k], population[k])) mask[k >> 3] |= 1 << (k & 7);
    else differing.push(trials[k]);
  }
  return { f64: float64ToBase64(Float64Array.from(differing)), sameAsParent: bytesToBase64(mask) };
}

function packValue(v: unknown): unknown {
  if (Array.isArray(v)) {
    const how = packing(v);
    if (how === 'numbers') return { f64: float64ToBase64(Float64Array.from(v as number[])) } satisfies PackedNumbers;
    if (how === 'reals') return { f64: doublesToBase64(v.length, (k) => asDouble(v[k])) } satisfies PackedNumbers;
    return v.map(packValue);
  }
  if (!isObject(v)) return v;
  const { trials, population } = v;
  const againstParents =
    isDeState(v) && Array.isArray(trials) && Array.isArray(population) && trials.length >= PACK_MIN_LENGTH && trials.every((x) => typeof x === 'number');
  const out: Record<string, unknown> = {};
  for (const [key, x] of Object.entries(v)) out[key] = againstParents && key === 'trials' ? packTrials(trials as number[], population as number[]) : packValue(x);
  return out;
}

/** The state with its long arrays of numbers packed; `unpackState` gives back an equal state. */
export function packState(state: OptimizerState): PackedOptimizerState {
  return packValue(state) as PackedOptimizerState;
}

class Unpackable extends Error {}

function isPacked(v: Record<string, unknown>): boolean {
  const keys = Object.keys(v);
  return typeof v.f64 === 'string' && keys.every((k) => k === 'f64' || k === 'sameAsParent');
}

/** The doubles of a packed array, +Infinity as null; NaN and −Infinity, which no state holds, refused. */
function unpackReals(text: string, where: string): JsonReal[] {
  const doubles = base64ToDoubles(text);
  if (typeof doubles === 'string') throw new Unpackable(`${where}.f64: ${doubles}`);
  const out = new Array<JsonReal>(doubles.length);
  for (let k = 0; k < doubles.length; k++) {
    const x = doubles[k];
    if (!(x > -Infinity)) throw new Unpackable(`${where}.f64[${k}] is ${x}; expected a number or +Infinity (null)`);
    out[k] = x < Infinity ? x : null;
  }
  return out;
}

function unpackTrials(packed: Record<string, unknown>, population: unknown, where: string): JsonReal[] {
  if (typeof packed.sameAsParent !== 'string') throw new Unpackable(`${where}.sameAsParent is not base64 text`);
  const mask = base64ToBytes(packed.sameAsParent);
  if (typeof mask === 'string') throw new Unpackable(`${where}.sameAsParent: ${mask}`);
  if (!Array.isArray(population)) throw new Unpackable(`${where}: the state has no population to take the trials' parent coordinates from`);
  const differing = unpackReals(packed.f64 as string, where);
  let same = 0;
  for (const byte of mask) for (let b = 0; b < BITS; b++) same += (byte >> b) & 1;
  const n = same + differing.length;
  if (mask.length !== Math.ceil(n / BITS)) throw new Unpackable(`${where}.sameAsParent has ${mask.length} bytes; expected ${Math.ceil(n / BITS)} for ${n} coordinates`);
  const out = new Array<JsonReal>(n);
  let next = 0;
  for (let k = 0; k < n; k++) {
    if ((mask[k >> 3] >> (k & 7)) & 1) {
      if (k >= population.length) throw new Unpackable(`${where}.sameAsParent marks coordinate ${k}, beyond the population's ${population.length}`);
      out[k] = population[k] as JsonReal;
    } else {
      out[k] = differing[next++];
    }
  }
  return out;
}

function unpackValue(v: unknown, where: string): unknown {
  if (Array.isArray(v)) return v.map((x, k) => unpackValue(x, `${where}[${k}]`));
  if (!isObject(v)) return v;
  if (isPacked(v)) {
    if (v.sameAsParent !== undefined) throw new Unpackable(`${where} holds trials outside a differential evolution's state`);
    return unpackReals(v.f64 as string, where);
  }
  const out: Record<string, unknown> = {};
  let trials: Record<string, unknown> | null = null;
  for (const [key, x] of Object.entries(v)) {
    if (key === 'trials' && isObject(x) && isPacked(x) && x.sameAsParent !== undefined && isDeState(v)) {
      trials = x;
      out[key] = null;
    } else {
      out[key] = unpackValue(x, `${where}.${key}`);
    }
  }
  if (trials !== null) out.trials = unpackTrials(trials, out.population, `${where}.trials`);
  return out;
}

/** The plain state (as `exportState()` writes it) of a packed or plain one, or what is wrong with its packing. */
export function unpackState(packed: unknown): UnpackResult {
  try {
    return { ok: true, state: unpackValue(packed, 'state') };
  } catch (error) {
    if (error instanceof Unpackable) return { ok: false, reason: error.message };
    throw error;
  }
}
