/**
 * Reads the typed set-up into a leg problem (createLegProblem's input), the search's
 * seed and budget, and the legs phased on one shaft. Each issue keeps the field it
 * belongs to (createLegProblem's own dotted paths, so its issues land there too): a text
 * that is not a number is said where it was typed, and nothing is clamped or rounded.
 */
import { MAX_PHASED_LEGS } from '../../core/gait';
import { createLegProblem, type LegProblem, type LegProblemInput } from '../../core/synthesis/legProblem';
import type { PoseFamilyId } from '../../core/synthesis/poseFamilies';
import { LEG_TARGET_KEYS, type LegSetup, type LegTargetKey } from './setup';

/** How each target names its figure and tolerance in the problem (and so in its issues). */
export const TARGET_FIELD_KEYS: Readonly<Record<LegTargetKey, { readonly value: string; readonly value2?: string; readonly tolerance: string }>> = {
  strideMm: { value: 'value', tolerance: 'toleranceMm' },
  stepHeightMm: { value: 'value', tolerance: 'toleranceMm' },
  minDutyFactor: { value: 'min', tolerance: 'tolerance' },
  maxFlatnessMm: { value: 'max', tolerance: 'toleranceMm' },
  maxSpeedVariation: { value: 'max', tolerance: 'tolerance' },
  minTransmissionDegInStance: { value: 'min', tolerance: 'toleranceDeg' },
  sizeBoxMm: { value: 'widthMm', value2: 'heightMm', tolerance: 'toleranceMm' },
};

export interface SetupIssue {
  /** The field (a dotted path of the problem, or `budget.*`, `seed`, `phasing.*`, `name`). */
  readonly path: string;
  readonly message: string;
}

export interface LegSearchSettings {
  readonly seed: number;
  /** Evaluations and seconds of the whole search (all families); null: not limited by it; at least one is given. */
  readonly budget: { readonly evaluations: number | null; readonly seconds: number | null };
}

export interface LegPhasingRead {
  readonly legs: number;
  readonly phasesDeg: number[];
}

export type LegSetupReading =
  | { readonly ok: true; readonly input: LegProblemInput; readonly problem: LegProblem; readonly settings: LegSearchSettings; readonly phasing: LegPhasingRead }
  | { readonly ok: false; readonly issues: readonly SetupIssue[] };

/** A number as typed: decimal point, optional sign and exponent; nothing else is taken. */
const NUMBER_TEXT = /^[+-]?(\d+\.?\d*|\.\d+)(e[+-]?\d+)?$/i;

class Reader {
  readonly issues: SetupIssue[] = [];
  /** Fields whose text did not read: the problem's own message about the placeholder would repeat it. */
  readonly textBad = new Set<string>();

  /** A required number; NaN (and an issue) when the text does not read. */
  num(path: string, text: string, what: string): number {
    const t = text.trim();
    if (t === '') return this.bad(path, `is empty; expected ${what}`);
    if (!NUMBER_TEXT.test(t)) return this.bad(path, `"${t}" is not a number; expected ${what}`);
    return Number(t);
  }

  /** An optional number: undefined when empty. */
  opt(path: string, text: string, what: string): number | undefined {
    return text.trim() === '' ? undefined : this.num(path, text, what);
  }

  bad(path: string, message: string): number {
    this.issues.push({ path, message });
    this.textBad.add(path);
    return NaN;
  }
}

function targetWhat(key: LegTargetKey): { value: string; tolerance: string; value2?: string } {
  switch (key) {
    case 'strideMm': return { value: 'a stride in mm', tolerance: 'a tolerance in mm' };
    case 'stepHeightMm': return { value: 'a step height in mm', tolerance: 'a tolerance in mm' };
    case 'minDutyFactor': return { value: 'a share of the turn (0.5 for half)', tolerance: 'a share of the turn' };
    case 'maxFlatnessMm': return { value: 'a peak-to-peak height in mm', tolerance: 'a tolerance in mm' };
    case 'maxSpeedVariation': return { value: 'a ratio ((max − min) / mean)', tolerance: 'a ratio' };
    case 'minTransmissionDegInStance': return { value: 'an angle in degrees', tolerance: 'an angle in degrees' };
    case 'sizeBoxMm': return { value: 'a width in mm', value2: 'a height in mm', tolerance: 'a tolerance in mm' };
  }
}

