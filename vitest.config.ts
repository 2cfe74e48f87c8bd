import { configDefaults, defineConfig } from 'vitest/config';

// Three projects: `unit` (unit, property and reference tests, fast, no build), then
// `browser` and `browser-timed` (tests/browser: each one's globalSetup builds and serves
// the app, and runs only when one of its files is selected). The browser groups run after
// the unit group, so Chromium does not compete with the unit tests for the CPU.
/**
 * Browser tests that compare the page's own timings (no main-thread task over a bar, a
 * hidden page's speed against a visible one's): they run last, one at a time, with
 * nothing else on the machine's cores.
 */
const TIMED_BROWSER_FILES = ['tests/browser/workspace.test.ts', 'tests/browser/target-input.test.ts', 'tests/browser/hidden-tab.test.ts'];

export default defineConfig({
  test: {
    environment: 'node',
    testTimeout: 60_000,
    hookTimeout: 180_000,
    projects: [
      {
        extends: true,
        test: {
          name: 'unit',
          include: ['tests/**/*.test.ts'],
          exclude: [...configDefaults.exclude, 'tests/browser/**'],
          // Threads, and modules kept across a worker's files: the unit tests hold no
          // global state between files (none stubs a global or leaves fake timers on), and
          // re-importing the core for every file was most of the group's time.
          pool: 'threads',
          isolate: false,
          sequence: { groupOrder: 0 },
        },
      },
      {
        extends: true,
        test: {
          name: 'browser',
          include: ['tests/browser/**/*.test.ts'],
          exclude: [...configDefaults.exclude, ...TIMED_BROWSER_FILES],
          globalSetup: ['tests/browser/global-setup.ts'],
          // Two files at a time: most of their time is waiting on the app (checkpoints,
          // reloads), not computing.
          maxWorkers: 2,
          sequence: { groupOrder: 1 },
        },
      },
      {
        extends: true,
        test: {
          name: 'browser-timed',
          include: [...TIMED_BROWSER_FILES],
          globalSetup: ['tests/browser/global-setup.ts'],
          fileParallelism: false,
          sequence: { groupOrder: 2 },
        },
      },
    ],
  },
});
