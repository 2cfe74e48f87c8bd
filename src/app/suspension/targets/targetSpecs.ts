/**
 * Each target in words and units, as the panel labels it and the messages name it, and
 * which of a TargetDraft's fields it reads. One table for the panel and the reader.
 */
import { DEFAULT_TOLERANCES } from '../../../core/synthesis/suspensionProblem';
import type { TargetKey, TargetTextField } from './setup';

export interface TargetSpec {
  readonly title: string;
  /** The unit of the band, limit or curve values; '' for the leverage ratio (a plain number). */
  readonly unit: string;
  readonly defaultTolerance: number;
  /** Text fields read, besides weight and tolerance (the leverage ratio's depend on its form). */
  readonly fields: readonly TargetTextField[];
  /** Bands and limits count as a constraint or a penalty; curves always add to the value. */
  readonly hasMode: boolean;
  readonly note: string;
}

export const TARGET_SPECS: Readonly<Record<TargetKey, TargetSpec>> = {
  axlePath: {
    title: 'Axle path',
    unit: 'mm',
    defaultTolerance: DEFAULT_TOLERANCES.axlePathMm,
    fields: ['points'],
    hasMode: false,
    note: 'rear axle x over vertical wheel travel: pairs "travel mm, axle x mm", one a line',
  },
  leverageRatio: {
    title: 'Leverage ratio',
    unit: '',
    defaultTolerance: DEFAULT_TOLERANCES.leverageRatio,
    fields: ['start', 'end', 'exponent', 'points'],
    hasMode: false,
    note: 'wheel travel per shock shortening; shape: start + (end − start)·u^exponent, u the share of the travel',
  },
  antiSquatAtSag: {
    title: 'Anti-squat at sag',
    unit: '%',
    defaultTolerance: DEFAULT_TOLERANCES.antiSquatPct,
    fields: ['min', 'max', 'cogs'],
    hasMode: true,
    note: 'a band, in each of the cogs given',
  },
  antiRiseAtSag: {
    title: 'Anti-rise at sag',
    unit: '%',
    defaultTolerance: DEFAULT_TOLERANCES.antiRisePct,
    fields: ['min', 'max'],
    hasMode: true,
    note: 'a band; brake on the axle-carrying body',
  },
  travelMm: {
    title: 'Wheel travel',
    unit: 'mm',
    defaultTolerance: DEFAULT_TOLERANCES.travelMm,
    fields: ['min', 'max'],
    hasMode: true,
    note: 'the vertical wheel travel the stroke gives',
  },
  chainGrowthMm: {
    title: 'Chain growth',
    unit: 'mm',
    defaultTolerance: DEFAULT_TOLERANCES.chainGrowthMm,
    fields: ['max', 'cogs'],
    hasMode: true,
    note: 'largest |chain growth| over the travel; cogs empty: every cog',
  },
  kickbackDeg: {
    title: 'Pedal kickback',
    unit: '°',
    defaultTolerance: DEFAULT_TOLERANCES.kickbackDeg,
    fields: ['max', 'cogs'],
    hasMode: true,
    note: 'largest |pedal kickback| over the travel; cogs empty: every cog',
  },
};

/** The fields a target reads in its present form. */
export function fieldsOf(key: TargetKey, form: 'shape' | 'points'): readonly TargetTextField[] {
  if (key !== 'leverageRatio') return TARGET_SPECS[key].fields;
  return form === 'shape' ? ['start', 'end', 'exponent'] : ['points'];
}

/** A field's name in a label or a message, with its unit. */
export function targetFieldLabel(key: TargetKey, field: TargetTextField): string {
  const u = TARGET_SPECS[key].unit;
  const withUnit = (w: string) => (u === '' ? w : `${w} (${u})`);
  switch (field) {
    case 'points':
      return key === 'axlePath' ? 'points (travel mm, axle x mm)' : 'points (travel mm, leverage ratio)';
    case 'start':
      return 'start, at full extension';
    case 'end':
      return 'end, at full travel';
    case 'exponent':
      return 'shape exponent (1: straight; empty: 1)';
    case 'min':
      return withUnit('from');
    case 'max':
      return withUnit(TARGET_SPECS[key].fields.includes('min') ? 'to' : 'at most');
    case 'cogs':
      return 'cogs (teeth)';
    case 'weight':
      return 'weight (empty: 1)';
    case 'tolerance':
      return `tolerance${u === '' ? '' : ` (${u})`} (empty: ${TARGET_SPECS[key].defaultTolerance})`;
  }
}