/** The problem's input from the set-up, with the issues of texts that do not read (their values NaN). */
export function legProblemInputOf(setup: LegSetup, r: Reader = new Reader()): { input: LegProblemInput; reader: Reader } {
  const g = setup.ground;
  const ground: LegProblemInput['ground'] = g.kind === 'level'
    ? { kind: 'level', yMm: r.num('ground.yMm', g.yMm, 'a height in mm') }
    : {
        kind: 'line',
        point: { x: r.num('ground.point', g.px, 'the point\'s x in mm'), y: r.num('ground.point', g.py, 'the point\'s y in mm') },
        direction: { x: r.num('ground.direction', g.dx, 'the direction\'s x'), y: r.num('ground.direction', g.dy, 'the direction\'s y') },
      };
  const targets: Record<string, unknown> = {};
  const fp = setup.footPath;
  if (fp.on) {
    const points = fp.points.map((p, i) => [r.num(`targets.footPath.points[${i}]`, p.x, `x of point ${i + 1} in mm`), r.num(`targets.footPath.points[${i}]`, p.y, `y of point ${i + 1} in mm`)]);
    const weight = r.opt('targets.footPath.weight', fp.weight, 'a weight ≥ 0 (empty: 1)');
    const toleranceMm = r.opt('targets.footPath.toleranceMm', fp.tolerance, 'a tolerance in mm (empty: the stance tolerance)');
    targets.footPath = { points, ...(weight === undefined ? {} : { weight }), ...(toleranceMm === undefined ? {} : { toleranceMm }) };
  }
  for (const key of LEG_TARGET_KEYS) {
    const d = setup.targets[key];
    if (!d.on) continue;
    const names = TARGET_FIELD_KEYS[key];
    const what = targetWhat(key);
    const base = `targets.${key}`;
    const t: Record<string, number> = { [names.value]: r.num(`${base}.${names.value}`, d.value, what.value) };
    if (names.value2 !== undefined) t[names.value2] = r.num(`${base}.${names.value2}`, d.value2, what.value2 ?? '');
    const weight = r.opt(`${base}.weight`, d.weight, 'a weight ≥ 0 (empty: 1)');
    const tolerance = r.opt(`${base}.${names.tolerance}`, d.tolerance, `${what.tolerance} (empty: the default)`);
    if (weight !== undefined) t.weight = weight;
    if (tolerance !== undefined) t[names.tolerance] = tolerance;
    targets[key] = t;
  }
  const keepOut = setup.keepOut.map((k, i) => {
    const at = `keepOut[${i}]`;
    const circle = { x: r.num(at, k.x, 'x in mm'), y: r.num(at, k.y, 'y in mm'), r: r.num(at, k.r, 'a radius in mm') };
    // Said now, not only once the rest reads (the path problem that checks the circles is built last).
    if (Number.isFinite(circle.r) && !(circle.r > 0)) r.bad(at, `has r = ${circle.r}; expected a radius in mm with r > 0`);
    return k.name.trim() === '' ? circle : { name: k.name.trim(), ...circle };
  });
  const bounds: Partial<Record<PoseFamilyId, Record<string, [number, number]>>> = {};
  for (const family of setup.families) {
    const rows = setup.regions[family] ?? [];
    if (rows.length === 0) continue;
    const box: Record<string, [number, number]> = {};
    rows.forEach((row) => {
      const at = `bounds.${family}.${row.variable}`;
      if (Object.hasOwn(box, row.variable)) {
        r.bad(at, `${row.variable} has two ranges; expected one range per variable`);
        return;
      }
      const range: [number, number] = [r.num(at, row.min, `the lower end of ${row.variable}`), r.num(at, row.max, `the upper end of ${row.variable}`)];
      if (Number.isFinite(range[0]) && Number.isFinite(range[1]) && !(range[0] < range[1])) r.bad(at, `is [${range[0]}, ${range[1]}]; expected the lower end below the upper end`);
      box[row.variable] = range;
    });
    bounds[family] = box;
  }
  const steps = r.opt('steps', setup.steps, 'a whole number of foot samples per crank turn (empty: the default)');
  const input: LegProblemInput = {
    kind: 'leg',
    name: setup.name.trim(),
    families: [...setup.families],
    ground,
    stanceToleranceMm: r.num('stanceToleranceMm', setup.stanceToleranceMm, 'a stance tolerance in mm'),
    crankDirection: setup.crankDirection,
    walkingDirection: setup.walkingDirection,
    ...(steps === undefined ? {} : { steps }),
    targets: targets as LegProblemInput['targets'],
    ...(keepOut.length === 0 ? {} : { keepOut }),
    ...(Object.keys(bounds).length === 0 ? {} : { bounds }),
  };
  return { input, reader: r };
}

