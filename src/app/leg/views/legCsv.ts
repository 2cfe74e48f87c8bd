/**
 * The curves of a leg over one crank turn as CSV (RFC 4180, CRLF line ends): the caution
 * as a `#` comment line (a file travels without the page that showed it), the header
 * with the unit in each column's name, then one row per sample of the turn. Numbers are
 * written in full (the shortest decimal that reads back to the same double).
 */
import { GAIT_CAUTION, type GaitFigures } from '../../../core/gait';
import { DEG_PER_RAD, stanceMask } from './legGeometry';

export const LEG_CSV_COLUMNS = ['crank_angle_deg', 'x_mm', 'y_mm', 'height_mm', 'along_mm', 'backward_speed_mm_per_rad', 'in_stance'] as const;

/** A text cell, quoted when it holds a comma, a quote or a line end (RFC 4180). */
function textCell(text: string): string {
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

function numberCell(v: number): string {
  return Number.isFinite(v) ? String(v) : '';
}

function rows(figures: GaitFigures, label: string | undefined): string[] {
  const p = figures.path;
  const stance = stanceMask(figures);
  const lead = label === undefined ? '' : `${textCell(label)},`;
  const out: string[] = [];
  for (let k = 0; k < p.turnRad.length; k++) {
    const cells = [p.turnRad[k] * DEG_PER_RAD, p.xMm[k], p.yMm[k], p.heightMm[k], p.alongMm[k], -p.alongRateMmPerRad[k]].map(numberCell);
    out.push(`${lead}${cells.join(',')},${stance[k]}`);
  }
  return out;
}

function header(labelled: boolean): string {
  return `${labelled ? 'leg,' : ''}${LEG_CSV_COLUMNS.join(',')}`;
}

/**
 * The foot's curves at every sample of the turn (the last row is the first pose again,
 * at 360°): crank angle from the reference pose, the foot's position, its height above
 * the ground line and position along it, its backward speed along the ground (mm per rad
 * of crank; positive pushes the body forward) and whether it is in stance (1) or not (0),
 * from the core's stance intervals. A label adds a first column naming the leg.
 */
export function legCurvesCsv(figures: GaitFigures, label?: string): string {
  const lines = [`# ${GAIT_CAUTION}`, header(label !== undefined), ...rows(figures, label)];
  return `${lines.join('\r\n')}\r\n`;
}

/** Several legs' curves in one file, one block of rows per leg, its label in the first column. */
export function legCompareCsv(legs: readonly { readonly label: string; readonly figures: GaitFigures }[]): string {
  const lines = [`# ${GAIT_CAUTION}`, header(true), ...legs.flatMap((l) => rows(l.figures, l.label))];
  return `${lines.join('\r\n')}\r\n`;
}
