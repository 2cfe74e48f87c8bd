/**
 * `takeImmigrants` places immigrants exactly as the island placed them before the
 * optimizers had the method: by editing the optimizer's exported JSON state and
 * restoring the optimizer from it. That placement is copied below, as it was in
 * workers/migration.ts (commit d0f4fbf), as the independent reference
 * `placeByStateEdit`. Two copies of each optimizer run side by side on the same problem,
 * one taking immigrants through the method, the other through the reference; every
 * batch asked, every answer and every exported state must be the same, bit for bit.
 */
import { describe, expect, it } from 'vitest';
import {
  createOptimizer,
  precedes,
  Prng,
  restoreOptimizer,
  type DeState,
  type Immigrant,
  type Immigration,
  type JsonReal,
  type Optimizer,
  type OptimizerConfig,
  type OptimizerState,
} from '../../src/core/optimize';

// ---------------------------------------------------------------------------------------
// The reference: workers/migration.ts before this change (its injectImmigrants), and the
// island's use of it (workers/island.ts placeImmigrants), unchanged but for names.

interface UnitImmigrant {
  readonly u: Float64Array;
  readonly value: number;
  readonly violation: number;
}

type InjectResult =
  | { readonly kind: 'injected'; readonly state: OptimizerState; readonly accepted: number }
  | { readonly kind: 'later' }
  | { readonly kind: 'never' };

const decode = (v: JsonReal): number => (v === null ? Infinity : v);

