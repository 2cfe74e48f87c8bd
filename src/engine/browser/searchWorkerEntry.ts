/**
 * The browser's search worker: workers/searchWorker.ts, and the life lock that tells the
 * page at once when the worker ends (lifeLock.ts).
 */
import '../../../workers/searchWorker';
import { holdLifeLock } from './lifeLock';

holdLifeLock();
