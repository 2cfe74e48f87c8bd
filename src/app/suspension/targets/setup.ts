/**
 * The suspension search's set-up as the user typed it: the layouts to search, each
 * target's fields, the pivot regions changed from the core's defaults, the keep-out
 * circles, the budget and the seed. Every number is kept as text, so a value being
 * corrected is kept too; `readSearchProblem` reads them. Pure updates; nothing is
 * clamped or rounded here except what a drag produces (DRAWN_STEP_MM).
 */
import {
  LAYOUT_KINDS,
  LAYOUT_PIVOTS,
  SHOCK_FRAME_EYE,
  type LayoutKind,
} from '../../../core/suspension';
import { SHOCK_ANGLE_VARIABLE, defaultLayoutBounds, type BandMode } from '../../../core/synthesis/suspensionProblem';

export const TARGET_KEYS = ['axlePath', 'leverageRatio', 'antiSquatAtSag', 'antiRiseAtSag', 'travelMm', 'chainGrowthMm', 'kickbackDeg'] as const;
export type TargetKey = (typeof TARGET_KEYS)[number];

/** One target's fields; each kind of target reads the ones it has (see TARGET_FIELDS). */
export interface TargetDraft {
  readonly on: boolean;
  /** Bands and limits: a constraint (ranked first) or a penalty added to the value. */
  readonly as: BandMode;
  /** The leverage ratio: start and end values with a shape, or points over travel. */
  readonly form: 'shape' | 'points';
  /** Pairs "travel mm, value", one a line or separated by semicolons. */
  readonly points: string;
  readonly start: string;
  readonly end: string;
  readonly exponent: string;
  readonly min: string;
  readonly max: string;
  /** Teeth of cogs of the bicycle's cassette, "21, 24, 28". */
  readonly cogs: string;
  /** Empty: 1. */
  readonly weight: string;
  /** Empty: the core's default tolerance of the term. */
  readonly tolerance: string;
}

export type TargetTextField = 'points' | 'start' | 'end' | 'exponent' | 'min' | 'max' | 'cogs' | 'weight' | 'tolerance';

/** A variable's range as typed: mm for a pivot coordinate, degrees for the shock angle. */
export interface RangeDraft {
  readonly min: string;
  readonly max: string;
}

export interface KeepOutDraft {
  readonly name: string;
  readonly x: string;
  readonly y: string;
  readonly r: string;
}

export interface SearchSetup {
  /** In LAYOUT_KINDS order. */
  readonly layouts: readonly LayoutKind[];
  readonly targets: Readonly<Record<TargetKey, TargetDraft>>;
  /**
   * Ranges changed from the core's defaults, per layout, by variable (`mainPivot.x`,
   * `shockAngle`); a variable without one searches the core's default box.
   */
  readonly regions: Readonly<Partial<Record<LayoutKind, Readonly<Record<string, RangeDraft>>>>>;
  readonly keepOut: readonly KeepOutDraft[];
  /** Either or both; empty for none. */
  readonly budget: { readonly seconds: string; readonly evaluations: string };
  readonly seed: string;
  /** Samples over the stroke each design is evaluated at; empty: the core's default. */
  readonly steps: string;
}

/** What the side view's pointer does: draw a pivot's region, place a keep-out, or nothing special. */
export type SetupTool = { readonly kind: 'region'; readonly layout: LayoutKind; readonly pivot: string } | { readonly kind: 'keepOut' } | null;

export type SearchSetupAction =
  | { readonly type: 'layout'; readonly kind: LayoutKind; readonly on: boolean }
  | { readonly type: 'targetOn'; readonly key: TargetKey; readonly on: boolean }
  | { readonly type: 'targetText'; readonly key: TargetKey; readonly field: TargetTextField; readonly text: string }
  | { readonly type: 'targetMode'; readonly key: TargetKey; readonly as: BandMode }
  | { readonly type: 'leverageForm'; readonly form: 'shape' | 'points' }
  | { readonly type: 'rangeText'; readonly layout: LayoutKind; readonly variable: string; readonly bound: 'min' | 'max'; readonly text: string }
  /** A region dragged out on the side view, mm (rounded here to DRAWN_STEP_MM). */
  | { readonly type: 'regionDrawn'; readonly layout: LayoutKind; readonly pivot: string; readonly x: readonly [number, number]; readonly y: readonly [number, number] }
  | { readonly type: 'rangeDefault'; readonly layout: LayoutKind; readonly variable: string }
  | { readonly type: 'keepOutAdd'; readonly circle?: { readonly x: number; readonly y: number; readonly r: number } }
  | { readonly type: 'keepOutRemove'; readonly index: number }
  | { readonly type: 'keepOutText'; readonly index: number; readonly field: keyof KeepOutDraft; readonly text: string }
  /** A keep-out moved (centre) or resized (r) on the side view, mm (rounded here to DRAWN_STEP_MM); what was not dragged keeps its text. */
  | { readonly type: 'keepOutDrawn'; readonly index: number; readonly centre?: { readonly x: number; readonly y: number }; readonly r?: number }
  | { readonly type: 'budget'; readonly field: 'seconds' | 'evaluations'; readonly text: string }
  | { readonly type: 'seed'; readonly text: string }
  | { readonly type: 'steps'; readonly text: string };

