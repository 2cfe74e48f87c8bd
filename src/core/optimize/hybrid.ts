/**
 * A hybrid schedule: a global search (L-SHADE or DE/rand/1/bin) for `globalShare` of the
 * budget, then a Nelder–Mead polish of the best distinct points it found, best first.
 *
 * Candidates: during the global phase every evaluated point is offered to a
 * `DistinctElite` of `polishCount` entries, distinct meaning an RMS coordinate difference
 * above `distinctDistance` (box units). The final population is no source for this:
 * L-SHADE ends with 4 individuals, mostly in one basin.
 *
 * Each polish starts at its candidate (already evaluated, so not asked again) and gets
 * half of the budget left, the last candidate all of it, so the best gets most; budget a
 * polish leaves unused (it converged) passes on. The schedule stops as converged when
 * the last polish has converged.
 *
 * The global search draws from stream 0 of this optimizer's generator and polish k
 * from stream k + 1, so each part is reproducible on its own.
 */
import type { Avoidance } from './avoid';
import { OptimizerBase } from './base';
import { encodeReal, fail, readInteger, readLength, readLiteral, readNumbers, readObject, readReal } from './codec';
import { resolveConfig } from './config';
import { DifferentialEvolution } from './de';
import { DistinctElite } from './elite';
import { checkImmigrants, IMMIGRATION_LATER, IMMIGRATION_NEVER, rankImmigrants } from './immigration';
import { NelderMead } from './nelder-mead';
import { PrefixViews } from './prefixViews';
import type { Prng } from './prng';
import { BestTracker, canonicalInto } from './ranking';
import { readHeader, targetOrBudget, writeHeader } from './state';
import type { HybridState, Immigrant, Immigration, Optimizer, ResolvedDe, ResolvedHybrid, ResolvedNelderMead, StopReason } from './types';

export class Hybrid extends OptimizerBase implements Optimizer {
  readonly dim: number;
  private readonly config: ResolvedHybrid;
  /** Never drawn from: its streams seed the parts. */
  private readonly rng: Prng;
  private phase: 'global' | 'polish' = 'global';
  private global: DifferentialEvolution | null = null;
  /** The best distinct points of the global phase: the candidates to polish. */
  private readonly candidates: DistinctElite;
  private polishIndex = 0;
  private polish: NelderMead | null = null;
  /** The told batch's canonical values and violations, for the `offerAt` forms. */
  private readonly toldValues = new PrefixViews();
  private readonly toldViolations = new PrefixViews();

  private constructor(config: ResolvedHybrid, rng: Prng, evaluations: number, stop: StopReason | null, best: BestTracker) {
    super(evaluations, stop, best);
    this.dim = config.dim;
    this.config = config;
    this.rng = rng;
    this.candidates = new DistinctElite(config.dim, config.polishCount, config.distinctDistance);
  }

  /** A new search; the global phase's initial population keeps away from the basins of `avoid` when given. */
  static create(config: ResolvedHybrid, rng: Prng, avoid?: Avoidance): Hybrid {
    const hybrid = new Hybrid(config, rng, 0, null, new BestTracker(config.dim));
    const { dim, seed, stream, targetValue } = config;
    const maxEvaluations = Math.max(1, Math.floor(config.globalShare * config.maxEvaluations));
    // Through resolveConfig, so the part's config has the field order a restored one has.
    const globalConfig = resolveConfig({ ...config.global, dim, maxEvaluations, seed, stream, targetValue }) as ResolvedDe;
    hybrid.global = DifferentialEvolution.create(globalConfig, rng.split(0), avoid);
    return hybrid;
  }

  static fromState(o: Record<string, unknown>, where: string): Hybrid {
    const h = readHeader(o, where, ['hybrid'] as const);
    const config = h.config;
    const d = config.dim;
    const hybrid = new Hybrid(config, h.rng, h.evaluations, h.stopReason, h.best);
    hybrid.phase = readLiteral(o.phase, `${where}.phase`, ['global', 'polish'] as const);
    const count = readLength(o.candidates, `${where}.candidates`, config.polishCount);
    const list = o.candidates as unknown[];
    const elite = hybrid.candidates;
    for (let k = 0; k < count; k++) {
      const at = `${where}.candidates[${k}]`;
      const c = readObject(list[k], at);
      readNumbers(c.x, `${at}.x`, d, 0, 1, elite.x.subarray(k * d, (k + 1) * d));
      elite.values[k] = readReal(c.value, `${at}.value`);
      const violation = readReal(c.violation, `${at}.violation`);
      if (!(violation >= 0 && violation < Infinity)) fail(`${at}.violation`, violation, 'a finite violation ≥ 0');
      elite.violations[k] = violation;
    }
    elite.count = count;
    const running = h.stopReason === null;
    if (hybrid.phase === 'global') {
      if (!running) {
        if (o.global !== null) fail(`${where}.global`, o.global, 'null once the search stopped');
      } else {
        const part = DifferentialEvolution.fromState(readObject(o.global, `${where}.global`), `${where}.global`);
        if (part.dim !== d) fail(`${where}.global.config.dim`, part.dim, String(d));
        if (part.evaluations() !== h.evaluations) fail(`${where}.global.evaluations`, part.evaluations(), String(h.evaluations));
        if (part.done()) fail(`${where}.global.stopReason`, part.stopReason(), 'null while the hybrid runs its global phase');
        hybrid.global = part;
      }
      hybrid.polishIndex = readInteger(o.polishIndex, `${where}.polishIndex`, 0, 0);
    } else {
      hybrid.polishIndex = readInteger(o.polishIndex, `${where}.polishIndex`, 0, Math.max(0, count - 1));
      if (running) {
        const part = NelderMead.fromState(readObject(o.polish, `${where}.polish`), `${where}.polish`);
        if (part.dim !== d) fail(`${where}.polish.config.dim`, part.dim, String(d));
        if (part.evaluations() > h.evaluations) fail(`${where}.polish.evaluations`, part.evaluations(), `at most ${h.evaluations}`);
        if (part.done()) fail(`${where}.polish.stopReason`, part.stopReason(), 'null while the hybrid polishes');
        hybrid.polish = part;
      } else if (o.polish !== null) {
        fail(`${where}.polish`, o.polish, 'null once the search stopped');
      }
    }
    return hybrid;
  }

