/** The parts every optimizer state shares: format tag, configuration, PRNG, counters, best point. */
import { encodeReal, fail, readBoolean, readInteger, readLiteral, readNumbers, readObject, readReal } from './codec';
import { resolveConfig } from './config';
import { Prng } from './prng';
import { BestTracker } from './ranking';
import type { BestPointState, ResolvedConfig, StopReason } from './types';
import { STATE_FORMAT, STATE_VERSION } from './types';

export const STOP_REASONS = ['budget', 'target', 'converged'] as const;

export function encodeBest(best: BestTracker): BestPointState {
  return { x: Array.from(best.x), value: encodeReal(best.value), violation: encodeReal(best.violation), seen: best.seen };
}

export function readBest(v: unknown, where: string, dim: number): BestTracker {
  const o = readObject(v, where);
  const best = new BestTracker(dim);
  readNumbers(o.x, `${where}.x`, dim, 0, 1, best.x);
  best.value = readReal(o.value, `${where}.value`);
  best.violation = readReal(o.violation, `${where}.violation`);
  if (!(best.violation >= 0)) fail(`${where}.violation`, best.violation, 'a violation ≥ 0');
  best.seen = readBoolean(o.seen, `${where}.seen`);
  return best;
}

export interface Header<C extends ResolvedConfig> {
  readonly config: C;
  readonly rng: Prng;
  readonly evaluations: number;
  readonly stopReason: StopReason | null;
  readonly best: BestTracker;
}

/** Reads format, version, config (of one of `kinds`), PRNG, counters and best point of a state. */
export function readHeader<K extends ResolvedConfig['kind']>(
  o: Record<string, unknown>,
  where: string,
  kinds: readonly K[],
): Header<Extract<ResolvedConfig, { kind: K }>> {
  if (o.format !== STATE_FORMAT) fail(`${where}.format`, o.format, JSON.stringify(STATE_FORMAT));
  if (o.version !== STATE_VERSION) fail(`${where}.version`, o.version, String(STATE_VERSION));
  const kind = readLiteral(o.kind, `${where}.kind`, kinds);
  const config = resolveConfig(o.config, `${where}.config`);
  if (config.kind !== kind) fail(`${where}.config.kind`, config.kind, JSON.stringify(kind));
  const problem = Prng.checkState(o.rng);
  if (problem !== null) fail(`${where}.rng`, o.rng, `a PRNG state (it ${problem})`);
  const evaluations = readInteger(o.evaluations, `${where}.evaluations`, 0, config.maxEvaluations);
  const stopReason = o.stopReason === null ? null : readLiteral(o.stopReason, `${where}.stopReason`, STOP_REASONS);
  return {
    config: config as Extract<ResolvedConfig, { kind: K }>,
    rng: Prng.fromState(o.rng as Parameters<typeof Prng.fromState>[0]),
    evaluations,
    stopReason,
    best: readBest(o.best, `${where}.best`, config.dim),
  };
}

/** The header fields of an exported state. */
export function writeHeader<C extends ResolvedConfig>(
  config: C,
  rng: Prng,
  evaluations: number,
  stopReason: StopReason | null,
  best: BestTracker,
) {
  return {
    format: STATE_FORMAT,
    version: STATE_VERSION,
    kind: config.kind,
    // A copy: the caller may change what it is given without changing the optimizer.
    config: JSON.parse(JSON.stringify(config)) as C,
    rng: rng.exportState(),
    evaluations,
    stopReason,
    best: encodeBest(best),
  } as const;
}

/** The stop test every optimizer makes after a tell: target first, then budget. */
export function targetOrBudget(
  best: BestTracker,
  targetValue: number | null,
  evaluations: number,
  maxEvaluations: number,
): StopReason | null {
  if (targetValue !== null && best.violation <= 0 && best.value <= targetValue) return 'target';
  if (evaluations >= maxEvaluations) return 'budget';
  return null;
}
