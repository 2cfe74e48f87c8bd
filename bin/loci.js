#!/usr/bin/env node
// Runs the TypeScript command line on Node without a build step: tsx compiles
// src/cli on import, with the project's own tsconfig whatever the working directory.
import { fileURLToPath } from 'node:url';
import { register } from 'tsx/esm/api';

register({ tsconfig: fileURLToPath(new URL('../tsconfig.json', import.meta.url)) });
const { runCli } = await import('../src/cli/main.ts');
await runCli();
