/**
 * The set-up a leg problem file's content types into the fields, and the demo: the toy
 * walker of public/examples/toy-walker-leg-problem.json (a problem of our own), ready to
 * search with a small budget.
 */
import * as z from 'zod';
import { legProblemShape } from '../../core/io/legProblemFile';
import type { LegProblemInput } from '../../core/synthesis/legProblem';
import toyWalker from '../../../public/examples/toy-walker-leg-problem.json';
import { TARGET_FIELD_KEYS } from './readSetup';
import { LEG_TARGET_KEYS, emptyLegSetup, type LegSetup, type LegTargetDraft } from './setup';

/** The demo's budget: enough for a first look in a few seconds. */
export const DEMO_EVALUATIONS = 6000;
export const DEMO_SEED = 1;

const legFileContent = z.looseObject({ name: z.string(), ...legProblemShape });

const text = (v: number | undefined): string => (v === undefined ? '' : String(v));

/** The fields a leg problem's input fills (every target it has switched on, its weights and tolerances as given). */
export function setupOfInput(input: LegProblemInput, budget: { evaluations: number | null; seconds: number | null }, seed: number): LegSetup {
  const empty = emptyLegSetup();
  const g = input.ground;
  const t = input.targets as Record<string, Record<string, number> | undefined>;
  const targets = Object.fromEntries(LEG_TARGET_KEYS.map((key): [string, LegTargetDraft] => {
    const given = t[key];
    if (given === undefined) return [key, empty.targets[key]];
    const names = TARGET_FIELD_KEYS[key];
    return [key, { on: true, value: text(given[names.value]), value2: names.value2 === undefined ? '' : text(given[names.value2]), weight: text(given.weight), tolerance: text(given[names.tolerance]) }];
  })) as unknown as LegSetup['targets'];
  const fp = input.targets.footPath;
  const regions: Record<string, { variable: string; min: string; max: string }[]> = {};
  for (const [family, box] of Object.entries(input.bounds ?? {})) {
    regions[family] = Object.entries(box ?? {}).map(([variable, [lo, hi]]) => ({ variable, min: String(lo), max: String(hi) }));
  }
  return {
    ...empty,
    name: input.name,
    footPath: fp === undefined ? empty.footPath : { on: true, points: fp.points.map((p) => ({ x: String(p[0]), y: String(p[1]) })), weight: text(fp.weight), tolerance: text(fp.toleranceMm) },
    ground: g.kind === 'level' ? { ...empty.ground, kind: 'level', yMm: String(g.yMm) } : { kind: 'line', yMm: '', px: String(g.point.x), py: String(g.point.y), dx: String(g.direction.x), dy: String(g.direction.y) },
    stanceToleranceMm: String(input.stanceToleranceMm),
    crankDirection: input.crankDirection,
    walkingDirection: input.walkingDirection,
    steps: text(input.steps),
    targets,
    families: [...input.families] as LegSetup['families'],
    regions,
    keepOut: (input.keepOut ?? []).map((k) => ({ name: k.name ?? '', x: String(k.x), y: String(k.y), r: String(k.r) })),
    budget: { evaluations: budget.evaluations === null ? '' : String(budget.evaluations), seconds: budget.seconds === null ? '' : String(budget.seconds) },
    seed: String(seed),
  };
}

/** The problem input a leg problem file's content holds, or null when it is not one. */
export function legInputOfFile(json: unknown): LegProblemInput | null {
  const read = legFileContent.safeParse(json);
  if (!read.success) return null;
  const { format: _f, version: _v, description: _d, ...input } = read.data as Record<string, unknown>;
  return input as unknown as LegProblemInput;
}

/** The toy walker demo, ready to search; three legs a third of a turn apart for the contact figures. */
export function demoLegSetup(): LegSetup {
  const input = legInputOfFile(toyWalker);
  // The demo file is ours and read by its tests; an unreadable one is a programmer error.
  if (input === null) throw new Error('demoLegSetup: public/examples/toy-walker-leg-problem.json is not a leg problem file');
  return { ...setupOfInput(input, { evaluations: DEMO_EVALUATIONS, seconds: null }, DEMO_SEED), phasing: { legs: '3', phasesDeg: '0, 120, 240' } };
}
