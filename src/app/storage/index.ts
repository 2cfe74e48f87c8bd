/** Keeping work: the project, run checkpoints and background images in IndexedDB. */
export { openLociDb, type LociDb } from './db';
export { indexedDbCheckpointStore, dropCheckpointsExcept, checkpointScope, CHECKPOINTS_KEPT } from './checkpointStore';
export { loadProject, saveProject, createProjectSaver, type ProjectSaver } from './projectStore';
export { readProject } from './projectSchema';
export { putImage, getImage, dropImagesExcept, deleteImage, TRACE_IMAGE_PREFIX, LEG_TRACE_IMAGE_PREFIX } from './imageStore';
export { loadTraceRecord, saveTraceRecord, deleteTraceRecord, TRACE_RECORD_KEY, LEG_TRACE_RECORD_KEY } from './traceRecordStore';
export { keepRun, isKept, listKeptRuns, getKeptRun, renameKeptRun, deleteKeptRun, listPins, putPin, deletePin, type Listing } from './runHistoryStore';
