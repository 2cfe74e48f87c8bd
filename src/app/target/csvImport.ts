/** From CSV text (pasted or from a file) to the action that replaces the target, or the one that reports why not. */
import { MAX_POINTS_CSV_CHARS, delimiterName, parsePointsCsv, type PointsCsvResult } from '../../core/io/pointsCsv';
import type { Action } from '../state/reducer';
import type { TargetState } from '../state/project';

/**
 * The table says itself whether the path closes (its last row repeats the first): a
 * pasted open path after a closed one is open, and the notice says which it is.
 */
export function importCsvAction(text: string, source: string, current: TargetState): Action {
  return importTableAction(parsePointsCsv(text), source, current);
}

/** The same, from what the reader made of the text (in a worker, for a long text). */
export function importTableAction(table: PointsCsvResult, source: string, current: TargetState): Action {
  if (!table.ok) return { type: 'target/import-failed', issues: table.issues, source };
  const weights = table.weights;
  const points = table.points.map((p, i) => {
    const at = { x: p.x, y: p.y, driverDeg: table.driverDeg?.[i] ?? null };
    return weights === null ? at : { ...at, weight: weights[i] };
  });
  const read = [
    `${delimiterName(table.delimiter)}-separated${table.decimalComma ? ', decimal comma' : ''}${table.header === null ? ', no header' : `, columns ${table.header.join(' | ')}`}`,
  ];
  read.push(
    table.closedByRepeat
      ? 'The last row repeated the first, so it was dropped and the path is closed.'
      : 'The last row does not repeat the first, so the path is open. To make a loop, tick "Closed path" or end the table with its first point.',
  );
  if (table.driverDeg !== null) {
    read.push(
      table.driverUnit === 'rad'
        ? 'Crank angles were read in radians (the column says rad) and are shown in degrees, so the timing is set to prescribed.'
        : 'Crank angles were read in degrees, so the timing is set to prescribed.',
    );
  }
  if (weights !== null) read.push(`Weights were read (from ${Math.min(...weights)} to ${Math.max(...weights)}); they are in the weight column of the point table and the search uses them.`);
  return {
    type: 'target/replace',
    points,
    closed: table.closedByRepeat,
    timing: table.driverDeg !== null ? 'prescribed' : current.timing === 'prescribed' ? 'unprescribed' : current.timing,
    notice: { kind: 'info', title: `Read ${points.length} points from ${source}`, lines: read },
  };
}

/**
 * Longest text the CSV box takes to edit, characters (about 1,500 rows). A text area lays
 * out all its text again on every edit: without a GPU, tens of kB already take a second
 * an edit. Longer text is read directly instead, in a worker (csvParse.ts).
 */
export const MAX_CSV_BOX_CHARS = 16_000;

/** Text too large to be a target (a file, or a paste) is refused before it is read: the reader's own limit. */
export function tooLargeAction(chars: number, source: string, what: 'file' | 'text'): Action | null {
  if (chars <= MAX_POINTS_CSV_CHARS) return null;
  return {
    type: 'target/import-failed',
    source,
    issues: [{ row: 0, message: `the ${what} is ${Math.round(chars / 1000)} kB; a target ${what === 'file' ? 'file' : 'pasted as text'} may be at most ${MAX_POINTS_CSV_CHARS / 1000} kB` }],
  };
}

/** A file too large to be a target is refused before it is read. */
export function fileTooLarge(file: { readonly size: number; readonly name: string }): Action | null {
  return tooLargeAction(file.size, file.name, 'file');
}
