/**
 * For a realm under a Content-Security-Policy without 'unsafe-eval' (the built app's, in
 * csp.ts): nothing is compiled from strings, so nothing is refused and reported. zod
 * parses without compiling its parsers, and linkage plans are interpreted (run.ts); both
 * give the same results as compiled code. Call once, before anything parses or compiles.
 */
import { config } from 'zod';
import { forgoKernelGeneration } from './linkage/specialise';

export function forgoCodeGeneration(): void {
  config({ jitless: true });
  forgoKernelGeneration();
}
