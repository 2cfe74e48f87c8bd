/**
 * The leg search's set-up as the user typed it: the foot trajectory's points, the ground
 * line, the stance tolerance, the crank's and the body's directions, the samples per
 * turn, the legs on one shaft and their phases, each target (optional, weighted, with a
 * tolerance), the pivot regions per family, the keep-out circles, the families, the
 * budget and the seed. Every number is kept as text, so a value being corrected is kept
 * too; `readLegSetup` reads them. Pure updates; nothing is clamped or rounded here.
 */
import type { PoseFamilyId } from '../../core/synthesis/poseFamilies';
import { LEG_FAMILY_IDS } from '../../core/synthesis/legProblem';
import type { KeepOutDraft } from '../suspension/targets/setup';

/** The gait targets besides the foot trajectory, in the order the panel lists them. */
export const LEG_TARGET_KEYS = ['strideMm', 'stepHeightMm', 'minDutyFactor', 'maxFlatnessMm', 'maxSpeedVariation', 'minTransmissionDegInStance', 'sizeBoxMm'] as const;
export type LegTargetKey = (typeof LEG_TARGET_KEYS)[number];

export interface PointDraft {
  readonly x: string;
  readonly y: string;
}

/** One target's fields: its figure (the size box has two), weight (empty: 1) and tolerance (empty: the core's default). */
export interface LegTargetDraft {
  readonly on: boolean;
  readonly value: string;
  /** The size box's height; unused by the other targets. */
  readonly value2: string;
  readonly weight: string;
  readonly tolerance: string;
}

export interface RegionDraft {
  readonly variable: string;
  readonly min: string;
  readonly max: string;
}

/** A keep-out circle as typed: the same draft as the suspension set-up's. */
export type { KeepOutDraft };

export interface LegSetup {
  readonly name: string;
  readonly footPath: { readonly on: boolean; readonly points: readonly PointDraft[]; readonly weight: string; readonly tolerance: string };
  readonly ground: { readonly kind: 'level' | 'line'; readonly yMm: string; readonly px: string; readonly py: string; readonly dx: string; readonly dy: string };
  readonly stanceToleranceMm: string;
  readonly crankDirection: 1 | -1;
  readonly walkingDirection: 1 | -1;
  /** Foot samples per turn in the search; empty: the core's default. */
  readonly steps: string;
  /** Legs on one shaft for the contact figures of an opened design, and their phases, "0, 120, 240" degrees. */
  readonly phasing: { readonly legs: string; readonly phasesDeg: string };
  readonly targets: Readonly<Record<LegTargetKey, LegTargetDraft>>;
  /** In LEG_FAMILY_IDS order. */
  readonly families: readonly PoseFamilyId[];
  /** Pivot regions: ranges changed from the core's default box, per family. */
  readonly regions: Readonly<Partial<Record<PoseFamilyId, readonly RegionDraft[]>>>;
  readonly keepOut: readonly KeepOutDraft[];
  /** Either or both; empty for none. */
  readonly budget: { readonly evaluations: string; readonly seconds: string };
  readonly seed: string;
}

export type LegSetupAction =
  | { readonly type: 'name'; readonly text: string }
  | { readonly type: 'footPathOn'; readonly on: boolean }
  | { readonly type: 'footPathText'; readonly field: 'weight' | 'tolerance'; readonly text: string }
  | { readonly type: 'pointAdd'; readonly x?: string; readonly y?: string }
  | { readonly type: 'pointText'; readonly index: number; readonly field: 'x' | 'y'; readonly text: string }
  | { readonly type: 'pointDelete'; readonly index: number }
  | { readonly type: 'pointsReplace'; readonly points: readonly PointDraft[] }
  | { readonly type: 'groundKind'; readonly kind: 'level' | 'line' }
  | { readonly type: 'groundText'; readonly field: 'yMm' | 'px' | 'py' | 'dx' | 'dy'; readonly text: string }
  | { readonly type: 'stanceTolerance'; readonly text: string }
  | { readonly type: 'crankDirection'; readonly sense: 1 | -1 }
  | { readonly type: 'walkingDirection'; readonly sense: 1 | -1 }
  | { readonly type: 'steps'; readonly text: string }
  | { readonly type: 'phasing'; readonly field: 'legs' | 'phasesDeg'; readonly text: string }
  | { readonly type: 'targetOn'; readonly key: LegTargetKey; readonly on: boolean }
  | { readonly type: 'targetText'; readonly key: LegTargetKey; readonly field: 'value' | 'value2' | 'weight' | 'tolerance'; readonly text: string }
  | { readonly type: 'family'; readonly family: PoseFamilyId; readonly on: boolean }
  | { readonly type: 'regionAdd'; readonly family: PoseFamilyId; readonly variable: string }
  | { readonly type: 'regionText'; readonly family: PoseFamilyId; readonly index: number; readonly field: keyof RegionDraft; readonly text: string }
  | { readonly type: 'regionRemove'; readonly family: PoseFamilyId; readonly index: number }
  | { readonly type: 'keepOutAdd' }
  | { readonly type: 'keepOutText'; readonly index: number; readonly field: keyof KeepOutDraft; readonly text: string }
  | { readonly type: 'keepOutRemove'; readonly index: number }
  | { readonly type: 'budget'; readonly field: 'evaluations' | 'seconds'; readonly text: string }
  | { readonly type: 'seed'; readonly text: string };

