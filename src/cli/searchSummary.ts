/**
 * What a fit of a suspension or leg problem would search, family (or layout) by family:
 * its variables with their bounds, as `loci check` prints them and writes them as JSON.
 */
import type { SearchObjectiveOf } from '../core/synthesis';

export interface FamilySearchSummary {
  readonly family: string;
  readonly name: string;
  readonly dim: number;
  readonly variables: { readonly name: string; readonly lower: number; readonly upper: number }[];
}

/** The summary of one family's objective, named `name`. */
export function familySearchSummary(objective: SearchObjectiveOf<string, unknown>, name: string): FamilySearchSummary {
  return {
    family: objective.family,
    name,
    dim: objective.dim,
    variables: objective.variableNames.map((variable, j) => ({ name: variable, lower: objective.lower[j], upper: objective.upper[j] })),
  };
}

const round = (v: number) => String(Number(v.toPrecision(6)));

/** Each family's line and one line a variable with its bounds (6 significant digits), indented under the summary's heading. */
export function familySearchLines(families: readonly FamilySearchSummary[]): string[] {
  const lines: string[] = [];
  for (const f of families) {
    lines.push(`  ${f.family} (${f.name}): ${f.dim} variables`);
    const width = Math.max(...f.variables.map((v) => v.name.length));
    for (const v of f.variables) lines.push(`    ${v.name.padEnd(width)}  ${round(v.lower)} … ${round(v.upper)}`);
  }
  return lines;
}
