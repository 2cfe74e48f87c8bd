/**
 * What each settings field accepts, checked as the user types: a value, or a message in
 * the user's words that names the field, says what is wrong and what is expected. The
 * limits are the ones the engine and the problem reader apply (src/engine/runSpec.ts,
 * src/core/synthesis/problem.ts), so a value a field accepts is one a search accepts.
 */
import { MAX_BOUND_MAGNITUDE, MAX_CONSTRAINT_MM, MAX_TERM_WEIGHT } from '../../core/synthesis/problem';
import { DEFAULT_ARCHIVE, MAX_BUDGET_EVALUATIONS, MAX_BUDGET_SECONDS, MAX_CHECKPOINT_EVERY_S, MIN_CHECKPOINT_EVERY_S } from '../../engine/runSpec';

export type Checked<T> = { readonly ok: true; readonly value: T } | { readonly ok: false; readonly message: string };

/** The largest evaluation budget: the engine's. */
export const MAX_EVALUATIONS = MAX_BUDGET_EVALUATIONS;
/** The longest time budget, seconds: the engine's. */
export const MAX_SECONDS = MAX_BUDGET_SECONDS;
/** MAX_SECONDS in days, for messages. */
const MAX_DAYS = MAX_SECONDS / (24 * 3600);
/** The seeds the engine's run spec and the optimizers' configuration accept: safe integers ≥ 0. */
export const MAX_SEED = Number.MAX_SAFE_INTEGER;
/** A transmission angle is measured as the acute angle between coupler and output link: 0° to 90°. */
export const MAX_TRANSMISSION_DEG = 90;

export { MAX_BOUND_MAGNITUDE, MAX_CONSTRAINT_MM };

/** A decimal number as people type it: a point or a comma, an optional exponent; nothing else. */
const DECIMAL = /^[+-]?(?:\d+(?:[.,]\d*)?|[.,]\d+)(?:e[+-]?\d+)?$/i;

type Read = { readonly kind: 'empty' } | { readonly kind: 'number'; readonly value: number; readonly text: string } | { readonly kind: 'bad'; readonly text: string };

export function readDecimal(text: string): Read {
  const t = text.trim();
  if (t.length === 0) return { kind: 'empty' };
  if (!DECIMAL.test(t)) return { kind: 'bad', text: t };
  return { kind: 'number', value: Number(t.replace(',', '.')), text: t };
}

/** A count as the page shows it: 1,000,000. */
export function formatCount(n: number): string {
  return n.toLocaleString('en-GB', { maximumFractionDigits: 0 });
}

/** A stored value as a field shows it: ten significant digits, so a sum's 20.899999999999977 reads 20.9. */
export function formatValue(v: number): string {
  return String(Number(v.toPrecision(10)));
}

function fail<T>(message: string): Checked<T> {
  return { ok: false, message };
}

/** The common first step: a number, or the message for an empty or unreadable field. */
function numberOf(field: string, text: string, expected: string): Checked<{ value: number; text: string }> {
  const read = readDecimal(text);
  if (read.kind === 'empty') return fail(`${field}: empty; expected ${expected}.`);
  if (read.kind === 'bad') return fail(`${field}: "${read.text}" is not a number; expected ${expected}.`);
  return { ok: true, value: { value: read.value, text: read.text } };
}

function wholeInRange(field: string, text: string, min: number, max: number, expected: string, tooFew: string): Checked<number> {
  const n = numberOf(field, text, expected);
  if (!n.ok) return n;
  const { value, text: shown } = n.value;
  // In a count a comma is a thousands separator or a slip, never a decimal comma: 20,000 must not become 20.
  if (shown.includes(',')) return fail(`${field}: "${shown}" has a comma; write the whole number without separators (20000, not 20,000); expected ${expected}.`);
  if (!Number.isFinite(value) || value > max) return fail(`${field}: ${shown} is more than ${formatCount(max)}; expected ${expected}.`);
  if (!Number.isInteger(value)) return fail(`${field}: ${shown} is not a whole number; expected ${expected}.`);
  if (value < min) return fail(`${field}: ${shown} is ${tooFew}; expected ${expected}.`);
  return { ok: true, value };
}

