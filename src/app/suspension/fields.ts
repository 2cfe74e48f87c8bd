/**
 * The bicycle panel's fields as the user typed them, and the Bicycle they make: each
 * text read as a number (or a list of teeth), then validateBicycle, with every message
 * put beside the field it is about. Pure; nothing is rounded or clamped.
 */
import { BICYCLE_RANGES, validateBicycle, type Bicycle, type GasLaw, type SpringSpec } from '../../core/suspension';

export type FrontMode = 'wheelbase' | 'frontContact';
export type SpringMode = 'none' | 'coil' | 'air';

/** Every text field of the panel; sag is a percentage here and a share in the Bicycle. */
export interface BicycleDraft {
  readonly rearAxleX: string;
  readonly rearAxleY: string;
  readonly wheelRadius: string;
  readonly frontMode: FrontMode;
  readonly front: string;
  readonly comHeight: string;
  readonly chainringTeeth: string;
  readonly cogTeeth: string;
  readonly chainPitch: string;
  readonly eyeToEye: string;
  readonly stroke: string;
  readonly sagPct: string;
  readonly springMode: SpringMode;
  readonly coilRate: string;
  readonly coilPreload: string;
  readonly airPressure: string;
  readonly airVolume: string;
  readonly airPistonArea: string;
  readonly gasLaw: GasLaw;
}

export type DraftField = {
  [K in keyof BicycleDraft]: BicycleDraft[K] extends string ? (string extends BicycleDraft[K] ? K : never) : never;
}[keyof BicycleDraft];

export type FieldIssues = Readonly<Partial<Record<DraftField, readonly string[]>>>;

export interface DraftReading {
  /** The bicycle, when every field holds what it must; null otherwise. */
  readonly bicycle: Bicycle | null;
  readonly issues: FieldIssues;
  readonly issueCount: number;
}

/** Where each of validateBicycle's paths is shown. */
function fieldOfPath(path: string): DraftField | null {
  if (path.startsWith('cogTeeth')) return 'cogTeeth';
  const map: Readonly<Record<string, DraftField>> = {
    'rearAxleMm.x': 'rearAxleX',
    'rearAxleMm.y': 'rearAxleY',
    wheelRadiusMm: 'wheelRadius',
    frontContactXMm: 'front',
    wheelbaseMm: 'front',
    comHeightMm: 'comHeight',
    chainringTeeth: 'chainringTeeth',
    chainPitchMm: 'chainPitch',
    'shock.eyeToEyeMm': 'eyeToEye',
    'shock.strokeMm': 'stroke',
    sag: 'sagPct',
    'spring.rateNPerMm': 'coilRate',
    'spring.preloadMm': 'coilPreload',
    'spring.pressureKPa': 'airPressure',
    'spring.volumeMm3': 'airVolume',
    'spring.pistonAreaMm2': 'airPistonArea',
  };
  return map[path] ?? null;
}

export const NUMBER_TEXT = /^[+-]?(\d+\.?\d*|\.\d+)(e[+-]?\d+)?$/i;

type Read = { readonly ok: true; readonly value: number | undefined } | { readonly ok: false; readonly message: string };

/** A field's number; empty is `undefined` when the field may be left out. */
function readNumber(text: string, unit: string, optional: boolean): Read {
  const t = text.trim();
  if (t === '') return optional ? { ok: true, value: undefined } : { ok: false, message: `empty; expected a number of ${unit}` };
  if (!NUMBER_TEXT.test(t)) return { ok: false, message: `"${t}" is not a number; expected a number of ${unit} (a point for decimals)` };
  return { ok: true, value: Number(t) };
}

/** The cassette's teeth from a list such as "10, 12, 14" (commas or spaces). */
export function readCogs(text: string): { readonly teeth: number[]; readonly problems: string[] } {
  const parts = text.split(/[,;\s]+/).filter((p) => p !== '');
  const problems: string[] = [];
  const teeth = parts.map((p) => {
    if (!NUMBER_TEXT.test(p)) {
      problems.push(`"${p}" is not a number of teeth`);
      return NaN;
    }
    return Number(p);
  });
  if (parts.length === 0) problems.push('no cogs given; expected the teeth of each cog, such as 10, 12, 14');
  return { teeth, problems };
}

function pct(share: number): string {
  return String(Number((share * 100).toPrecision(12)));
}

