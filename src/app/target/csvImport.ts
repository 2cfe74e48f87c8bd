/** From CSV text (pasted or from a file) to the action that replaces the target, or the one that reports why not. */
import { MAX_POINTS_CSV_CHARS, delimiterName, parsePointsCsv } from '../../core/io/pointsCsv';
import type { Action } from '../state/reducer';
import type { TargetState } from '../state/project';

export function importCsvAction(text: string, source: string, current: TargetState): Action {
  const table = parsePointsCsv(text);
  if (!table.ok) return { type: 'target/import-failed', issues: table.issues, source };
  const points = table.points.map((p, i) => ({ x: p.x, y: p.y, driverDeg: table.driverDeg?.[i] ?? null }));
  const read = [
    `${delimiterName(table.delimiter)}-separated${table.decimalComma ? ', decimal comma' : ''}${table.header === null ? ', no header' : `, columns ${table.header.join(' | ')}`}`,
  ];
  if (table.closedByRepeat) read.push('The last row repeated the first, so it was dropped and the path is closed.');
  if (table.driverDeg !== null) read.push('Crank angles were read (degrees), so the timing is set to prescribed.');
  if (table.weights !== null) read.push(weightsLine(table.weights));
  return {
    type: 'target/replace',
    points,
    closed: table.closedByRepeat ? true : current.closed,
    timing: table.driverDeg !== null ? 'prescribed' : current.timing === 'prescribed' ? 'unprescribed' : current.timing,
    notice: { kind: 'info', title: `Read ${points.length} points from ${source}`, lines: read },
  };
}

/** The page weights every point equally: say so when the file's weights differ, rather than drop them unseen. */
function weightsLine(weights: readonly number[]): string {
  if (weights.every((w) => w === weights[0])) return 'The weight column gives every point the same weight, as this page does.';
  return 'The weight column was read but is not used: this page weights every point equally. To fit with these weights, write them as target.weights in a problem file and run loci fit.';
}

/** A file too large to be a target is refused before it is read. */
export function fileTooLarge(file: { readonly size: number; readonly name: string }): Action | null {
  if (file.size <= MAX_POINTS_CSV_CHARS) return null;
  return {
    type: 'target/import-failed',
    source: file.name,
    issues: [{ row: 0, message: `the file is ${Math.round(file.size / 1000)} kB; a target file may be at most ${MAX_POINTS_CSV_CHARS / 1000} kB` }],
  };
}
