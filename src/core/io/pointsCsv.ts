/**
 * Target points from CSV text: x and y in mm, and optionally a crank angle per point
 * (prescribed timing) and a weight. Reads what spreadsheets and measuring tools write:
 * with or without a header row; comma, semicolon or tab between values; quoted values
 * (RFC 4180, also with spaces around them and line breaks inside); a decimal comma
 * where the separator is not a comma; a byte-order mark; blank lines.
 *
 * Expected failures are values: `{ ok: false, issues }`, each issue naming the row (the
 * line of the text where it starts, as a text editor numbers lines) and what is wrong,
 * so the caller can keep the current target and show the messages. Every value is held
 * to the limits of a problem (src/core/synthesis/problem.ts), so what this reads a
 * search can use.
 */
import Papa from 'papaparse';
import { MAX_LISTED_ISSUES } from './schemaMessages';
import {
  MAX_TARGET_COORDINATE_MM,
  MAX_DRIVER_VALUE_RAD,
  MAX_TARGET_POINTS,
  MAX_WEIGHT,
  MIN_TARGET_SPAN_MM,
  MIN_TARGET_SPAN_SHARE,
  minTargetSpanMm,
} from '../synthesis/problem';
import { MIN_TARGET_POINTS } from '../synthesis/target';

export { MAX_LISTED_ISSUES, MAX_TARGET_POINTS, MIN_TARGET_POINTS };

/** A target file larger than this is refused before it is parsed (characters, about bytes). */
export const MAX_POINTS_CSV_CHARS = 1_000_000;
/** Two points closer than this (mm) are the same point. */
export const REPEATED_POINT_TOL_MM = 1e-6;
/** Largest |crank angle| in degrees: MAX_DRIVER_VALUE_RAD, rounded down to a whole degree. */
const MAX_DRIVER_DEG = Math.floor((MAX_DRIVER_VALUE_RAD * 180) / Math.PI);

export type CsvDelimiter = ',' | ';' | '\t';

export interface CsvIssue {
  /** 1-based line of the text where the row starts (header and blank lines counted); 0 for the file as a whole. */
  readonly row: number;
  readonly message: string;
}

export interface PointsTable {
  /** x, y in mm, in file order. */
  readonly points: readonly { readonly x: number; readonly y: number }[];
  /** Crank angle of each point in degrees, when the file has a timing column. */
  readonly driverDeg: readonly number[] | null;
  /** The unit the timing column was written in (its values are converted to degrees above); null without one. */
  readonly driverUnit: 'deg' | 'rad' | null;
  /** Weight of each point, when the file has a weight column. */
  readonly weights: readonly number[] | null;
  /** The last row repeated the first: it was dropped, and the path is closed. */
  readonly closedByRepeat: boolean;
  readonly delimiter: CsvDelimiter;
  readonly decimalComma: boolean;
  /** The header row as written, or null when the file has none. */
  readonly header: readonly string[] | null;
}

export type PointsCsvResult = ({ readonly ok: true } & PointsTable) | { readonly ok: false; readonly issues: readonly CsvIssue[] };

type ColumnRole = 'x' | 'y' | 'driver' | 'weight';

interface Columns {
  readonly x: number;
  readonly y: number;
  readonly driver: number;
  readonly weight: number;
  /** The driver column is in radians (its header says so); degrees otherwise. */
  readonly driverRad: boolean;
}

const DELIMITER_NAMES: Record<CsvDelimiter, string> = { ',': 'comma', ';': 'semicolon', '\t': 'tab' };

// One number: optional sign, digits with one decimal point or comma, optional exponent.
const NUMBER_PATTERN = /^[+-]?(?:\d+(?:[.,]\d*)?|[.,]\d+)(?:[eE][+-]?\d+)?$/;

function parseNumber(cell: string): number | null {
  const text = cell.trim();
  if (!NUMBER_PATTERN.test(text)) return null;
  const value = Number(text.replace(',', '.'));
  return Number.isFinite(value) ? value : null;
}

