/**
 * The suspension search problem from the workspace: the bicycle's fields and the search
 * set-up, as typed, read into a SuspensionProblemInput and checked by
 * createSuspensionProblem. Every issue, the reader's or the core's, names the field it
 * is about, so the panel shows it there. Pure; nothing is clamped, rounded or dropped:
 * a value that does not read is an issue and there is no problem to search.
 *
 * Field names: `layouts`, `targets`, `targets.<key>` (a whole band or start–end pair),
 * `targets.<key>.<field>` (TargetTextField, or `as`), `regions.<layout>.<variable>` and
 * `….min` / `….max`, `keepOut.<i>` and `keepOut.<i>.<name|x|y|r>`, `budget`,
 * `budget.seconds`, `budget.evaluations`, `seed`, `steps`, `bicycle.<draft field>`.
 */
import type { Bicycle } from '../../../core/suspension';
import { DEFAULT_SHOCK_BODIES, LAYOUT_NAMES, demoAxleBody, hasBodyChoice, type LayoutKind } from '../../../core/suspension';
import {
  DEFAULT_SUSPENSION_STEPS,
  SHOCK_ANGLE_VARIABLE,
  createSuspensionProblem,
  type SuspensionProblem,
  type SuspensionProblemInput,
} from '../../../core/synthesis/suspensionProblem';
import { checkEvaluations, checkSeconds, checkSeed } from '../../state/fields';
import { NUMBER_TEXT, readCogs, readDraft } from '../fields';
import { pivotLabel } from '../labels';
import type { LayoutDraft, SuspensionState } from '../state';
import { TARGET_KEYS, degToRad, type SearchSetup, type TargetDraft, type TargetKey, type TargetTextField } from './setup';
import { TARGET_SPECS, targetFieldLabel } from './targetSpecs';

export interface SearchProblemIssue {
  readonly field: string;
  readonly message: string;
}

/** How long the search may run and the seed it starts from: either budget or both (null: not given). */
export interface SearchRunSettings {
  readonly budget: { readonly seconds: number | null; readonly evaluations: number | null };
  readonly seed: number;
}

export type SearchProblemReading =
  | { readonly ok: true; readonly input: SuspensionProblemInput; readonly problem: SuspensionProblem; readonly run: SearchRunSettings }
  | { readonly ok: false; readonly issues: SearchProblemIssue[] };

/** A search set-up field's name in words (what a message starts with). */
export function searchFieldLabel(field: string): string {
  const parts = field.split('.');
  if (parts[0] === 'targets' && parts.length >= 2) {
    const key = parts[1] as TargetKey;
    const title = TARGET_SPECS[key]?.title ?? parts[1];
    if (parts.length === 2) return title;
    if (parts[2] === 'as') return `${title}, counts as`;
    return `${title}, ${targetFieldLabel(key, parts[2] as TargetTextField)}`;
  }
  if (parts[0] === 'regions' && parts.length >= 2) {
    const kind = LAYOUT_NAMES[parts[1] as LayoutKind] ?? parts[1];
    if (parts.length === 2) return `Regions of the ${kind}`;
    const variable = parts[2] === SHOCK_ANGLE_VARIABLE ? 'shock angle (°)' : `${pivotLabel(parts[2])} ${parts[3]} (mm)`;
    const bound = parts[2] === SHOCK_ANGLE_VARIABLE ? parts[3] : parts[4];
    return `${kind}, ${variable}${bound === undefined ? '' : bound === 'min' ? ', from' : ', to'}`;
  }
  if (parts[0] === 'keepOut' && parts.length >= 2) return `Keep-out ${Number(parts[1]) + 1}${parts[2] === undefined ? '' : `, ${parts[2]}${parts[2] === 'name' ? '' : ' (mm)'}`}`;
  if (parts[0] === 'bicycle') return `Bicycle panel, ${pivotLabel(parts[1] ?? '')}`;
  if (field === 'layouts') return 'Layouts to search';
  if (field === 'targets') return 'Targets';
  if (field === 'budget') return 'Budget';
  if (field === 'steps') return 'Travel samples per design';
  return field;
}

