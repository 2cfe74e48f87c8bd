/**
 * Checks a configuration and fills in the defaults. The same reader takes back the
 * resolved configuration a state carries, so a checkpoint is checked like new input.
 */
import {
  fail,
  readBoolean,
  readInteger,
  readLiteral,
  readNumber,
  readNumbers,
  readObject,
  readOptionalNumber,
} from './codec';
import { MAX_STREAM } from './prng';
import type {
  GlobalOptions,
  LshadeOptions,
  NelderMeadOptions,
  RandOneBinOptions,
  ResolvedCommon,
  ResolvedConfig,
  ResolvedHybrid,
  ResolvedInnerOptions,
  ResolvedNelderMead,
  ResolvedRestart,
} from './types';

export const MAX_DIM = 1000;
export const MAX_POPULATION = 10000;
/** Population × dim: at most 4 Mi doubles (32 MB) per buffer. */
export const MAX_POPULATION_ENTRIES = 4 * 1024 * 1024;
const MAX_MEMORY_SIZE = 1000;
const MAX_ARCHIVE_RATE = 10;
const MAX_POLISH_COUNT = 100;
/**
 * The hybrid's share of its budget for the global search when a configuration names none:
 * half, chosen on the whole reach set (bench/README.md, "Reach"). States keep the share
 * they were written with.
 */
export const DEFAULT_GLOBAL_SHARE = 0.5;
const MAX_STALE_RESTARTS = 1_000_000;
const MAX_POPULATION_GROWTH = 10;
const MAX_AVOID_ATTEMPTS = 1000;
const MAX_BASINS = 1000;
const INNER_KINDS = ['lshade', 'de-rand-1-bin', 'nelder-mead', 'hybrid'] as const;
/**
 * Shortest restart run per variable, evaluations: 10 000 × D is the budget of one run in the
 * CEC 2005 real-parameter benchmark (Suganthan et al., 2005), the scale L-SHADE was tuned
 * at. A budget of several such runs is spent in several searches, each away from the
 * basins before it; a smaller one in one search, as before.
 */
export const RUN_EVALUATIONS_PER_VARIABLE = 10_000;
/** Largest simplex edge: a vertex flipped to the other side of the start stays in the box. */
export const MAX_SIMPLEX_STEP = 0.5;

type Fields = Record<string, unknown>;

function populationDefault(perDim: number, dim: number): number {
  const wanted = Math.max(4, Math.round(perDim * dim));
  return Math.min(wanted, MAX_POPULATION, Math.floor(MAX_POPULATION_ENTRIES / dim));
}

function readPopulation(v: unknown, where: string, dim: number, fallback: number): number {
  const n = readInteger(v ?? fallback, where, 4, MAX_POPULATION);
  if (n * dim > MAX_POPULATION_ENTRIES) fail(where, n, `at most ${Math.floor(MAX_POPULATION_ENTRIES / dim)} for dim ${dim}`);
  return n;
}

function readCommon(o: Fields, where: string): ResolvedCommon {
  const dim = readInteger(o.dim, `${where}.dim`, 1, MAX_DIM);
  const maxEvaluations = readInteger(o.maxEvaluations, `${where}.maxEvaluations`, 1, Number.MAX_SAFE_INTEGER);
  const seed = readInteger(o.seed, `${where}.seed`, 0, Number.MAX_SAFE_INTEGER);
  const stream = o.stream === undefined || o.stream === null ? null : readInteger(o.stream, `${where}.stream`, 0, MAX_STREAM);
  const targetValue = readOptionalNumber(o.targetValue, `${where}.targetValue`);
  return { dim, maxEvaluations, seed, stream, targetValue };
}

function readLshade(o: Fields, where: string, dim: number): LshadeOptions {
  const initialPopulation = readPopulation(o.initialPopulation, `${where}.initialPopulation`, dim, populationDefault(18, dim));
  return {
    initialPopulation,
    minPopulation: readInteger(o.minPopulation ?? 4, `${where}.minPopulation`, 4, initialPopulation),
    memorySize: readInteger(o.memorySize ?? 6, `${where}.memorySize`, 1, MAX_MEMORY_SIZE),
    pBest: readNumber(o.pBest ?? 0.11, `${where}.pBest`, 0, 1, true),
    archiveRate: readNumber(o.archiveRate ?? 2.6, `${where}.archiveRate`, 0, MAX_ARCHIVE_RATE),
    xTolerance: readNumber(o.xTolerance ?? 1e-12, `${where}.xTolerance`, 0, 1),
  };
}

function readRandOneBin(o: Fields, where: string, dim: number): RandOneBinOptions {
  return {
    population: readPopulation(o.population, `${where}.population`, dim, populationDefault(10, dim)),
    differentialWeight: readNumber(o.differentialWeight ?? 0.8, `${where}.differentialWeight`, 0, 2, true),
    crossoverRate: readNumber(o.crossoverRate ?? 0.9, `${where}.crossoverRate`, 0, 1),
    xTolerance: readNumber(o.xTolerance ?? 1e-12, `${where}.xTolerance`, 0, 1),
  };
}

function readNelderMead(o: Fields, where: string, defaultStep: number): Omit<NelderMeadOptions, 'x0'> {
  const initialStep = readNumber(o.initialStep ?? defaultStep, `${where}.initialStep`, 0, MAX_SIMPLEX_STEP, true);
  return {
    initialStep,
    simplexTolerance: readNumber(o.simplexTolerance ?? 1e-10, `${where}.simplexTolerance`, 0, 1),
    valueTolerance: readNumber(o.valueTolerance ?? 1e-12, `${where}.valueTolerance`, 0, 1),
    restartStepFactor: readNumber(o.restartStepFactor ?? 0.5, `${where}.restartStepFactor`, 0, 1, true),
    minRestartStep: readNumber(o.minRestartStep ?? Math.min(1e-6, initialStep), `${where}.minRestartStep`, 0, initialStep, true),
    maxStaleRestarts: readInteger(o.maxStaleRestarts ?? 3, `${where}.maxStaleRestarts`, 1, MAX_STALE_RESTARTS),
  };
}

