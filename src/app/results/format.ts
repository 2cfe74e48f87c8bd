/**
 * How the results views write numbers and names: every length in mm, every angle in
 * degrees, with the unit beside the figure, and family ids in the trade's words.
 */
import { FAMILY_NAMES } from '../../core/synthesis';

export function familyName(family: string): string {
  return (FAMILY_NAMES as Readonly<Record<string, string>>)[family] ?? family;
}

/** Below this (mm) a length is written in exponent form, so a near-exact fit still shows its size. */
const EXPONENT_BELOW_MM = 1e-3;

/** A length in mm without the unit: about four significant figures, exponent form when tiny. */
export function formatMmValue(mm: number): string {
  if (!Number.isFinite(mm)) return '—';
  const size = Math.abs(mm);
  if (size < EXPONENT_BELOW_MM && size > 0) return mm.toExponential(2);
  if (size >= 1000) return mm.toFixed(0);
  if (size >= 100) return mm.toFixed(1);
  if (size >= 10) return mm.toFixed(2);
  return mm.toFixed(3);
}

export function formatMm(mm: number): string {
  return Number.isFinite(mm) ? `${formatMmValue(mm)} mm` : '—';
}

export function formatDeg(deg: number, decimals = 1): string {
  return Number.isFinite(deg) ? `${deg.toFixed(decimals)}°` : '—';
}

export function formatDegRange(range: { readonly min: number; readonly max: number } | undefined): string {
  if (range === undefined || !Number.isFinite(range.min) || !Number.isFinite(range.max)) return '—';
  return `${range.min.toFixed(0)}°–${range.max.toFixed(0)}°`;
}

/** Width × height of a bounding box, with " mm" unless the column header carries the unit. */
export function formatSize(size: { readonly widthMm: number; readonly heightMm: number }, withUnit = true): string {
  return `${formatMmValue(size.widthMm)} × ${formatMmValue(size.heightMm)}${withUnit ? ' mm' : ''}`;
}

/** A driver value in its display unit: degrees for a rotation driver, mm for a length driver. */
export function formatDriver(value: number, unit: 'deg' | 'mm'): string {
  return unit === 'deg' ? formatDeg(value) : formatMm(value);
}
