/**
 * The two ways to get an optimizer: from a configuration, or from an exported state.
 * Both check their input once and return `{ ok: false, reason }` when it is wrong.
 */
import { InvalidInput, readLiteral, readObject } from './codec';
import { resolveConfig } from './config';
import { DifferentialEvolution } from './de';
import { Hybrid } from './hybrid';
import { NelderMead } from './nelder-mead';
import { Prng } from './prng';
import type { OptimizerConfig, OptimizerResult, ResolvedConfig } from './types';

function build(config: ResolvedConfig): DifferentialEvolution | NelderMead | Hybrid {
  const root = Prng.fromSeed(config.seed);
  const rng = config.stream === null ? root : root.split(config.stream);
  switch (config.kind) {
    case 'lshade':
    case 'de-rand-1-bin':
      return DifferentialEvolution.create(config, rng);
    case 'nelder-mead':
      return NelderMead.create(config, rng);
    case 'hybrid':
      return Hybrid.create(config, rng);
  }
}

function guard(make: () => DifferentialEvolution | NelderMead | Hybrid): OptimizerResult {
  try {
    return { ok: true, optimizer: make() };
  } catch (error) {
    if (error instanceof InvalidInput) return { ok: false, reason: error.message };
    throw error;
  }
}

/** A new optimizer; `config` is copied, never kept. */
export function createOptimizer(config: OptimizerConfig): OptimizerResult {
  return guard(() => build(resolveConfig(config)));
}

/** The optimizer an `exportState()` (possibly through JSON) describes, in exactly that state. */
export function restoreOptimizer(state: unknown): OptimizerResult {
  return guard(() => {
    const o = readObject(state, 'state');
    const kind = readLiteral(o.kind, 'state.kind', ['lshade', 'de-rand-1-bin', 'nelder-mead', 'hybrid'] as const);
    switch (kind) {
      case 'lshade':
      case 'de-rand-1-bin':
        return DifferentialEvolution.fromState(o, 'state');
      case 'nelder-mead':
        return NelderMead.fromState(o, 'state');
      case 'hybrid':
        return Hybrid.fromState(o, 'state');
    }
  });
}