/** The separator the file uses: a tab anywhere wins, then a semicolon, else a comma. */
function detectDelimiter(text: string): CsvDelimiter {
  if (text.includes('\t')) return '\t';
  if (text.includes(';')) return ';';
  return ',';
}

function roleOfHeader(name: string): ColumnRole | null {
  const n = name.trim().toLowerCase();
  // "x", "x_mm", "x (mm)", "X [mm]", but not "xpos".
  if (/^x(?![a-z])/.test(n)) return 'x';
  if (/^y(?![a-z])/.test(n)) return 'y';
  if (/angle|theta|crank|driver|timing|input|\bdeg|\brad/.test(n)) return 'driver';
  if (/weight|^w$/.test(n)) return 'weight';
  return null;
}

function isRadians(name: string): boolean {
  return /\brad|\(rad\)|_rad\b|radian/.test(name.trim().toLowerCase());
}

function show(cell: string): string {
  const t = cell.trim();
  return t.length > 24 ? `"${t.slice(0, 24)}…"` : `"${t}"`;
}

function columnsFromHeader(header: readonly string[], row: number): { ok: true; columns: Columns } | { ok: false; issue: CsvIssue } {
  const index: Record<ColumnRole, number> = { x: -1, y: -1, driver: -1, weight: -1 };
  header.forEach((name, k) => {
    const role = roleOfHeader(name);
    if (role !== null && index[role] === -1) index[role] = k;
  });
  if (index.x === -1 && index.y === -1 && header.length >= 2) {
    // A header with names we do not know ("a;b"): the first two columns are x and y.
    index.x = 0;
    index.y = 1;
  }
  if (index.x === -1 || index.y === -1) {
    return {
      ok: false,
      issue: { row, message: `row ${row}, the header, names no ${index.x === -1 ? 'x' : 'y'} column; expected columns named x and y (mm), and optionally angle (deg) and weight` },
    };
  }
  const driverRad = index.driver !== -1 && isRadians(header[index.driver]);
  return { ok: true, columns: { ...index, driverRad } };
}

function columnsFromWidth(width: number, row: number, delimiter: CsvDelimiter): { ok: true; columns: Columns } | { ok: false; issue: CsvIssue } {
  if (width === 2) return { ok: true, columns: { x: 0, y: 1, driver: -1, weight: -1, driverRad: false } };
  if (width === 3) return { ok: true, columns: { x: 0, y: 1, driver: 2, weight: -1, driverRad: false } };
  return {
    ok: false,
    issue: {
      row,
      message:
        `row ${row} has ${width} value${width === 1 ? '' : 's'}; expected 2 (x, y in mm) or 3 (x, y, crank angle in degrees)` +
        (width === 1 ? ', separated by a comma, semicolon or tab' : ', or a header row naming the columns') +
        (width === 4 && delimiter === ',' ? '; numbers with a decimal comma need a semicolon or a tab between values' : ''),
    },
  };
}

function isBlank(cells: readonly string[]): boolean {
  return cells.every((c) => c.trim().length === 0);
}

interface CsvRecord {
  /** The line of the text where the record starts, 1-based. */
  readonly line: number;
  readonly cells: string[];
}

/** A cell as written, less the spaces around it and the quotes of a quoted value that had a space before it. */
function unquoteSpaced(cell: string): string {
  const t = cell.trim();
  return t.length >= 2 && t.startsWith('"') && t.endsWith('"') ? t.slice(1, -1).replace(/""/g, '"') : cell;
}

/** Line breaks (LF, CRLF or a lone CR) in text[from, to). */
function lineBreaks(text: string, from: number, to: number): number {
  let count = 0;
  for (let i = from; i < to; i++) {
    const c = text.charCodeAt(i);
    if (c === 10 || (c === 13 && text.charCodeAt(i + 1) !== 10)) count++;
  }
  return count;
}

