/**
 * The two ways to get an optimizer: from a configuration, or from an exported state.
 * Both check their input once and return `{ ok: false, reason }` when it is wrong.
 */
import { InvalidInput, readObject } from './codec';
import { resolveConfig } from './config';
import { buildInner, restoreInner, type InnerOptimizer } from './inner';
import { Prng } from './prng';
import { Restart } from './restart';
import type { OptimizerConfig, OptimizerResult, ResolvedConfig } from './types';

function build(config: ResolvedConfig): InnerOptimizer | Restart {
  const root = Prng.fromSeed(config.seed);
  const rng = config.stream === null ? root : root.split(config.stream);
  return config.kind === 'restart' ? Restart.create(config, rng) : buildInner(config, rng);
}

function guard(make: () => InnerOptimizer | Restart): OptimizerResult {
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
    return o.kind === 'restart' ? Restart.fromState(o, 'state') : restoreInner(o, 'state');
  });
}
