/** The engine in a browser: module Workers. The IndexedDB checkpoint store lives with the app, against CheckpointStore. */
export { browserEnvironment, spawnBrowserSearchWorker } from './environment';
