/**
 * Where each issue of the set-up is said: the field (or the row, or the group) its path
 * names. A point's, a keep-out circle's or a region's issues are said on its row; an
 * issue of a list (the families, the trajectory's point count) beside the list.
 */
import { FAMILY_NAMES } from '../../core/synthesis/problem';
import type { SetupIssue } from './readSetup';
import { LEG_TARGET_KEYS, type LegTargetKey } from './setup';
import { TARGET_SPECS } from './targetSpecs';

/** The field key a path's issue is shown at. */
export function fieldKeyOf(path: string): string {
  const row = /^(targets\.footPath\.points\[\d+\]|keepOut\[\d+\])/.exec(path);
  if (row !== null) return row[1];
  if (path === 'targets.footPath') return 'targets.footPath.points';
  if (/^families\[\d+\]$/.test(path)) return 'families';
  return path;
}

export function issuesByField(issues: readonly SetupIssue[]): Map<string, string[]> {
  const map = new Map<string, string[]>();
  for (const i of issues) {
    const key = fieldKeyOf(i.path);
    const list = map.get(key) ?? [];
    if (!list.includes(i.message)) list.push(i.message);
    map.set(key, list);
  }
  return map;
}

const FIELD_LABELS: Readonly<Record<string, string>> = {
  name: 'Problem name',
  ground: 'Ground line',
  'ground.kind': 'Ground line',
  'ground.yMm': 'Ground height y',
  'ground.point': 'Ground point',
  'ground.direction': 'Ground direction',
  stanceToleranceMm: 'Stance tolerance',
  crankDirection: 'Crank turns',
  walkingDirection: 'Body walks towards',
  steps: 'Foot samples per turn',
  'phasing.legs': 'Legs on one shaft',
  'phasing.phasesDeg': 'Their phases',
  targets: 'Gait targets',
  'targets.footPath.points': 'Foot trajectory',
  'targets.footPath.weight': 'Foot trajectory: weight',
  'targets.footPath.toleranceMm': 'Foot trajectory: tolerance',
  families: 'Families to search',
  'budget.evaluations': 'Budget in evaluations',
  'budget.seconds': 'Budget in seconds',
  seed: 'Seed',
};

/** The field a path names, as its label on the page (the path itself when it has none). */
export function fieldLabel(path: string): string {
  const key = fieldKeyOf(path);
  const known = FIELD_LABELS[key];
  if (known !== undefined) return known;
  const point = /^targets\.footPath\.points\[(\d+)\]$/.exec(key);
  if (point !== null) return `Foot trajectory point ${Number(point[1]) + 1}`;
  const circle = /^keepOut\[(\d+)\]$/.exec(key);
  if (circle !== null) return `Keep-out circle ${Number(circle[1]) + 1}`;
  const target = /^targets\.([A-Za-z]+)\.(\w+)$/.exec(key);
  if (target !== null && (LEG_TARGET_KEYS as readonly string[]).includes(target[1])) {
    const spec = TARGET_SPECS[target[1] as LegTargetKey];
    const field = target[2] === 'weight' ? 'weight' : /^tolerance/.test(target[2]) ? 'tolerance' : target[2] === 'heightMm' ? (spec.value2Label ?? target[2]) : spec.valueLabel;
    return `${spec.label}: ${field}`;
  }
  const region = /^bounds\.([\w-]+)(?:\.(.+))?$/.exec(key);
  if (region !== null) {
    const name = (FAMILY_NAMES as Readonly<Record<string, string>>)[region[1]] ?? region[1];
    return region[2] === undefined ? `${name} pivot regions` : `${name} region ${region[2]}`;
  }
  return path;
}

/** An issue in words for the list beside Start: the field as the page labels it, then what is wrong. */
export function issueLine(issue: SetupIssue): string {
  return issue.path === '' ? issue.message : `${fieldLabel(issue.path)}: ${issue.message}`;
}
