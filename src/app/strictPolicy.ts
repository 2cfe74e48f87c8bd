/**
 * The page runs under the built app's Content-Security-Policy (csp.ts), which refuses code
 * built from strings: forgone here, before anything parses or compiles. Imported first by
 * main.tsx.
 */
import { forgoCodeGeneration } from '../core/codeGeneration';

forgoCodeGeneration();
