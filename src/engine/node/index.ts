/** The engine on Node: worker threads and checkpoint files. */
export { nodeEnvironment, spawnNodeSearchWorker, type NodeWorkerHandle } from './environment';
export { fileCheckpointStore, writeFileAtomic } from './fileCheckpointStore';
