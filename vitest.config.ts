import { configDefaults, defineConfig } from 'vitest/config';

// Two projects: `unit` (unit, property and reference tests, fast, no build), then
// `browser` (tests/browser: its globalSetup builds and serves the app, and runs only when
// one of its files is selected). The browser group runs after the unit group, so Chromium
// does not compete with the unit tests for the CPU. No test asserts a speed: rates are
// measured by `npm run bench`.

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
          // Both cores (the default leaves one free): the group runs alone, before the browser group.
          maxWorkers: 2,
          sequence: { groupOrder: 0 },
        },
      },
      {
        extends: true,
        test: {
          name: 'browser',
          include: ['tests/browser/**/*.test.ts'],
          globalSetup: ['tests/browser/global-setup.ts'],
          // Threads, and modules kept across a worker's files, as in the unit group: each
          // file launches its own Chromium and closes its pages, and a fresh process per
          // file spent its first seconds importing playwright-core on a busy CPU.
          pool: 'threads',
          isolate: false,
          // Two files at a time: together they keep both cores busy (the app's searches and
          // drawing); three at a time starved a search's start.
          maxWorkers: 2,
          sequence: { groupOrder: 1 },
          // A poll for the page to follow an edit: vitest's default gives up after 1 s,
          // which a full run on a loaded machine overran (a layout switch's figures, drawn
          // in 0.1 s alone); a poll that succeeds returns as soon as it does.
          expect: { poll: { timeout: 10_000 } },
        },
      },
    ],
  },
});
