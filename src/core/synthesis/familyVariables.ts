/**
 * The design variables of each path family, known without building its encoding: the
 * four-bar's link-length variables, and the pose families' joint positions in their
 * plan's slot order. problem.ts checks every bound's name against these, and the
 * encodings take their names from here, so the two cannot differ. Imports nothing of
 * problem.ts (which imports this module).
 */
import { compile, fourBar, sliderCrank, stephensonI, stephensonII, stephensonIII, wattI, wattII, type Linkage, type Plan } from '../linkage';

/** Builders of the pose-based families, by family id. */
export const POSE_FAMILY_BUILDERS = {
  fourbar: () => fourBar(),
  'slider-crank': () => sliderCrank(),
  'watt-i': () => wattI(),
  'watt-ii': () => wattII(),
  'stephenson-i': () => stephensonI(),
  'stephenson-ii': () => stephensonII(),
  'stephenson-iii': () => stephensonIII(),
} as const satisfies Readonly<Record<string, () => Linkage>>;

/** The four-bar's link-length variables with a fixed placement (the literature's form) and with a free one (units of the ground link). */
export const FOUR_BAR_FIXED_NAMES: readonly string[] = ['r1', 'r2', 'r3', 'r4', 'rcx', 'rcy', 'theta0', 'x0', 'y0'];
export const FOUR_BAR_FREE_NAMES: readonly string[] = ['r2', 'r3', 'r4', 'rcx', 'rcy'];

/** A pose family's variables: each joint's and point's reference position, in the plan's slot order. */
export function poseVariableNames(plan: Plan): string[] {
  const names: string[] = [];
  for (const id of [...plan.jointIds, ...plan.pointIds]) names.push(`${id}.x`, `${id}.y`);
  return names;
}

/** The mechanism variables of `family` (per-point driver variables not included), or null for an unknown family. */
export function mechanismVariableNames(family: string, placement: 'fixed' | 'free'): readonly string[] | null {
  if (family === 'fourbar-lengths') return placement === 'free' ? FOUR_BAR_FREE_NAMES : FOUR_BAR_FIXED_NAMES;
  if (!Object.hasOwn(POSE_FAMILY_BUILDERS, family)) return null;
  const compiled = compile(POSE_FAMILY_BUILDERS[family as keyof typeof POSE_FAMILY_BUILDERS]());
  return compiled.ok ? poseVariableNames(compiled.plan) : null;
}

/** Prefix of a family's per-point driver variables (`theta2_1`, `driver_1`, …). */
export function driverVariablePrefix(family: string): string {
  return family === 'fourbar-lengths' ? 'theta2' : 'driver';
}
