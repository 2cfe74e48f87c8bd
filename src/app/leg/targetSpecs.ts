/** How the set-up names each gait target, its figure's unit and its tolerance's default, in the page's words. */
import type { LegTargetKey } from './setup';

export interface TargetSpec {
  readonly label: string;
  readonly valueLabel: string;
  readonly value2Label?: string;
  readonly unit: string;
  readonly toleranceUnit: string;
  readonly toleranceDefault: string;
}

export const TARGET_SPECS: Readonly<Record<LegTargetKey, TargetSpec>> = {
  strideMm: { label: 'Stride', valueLabel: 'Stride wanted', unit: 'mm', toleranceUnit: 'mm', toleranceDefault: 'the stance tolerance' },
  stepHeightMm: { label: 'Step height', valueLabel: 'Step height wanted', unit: 'mm', toleranceUnit: 'mm', toleranceDefault: 'the stance tolerance' },
  minDutyFactor: { label: 'Minimum duty factor', valueLabel: 'Duty factor at least', unit: 'of the turn', toleranceUnit: '', toleranceDefault: '0.05' },
  maxFlatnessMm: { label: 'Maximum stance flatness (peak-to-peak)', valueLabel: 'Flatness at most', unit: 'mm', toleranceUnit: 'mm', toleranceDefault: 'the stance tolerance' },
  maxSpeedVariation: { label: 'Maximum stance speed variation', valueLabel: 'Variation at most', unit: '(max − min)/mean', toleranceUnit: '', toleranceDefault: '0.05' },
  minTransmissionDegInStance: { label: 'Minimum transmission angle in stance', valueLabel: 'Angle at least', unit: '°', toleranceUnit: '°', toleranceDefault: '5°' },
  sizeBoxMm: { label: 'Size box', valueLabel: 'Width at most', value2Label: 'Height at most', unit: 'mm', toleranceUnit: 'mm', toleranceDefault: 'the stance tolerance' },
};