/** Where the core's issue path is shown (its `[i]` indices are the field's own list). */
export function fieldOfProblemPath(path: string): string {
  if (path === 'bicycle' || path.startsWith('bicycle.')) return 'bicycle';
  if (path.startsWith('layouts')) return 'layouts';
  const keep = /^keepOut\[(\d+)\]/.exec(path);
  if (keep !== null) return `keepOut.${keep[1]}`;
  const bounds = /^bounds\.([^.]+)(?:\.(.+))?$/.exec(path);
  if (bounds !== null) return bounds[2] === undefined ? `regions.${bounds[1]}` : `regions.${bounds[1]}.${bounds[2]}`;
  const target = /^targets\.(\w+)(?:\.(\w+))?/.exec(path);
  if (target !== null) {
    if (target[2] === undefined) return `targets.${target[1]}`;
    const sub = target[2].startsWith('tolerance') ? 'tolerance' : target[2] === 'minPct' ? 'min' : target[2] === 'maxPct' ? 'max' : target[2];
    return `targets.${target[1]}.${sub}`;
  }
  return path;
}

class Reader {
  readonly issues: SearchProblemIssue[] = [];
  add(field: string, what: string): void {
    this.issues.push({ field, message: `${searchFieldLabel(field)}: ${what}` });
  }
  /** A number, or NaN with the issue; undefined when the field may be left empty and is. */
  num(field: string, text: string, expected: string, optional = false): number | undefined {
    const t = text.trim();
    if (t === '') {
      if (optional) return undefined;
      this.add(field, `empty; expected ${expected}`);
      return NaN;
    }
    if (!NUMBER_TEXT.test(t)) {
      this.add(field, `"${t}" is not a number; expected ${expected} (a point for decimals)`);
      return NaN;
    }
    return Number(t);
  }
  /** Pairs "travel mm, value", one a line or separated by semicolons. */
  points(field: string, text: string, valueWords: string): number[][] {
    const lines = text.split(/[;\n]+/).map((l) => l.trim()).filter((l) => l !== '');
    if (lines.length === 0) this.add(field, `empty; expected pairs "travel mm, ${valueWords}", one a line`);
    return lines.map((line, i) => {
      const parts = line.split(/[,\s]+/).filter((p) => p !== '');
      if (!(parts.length === 2 && parts.every((p) => NUMBER_TEXT.test(p)))) {
        this.add(field, `line ${i + 1} "${line}" is not two numbers; expected "travel mm, ${valueWords}"`);
        return [NaN, NaN];
      }
      return parts.map(Number);
    });
  }
  cogs(field: string, text: string, required: boolean): number[] | undefined {
    if (text.trim() === '') {
      if (required) this.add(field, 'empty; expected the cogs (teeth) of the cassette to read it in, such as 21, 24, 28');
      return required ? [] : undefined;
    }
    const read = readCogs(text);
    for (const p of read.problems) this.add(field, p);
    return read.teeth;
  }
}

const UNIT_WORDS: Readonly<Record<string, string>> = { '': 'a leverage ratio', '%': 'a percentage', '°': 'an angle in degrees', mm: 'a length in mm' };

type Targets = { -readonly [K in keyof SuspensionProblemInput['targets']]: SuspensionProblemInput['targets'][K] };