function readGlobal(v: unknown, where: string, dim: number): GlobalOptions {
  const o = v === undefined || v === null ? {} : readObject(v, where);
  const kind = readLiteral(o.kind ?? 'lshade', `${where}.kind`, ['lshade', 'de-rand-1-bin'] as const);
  return kind === 'lshade' ? { kind, ...readLshade(o, where, dim) } : { kind, ...readRandOneBin(o, where, dim) };
}

/** Checks `input` (a config, or the config inside a state) and fills in defaults; throws InvalidInput. */
export function resolveConfig(input: unknown, where = 'config'): ResolvedConfig {
  const o = readObject(input, where);
  const kind = readLiteral(o.kind, `${where}.kind`, [...INNER_KINDS, 'restart'] as const);
  const common = readCommon(o, where);
  const { dim } = common;
  switch (kind) {
    case 'lshade':
      return { kind, ...common, ...readLshade(o, where, dim) };
    case 'de-rand-1-bin':
      return { kind, ...common, ...readRandOneBin(o, where, dim) };
    case 'nelder-mead': {
      const x0 = o.x0 === undefined || o.x0 === null ? null : Array.from(readNumbers(o.x0, `${where}.x0`, dim, 0, 1));
      const resolved: ResolvedNelderMead = { kind, ...common, x0, ...readNelderMead(o, where, 0.1) };
      return resolved;
    }
    case 'hybrid': {
      const polish = o.polish === undefined || o.polish === null ? {} : readObject(o.polish, `${where}.polish`);
      const resolved: ResolvedHybrid = {
        kind,
        ...common,
        globalShare: readNumber(o.globalShare ?? DEFAULT_GLOBAL_SHARE, `${where}.globalShare`, 0, 1, true),
        polishCount: readInteger(o.polishCount ?? 3, `${where}.polishCount`, 0, MAX_POLISH_COUNT),
        distinctDistance: readNumber(o.distinctDistance ?? 0.05, `${where}.distinctDistance`, 0, 1),
        global: readGlobal(o.global, `${where}.global`, dim),
        polish: readNelderMead(polish, `${where}.polish`, 0.02),
      };
      return resolved;
    }
    case 'restart':
      return readRestart(o, where, common);
  }
}

/** The largest population a restart may grow to in `dim` variables. */
export function maxPopulation(dim: number): number {
  return Math.min(MAX_POPULATION, Math.floor(MAX_POPULATION_ENTRIES / dim));
}

function readRestart(o: Fields, where: string, common: ResolvedCommon): ResolvedRestart {
  const innerInput = o.inner === undefined || o.inner === null ? { kind: 'lshade' } : readObject(o.inner, `${where}.inner`);
  readLiteral(innerInput.kind, `${where}.inner.kind`, INNER_KINDS);
  const { dim, maxEvaluations, seed, stream } = common;
  // A target given with the inner search (an island wraps a job's search, target and all) stops the scheme too.
  const targetValue = common.targetValue ?? readOptionalNumber(innerInput.targetValue, `${where}.inner.targetValue`);
  const resolved = resolveConfig({ ...innerInput, dim, maxEvaluations, seed, stream, targetValue }, `${where}.inner`);
  if (resolved.kind === 'restart') fail(`${where}.inner.kind`, resolved.kind, 'a search that is not itself a restart scheme');
  const inner = withoutCommon(resolved);
  return {
    kind: 'restart',
    ...common,
    targetValue,
    inner,
    populationGrowth: readNumber(o.populationGrowth ?? 2, `${where}.populationGrowth`, 1, MAX_POPULATION_GROWTH),
    stallShare: readNumber(o.stallShare ?? 0.25, `${where}.stallShare`, 0, 1, true),
    avoidDistance: readNumber(o.avoidDistance ?? 0.05, `${where}.avoidDistance`, 0, 1),
    avoidAttempts: readInteger(o.avoidAttempts ?? 32, `${where}.avoidAttempts`, 1, MAX_AVOID_ATTEMPTS),
    maxBasins: readInteger(o.maxBasins ?? 64, `${where}.maxBasins`, 0, MAX_BASINS),
    runEvaluations:
      o.runEvaluations === undefined || o.runEvaluations === null
        ? null
        : readInteger(o.runEvaluations, `${where}.runEvaluations`, 1, Number.MAX_SAFE_INTEGER),
    growRuns: readBoolean(o.growRuns ?? false, `${where}.growRuns`),
    // null switches the split off (the option is absent from states written before it existed: they get the default).
    runEvaluationsPerVariable:
      o.runEvaluationsPerVariable === null
        ? null
        : readInteger(o.runEvaluationsPerVariable ?? RUN_EVALUATIONS_PER_VARIABLE, `${where}.runEvaluationsPerVariable`, 1, Math.floor(Number.MAX_SAFE_INTEGER / MAX_DIM)),
    penaliseBasins: readBoolean(o.penaliseBasins ?? true, `${where}.penaliseBasins`),
  };
}

function withoutCommon(config: Exclude<ResolvedConfig, ResolvedRestart>): ResolvedInnerOptions {
  // eslint-disable-next-line @typescript-eslint/no-unused-vars
  const { dim, maxEvaluations, seed, stream, targetValue, ...rest } = config;
  return rest as ResolvedInnerOptions;
}