/** Reads every field and validates the bicycle they make. */
export function readDraft(d: BicycleDraft): DraftReading {
  const issues: Partial<Record<DraftField, string[]>> = {};
  const add = (field: DraftField, message: string) => (issues[field] ??= []).push(message);
  const num = (field: DraftField, unit: string, optional = false): number | undefined => {
    const read = readNumber(d[field], unit, optional);
    if (read.ok) return read.value;
    add(field, read.message);
    return NaN;
  };
  const rearAxleMm = { x: num('rearAxleX', 'mm') as number, y: num('rearAxleY', 'mm') as number };
  const front = num('front', 'mm') as number;
  const cogs = readCogs(d.cogTeeth);
  for (const p of cogs.problems) add('cogTeeth', p);
  const sagPct = num('sagPct', '%') as number;
  let spring: SpringSpec | undefined;
  if (d.springMode === 'coil') {
    const preloadMm = num('coilPreload', 'mm', true);
    spring = { kind: 'coil', rateNPerMm: num('coilRate', 'N/mm') as number, ...(preloadMm === undefined ? {} : { preloadMm }) };
  } else if (d.springMode === 'air') {
    spring = {
      kind: 'air',
      pressureKPa: num('airPressure', 'kPa') as number,
      volumeMm3: num('airVolume', 'mm³') as number,
      pistonAreaMm2: num('airPistonArea', 'mm²') as number,
      gasLaw: d.gasLaw,
    };
  }
  const chainPitchMm = num('chainPitch', 'mm', true);
  const bicycle: Bicycle = {
    rearAxleMm,
    wheelRadiusMm: num('wheelRadius', 'mm') as number,
    ...(d.frontMode === 'wheelbase' ? { wheelbaseMm: front } : { frontContactXMm: front }),
    comHeightMm: num('comHeight', 'mm') as number,
    chainringTeeth: num('chainringTeeth', 'teeth') as number,
    cogTeeth: cogs.teeth,
    ...(chainPitchMm === undefined ? {} : { chainPitchMm }),
    shock: { eyeToEyeMm: num('eyeToEye', 'mm') as number, strokeMm: num('stroke', 'mm') as number },
    sag: sagPct / 100,
    ...(spring === undefined ? {} : { spring }),
  };
  const unreadable = new Set(Object.keys(issues));
  const checked = validateBicycle(bicycle);
  if (!checked.ok) {
    for (const issue of checked.issues) {
      const field = fieldOfPath(issue.path);
      if (field === null) continue;
      // A field whose text is not a number already says so; the validator's "NaN" would only repeat it.
      if (unreadable.has(field)) continue;
      if (field === 'sagPct') {
        const [lo, hi] = BICYCLE_RANGES.sag;
        add(field, `sag ${d.sagPct.trim()} % is outside the accepted ${pct(lo)}–${pct(hi)} % of the wheel travel`);
      } else {
        add(field, issue.message);
      }
    }
  }
  const issueCount = Object.values(issues).reduce((n, list) => n + list.length, 0);
  return { bicycle: issueCount === 0 ? bicycle : null, issues, issueCount };
}

function text(value: number | undefined): string {
  return value === undefined ? '' : String(value);
}

/** The fields showing a bicycle (a loaded design, the demo). */
export function draftOf(b: Bicycle): BicycleDraft {
  const spring = b.spring;
  return {
    rearAxleX: text(b.rearAxleMm.x),
    rearAxleY: text(b.rearAxleMm.y),
    wheelRadius: text(b.wheelRadiusMm),
    frontMode: b.wheelbaseMm !== undefined ? 'wheelbase' : 'frontContact',
    front: text(b.wheelbaseMm ?? b.frontContactXMm),
    comHeight: text(b.comHeightMm),
    chainringTeeth: text(b.chainringTeeth),
    cogTeeth: b.cogTeeth.join(', '),
    chainPitch: text(b.chainPitchMm),
    eyeToEye: text(b.shock.eyeToEyeMm),
    stroke: text(b.shock.strokeMm),
    sagPct: pct(b.sag),
    springMode: spring === undefined ? 'none' : spring.kind,
    coilRate: spring?.kind === 'coil' ? text(spring.rateNPerMm) : '',
    coilPreload: spring?.kind === 'coil' ? text(spring.preloadMm) : '',
    airPressure: spring?.kind === 'air' ? text(spring.pressureKPa) : '',
    airVolume: spring?.kind === 'air' ? text(spring.volumeMm3) : '',
    airPistonArea: spring?.kind === 'air' ? text(spring.pistonAreaMm2) : '',
    gasLaw: spring?.kind === 'air' ? spring.gasLaw : 'isothermal',
  };
}

/**
 * The other way of giving the front wheel: front contact x = rear axle x + wheelbase.
 * The value is converted when both numbers read; otherwise the text is kept as typed.
 */
export function switchFrontMode(d: BicycleDraft, mode: FrontMode): BicycleDraft {
  if (mode === d.frontMode) return d;
  const axle = readNumber(d.rearAxleX, 'mm', false);
  const front = readNumber(d.front, 'mm', false);
  if (!(axle.ok && front.ok && axle.value !== undefined && front.value !== undefined)) return { ...d, frontMode: mode };
  const value = mode === 'frontContact' ? axle.value + front.value : front.value - axle.value;
  return { ...d, frontMode: mode, front: String(Number(value.toPrecision(12))) };
}
