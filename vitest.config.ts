import { configDefaults, defineConfig } from 'vitest/config';

// Two projects: `unit` (unit, property and reference tests, fast, no build) and `browser`
// (tests/browser: its globalSetup builds and serves the app once, and runs only when a
// browser test file is selected). The browser group runs after the unit group, one file
// at a time, so Chromium does not compete with the unit tests for the CPU.
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
          sequence: { groupOrder: 0 },
        },
      },
      {
        extends: true,
        test: {
          name: 'browser',
          include: ['tests/browser/**/*.test.ts'],
          globalSetup: ['tests/browser/global-setup.ts'],
          fileParallelism: false,
          sequence: { groupOrder: 1 },
        },
      },
    ],
  },
});
