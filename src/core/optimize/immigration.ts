/**
 * Immigrants: points another search evaluated, offered to an optimizer (the island
 * model's migration). A population takes them by replacing its worst members when they
 * rank before them, the island-model scheme of replacing the worst (Cantú-Paz, 2001,
 * "Migration policies, selection pressure, and parallel evolutionary algorithms").
 *
 * Where a search takes immigrants (each optimizer's `takeImmigrants`):
 * - differential evolution (L-SHADE, rand/1/bin) once its initial population is
 *   evaluated, and the hybrid in its global phase: placed now;
 * - the same while the initial population is still being evaluated: 'later' (that
 *   evaluation would overwrite them), so the caller offers them again after a tell;
 * - a restart scheme: where its current run takes them;
 * - Nelder–Mead, the hybrid's polish and any stopped search: 'never' (a simplex is a
 *   local search; an outside point would break its geometry).
 */
import { precedes } from './ranking';
import type { Immigrant, Immigration } from './types';

export const IMMIGRATION_LATER: Immigration = { kind: 'later' };
export const IMMIGRATION_NEVER: Immigration = { kind: 'never' };

/** Throws (a programmer error: the caller converts and checks what it receives) unless every immigrant is a point of the box with a finite value and violation. */
export function checkImmigrants(immigrants: readonly Immigrant[], dim: number): void {
  if (!Array.isArray(immigrants)) throw new TypeError('takeImmigrants(): immigrants is not an array');
  for (const [k, m] of immigrants.entries()) {
    const u = m.u;
    if (!(u !== null && typeof u === 'object' && u.length === dim)) throw new TypeError(`takeImmigrants(): immigrant ${k} has no point of ${dim} coordinates`);
    for (let j = 0; j < dim; j++) {
      if (!(u[j] >= 0 && u[j] <= 1)) throw new RangeError(`takeImmigrants(): immigrant ${k} coordinate ${j} is ${u[j]}; expected a number in [0, 1] (box units)`);
    }
    if (!Number.isFinite(m.value)) throw new RangeError(`takeImmigrants(): immigrant ${k} value is ${m.value}; expected a finite number`);
    if (!(m.violation >= 0 && m.violation < Infinity)) throw new RangeError(`takeImmigrants(): immigrant ${k} violation is ${m.violation}; expected a finite number ≥ 0`);
  }
}

/** The immigrants best first by feasibility-first ranking, equals in the order given. */
export function rankImmigrants(immigrants: readonly Immigrant[]): Immigrant[] {
  const order = immigrants.map((_, k) => k);
  order.sort((a, b) => {
    const ma = immigrants[a];
    const mb = immigrants[b];
    if (precedes(ma.value, ma.violation, mb.value, mb.violation)) return -1;
    if (precedes(mb.value, mb.violation, ma.value, ma.violation)) return 1;
    return a - b;
  });
  return order.map((k) => immigrants[k]);
}

/**
 * Replaces the worst of the `n` members (rows of `population`, with `values` and
 * `violations`) by the immigrants of `ranked` (best first) while each ranks strictly
 * before the member it would replace; returns how many it placed. Members are taken
 * worst first, equals in index order.
 */
export function replaceWorst(
  ranked: readonly Immigrant[],
  population: Float64Array,
  values: Float64Array,
  violations: Float64Array,
  n: number,
  dim: number,
): number {
  if (ranked.length === 0) return 0;
  const worstFirst = Array.from({ length: n }, (_, i) => i);
  worstFirst.sort((a, b) => {
    if (precedes(values[b], violations[b], values[a], violations[a])) return -1;
    if (precedes(values[a], violations[a], values[b], violations[b])) return 1;
    return a - b;
  });
  let accepted = 0;
  for (const m of ranked) {
    if (accepted >= n) break;
    const slot = worstFirst[accepted];
    if (!precedes(m.value, m.violation, values[slot], violations[slot])) break;
    for (let j = 0; j < dim; j++) population[slot * dim + j] = m.u[j];
    values[slot] = m.value;
    violations[slot] = m.violation;
    accepted++;
  }
  return accepted;
}
