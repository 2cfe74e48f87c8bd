/**
 * Imported first by searchWorker.ts, so it runs before any module builds a zod schema: a
 * browser worker runs under the page's policy (csp.ts), which refuses code built from
 * strings, so it forgoes it. On Node (the command line) nothing changes.
 */
import { forgoCodeGeneration } from '../src/core/codeGeneration';

if (typeof (globalThis as { WorkerGlobalScope?: unknown }).WorkerGlobalScope === 'function') forgoCodeGeneration();
