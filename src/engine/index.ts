/**
 * The search engine: runs jobs (target × family × seed) as islands over workers, with
 * budgets, migration, an archive of distinct candidates, progress, pause/resume/cancel
 * and checkpoints. Environment-specific parts are in node/ and browser/.
 */
export { createRun, restoreRun, DEFAULT_TOP_K } from './run';
export { restoreRunFromStore } from './restoreFromStore';
export type { MakeRunResult, RankedCandidate, RestoreFromStoreResult, Run, RunOptions, RunProgress, RunResult, RunStatus, RunStopReason } from './runTypes';
export { defineRun, planIslands, DEFAULT_ISLAND_EVALUATIONS, MAX_CHECKPOINT_EVERY_S, MIN_CHECKPOINT_EVERY_S } from './runSpec';
export type { IslandPlan, JobSpec, RunInput, RunSpec } from './runSpec';
export { CHECKPOINT_FORMAT, CHECKPOINT_VERSION, decodeCheckpoint, encodeCheckpoint } from './checkpoint';
export type { CheckpointPayload } from './checkpoint';
export { memoryCheckpointStore, type CheckpointListing, type CheckpointStore, type StoredCheckpoint } from './checkpointStore';
export type { EngineEnvironment, WorkerHandle } from './environment';
export { fnv1a64Hex } from './checksum';
export { DesignDescriber, type DescribeResult } from './designDescriber';
export type { CandidateDetail, DescribedCandidate, Individual, ObjectiveSpec } from '../../workers/api';