/** What a drag on the side view lands on, mm: the mouse gives no finer size the user meant. */
export const DRAWN_STEP_MM = 0.1;
/** Digits the default ranges are shown with: mm to 0.1 mm, the shock angle to 0.01°. */
const DEFAULT_MM_DECIMALS = 1;
const DEFAULT_DEG_DECIMALS = 2;

export function degToRad(deg: number): number {
  return (deg * Math.PI) / 180;
}

export function radToDeg(rad: number): number {
  return (rad * 180) / Math.PI;
}

/** A dragged length as the fields show it: on the DRAWN_STEP_MM grid, "20.9" and never 20.899999999999977. */
export function drawnText(mm: number): string {
  return String(Number((Math.round(mm / DRAWN_STEP_MM) * DRAWN_STEP_MM).toFixed(1)));
}

/** The pivots a search places (the shock's frame eye follows from the shock angle). */
export function searchedPivots(kind: LayoutKind): readonly string[] {
  return LAYOUT_PIVOTS[kind].filter((p) => p !== SHOCK_FRAME_EYE);
}

/** A variable's unit in the fields: degrees for the shock angle (the problem takes radians), mm otherwise. */
export function rangeUnit(variable: string): '°' | 'mm' {
  return variable === SHOCK_ANGLE_VARIABLE ? '°' : 'mm';
}

/** The core's default range of a variable as a field shows it (degrees for the shock angle). */
export function defaultRangeText(kind: LayoutKind, variable: string): RangeDraft {
  const box = defaultLayoutBounds(kind)[variable];
  const angle = variable === SHOCK_ANGLE_VARIABLE;
  const show = (v: number) => String(Number((angle ? radToDeg(v) : v).toFixed(angle ? DEFAULT_DEG_DECIMALS : DEFAULT_MM_DECIMALS)));
  return { min: show(box[0]), max: show(box[1]) };
}

/** The range a field shows: the user's, or the core's default. */
export function rangeText(setup: SearchSetup, kind: LayoutKind, variable: string): { readonly range: RangeDraft; readonly changed: boolean } {
  const own = setup.regions[kind]?.[variable];
  return own === undefined ? { range: defaultRangeText(kind, variable), changed: false } : { range: own, changed: true };
}

const OFF: TargetDraft = {
  on: false,
  as: 'constraint',
  form: 'shape',
  points: '',
  start: '',
  end: '',
  exponent: '',
  min: '',
  max: '',
  cogs: '',
  weight: '',
  tolerance: '',
};

/**
 * What a trail-bike designer of our own invention would enter (no real bicycle's
 * figures): a leverage ratio falling from 2.9 to 2.4, anti-squat near 100 % at sag in
 * the middle cogs, some anti-rise, a travel band and a kickback limit in the extreme
 * gears; three layouts; a chainring and a bottle kept clear.
 */
export function demoSearchSetup(): SearchSetup {
  return {
    layouts: ['singlePivot', 'fourBarSeatStayAxle', 'wattSixBar'],
    targets: {
      axlePath: { ...OFF, points: '0, -435\n70, -441\n140, -443' },
      leverageRatio: { ...OFF, on: true, start: '2.9', end: '2.4', exponent: '1', weight: '1', tolerance: '0.05' },
      antiSquatAtSag: { ...OFF, on: true, as: 'penalty', cogs: '21, 24, 28', min: '95', max: '105', weight: '1', tolerance: '5' },
      antiRiseAtSag: { ...OFF, on: true, as: 'penalty', min: '50', max: '90', weight: '0.3', tolerance: '' },
      travelMm: { ...OFF, on: true, as: 'constraint', min: '135', max: '150' },
      chainGrowthMm: { ...OFF, as: 'penalty', max: '10' },
      kickbackDeg: { ...OFF, on: true, as: 'penalty', max: '25', cogs: '10, 51', weight: '0.2', tolerance: '2' },
    },
    regions: {},
    keepOut: [
      // The 32 T ring's tip circle is about 68 mm in radius (pitch radius 64.7 mm, ISO 606): kept clear with 2 mm to spare.
      { name: 'chainring', x: '0', y: '0', r: '70' },
      { name: 'bottle', x: '130', y: '250', r: '35' },
    ],
    budget: { seconds: '60', evaluations: '' },
    seed: '1',
    steps: '',
  };
}

