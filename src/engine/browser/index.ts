/**
 * The engine in a browser: module Workers. A page takes `pageEnvironment()`, whose runs
 * are hosted by the engine worker. The IndexedDB checkpoint store lives with the app,
 * against CheckpointStore, and reaches the engine worker as a comlink proxy.
 */
export { browserEnvironment, spawnBrowserSearchWorker } from './environment';
export { pageEnvironment } from './pageEnvironment';