function readTarget(r: Reader, key: TargetKey, d: TargetDraft, targets: Targets): void {
  const f = (name: string) => `targets.${key}.${name}`;
  const spec = TARGET_SPECS[key];
  const unit = UNIT_WORDS[spec.unit] ?? `a number of ${spec.unit}`;
  const weight = r.num(f('weight'), d.weight, 'a weight of 0 or more (empty: 1)', true);
  const tolerance = r.num(f('tolerance'), d.tolerance, `a tolerance above 0 (empty: ${spec.defaultTolerance})`, true);
  const opt = <K extends string>(name: K, v: number | undefined) => (v === undefined ? {} : ({ [name]: v } as Record<K, number>));
  const as = spec.hasMode ? { as: d.as } : {};
  const field = (name: TargetTextField, expected = unit, optional = false) => r.num(f(name), d[name], expected, optional) as number;
  switch (key) {
    case 'axlePath':
      targets.axlePath = { points: r.points(f('points'), d.points, 'axle x mm'), ...opt('weight', weight), ...opt('toleranceMm', tolerance) };
      return;
    case 'leverageRatio':
      if (d.form === 'points') {
        targets.leverageRatio = { points: r.points(f('points'), d.points, 'leverage ratio'), ...opt('weight', weight), ...opt('tolerance', tolerance) };
      } else {
        const exponent = r.num(f('exponent'), d.exponent, 'a shape exponent above 0 (empty: 1)', true);
        targets.leverageRatio = { start: field('start'), end: field('end'), ...opt('exponent', exponent), ...opt('weight', weight), ...opt('tolerance', tolerance) };
      }
      return;
    case 'antiSquatAtSag':
      targets.antiSquatAtSag = { cogs: r.cogs(f('cogs'), d.cogs, true) ?? [], minPct: field('min'), maxPct: field('max'), ...as, ...opt('weight', weight), ...opt('tolerancePct', tolerance) };
      return;
    case 'antiRiseAtSag':
      targets.antiRiseAtSag = { minPct: field('min'), maxPct: field('max'), ...as, ...opt('weight', weight), ...opt('tolerancePct', tolerance) };
      return;
    case 'travelMm':
      targets.travelMm = { min: field('min'), max: field('max'), ...as, ...opt('weight', weight), ...opt('toleranceMm', tolerance) };
      return;
    case 'chainGrowthMm': {
      const cogs = r.cogs(f('cogs'), d.cogs, false);
      targets.chainGrowthMm = { max: field('max'), ...(cogs === undefined ? {} : { cogs }), ...as, ...opt('weight', weight), ...opt('toleranceMm', tolerance) };
      return;
    }
    case 'kickbackDeg': {
      const cogs = r.cogs(f('cogs'), d.cogs, false);
      targets.kickbackDeg = { max: field('max'), ...(cogs === undefined ? {} : { cogs }), ...as, ...opt('weight', weight), ...opt('toleranceDeg', tolerance) };
      return;
    }
  }
}

function readBounds(r: Reader, setup: SearchSetup): Record<string, Record<string, number[]>> {
  const bounds: Record<string, Record<string, number[]>> = {};
  for (const kind of setup.layouts) {
    const own = setup.regions[kind];
    if (own === undefined) continue;
    const boxes: Record<string, number[]> = {};
    for (const [variable, range] of Object.entries(own)) {
      const angle = variable === SHOCK_ANGLE_VARIABLE;
      const expected = angle ? 'an angle in degrees, counter-clockwise from +x' : 'a coordinate in mm';
      const lo = r.num(`regions.${kind}.${variable}.min`, range.min, expected) as number;
      const hi = r.num(`regions.${kind}.${variable}.max`, range.max, expected) as number;
      // The fields hold degrees; the problem takes radians.
      boxes[variable] = angle ? [degToRad(lo), degToRad(hi)] : [lo, hi];
    }
    bounds[kind] = boxes;
  }
  return bounds;
}

function readRun(r: Reader, setup: SearchSetup): SearchRunSettings {
  const { seconds, evaluations } = setup.budget;
  let s: number | null = null;
  let e: number | null = null;
  if (seconds.trim() === '' && evaluations.trim() === '') r.add('budget', 'none given; expected seconds, evaluations or both (the search stops at whichever comes first)');
  if (seconds.trim() !== '') {
    const c = checkSeconds(seconds);
    if (c.ok) s = c.value;
    else r.issues.push({ field: 'budget.seconds', message: c.message });
  }
  if (evaluations.trim() !== '') {
    const c = checkEvaluations(evaluations, 1);
    if (c.ok) e = c.value;
    else r.issues.push({ field: 'budget.evaluations', message: c.message });
  }
  const seed = checkSeed(setup.seed);
  if (!seed.ok) r.issues.push({ field: 'seed', message: seed.message });
  return { budget: { seconds: s, evaluations: e }, seed: seed.ok ? seed.value : NaN };
}

