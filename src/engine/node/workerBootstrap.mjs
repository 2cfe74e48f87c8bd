// Starts workers/searchWorker.ts in a Node worker thread. Node 20 does not apply module
// loaders given in a worker's execArgv (nodejs/node#47747), so `--import tsx` there does
// not work; this plain module registers tsx's loader in the thread itself, then imports
// the TypeScript entry named in workerData.
import { fileURLToPath } from 'node:url';
import { workerData } from 'node:worker_threads';
import { register } from 'tsx/esm/api';

register({ tsconfig: fileURLToPath(new URL('../../../tsconfig.json', import.meta.url)) });
await import(workerData.entry);
