/** The engine on Node: worker threads and checkpoint files. */
export { nodeEnvironment, spawnNodeSearchWorker, type NodeWorkerHandle } from './environment';
export { checkpointPathsFor, fileCheckpointStore, previousPathFor, temporaryPathFor, writeFileAtomic, type FileCheckpointStoreOptions } from './fileCheckpointStore';
export { fsReason, nodeFileOps, type FileOps } from './fileOps';
export { checkFileTarget, type FileTargetCheck } from './fileTarget';