/**
 * Splits CSV text into records with papaparse (RFC 4180, Shafranovich 2005), numbering
 * each record by the line of the text it starts on, so a quoted value with a line break
 * in it does not shift the rows after it. A value quoted after a space (`x, "y"`) is
 * read as the quoted value. Stops at the first malformed quote.
 */
function splitRecords(text: string, delimiter: CsvDelimiter): { records: CsvRecord[]; issue: CsvIssue | null } {
  const records: CsvRecord[] = [];
  let issue: CsvIssue | null = null;
  let start = 0;
  let line = 1;
  Papa.parse<string[]>(text, {
    delimiter,
    skipEmptyLines: false,
    step: (result, parser) => {
      const error = result.errors[0];
      if (error !== undefined) {
        const message = error.code === 'MissingQuotes'
          ? `row ${line} has a quote that is never closed`
          : `row ${line} has a quote in the wrong place; a quoted value ends with a quote before the separator or the end of the line`;
        issue = { row: line, message };
        parser.abort();
        return;
      }
      records.push({ line, cells: result.data.map(unquoteSpaced) });
      const end = result.meta.cursor;
      line += lineBreaks(text, start, end);
      start = end;
    },
  });
  return { records, issue };
}

/**
 * For each of the first `count` points, the first earlier point within `tolMm` of it, or
 * −1. A grid of cells `tolMm` wide: a point within tolMm is in one of the 3 × 3 cells
 * around, so the check is linear in the points (expected), not quadratic.
 */
export function firstRepeats(xs: ArrayLike<number>, ys: ArrayLike<number>, count: number, tolMm: number): Int32Array {
  const repeats = new Int32Array(count).fill(-1);
  const cells = new Map<string, number[]>();
  for (let i = 0; i < count; i++) {
    const cx = Math.floor(xs[i] / tolMm);
    const cy = Math.floor(ys[i] / tolMm);
    let first = -1;
    for (let dx = -1; dx <= 1; dx++) {
      for (let dy = -1; dy <= 1; dy++) {
        const near = cells.get(`${cx + dx},${cy + dy}`);
        if (near === undefined) continue;
        for (const j of near) {
          if ((first === -1 || j < first) && Math.hypot(xs[i] - xs[j], ys[i] - ys[j]) <= tolMm) first = j;
        }
      }
    }
    repeats[i] = first;
    const key = `${cx},${cy}`;
    const own = cells.get(key);
    if (own === undefined) cells.set(key, [i]);
    else own.push(i);
  }
  return repeats;
}