/** Evaluations: a whole number, at least one per search island (the engine's rule), at most MAX_EVALUATIONS. */
export function checkEvaluations(text: string, islands: number): Checked<number> {
  const min = Math.max(1, islands);
  const perIsland = min > 1 ? ` (at least one for each of the ${min} search islands)` : '';
  return wholeInRange('Budget in evaluations', text, min, MAX_EVALUATIONS, `a whole number of evaluations from ${formatCount(min)} to ${formatCount(MAX_EVALUATIONS)}${perIsland}`, 'too few');
}

export function checkSeconds(text: string): Checked<number> {
  const field = 'Budget in seconds';
  const expected = `a time above 0 s, up to ${formatCount(MAX_SECONDS)} s (${formatCount(MAX_DAYS)} days)`;
  const n = numberOf(field, text, expected);
  if (!n.ok) return n;
  const { value, text: shown } = n.value;
  if (!(value > 0)) return fail(`${field}: ${shown} s is no time at all; expected ${expected}.`);
  if (!(value <= MAX_SECONDS)) return fail(`${field}: ${shown} s is longer than ${formatCount(MAX_DAYS)} days; expected ${expected}.`);
  return { ok: true, value };
}

/** Seconds between checkpoints: the engine's range (a second to a day). */
export function checkCheckpointEvery(text: string): Checked<number> {
  const field = 'Checkpoint every';
  const expected = `a time from ${MIN_CHECKPOINT_EVERY_S} s to ${formatCount(MAX_CHECKPOINT_EVERY_S)} s (a day)`;
  const n = numberOf(field, text, expected);
  if (!n.ok) return n;
  const { value, text: shown } = n.value;
  if (!(value >= MIN_CHECKPOINT_EVERY_S)) return fail(`${field}: ${shown} s is under ${MIN_CHECKPOINT_EVERY_S} s (saving would take a noticeable share of the search); expected ${expected}.`);
  if (!(value <= MAX_CHECKPOINT_EVERY_S)) return fail(`${field}: ${shown} s is longer than a day; expected ${expected}.`);
  return { ok: true, value };
}

export function checkSeed(text: string): Checked<number> {
  return wholeInRange('Seed', text, 0, MAX_SEED, `a whole number from 0 to ${formatCount(MAX_SEED)}`, 'below 0');
}

/** Minimum transmission angle, degrees; empty for none. */
export function checkMinTransmission(text: string): Checked<number | null> {
  const field = 'Minimum transmission angle';
  const expected = `an angle from 0° to ${MAX_TRANSMISSION_DEG}°, or empty for none`;
  if (readDecimal(text).kind === 'empty') return { ok: true, value: null };
  const n = numberOf(field, text, expected);
  if (!n.ok) return n;
  const { value, text: shown } = n.value;
  if (!(value >= 0)) return fail(`${field}: ${shown}° is below 0°; expected ${expected}.`);
  if (!(value <= MAX_TRANSMISSION_DEG)) return fail(`${field}: ${shown}° is above ${MAX_TRANSMISSION_DEG}° (a transmission angle is at most a right angle); expected ${expected}.`);
  return { ok: true, value };
}

/** Most target spans a size limit may be: the default boxes reach about 13 spans, so 1000 is far past any design. */
export const MAX_SIZE_SPANS = 1000;

