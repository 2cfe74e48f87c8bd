/**
 * What the point table's cells accept, checked as the user types: a value, or a message
 * that names the point and the field, says what is wrong and what is expected. The
 * limits are the problem's (src/core/synthesis/problem.ts), so a value a cell accepts is
 * one a search accepts.
 */
import { MAX_DRIVER_VALUE_RAD, MAX_TARGET_COORDINATE_MM, MAX_WEIGHT } from '../../core/synthesis/problem';
import { formatCount, readDecimal, type Checked } from '../state/fields';

/** Largest |crank angle| a cell takes, degrees: the problem's limit in radians, rounded down to a whole degree. */
export const MAX_CELL_ANGLE_DEG = Math.floor((MAX_DRIVER_VALUE_RAD * 180) / Math.PI);

function fail<T>(message: string): Checked<T> {
  return { ok: false, message };
}

/** x or y of point `n` (1-based), mm: required, within ±MAX_TARGET_COORDINATE_MM. */
export function checkCoordinate(axis: 'x' | 'y', n: number, text: string): Checked<number> {
  const field = `Point ${n}, ${axis}`;
  const expected = `a coordinate in mm from −${formatCount(MAX_TARGET_COORDINATE_MM)} to ${formatCount(MAX_TARGET_COORDINATE_MM)}`;
  const read = readDecimal(text);
  if (read.kind === 'empty') return fail(`${field}: empty; expected ${expected} (a point needs both x and y; delete the row to remove the point).`);
  if (read.kind === 'bad') return fail(`${field}: "${read.text}" is not a number; expected ${expected}.`);
  if (!(Math.abs(read.value) <= MAX_TARGET_COORDINATE_MM)) return fail(`${field}: ${read.text} mm is beyond ±${formatCount(MAX_TARGET_COORDINATE_MM)} mm; expected ${expected}.`);
  return { ok: true, value: read.value };
}

/** Crank angle of point `n`, degrees; empty for none (prescribed timing then lists the point as missing one). */
export function checkCrankAngle(n: number, text: string): Checked<number | null> {
  const field = `Point ${n}, crank angle`;
  const expected = `an angle in degrees from −${formatCount(MAX_CELL_ANGLE_DEG)} to ${formatCount(MAX_CELL_ANGLE_DEG)}`;
  const read = readDecimal(text);
  if (read.kind === 'empty') return { ok: true, value: null };
  if (read.kind === 'bad') return fail(`${field}: "${read.text}" is not a number; expected ${expected}.`);
  if (!(Math.abs(read.value) <= MAX_CELL_ANGLE_DEG)) return fail(`${field}: ${read.text}° is beyond ±${formatCount(MAX_CELL_ANGLE_DEG)}°; expected ${expected}.`);
  return { ok: true, value: read.value };
}

/**
 * Weight of point `n`: 0 … MAX_WEIGHT, and not 0 when every other point's weight is 0
 * (`othersAllZero`), since a target with no weight anywhere has nothing to fit.
 */
export function checkWeight(n: number, text: string, othersAllZero: boolean): Checked<number> {
  const field = `Point ${n}, weight`;
  const expected = `a weight from 0 to ${formatCount(MAX_WEIGHT)} (weights are relative)`;
  const read = readDecimal(text);
  if (read.kind === 'empty') return fail(`${field}: empty; expected ${expected}.`);
  if (read.kind === 'bad') return fail(`${field}: "${read.text}" is not a number; expected ${expected}.`);
  if (!(read.value >= 0)) return fail(`${field}: ${read.text} is below 0; expected ${expected}.`);
  if (!(read.value <= MAX_WEIGHT)) return fail(`${field}: ${read.text} is above ${formatCount(MAX_WEIGHT)}; expected ${expected}: scale the weights down.`);
  if (!(read.value > 0) && othersAllZero) return fail(`${field}: 0 would make every weight 0; expected at least one point with a weight above 0.`);
  return { ok: true, value: read.value };
}
