/** Builds and restores the searches a restart scheme can run: every kind but the scheme itself. */
import type { Avoidance } from './avoid';
import { readLiteral } from './codec';
import { DifferentialEvolution } from './de';
import { Hybrid } from './hybrid';
import { NelderMead } from './nelder-mead';
import type { Prng } from './prng';
import type { ResolvedInnerConfig } from './types';

export type InnerOptimizer = DifferentialEvolution | NelderMead | Hybrid;

/** A new search on `rng`; `avoid` steers a population's initial draws (Nelder–Mead takes its start from `config.x0`). */
export function buildInner(config: ResolvedInnerConfig, rng: Prng, avoid?: Avoidance): InnerOptimizer {
  switch (config.kind) {
    case 'lshade':
    case 'de-rand-1-bin':
      return DifferentialEvolution.create(config, rng, avoid);
    case 'nelder-mead':
      return NelderMead.create(config, rng);
    case 'hybrid':
      return Hybrid.create(config, rng, avoid);
  }
}

/** The search a state of one of these kinds describes; throws InvalidInput with what is wrong. */
export function restoreInner(o: Record<string, unknown>, where: string): InnerOptimizer {
  const kind = readLiteral(o.kind, `${where}.kind`, ['lshade', 'de-rand-1-bin', 'nelder-mead', 'hybrid'] as const);
  switch (kind) {
    case 'lshade':
    case 'de-rand-1-bin':
      return DifferentialEvolution.fromState(o, where);
    case 'nelder-mead':
      return NelderMead.fromState(o, where);
    case 'hybrid':
      return Hybrid.fromState(o, where);
  }
}
