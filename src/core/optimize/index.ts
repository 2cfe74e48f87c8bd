/**
 * Loci's optimizers: ask/tell searches of the unit box [0, 1]^dim with plain-JSON state,
 * feasibility-first ranking, and the one seeded generator.
 */
export type {
  BestPoint,
  BestPointState,
  CandidateState,
  CommonConfig,
  DeState,
  GlobalOptions,
  HybridConfig,
  HybridOptions,
  HybridState,
  Immigrant,
  Immigration,
  InnerConfig,
  InnerState,
  LshadeConfig,
  LshadeOptions,
  NelderMeadConfig,
  NelderMeadOptions,
  NelderMeadPhase,
  NelderMeadState,
  Optimizer,
  OptimizerConfig,
  OptimizerResult,
  OptimizerState,
  RandOneBinConfig,
  RandOneBinOptions,
  RestartConfig,
  RestartOptions,
  RestartState,
  StopReason,
} from './types';
export type { JsonReal } from './codec';
export { STATE_FORMAT, STATE_VERSION } from './types';
export { createOptimizer, restoreOptimizer } from './factory';
export { Restart } from './restart';
export { PrefixViews } from './prefixViews';
export { Prng, MAX_INT_RANGE, MAX_STREAM, type PrngState } from './prng';
export { canonicalInto, canonicalValue, canonicalViolation, precedes, precedesAt, precedesRawAt } from './ranking';
export { gaoHanCoefficients, type NelderMeadCoefficients } from './nelder-mead';
export { DistinctElite, rmsDistance } from './elite';
export { fromUnitBoxInto, toUnitBoxInto } from './box';
export { MAX_DIM, MAX_POPULATION, RUN_EVALUATIONS_PER_VARIABLE } from './config';
export { packState, unpackState, PACK_MIN_LENGTH, type Packed, type PackedNumbers, type PackedOptimizerState, type UnpackResult } from './packedState';