/** Whether an issue of the problem at `path` repeats a text issue already said (at it, or at the field above it). */
function saidAlready(path: string, said: ReadonlySet<string>): boolean {
  for (const p of said) if (path === p || path.startsWith(`${p}.`) || path.startsWith(`${p}[`) || p.startsWith(`${path}.`) || p.startsWith(`${path}[`)) return true;
  return false;
}

function readSettings(setup: LegSetup, r: Reader): LegSearchSettings {
  const seed = r.num('seed', setup.seed, 'a whole number ≥ 0');
  if (Number.isFinite(seed) && !(Number.isInteger(seed) && seed >= 0 && seed <= 0xffffffff)) r.bad('seed', `is ${seed}; expected a whole number from 0 to 4294967295`);
  const evaluations = r.opt('budget.evaluations', setup.budget.evaluations, 'a whole number of evaluations (empty: no limit)');
  const seconds = r.opt('budget.seconds', setup.budget.seconds, 'a number of seconds (empty: no limit)');
  if (evaluations !== undefined && Number.isFinite(evaluations) && !(Number.isInteger(evaluations) && evaluations > 0)) r.bad('budget.evaluations', `is ${evaluations}; expected a whole number of evaluations above 0`);
  if (seconds !== undefined && Number.isFinite(seconds) && !(seconds > 0)) r.bad('budget.seconds', `is ${seconds}; expected a number of seconds above 0`);
  if (evaluations === undefined && seconds === undefined) r.bad('budget.evaluations', 'is empty, and so is the time budget; expected evaluations, seconds or both');
  return { seed, budget: { evaluations: evaluations ?? null, seconds: seconds ?? null } };
}

function readPhasing(setup: LegSetup, r: Reader): LegPhasingRead {
  const legs = r.num('phasing.legs', setup.phasing.legs, `a whole number of legs from 1 to ${MAX_PHASED_LEGS}`);
  if (Number.isFinite(legs) && !(Number.isInteger(legs) && legs >= 1 && legs <= MAX_PHASED_LEGS)) r.bad('phasing.legs', `is ${legs}; expected a whole number of legs from 1 to ${MAX_PHASED_LEGS}`);
  const texts = setup.phasing.phasesDeg.split(/[,;\s]+/).filter((t) => t !== '');
  const phasesDeg = texts.map((t, i) => r.num('phasing.phasesDeg', t, `phase ${i + 1} in degrees`));
  if (Number.isInteger(legs) && phasesDeg.length !== legs) r.bad('phasing.phasesDeg', `has ${phasesDeg.length} phase${phasesDeg.length === 1 ? '' : 's'}; expected one per leg (${legs}), in degrees, separated by commas`);
  return { legs, phasesDeg };
}

/** The whole set-up: the problem (createLegProblem's issues included), the search settings and the phasing. */
export function readLegSetup(setup: LegSetup): LegSetupReading {
  const { input, reader } = legProblemInputOf(setup);
  if (input.name === '') reader.bad('name', 'is empty; expected a name for the problem');
  const settings = readSettings(setup, reader);
  const phasing = readPhasing(setup, reader);
  const created = createLegProblem(input);
  const issues = [...reader.issues];
  if (!created.ok) for (const i of created.issues) if (!saidAlready(i.path, reader.textBad)) issues.push(i);
  if (issues.length > 0 || !created.ok) return { ok: false, issues };
  return { ok: true, input, problem: created.problem, settings, phasing };
}
