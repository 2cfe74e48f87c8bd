import { configDefaults, defineConfig } from 'vitest/config';

// Three projects: `unit` (unit, property and reference tests, fast, no build), then
// `browser` and `browser-timed` (tests/browser: each one's globalSetup builds and serves
// the app, and runs only when one of its files is selected). The browser groups run after
// the unit group, so Chromium does not compete with the unit tests for the CPU.
/**
 * Browser tests that compare rates measured in the page (a hidden page's evaluations per
 * second against a visible one's): they run last, one at a time, with nothing else on the
 * machine's cores. (Main-thread tasks are judged by their CPU time, which load does not
 * stretch: tests/browser/mainThreadTasks.ts.)
 */
const TIMED_BROWSER_FILES = ['tests/browser/hidden-tab.test.ts'];

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
          // Both cores (the default leaves one free): the group runs alone, before the browser groups.
          maxWorkers: 2,
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
          // reloads), not computing; three at a time starved a search's start on two cores.
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
