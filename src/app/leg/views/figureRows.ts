/**
 * The gait figures in words, one row each with its unit, for the figure list of one leg
 * and the side-by-side table of several: one source for both. The duty factor always
 * carries its stance tolerance.
 */
import type { GaitFigures, TurnRange } from '../../../core/gait';
import { figure } from '../../suspension/labels';
import { turnRangeText } from './legGeometry';

export interface FigureRow {
  readonly key: string;
  readonly label: string;
  readonly value: string;
  /** A longer word on how the figure is read, for a tooltip. */
  readonly hint?: string;
}

function formatMm(v: number): string {
  return Number.isFinite(v) ? `${figure(v)} mm` : '—';
}

function formatDeg(v: number): string {
  return Number.isFinite(v) ? `${v.toFixed(1)}°` : '—';
}

function mmPerRad(v: number): string {
  return Number.isFinite(v) ? `${figure(v)} mm/rad` : '—';
}

function turnRanges(ranges: readonly TurnRange[]): string {
  return ranges.length === 0 ? 'none' : ranges.map((r) => turnRangeText(r.fromRad, r.toRad)).join(', ');
}

export function gaitFigureRows(figures: GaitFigures): FigureRow[] {
  const s = figures.longestStance;
  const tol = figures.dutyFactor.toleranceMm;
  const rows: FigureRow[] = [
    {
      key: 'duty',
      label: 'Duty factor',
      value: `${figure(figures.dutyFactor.value, 3)} (${figure(100 * figures.dutyFactor.value, 3)} % of the turn) at a stance tolerance of ±${figure(tol)} mm`,
      hint: 'the share of the crank turn with the foot within the stance tolerance of the ground line',
    },
    { key: 'stance', label: 'Stance (crank angle)', value: turnRanges(figures.stance.intervals), hint: 'from the reference pose, in the crank’s direction; a range such as 350°–40° runs through 0°' },
    { key: 'stride', label: 'Stride (longest stance)', value: s === null ? '— (no stance)' : formatMm(s.strideMm) },
    { key: 'stepHeight', label: 'Step height', value: formatMm(figures.stepHeightMm), hint: 'the greatest height of the foot above the ground line' },
    { key: 'lowest', label: 'Lowest foot height', value: formatMm(figures.lowestMm), hint: `below −${figure(tol)} mm the foot digs into the ground` },
    {
      key: 'flatness',
      label: 'Flatness in stance',
      value: s === null ? '—' : `${formatMm(s.flatness.peakToPeakMm)} peak to peak, ${formatMm(s.flatness.rmsMm)} RMS`,
    },
    {
      key: 'speed',
      label: 'Backward foot speed in stance',
      value: s === null ? '—' : `${mmPerRad(s.speed.minMmPerRad)} to ${mmPerRad(s.speed.maxMmPerRad)}, mean ${mmPerRad(s.speed.meanMmPerRad)}`,
      hint: 'mm per radian of crank (mm/s at 1 rad/s); positive pushes the body forward',
    },
    {
      key: 'variation',
      label: 'Speed variation in stance',
      value: s === null ? '—' : s.speed.variation === null ? '— (the foot does not push backwards)' : `${figure(100 * s.speed.variation, 3)} % of the mean`,
    },
  ];
  const g = figures.transmission.guidelineDeg;
  figures.transmission.loops.forEach((loop, i) => {
    const worst = loop.worstInStanceDeg;
    const outside = loop.outside.length === 0 ? `within ${g.min}°–${g.max}°` : `outside ${g.min}°–${g.max}° at ${turnRanges(loop.outside)}`;
    rows.push({
      key: `transmission${i}`,
      label: `Transmission in stance, loop ${loop.jointIds.join('–')}`,
      value: worst === null ? '— (no stance)' : `worst ${formatDeg(worst)} from the dead centre, ${outside}`,
      hint: 'the least of μ and 180° − μ over the stance',
    });
  });
  rows.push(
    { key: 'size', label: 'Leg size', value: `${figure(figures.size.widthMm)} × ${figure(figures.size.heightMm)} mm`, hint: 'the box holding every joint and point over the turn' },
    { key: 'steps', label: 'Samples per turn', value: String(figures.steps) },
  );
  return rows;
}