/** Size limit as a multiple of the target's span; empty for none. Above 1: the motion holds the target. */
export function checkMaxSizeSpans(text: string): Checked<number | null> {
  const field = 'Largest size';
  const expected = `a multiple of the target's span above 1 and at most ${formatCount(MAX_SIZE_SPANS)}, or empty for no limit`;
  if (readDecimal(text).kind === 'empty') return { ok: true, value: null };
  const n = numberOf(field, text, expected);
  if (!n.ok) return n;
  const { value, text: shown } = n.value;
  if (!(value > 1)) return fail(`${field}: ${shown} × the span is not above 1 (the motion holds the target, so it is at least the target's span); expected ${expected}.`);
  if (!(value <= MAX_SIZE_SPANS)) return fail(`${field}: ${shown} is more than ${formatCount(MAX_SIZE_SPANS)} spans; expected ${expected}.`);
  return { ok: true, value };
}

/** A term's weight: 0 (no term) up to the problem's MAX_TERM_WEIGHT. */
export function checkTermWeight(field: string, text: string): Checked<number> {
  const expected = `a weight from 0 (no term) to ${formatCount(MAX_TERM_WEIGHT)}`;
  const n = numberOf(field, text, expected);
  if (!n.ok) return n;
  const { value, text: shown } = n.value;
  if (!(value >= 0)) return fail(`${field}: ${shown} is below 0; expected ${expected}.`);
  if (!(value <= MAX_TERM_WEIGHT)) return fail(`${field}: ${shown} is more than ${formatCount(MAX_TERM_WEIGHT)}; expected ${expected}.`);
  return { ok: true, value };
}

/** The transmission guideline, degrees: above 0°, at most 90°. */
export function checkGuideline(text: string): Checked<number> {
  const field = 'Transmission guideline';
  const expected = `an angle above 0° and at most ${MAX_TRANSMISSION_DEG}° (common practice: 40°, so 40° to 140° cost nothing)`;
  const n = numberOf(field, text, expected);
  if (!n.ok) return n;
  const { value, text: shown } = n.value;
  if (!(value > 0)) return fail(`${field}: ${shown}° is not above 0°; expected ${expected}.`);
  if (!(value <= MAX_TRANSMISSION_DEG)) return fail(`${field}: ${shown}° is above ${MAX_TRANSMISSION_DEG}°; expected ${expected}.`);
  return { ok: true, value };
}

/** The most designs a family keeps: the run archive's capacity per family. */
export const MAX_RESULTS_PER_FAMILY = DEFAULT_ARCHIVE.capacity;

export function checkResultsPerFamily(text: string): Checked<number> {
  return wholeInRange(
    'Designs kept per family',
    text,
    1,
    MAX_RESULTS_PER_FAMILY,
    `a whole number from 1 to ${MAX_RESULTS_PER_FAMILY} (the most a search keeps of each family)`,
    'too few',
  );
}

/** What a pair of fields says: both values, or a message for either side (or both). */
export type PairChecked<T> = { readonly ok: true; readonly value: T } | { readonly ok: false; readonly lower: string | null; readonly upper: string | null };

function pairFail<T>(lower: string | null, upper: string | null): PairChecked<T> {
  return { ok: false, lower, upper };
}

function magnitude(field: string, text: string, limit: number, unit: string, expected: string): Checked<number> {
  const n = numberOf(field, text, expected);
  if (!n.ok) return n;
  const { value, text: shown } = n.value;
  if (!(Math.abs(value) <= limit)) return fail(`${field}: ${shown}${unit} is beyond ±${formatCount(limit)}${unit}; expected ${expected}.`);
  return { ok: true, value };
}