const OFF_TARGET: LegTargetDraft = { on: false, value: '', value2: '', weight: '', tolerance: '' };

/** A set-up with nothing typed yet but the usual choices (every target off, level ground). */
export function emptyLegSetup(): LegSetup {
  return {
    name: 'Walking leg',
    footPath: { on: false, points: [], weight: '', tolerance: '' },
    ground: { kind: 'level', yMm: '', px: '', py: '', dx: '1', dy: '0' },
    stanceToleranceMm: '',
    crankDirection: 1,
    walkingDirection: 1,
    steps: '',
    phasing: { legs: '1', phasesDeg: '0' },
    targets: Object.fromEntries(LEG_TARGET_KEYS.map((k) => [k, OFF_TARGET])) as Record<LegTargetKey, LegTargetDraft>,
    families: ['fourbar'],
    regions: {},
    keepOut: [],
    budget: { evaluations: '', seconds: '' },
    seed: '1',
  };
}

function replaceAt<T>(list: readonly T[], index: number, item: T): T[] {
  return list.map((v, i) => (i === index ? item : v));
}

export function reduceLegSetup(s: LegSetup, a: LegSetupAction): LegSetup {
  switch (a.type) {
    case 'name':
      return { ...s, name: a.text };
    case 'footPathOn':
      return { ...s, footPath: { ...s.footPath, on: a.on } };
    case 'footPathText':
      return { ...s, footPath: { ...s.footPath, [a.field]: a.text } };
    case 'pointAdd':
      return { ...s, footPath: { ...s.footPath, on: true, points: [...s.footPath.points, { x: a.x ?? '', y: a.y ?? '' }] } };
    case 'pointText': {
      const p = s.footPath.points[a.index];
      return p === undefined ? s : { ...s, footPath: { ...s.footPath, points: replaceAt(s.footPath.points, a.index, { ...p, [a.field]: a.text }) } };
    }
    case 'pointDelete':
      return { ...s, footPath: { ...s.footPath, points: s.footPath.points.filter((_, i) => i !== a.index) } };
    case 'pointsReplace':
      return { ...s, footPath: { ...s.footPath, on: true, points: [...a.points] } };
    case 'groundKind':
      return { ...s, ground: { ...s.ground, kind: a.kind } };
    case 'groundText':
      return { ...s, ground: { ...s.ground, [a.field]: a.text } };
    case 'stanceTolerance':
      return { ...s, stanceToleranceMm: a.text };
    case 'crankDirection':
      return { ...s, crankDirection: a.sense };
    case 'walkingDirection':
      return { ...s, walkingDirection: a.sense };
    case 'steps':
      return { ...s, steps: a.text };
    case 'phasing':
      return { ...s, phasing: { ...s.phasing, [a.field]: a.text } };
    case 'targetOn':
      return { ...s, targets: { ...s.targets, [a.key]: { ...s.targets[a.key], on: a.on } } };
    case 'targetText':
      return { ...s, targets: { ...s.targets, [a.key]: { ...s.targets[a.key], [a.field]: a.text } } };
    case 'family': {
      const on = new Set(s.families);
      if (a.on) on.add(a.family);
      else on.delete(a.family);
      return { ...s, families: LEG_FAMILY_IDS.filter((f) => on.has(f)) };
    }
    case 'regionAdd':
      return { ...s, regions: { ...s.regions, [a.family]: [...(s.regions[a.family] ?? []), { variable: a.variable, min: '', max: '' }] } };
    case 'regionText': {
      const list = s.regions[a.family] ?? [];
      const r = list[a.index];
      return r === undefined ? s : { ...s, regions: { ...s.regions, [a.family]: replaceAt(list, a.index, { ...r, [a.field]: a.text }) } };
    }
    case 'regionRemove':
      return { ...s, regions: { ...s.regions, [a.family]: (s.regions[a.family] ?? []).filter((_, i) => i !== a.index) } };
    case 'keepOutAdd':
      return { ...s, keepOut: [...s.keepOut, { name: '', x: '', y: '', r: '' }] };
    case 'keepOutText': {
      const k = s.keepOut[a.index];
      return k === undefined ? s : { ...s, keepOut: replaceAt(s.keepOut, a.index, { ...k, [a.field]: a.text }) };
    }
    case 'keepOutRemove':
      return { ...s, keepOut: s.keepOut.filter((_, i) => i !== a.index) };
    case 'budget':
      return { ...s, budget: { ...s.budget, [a.field]: a.text } };
    case 'seed':
      return { ...s, seed: a.text };
  }
}