/**
 * The problem the workspace's set-up describes, with the run's budget and seed, or every
 * issue, each with its field. Reads the design's name, the bicycle's fields and the set-up.
 */
/**
 * The body choice of the six-bar shown in the layout panel, when it is searched and not
 * the default: the search then searches that six-bar as it is drawn, and a design opened
 * from the results is analysed with the same bodies.
 */
function shownLayoutBodies(layout: LayoutDraft | undefined, layouts: readonly LayoutKind[]): SuspensionProblemInput['layoutBodies'] {
  if (layout === undefined || !hasBodyChoice(layout.kind) || !layouts.includes(layout.kind)) return undefined;
  const shock = layout.shock ?? DEFAULT_SHOCK_BODIES;
  const isDefault = layout.axleBody === demoAxleBody(layout.kind) && shock.eye === DEFAULT_SHOCK_BODIES.eye && shock.frameEye === DEFAULT_SHOCK_BODIES.frameEye;
  return isDefault ? undefined : { [layout.kind]: { axleBody: layout.axleBody, shock: { eye: shock.eye, frameEye: shock.frameEye } } };
}

export function readSearchProblem(state: Pick<SuspensionState, 'name' | 'draft' | 'search'> & { readonly layout?: LayoutDraft }): SearchProblemReading {
  const setup = state.search;
  const r = new Reader();
  const drafted = readDraft(state.draft);
  for (const [field, messages] of Object.entries(drafted.issues)) {
    for (const m of messages ?? []) r.issues.push({ field: `bicycle.${field}`, message: `${searchFieldLabel(`bicycle.${field}`)}: ${m}` });
  }
  const targets: Targets = {};
  for (const key of TARGET_KEYS) if (setup.targets[key].on) readTarget(r, key, setup.targets[key], targets);
  const keepOut = setup.keepOut.map((k, i) => {
    const f = (name: string) => `keepOut.${i}.${name}`;
    const name = k.name.trim();
    return {
      ...(name === '' ? {} : { name }),
      x: r.num(f('x'), k.x, 'a coordinate in mm') as number,
      y: r.num(f('y'), k.y, 'a coordinate in mm') as number,
      r: r.num(f('r'), k.r, 'a radius in mm') as number,
    };
  });
  const bounds = readBounds(r, setup);
  const run = readRun(r, setup);
  const steps = r.num('steps', setup.steps, `a whole number of samples over the stroke (empty: ${DEFAULT_SUSPENSION_STEPS})`, true);
  const layoutBodies = shownLayoutBodies(state.layout, setup.layouts);
  const input: SuspensionProblemInput = {
    kind: 'suspension',
    name: state.name,
    // A bicycle whose fields do not read is refused by the core as a whole (its fields say why); the rest is still checked.
    bicycle: drafted.bicycle ?? (null as unknown as Bicycle),
    layouts: [...setup.layouts],
    ...(steps === undefined ? {} : { steps }),
    targets,
    keepOut,
    bounds,
    ...(layoutBodies === undefined ? {} : { layoutBodies }),
  };
  const created = createSuspensionProblem(input);
  const unread = r.issues.map((i) => i.field);
  if (!created.ok) {
    for (const issue of created.issues) {
      const field = fieldOfProblemPath(issue.path);
      // A field that does not read already says so; the core's NaN message would only repeat it.
      if (unread.some((u) => u === field || u.startsWith(`${field}.`))) continue;
      const point = /points\[(\d+)\]/.exec(issue.path);
      r.issues.push({ field, message: `${searchFieldLabel(field)}: ${point === null ? '' : `pair ${Number(point[1]) + 1}, `}${issue.message}` });
    }
  }
  if (r.issues.length > 0 || !created.ok) return { ok: false, issues: r.issues };
  return { ok: true, input, problem: created.problem, run };
}