function injectIntoDe(de: DeState, immigrants: readonly UnitImmigrant[]): { state: DeState; accepted: number; best: UnitImmigrant | null } {
  const d = de.config.dim;
  const n = de.populationSize;
  const population = de.population.slice();
  const values = de.values.slice();
  const violations = de.violations.slice();
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

function injectImmigrants(state: OptimizerState, immigrants: readonly UnitImmigrant[]): InjectResult {
  if (state.stopReason !== null) return { kind: 'never' };
  if (state.kind === 'restart') {
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

/** The island's placement before this change: export, edit, restore (only when some were placed). */
function placeByStateEdit(optimizer: Optimizer, immigrants: readonly UnitImmigrant[]): { optimizer: Optimizer; outcome: Immigration } {
  const placed = injectImmigrants(optimizer.exportState(), immigrants);
  if (placed.kind === 'later') return { optimizer, outcome: { kind: 'later' } };
  if (placed.kind === 'never' || placed.accepted === 0) return { optimizer, outcome: placed.kind === 'never' ? { kind: 'never' } : { kind: 'placed', accepted: 0 } };
  const restored = restoreOptimizer(placed.state);
  if (!restored.ok) throw new Error(`the reference produced a state the optimizer rejects: ${restored.reason}`);
  return { optimizer: restored.optimizer, outcome: { kind: 'placed', accepted: placed.accepted } };
}

// ---------------------------------------------------------------------------------------
// The problem: a shifted sphere in the box with one linear constraint, so feasibility-first
// ranking (violations) takes part, and a corner where evaluation fails (NaN), so members
// rank equal (failed) and which of them an immigrant replaces is decided by the tie rule.

const DIM = 3;

function evaluate(u: ArrayLike<number>): { value: number; violation: number } {
  if (u[2] > 0.8) return { value: Number.NaN, violation: 0 };
  let value = 0;
  for (let j = 0; j < DIM; j++) value += (u[j] - 0.3) ** 2;
  return { value, violation: Math.max(0, u[0] + u[1] - 0.9) };
}

function make(config: OptimizerConfig): Optimizer {
  const made = createOptimizer(config);
  if (!made.ok) throw new Error(made.reason);
  return made.optimizer;
}

/** The population values of the differential evolution inside a state, if it has one running. */
function deOf(state: OptimizerState): DeState | null {
  if (state.kind === 'restart') return deOf(state.inner);
  if (state.kind === 'hybrid') return state.global;
  if (state.kind === 'lshade' || state.kind === 'de-rand-1-bin') return state;
  return null;
}

/**
 * A strong mix meets each rule: random evaluated points (some rank before the worst
 * members, some not), two immigrants of the same rank at different points, one tied with
 * the worst member (not placed: it must rank strictly before), and one better than the
 * best. A weak one holds only the tie and a point more infeasible than any of the problem.
 */
function immigrantsFor(state: OptimizerState, rng: Prng, strong: boolean): Immigrant[] {
  const out: Immigrant[] = [];
  // Immigrants were evaluated successfully elsewhere: failed points are not sent.
  for (let k = 0; out.length < 6 && k < 100; k++) {
    const u = new Float64Array(DIM);
    rng.fillFloats(u, DIM);
    const e = evaluate(u);
    if (Number.isFinite(e.value)) out.push({ u, ...e });
  }
  const twin = Float64Array.from(out[0].u, (c) => 1 - c);
  out.push({ u: twin, value: out[0].value, violation: out[0].violation });
  const de = deOf(state);
  if (de !== null && de.values.length > 0) {
    let worst = 0;
    for (let i = 1; i < de.values.length; i++) {
      if (precedes(decode(de.values[worst]), decode(de.violations[worst]), decode(de.values[i]), decode(de.violations[i]))) worst = i;
    }
    const value = de.values[worst];
    const violation = de.violations[worst];
    if (value !== null && violation !== null) out.push({ u: Float64Array.from(out[1].u, (c) => c * 0.5), value, violation });
  }
  if (!strong) return [...out.slice(7), { u: out[2].u, value: 0, violation: 5 }];
  out.push({ u: Float64Array.from({ length: DIM }, () => 0.3), value: -1, violation: 0 });
  return out;
}

function asUnit(immigrants: readonly Immigrant[]): UnitImmigrant[] {
  return immigrants.map((m) => ({ u: Float64Array.from(m.u), value: m.value, violation: m.violation }));
}

/** Runs the two copies for `batches` batches, offering immigrants after every `every`-th tell; returns the outcomes seen. */
function sideBySide(config: OptimizerConfig, batches: number, every: number): Immigration[] {
  const viaMethod = make(config);
  let viaState = make(config);
  const rng = Prng.fromSeed(2024);
  const outcomes: Immigration[] = [];
  const offer = (): void => {
    const immigrants = immigrantsFor(viaMethod.exportState(), rng, outcomes.length % 2 === 0);
    const outcome = viaMethod.takeImmigrants(immigrants);
    const reference = placeByStateEdit(viaState, asUnit(immigrants));
    viaState = reference.optimizer;
    expect(outcome).toEqual(reference.outcome);
    expect(viaMethod.exportState()).toEqual(viaState.exportState());
    outcomes.push(outcome);
  };
  offer();
  for (let batch = 1; batch <= batches && !viaMethod.done(); batch++) {
    const points = viaMethod.ask();
    const referencePoints = viaState.ask();
    expect(referencePoints.map((p) => Array.from(p))).toEqual(points.map((p) => Array.from(p)));
    const values = new Float64Array(points.length);
    const violations = new Float64Array(points.length);
    points.forEach((p, k) => {
      const e = evaluate(p);
      values[k] = e.value;
      violations[k] = e.violation;
    });
    viaMethod.tell(points, values, violations);
    viaState.tell(referencePoints, Float64Array.from(values), Float64Array.from(violations));
    if (batch % every === 0) offer();
  }
  offer();
  expect(viaMethod.done()).toBe(viaState.done());
  expect(viaMethod.best()).toEqual(viaState.best());
  expect(viaMethod.exportState()).toEqual(viaState.exportState());
  return outcomes;
}

const kinds = (outcomes: readonly Immigration[]) => new Set(outcomes.map((o) => (o.kind === 'placed' ? (o.accepted > 0 ? 'placed' : 'placed none') : o.kind)));
const common = { dim: DIM, seed: 11 } as const;

describe('takeImmigrants places immigrants as the JSON-state edit did', () => {
  it('L-SHADE: later while the initial population is evaluated, then over the worst members, then never once stopped', () => {
    const outcomes = sideBySide({ kind: 'lshade', maxEvaluations: 3000, ...common }, 200, 3);
    expect(kinds(outcomes)).toEqual(new Set(['later', 'placed', 'placed none', 'never']));
  });

  it('DE/rand/1/bin', () => {
    const outcomes = sideBySide({ kind: 'de-rand-1-bin', maxEvaluations: 2000, ...common }, 200, 2);
    expect(kinds(outcomes)).toContain('placed');
  });

  it('the hybrid: into its global search, never into a polish', () => {
    const outcomes = sideBySide({ kind: 'hybrid', maxEvaluations: 2500, ...common }, 400, 2);
    expect(kinds(outcomes)).toEqual(new Set(['later', 'placed', 'placed none', 'never']));
  });

  it('Nelder–Mead: never', () => {
    const outcomes = sideBySide({ kind: 'nelder-mead', maxEvaluations: 300, ...common }, 100, 5);
    expect(kinds(outcomes)).toEqual(new Set(['never']));
  });

  it('a restart scheme around L-SHADE, across restarts (each new run is later, then placed)', () => {
    const outcomes = sideBySide({ kind: 'restart', inner: { kind: 'lshade' }, runEvaluations: 1200, maxEvaluations: 6000, ...common }, 400, 2);
    expect(outcomes.filter((o) => o.kind === 'later').length).toBeGreaterThan(1);
    expect(kinds(outcomes)).toContain('placed');
  });

  it('a restart scheme around the hybrid, as an island runs one', () => {
    const outcomes = sideBySide({ kind: 'restart', inner: { kind: 'hybrid' }, runEvaluations: 1500, maxEvaluations: 5000, ...common }, 400, 2);
    expect(kinds(outcomes)).toEqual(new Set(['later', 'placed', 'placed none', 'never']));
  });

  it('a restart scheme around Nelder–Mead: never', () => {
    const outcomes = sideBySide({ kind: 'restart', inner: { kind: 'nelder-mead' }, runEvaluations: 200, maxEvaluations: 600, ...common }, 300, 3);
    expect(kinds(outcomes)).toEqual(new Set(['never']));
  });

  it('refuses an immigrant outside the box or with a non-finite value, naming it', () => {
    const opt = make({ kind: 'lshade', maxEvaluations: 1000, ...common });
    expect(() => opt.takeImmigrants([{ u: [0.5, Number.NaN, 0.5], value: 1, violation: 0 }])).toThrow('immigrant 0 coordinate 1 is NaN');
    expect(() => opt.takeImmigrants([{ u: [0.5, 0.5], value: 1, violation: 0 }])).toThrow('immigrant 0 has no point of 3 coordinates');
    expect(() => opt.takeImmigrants([{ u: [0.5, 0.5, 0.5], value: Infinity, violation: 0 }])).toThrow('immigrant 0 value is Infinity');
  });
});