  ask(): readonly Float64Array[] {
    const part = this.stop === null ? this.part() : null;
    return part === null ? [] : part.ask();
  }

  tell(points: readonly Float64Array[], values: Float64Array, violations?: Float64Array): void {
    const part = this.stop === null ? this.part() : null;
    if (part === null) {
      if (points.length > 0) throw new Error(`tell() got ${points.length} points; the search has stopped and asked for none`);
      return;
    }
    part.tell(points, values, violations);
    // The told points still hold their coordinates: the part writes its next batch into its other buffer.
    const global = this.phase === 'global';
    const n = points.length;
    const toldValues = this.toldValues.get(n);
    const toldViolations = this.toldViolations.get(n);
    // Candidates full of feasible points when the batch was asked take none of its
    // infeasible points, though an offer may free a place on the way (by taking the places
    // of several near it): so the batch's infeasible points are dropped whatever they
    // score, and infeasibleDroppedInto can say so.
    const refusing = global && !this.candidates.takesInfeasible();
    for (let k = 0; k < n; k++) {
      canonicalInto(values, violations, k, toldValues, toldViolations, k);
      this.bestPoint.offerAt(points[k], 0, toldValues, toldViolations, k);
      if (global && !(refusing && toldViolations[k] > 0)) this.candidates.offerAt(points[k], toldValues, toldViolations, k);
    }
    this.evaluationsTold += points.length;
    const { targetValue, maxEvaluations } = this.config;
    this.stop = targetOrBudget(this.bestPoint, targetValue, this.evaluationsTold, maxEvaluations);
    if (this.stop !== null) {
      // A stopped hybrid holds no running part, so its exported state restores.
      this.global = null;
      this.polish = null;
      return;
    }
    if (!part.done()) return;
    if (global) {
      this.global = null;
      this.phase = 'polish';
      this.polishIndex = -1;
    }
    this.nextPolish();
  }

  /** The running part's, where the candidates to polish refuse the batch's infeasible points (see tell; a polish drops none anyway). */
  infeasibleDroppedInto(out: Uint8Array): void {
    const part = this.stop === null ? this.part() : null;
    if (part === null) return;
    if (this.phase === 'global' && this.candidates.takesInfeasible()) {
      out.fill(0, 0, part.ask().length);
      return;
    }
    part.infeasibleDroppedInto(out);
  }

  /** Into the global search's population while it runs (not the candidates: they are points this search evaluated); never into a polish. */
  takeImmigrants(immigrants: readonly Immigrant[]): Immigration {
    checkImmigrants(immigrants, this.dim);
    const global = this.stop === null && this.phase === 'global' ? this.global : null;
    if (global === null) return IMMIGRATION_NEVER;
    if (global.initialising()) return IMMIGRATION_LATER;
    const ranked = rankImmigrants(immigrants);
    const accepted = global.placeRanked(ranked);
    if (accepted > 0) {
      const first = ranked[0];
      this.bestPoint.offer(Float64Array.from(first.u), 0, first.value, first.violation);
    }
    return { kind: 'placed', accepted };
  }

  exportState(): HybridState {
    const elite = this.candidates;
    const candidates = [];
    for (let k = 0; k < elite.count; k++) {
      candidates.push({ x: Array.from(elite.point(k)), value: encodeReal(elite.values[k]), violation: encodeReal(elite.violations[k]) });
    }
    return {
      ...writeHeader(this.config, this.rng, this.evaluationsTold, this.stop, this.bestPoint),
      kind: 'hybrid',
      phase: this.phase,
      global: this.global === null ? null : this.global.exportState(),
      candidates,
      polishIndex: this.polishIndex,
      polish: this.polish === null ? null : this.polish.exportState(),
    };
  }

  private part(): Optimizer | null {
    return this.phase === 'global' ? this.global : this.polish;
  }

  /** Starts the polish of the next candidate, or stops when none is left. */
  private nextPolish(): void {
    this.polish = null;
    this.polishIndex++;
    const elite = this.candidates;
    const count = elite.count;
    const left = count - this.polishIndex;
    if (left <= 0) {
      this.polishIndex = Math.max(0, count - 1);
      this.stop = 'converged';
      return;
    }
    const { dim, seed, stream, targetValue } = this.config;
    const k = this.polishIndex;
    const x = elite.point(k);
    const remaining = this.config.maxEvaluations - this.evaluationsTold;
    const polishConfig = resolveConfig({
      kind: 'nelder-mead',
      ...this.config.polish,
      x0: Array.from(x),
      dim,
      // Better candidates get more: half of what is left, the last candidate all of it.
      maxEvaluations: left === 1 ? remaining : Math.ceil(remaining / 2),
      seed,
      stream,
      targetValue,
    }) as ResolvedNelderMead;
    const start = { x, value: elite.values[k], violation: elite.violations[k] };
    this.polish = NelderMead.create(polishConfig, this.rng.split(1 + k), start);
  }
}