/** Link length limits, mm: both empty for none, or 0 ≤ shortest < longest ≤ MAX_CONSTRAINT_MM. */
export function checkLinkLengths(fromText: string, toText: string): PairChecked<readonly [number, number] | null> {
  const from = 'Shortest link length';
  const to = 'Longest link length';
  const expected = `a length from 0 to ${formatCount(MAX_CONSTRAINT_MM)} mm`;
  const a = readDecimal(fromText);
  const b = readDecimal(toText);
  if (a.kind === 'empty' && b.kind === 'empty') return { ok: true, value: null };
  if (a.kind === 'empty') return pairFail(`${from}: empty; give both lengths, or empty both for no limit.`, null);
  if (b.kind === 'empty') return pairFail(null, `${to}: empty; give both lengths, or empty both for no limit.`);
  const lo = magnitude(from, fromText, MAX_CONSTRAINT_MM, ' mm', expected);
  const hi = magnitude(to, toText, MAX_CONSTRAINT_MM, ' mm', expected);
  if (!lo.ok || !hi.ok) return pairFail(lo.ok ? null : lo.message, hi.ok ? null : hi.message);
  if (!(lo.value >= 0)) return pairFail(`${from}: ${formatValue(lo.value)} mm is below 0; expected ${expected}.`, null);
  if (!(hi.value > lo.value)) return pairFail(null, `${to}: ${formatValue(hi.value)} mm is not above the shortest, ${formatValue(lo.value)} mm; expected a longest length above the shortest.`);
  return { ok: true, value: [lo.value, hi.value] };
}

/**
 * A variable's bounds: two numbers within ±MAX_BOUND_MAGNITUDE, lower below upper. A
 * reversed or empty range is refused with its reason, never swapped or widened.
 */
export function checkBounds(variable: string, unit: string, lowerText: string, upperText: string): PairChecked<readonly [number, number]> {
  const u = unit.length > 0 ? ` ${unit}` : '';
  const expected = `a bound from −${formatCount(MAX_BOUND_MAGNITUDE)} to ${formatCount(MAX_BOUND_MAGNITUDE)}${u}`;
  const lo = magnitude(`${variable}, lower bound`, lowerText, MAX_BOUND_MAGNITUDE, u, expected);
  const hi = magnitude(`${variable}, upper bound`, upperText, MAX_BOUND_MAGNITUDE, u, expected);
  if (!lo.ok || !hi.ok) return pairFail(lo.ok ? null : lo.message, hi.ok ? null : hi.message);
  const [a, b] = [formatValue(lo.value), formatValue(hi.value)];
  if (lo.value > hi.value) {
    const message = `${variable}: the lower bound ${a}${u} is above the upper bound ${b}${u}; expected the lower bound below the upper (swap them to search ${b} to ${a}${u}).`;
    return pairFail(message, message);
  }
  if (!(lo.value < hi.value)) {
    const message = `${variable}: the lower and upper bounds are both ${a}${u}; expected the lower bound below the upper, a range to search.`;
    return pairFail(message, message);
  }
  return { ok: true, value: [lo.value, hi.value] };
}

/** A keep-out circle, mm: centre within ±MAX_CONSTRAINT_MM, radius above 0 and at most MAX_CONSTRAINT_MM. */
export function checkKeepOut(xText: string, yText: string, rText: string): Checked<{ x: number; y: number; r: number }> {
  const expected = `a centre x and y and a radius in mm, each at most ${formatCount(MAX_CONSTRAINT_MM)} mm in size, the radius above 0`;
  const x = magnitude('Keep-out circle, centre x', xText, MAX_CONSTRAINT_MM, ' mm', expected);
  if (!x.ok) return x;
  const y = magnitude('Keep-out circle, centre y', yText, MAX_CONSTRAINT_MM, ' mm', expected);
  if (!y.ok) return y;
  const r = magnitude('Keep-out circle, radius', rText, MAX_CONSTRAINT_MM, ' mm', expected);
  if (!r.ok) return r;
  if (!(r.value > 0)) return fail(`Keep-out circle, radius: ${formatValue(r.value)} mm is not above 0; expected ${expected}.`);
  return { ok: true, value: { x: x.value, y: y.value, r: r.value } };
}

export function checkProjectName(text: string): Checked<string> {
  const name = text.trim();
  if (name.length === 0) return fail('Project name: empty; expected a name for the project.');
  return { ok: true, value: name };
}
