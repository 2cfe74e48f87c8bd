/**
 * Migration into an optimizer through its JSON state: immigrants replace the worst
 * members of a differential-evolution population when they rank before them, the
 * island-model scheme of replacing the worst (Cantú-Paz, 2001, "Migration policies,
 * selection pressure, and parallel evolutionary algorithms"). The optimizers of
 * src/core/optimize have no injection call, and their state is their public, checked
 * form, so the island edits the state and restores the optimizer from it.
 *
 * Where a population takes immigrants:
 * - DE (L-SHADE, rand/1/bin) in its 'evolve' phase, and the hybrid's global phase;
 * - DE in its 'init' phase: not yet (the initial population is being evaluated and would
 *   overwrite them), so the island keeps them until the next generation;
 * - a restart scheme: where its current run takes them;
 * - Nelder–Mead and the hybrid's polish: never (a simplex is a local search; an outside
 *   point would break its geometry), so they are dropped.
 */
import { precedes, type DeState, type JsonReal, type OptimizerState } from '../src/core/optimize';

/** An immigrant in box units, with ranked value and violation (finite). */
export interface UnitImmigrant {
  readonly u: Float64Array;
  readonly value: number;
  readonly violation: number;
}

export type InjectResult =
  | { readonly kind: 'injected'; readonly state: OptimizerState; readonly accepted: number }
  | { readonly kind: 'later' }
  | { readonly kind: 'never' };

const decode = (v: JsonReal): number => (v === null ? Infinity : v);

/** Replaces the worst members of `de` by the immigrants that rank before them; returns the count. */
function injectIntoDe(de: DeState, immigrants: readonly UnitImmigrant[]): { state: DeState; accepted: number; best: UnitImmigrant | null } {
  const d = de.config.dim;
  const n = de.populationSize;
  const population = de.population.slice();
  const values = de.values.slice();
  const violations = de.violations.slice();
  // Worst first: candidates for replacement.
  const worstFirst = Array.from({ length: n }, (_, i) => i).sort((a, b) => {
    const av = decode(values[a]);
    const ac = decode(violations[a]);
    const bv = decode(values[b]);
    const bc = decode(violations[b]);
    return precedes(bv, bc, av, ac) ? -1 : precedes(av, ac, bv, bc) ? 1 : a - b;
  });
  const sorted = [...immigrants].sort((a, b) =>
    precedes(a.value, a.violation, b.value, b.violation) ? -1 : precedes(b.value, b.violation, a.value, a.violation) ? 1 : 0,
  );
  let accepted = 0;
  let best: UnitImmigrant | null = null;
  for (const immigrant of sorted) {
    if (accepted >= worstFirst.length) break;
    const slot = worstFirst[accepted];
    if (!precedes(immigrant.value, immigrant.violation, decode(values[slot]), decode(violations[slot]))) break;
    for (let j = 0; j < d; j++) population[slot * d + j] = immigrant.u[j];
    values[slot] = immigrant.value;
    violations[slot] = immigrant.violation;
    if (best === null) best = immigrant;
    accepted++;
  }
  return { state: { ...de, population, values, violations }, accepted, best };
}

function withBest<S extends OptimizerState>(state: S, best: UnitImmigrant | null): S {
  if (best === null) return state;
  const current = state.best;
  if (current.seen && !precedes(best.value, best.violation, decode(current.value), decode(current.violation))) return state;
  return { ...state, best: { x: Array.from(best.u), value: best.value, violation: best.violation, seen: true } };
}

function bestOf(state: OptimizerState): UnitImmigrant | null {
  const b = state.best;
  return b.seen && b.value !== null && b.violation !== null ? { u: Float64Array.from(b.x), value: b.value, violation: b.violation } : null;
}

/** The state with the immigrants placed, or when they can be placed. */
export function injectImmigrants(state: OptimizerState, immigrants: readonly UnitImmigrant[]): InjectResult {
  if (state.stopReason !== null) return { kind: 'never' };
  if (state.kind === 'restart') {
    // Into the current run; the scheme's best is the better of its past runs' and the run's.
    const placed = injectImmigrants(state.inner, immigrants);
    if (placed.kind !== 'injected' || placed.state.kind === 'restart') return placed;
    return { kind: 'injected', state: withBest({ ...state, inner: placed.state }, bestOf(placed.state)), accepted: placed.accepted };
  }
  if (state.kind === 'nelder-mead') return { kind: 'never' };
  if (state.kind === 'hybrid') {
    if (state.phase !== 'global' || state.global === null) return { kind: 'never' };
    if (state.global.phase === 'init') return { kind: 'later' };
    const placed = injectIntoDe(state.global, immigrants);
    const hybrid = withBest({ ...state, global: withBest(placed.state, placed.best) }, placed.best);
    return { kind: 'injected', state: hybrid, accepted: placed.accepted };
  }
  if (state.phase === 'init') return { kind: 'later' };
  const placed = injectIntoDe(state, immigrants);
  return { kind: 'injected', state: withBest(placed.state, placed.best), accepted: placed.accepted };
}
