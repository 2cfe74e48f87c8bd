/**
 * The design space of a path problem's family: the encoding's variables and default
 * boxes, the per-point driver variables of free timing, the problem's box overrides, and
 * the map from the optimizers' unit box. Built once per objective. Also what any kind of
 * problem's design space shows a search, and a design as a record of its variables.
 */
import { targetFrame, type MechanismEncoding } from '../encoding';
import { createFourBarLengths } from '../fourBarLengths';
import { createPoseFamily } from '../poseFamilies';
import type { FamilyId, Problem } from '../problem';
import { createSearchMap, type SearchMap } from '../searchMap';
import type { SearchObjectiveOf } from './types';

const TAU = 2 * Math.PI;

/** What any objective's design space gives a search: its variables, their boxes and the map from the unit box. */
export interface DesignSpace {
  readonly names: readonly string[];
  readonly dim: number;
  readonly lower: Float64Array;
  readonly upper: Float64Array;
  readonly searchMap: SearchMap;
}

export interface PathDesignSpace extends DesignSpace {
  readonly encoding: MechanismEncoding;
  readonly names: string[];
  /** Mechanism variables (the per-point driver variables follow them). */
  readonly mechanismDim: number;
}

type SpaceFields = 'dim' | 'lower' | 'upper' | 'variableNames' | 'searchMap' | 'fromSearchBoxInto' | 'toSearchBoxInto';

/** The design-space half of an objective (SearchObjectiveOf), the same for every kind of problem. */
export function objectiveSpace(space: DesignSpace): Pick<SearchObjectiveOf<string, unknown>, SpaceFields> {
  return {
    dim: space.dim,
    lower: space.lower,
    upper: space.upper,
    variableNames: space.names,
    searchMap: space.searchMap.kind,
    fromSearchBoxInto: space.searchMap.fromSearchBoxInto,
    toSearchBoxInto: space.searchMap.toSearchBoxInto,
  };
}

/** Design x as a record of its variables by name. */
export function variableRecord(names: readonly string[], x: ArrayLike<number>): Record<string, number> {
  const variables: Record<string, number> = {};
  names.forEach((name, j) => {
    variables[name] = x[j];
  });
  return variables;
}

export function createEncoding(problem: Problem, family: FamilyId): MechanismEncoding {
  const frame = targetFrame(problem.target.points);
  const sized = frame.size > 0 ? frame : { ...frame, size: 1 };
  if (family === 'fourbar-lengths') return createFourBarLengths(problem.placement, problem.constraints, sized);
  return createPoseFamily(family, problem.constraints, sized);
}

export function pathVariableNames(encoding: MechanismEncoding, problem: Problem): string[] {
  const names = [...encoding.names];
  if (problem.timing.mode === 'free') {
    const n = problem.target.points.length / 2;
    for (let i = 0; i < n; i++) names.push(`${encoding.driverName}_${i + 1}`);
  }
  return names;
}

export function createPathDesignSpace(problem: Problem, family: FamilyId): PathDesignSpace {
  const encoding = createEncoding(problem, family);
  const names = pathVariableNames(encoding, problem);
  const m = encoding.names.length;
  const dim = names.length;
  const lower = new Float64Array(dim);
  const upper = new Float64Array(dim);
  lower.set(encoding.lower);
  upper.set(encoding.upper);
  for (let i = m; i < dim; i++) {
    lower[i] = 0;
    upper[i] = TAU;
  }
  const overrides = problem.bounds[family] ?? {};
  for (const [name, box] of Object.entries(overrides)) {
    let matched = false;
    for (let j = 0; j < dim; j++) {
      if (names[j] === name || (j >= m && name === encoding.driverName)) {
        lower[j] = box[0];
        upper[j] = box[1];
        matched = true;
      }
    }
    // createProblem checks every name; reaching this is a programmer error.
    if (!matched) throw new RangeError(`bounds.${family}.${name}: no such variable; expected one of ${names.join(', ')}${dim > m ? ` or ${encoding.driverName}` : ''}`);
  }
  const n = problem.target.points.length / 2;
  const searchMap = createSearchMap(problem.searchMaps[family] ?? 'affine', {
    family,
    placement: problem.placement,
    freeDrivers: problem.timing.mode === 'free' ? n : 0,
    lower,
    upper,
  });
  return { encoding, names, mechanismDim: m, dim, lower, upper, searchMap };
}

/**
 * Normalised distance of x outside its box (each variable's excess over its box's width;
 * 1 for NaN), into `out[index]`: a double returned from a call that is not inlined is
 * boxed (an allocation).
 */
export function boxViolationInto(x: Float64Array, lower: Float64Array, upper: Float64Array, dim: number, out: Float64Array, index: number): void {
  let v = 0;
  for (let j = 0; j < dim; j++) {
    const w = upper[j] - lower[j];
    const xj = x[j];
    if (xj < lower[j]) v += (lower[j] - xj) / w;
    else if (xj > upper[j]) v += (xj - upper[j]) / w;
    else if (Number.isNaN(xj)) v += 1;
  }
  out[index] = v;
}