function withRange(setup: SearchSetup, kind: LayoutKind, variable: string, range: RangeDraft): SearchSetup {
  return { ...setup, regions: { ...setup.regions, [kind]: { ...(setup.regions[kind] ?? {}), [variable]: range } } };
}

function withKeepOut(setup: SearchSetup, index: number, change: Partial<KeepOutDraft>): SearchSetup {
  if (!(index >= 0 && index < setup.keepOut.length)) return setup;
  return { ...setup, keepOut: setup.keepOut.map((k, i) => (i === index ? { ...k, ...change } : k)) };
}

function withTarget(setup: SearchSetup, key: TargetKey, change: Partial<TargetDraft>): SearchSetup {
  return { ...setup, targets: { ...setup.targets, [key]: { ...setup.targets[key], ...change } } };
}

function isVariable(kind: LayoutKind, variable: string): boolean {
  return variable === SHOCK_ANGLE_VARIABLE || searchedPivots(kind).some((p) => variable === `${p}.x` || variable === `${p}.y`);
}

export function reduceSearchSetup(setup: SearchSetup, action: SearchSetupAction): SearchSetup {
  switch (action.type) {
    case 'layout': {
      if (setup.layouts.includes(action.kind) === action.on) return setup;
      const chosen = new Set(setup.layouts);
      if (action.on) chosen.add(action.kind);
      else chosen.delete(action.kind);
      return { ...setup, layouts: LAYOUT_KINDS.filter((k) => chosen.has(k)) };
    }
    case 'targetOn':
      return withTarget(setup, action.key, { on: action.on });
    case 'targetText':
      return setup.targets[action.key][action.field] === action.text ? setup : withTarget(setup, action.key, { [action.field]: action.text });
    case 'targetMode':
      return withTarget(setup, action.key, { as: action.as });
    case 'leverageForm':
      return withTarget(setup, 'leverageRatio', { form: action.form });
    case 'rangeText': {
      if (!isVariable(action.layout, action.variable)) return setup;
      // The bound not typed keeps the text it showed (the default, until changed).
      const { range } = rangeText(setup, action.layout, action.variable);
      return withRange(setup, action.layout, action.variable, { ...range, [action.bound]: action.text });
    }
    case 'regionDrawn': {
      if (!searchedPivots(action.layout).includes(action.pivot)) return setup;
      const [x0, x1] = [Math.min(...action.x), Math.max(...action.x)];
      const [y0, y1] = [Math.min(...action.y), Math.max(...action.y)];
      const once = withRange(setup, action.layout, `${action.pivot}.x`, { min: drawnText(x0), max: drawnText(x1) });
      return withRange(once, action.layout, `${action.pivot}.y`, { min: drawnText(y0), max: drawnText(y1) });
    }
    case 'rangeDefault': {
      const own = setup.regions[action.layout];
      if (own?.[action.variable] === undefined) return setup;
      const rest = { ...own };
      delete rest[action.variable];
      const regions = { ...setup.regions, [action.layout]: rest };
      if (Object.keys(rest).length === 0) delete regions[action.layout];
      return { ...setup, regions };
    }
    case 'keepOutAdd': {
      const c = action.circle;
      const name = `keep-out ${setup.keepOut.length + 1}`;
      const added: KeepOutDraft = c === undefined ? { name, x: '', y: '', r: '' } : { name, x: drawnText(c.x), y: drawnText(c.y), r: drawnText(c.r) };
      return { ...setup, keepOut: [...setup.keepOut, added] };
    }
    case 'keepOutRemove':
      return action.index >= 0 && action.index < setup.keepOut.length ? { ...setup, keepOut: setup.keepOut.filter((_, i) => i !== action.index) } : setup;
    case 'keepOutText':
      return withKeepOut(setup, action.index, { [action.field]: action.text });
    case 'keepOutDrawn':
      return withKeepOut(setup, action.index, {
        ...(action.centre === undefined ? {} : { x: drawnText(action.centre.x), y: drawnText(action.centre.y) }),
        ...(action.r === undefined ? {} : { r: drawnText(action.r) }),
      });
    case 'budget':
      return { ...setup, budget: { ...setup.budget, [action.field]: action.text } };
    case 'seed':
      return { ...setup, seed: action.text };
    case 'steps':
      return { ...setup, steps: action.text };
  }
}
