/**
 * The browser's engine worker: hosts the page's runs (runService.ts), exposed with
 * comlink, so their orchestration runs off the page's main thread, which a browser slows
 * in a hidden tab. Its runs start their search workers from here (nested workers). It
 * holds a life lock (lifeLock.ts) so the page learns at once if it ends.
 */
// First: the page's policy refuses code built from strings (checkpoints are parsed here).
import '../../../workers/browserPolicy';
import { expose } from 'comlink';
import { createRunService } from '../runService';
import { browserEnvironment } from './environment';
import { holdLifeLock } from './lifeLock';

holdLifeLock();
expose(createRunService(browserEnvironment()));
