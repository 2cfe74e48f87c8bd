/**
 * Migration into an island's optimizer: the immigrants other islands send, in the
 * design's units, brought into the optimizer's box (clamped to it, as a search map may
 * round a bound's image a hair outside) for its `takeImmigrants`, which places them
 * (src/core/optimize/immigration.ts says where each search takes them).
 */
import type { Immigrant } from '../src/core/optimize';
import type { Individual } from './api';
import type { SearchObjective } from './searchObjective';

/** The individuals in box units, each coordinate clamped to [0, 1]. */
export function toUnitImmigrants(objective: SearchObjective, individuals: readonly Individual[]): Immigrant[] {
  return individuals.map((individual) => {
    const u = objective.toSearchBoxInto(individual.x, new Float64Array(objective.dim));
    for (let j = 0; j < u.length; j++) u[j] = Math.min(1, Math.max(0, u[j]));
    return { u, value: individual.value, violation: individual.violation };
  });
}