/** Reads target points from CSV text; see the module comment for what it accepts. */
export function parsePointsCsv(input: string): PointsCsvResult {
  if (input.length > MAX_POINTS_CSV_CHARS) {
    const kb = Math.round(input.length / 1000);
    return { ok: false, issues: [{ row: 0, message: `the text is ${kb} kB; a target may be at most ${MAX_POINTS_CSV_CHARS / 1000} kB (${MAX_TARGET_POINTS} points)` }] };
  }
  const text = input.charCodeAt(0) === 0xfeff ? input.slice(1) : input;
  const delimiter = detectDelimiter(text);
  const split = splitRecords(text, delimiter);

  const issues: CsvIssue[] = [];
  let more = 0;
  const report = (issue: CsvIssue) => {
    if (issues.length < MAX_LISTED_ISSUES) issues.push(issue);
    else more++;
  };
  if (split.issue !== null) report(split.issue);

  const filled = split.records.filter((r) => !isBlank(r.cells)).map((r) => ({ row: r.line, cells: r.cells }));
  if (filled.length === 0) {
    return { ok: false, issues: issues.length > 0 ? issues : [{ row: 0, message: 'there are no points: expected rows of x and y in mm' }] };
  }

  const first = filled[0];
  // A header is a row of names only; a row mixing numbers and text is a data row with a mistake.
  const hasHeader =
    first.cells.some((c) => /\p{L}/u.test(c)) && first.cells.every((c) => c.trim().length === 0 || parseNumber(c) === null);
  const dataRows = hasHeader ? filled.slice(1) : filled;
  if (dataRows.length > MAX_TARGET_POINTS) {
    return { ok: false, issues: [{ row: 0, message: `there are ${dataRows.length} rows of points; a target may have at most ${MAX_TARGET_POINTS} (resample it first)` }] };
  }
  const found = hasHeader ? columnsFromHeader(first.cells, first.row) : columnsFromWidth(first.cells.length, first.row, delimiter);
  if (!found.ok) return { ok: false, issues: [found.issue] };
  const columns = found.columns;
  const width = first.cells.length;
  const needed = Math.max(columns.x, columns.y, columns.driver, columns.weight) + 1;
  const angleUnit = columns.driverRad ? 'rad' : '°';
  const angleLimit = columns.driverRad ? MAX_DRIVER_VALUE_RAD : MAX_DRIVER_DEG;

  const xs: number[] = [];
  const ys: number[] = [];
  const driver: number[] = [];
  const weights: number[] = [];
  const sourceRows: number[] = [];
  let decimalComma = false;
  for (const { row, cells } of dataRows) {
    if (cells.length !== width) {
      report({ row, message: `row ${row} has ${cells.length} value${cells.length === 1 ? '' : 's'}; the ${hasHeader ? 'header has' : 'first row has'} ${width}` });
      continue;
    }
    if (cells.length < needed) {
      report({ row, message: `row ${row} has ${cells.length} values; expected at least ${needed}` });
      continue;
    }
    const read = (k: number, what: string): number | null => {
      if (k === -1) return 0;
      const cell = cells[k];
      if (cell.trim().length === 0) {
        report({ row, message: `row ${row}: the ${what} value is empty` });
        return null;
      }
      const value = parseNumber(cell);
      if (value === null) report({ row, message: `row ${row}: ${what} is ${show(cell)}, which is not a number` });
      else if (cell.includes(',')) decimalComma = true;
      return value;
    };
    const x = read(columns.x, 'x');
    const y = read(columns.y, 'y');
    const d = read(columns.driver, 'the crank angle');
    const w = read(columns.weight, 'the weight');
    if (x === null || y === null || d === null || w === null) continue;
    if (!(Math.abs(x) <= MAX_TARGET_COORDINATE_MM && Math.abs(y) <= MAX_TARGET_COORDINATE_MM)) {
      report({ row, message: `row ${row}: the point (${x}, ${y}) has a coordinate beyond ±${MAX_TARGET_COORDINATE_MM} mm; move the target nearer the origin` });
      continue;
    }
    if (!(Math.abs(d) <= angleLimit)) {
      report({ row, message: `row ${row}: the crank angle is ${d}${angleUnit === 'rad' ? ' rad' : '°'}; expected an angle from −${angleLimit} to ${angleLimit}${angleUnit === 'rad' ? ' rad' : '°'}` });
      continue;
    }
    if (columns.weight !== -1 && !(w >= 0 && w <= MAX_WEIGHT)) {
      report({ row, message: `row ${row}: the weight is ${w}; expected a number ≥ 0${w >= 0 ? ` and at most ${MAX_WEIGHT} (weights are relative: scale them down)` : ''}` });
      continue;
    }
    xs.push(x);
    ys.push(y);
    driver.push(columns.driverRad ? (d * 180) / Math.PI : d);
    weights.push(w);
    sourceRows.push(row);
  }
  // The last row repeating the first closes the path: a common way to write a loop.
  let count = xs.length;
  let closedByRepeat = false;
  if (count > MIN_TARGET_POINTS && Math.hypot(xs[count - 1] - xs[0], ys[count - 1] - ys[0]) <= REPEATED_POINT_TOL_MM) {
    closedByRepeat = true;
    count--;
  }
  const repeats = firstRepeats(xs, ys, count, REPEATED_POINT_TOL_MM);
  for (let i = 0; i < count; i++) {
    const j = repeats[i];
    if (j !== -1) report({ row: sourceRows[i], message: `row ${sourceRows[i]} repeats the point of row ${sourceRows[j]} (x ${xs[i]}, y ${ys[i]} mm); each point must be different` });
  }
  if (issues.length === 0 && count < MIN_TARGET_POINTS) {
    report({ row: 0, message: `there ${count === 1 ? 'is 1 point' : `are ${count} points`}; a target needs at least ${MIN_TARGET_POINTS}` });
  }
  if (issues.length === 0) {
    let largest = 0;
    let minX = Infinity;
    let maxX = -Infinity;
    let minY = Infinity;
    let maxY = -Infinity;
    for (let i = 0; i < count; i++) {
      largest = Math.max(largest, Math.abs(xs[i]), Math.abs(ys[i]));
      minX = Math.min(minX, xs[i]);
      maxX = Math.max(maxX, xs[i]);
      minY = Math.min(minY, ys[i]);
      maxY = Math.max(maxY, ys[i]);
    }
    const span = Math.max(maxX - minX, maxY - minY);
    const needed = minTargetSpanMm(largest);
    if (!(span >= needed)) {
      report({ row: 0, message: `the points span ${span} mm; a target must span at least ${needed} mm (${MIN_TARGET_SPAN_MM} mm, and ${MIN_TARGET_SPAN_SHARE} × its largest coordinate) for its shape to be represented` });
    }
    if (columns.weight !== -1 && !weights.slice(0, count).some((w) => w > 0)) {
      report({ row: 0, message: 'every weight is 0; expected at least one point with a weight above 0' });
    }
  }
  if (issues.length > 0) {
    const listed = more > 0 ? [...issues, { row: 0, message: `and ${more} more problem${more === 1 ? '' : 's'}` }] : issues;
    return { ok: false, issues: listed };
  }
  const points = xs.slice(0, count).map((x, i) => ({ x, y: ys[i] }));
  return {
    ok: true,
    points,
    driverDeg: columns.driver === -1 ? null : driver.slice(0, count),
    driverUnit: columns.driver === -1 ? null : columns.driverRad ? 'rad' : 'deg',
    weights: columns.weight === -1 ? null : weights.slice(0, count),
    closedByRepeat,
    delimiter,
    decimalComma,
    header: hasHeader ? first.cells.map((c) => c.trim()) : null,
  };
}

/** The name of a separator, for messages ("semicolon"). */
export function delimiterName(delimiter: CsvDelimiter): string {
  return DELIMITER_NAMES[delimiter];
}

/** Target points as CSV text with a header (x, y in mm, and the crank angle when every point has one). */
/**
 * Target points as CSV the reader takes back: x and y in mm, the crank angle column when
 * every point has one, the weight column when every point has one (nothing the table
 * holds is dropped); a closed path ends with its first row again, as the reader reads a loop.
 */
export function formatPointsCsv(
  points: readonly { readonly x: number; readonly y: number; readonly driverDeg?: number | null; readonly weight?: number }[],
  options: { readonly closed?: boolean } = {},
): string {
  const withAngle = points.length > 0 && points.every((p) => typeof p.driverDeg === 'number');
  const withWeight = points.length > 0 && points.every((p) => typeof p.weight === 'number');
  const header = ['x_mm', 'y_mm', ...(withAngle ? ['angle_deg'] : []), ...(withWeight ? ['weight'] : [])].join(',');
  const row = (p: (typeof points)[number]) => [p.x, p.y, ...(withAngle ? [p.driverDeg] : []), ...(withWeight ? [p.weight] : [])].join(',');
  const rows = points.map(row);
  if (options.closed === true && points.length > 0) rows.push(row(points[0]));
  return [header, ...rows].join('\n') + '\n';
}
