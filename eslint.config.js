// Lint the architecture as well as the code: the import rules below keep the layers of
// DESIGN.md pointing one way (app and cli -> engine -> workers API -> core).
import js from '@eslint/js';
import tseslint from 'typescript-eslint';
import reactHooks from 'eslint-plugin-react-hooks';
import globals from 'globals';

const uiAndIo = ['react', 'react-dom', 'react-dom/*', 'd3', 'd3-*', 'comlink', 'comlink/*', 'idb', 'playwright-core', 'node:*', 'fs', 'path', 'worker_threads'];

export default tseslint.config(
  { ignores: ['dist/**', 'node_modules/**', 'bench/peers/node_modules/**', 'coverage/**', 'tests/browser/.artifacts/**'] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    languageOptions: { globals: { ...globals.browser, ...globals.node } },
    rules: {
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_' }],
      eqeqeq: ['error', 'always'],
      'no-constant-condition': ['error', { checkLoops: false }],
    },
  },
  {
    files: ['src/core/**/*.ts'],
    languageOptions: { globals: { ...globals.es2021 } },
    rules: {
      'no-restricted-imports': ['error', {
        patterns: [
          { group: uiAndIo, message: 'src/core is pure TypeScript: no UI, DOM, worker or I/O libraries.' },
          { group: ['**/engine/**', '**/app/**', '**/cli/**', '**/workers/**'], message: 'src/core must not import a higher layer.' },
        ],
      }],
      'no-restricted-globals': ['error', 'window', 'document', 'navigator', 'self', 'localStorage', 'indexedDB', 'fetch', 'Worker', 'process', 'performance', 'setTimeout', 'setInterval'],
      'no-restricted-properties': ['error', { object: 'Math', property: 'random', message: 'Use the seeded PRNG in src/core/optimize.' }, { object: 'Date', property: 'now', message: 'src/core is deterministic: pass time in.' }],
      'no-console': 'error',
    },
  },
  {
    files: ['src/engine/**/*.ts', 'workers/**/*.ts'],
    rules: {
      'no-restricted-imports': ['error', {
        patterns: [
          { group: ['react', 'react-dom', 'react-dom/*', 'd3', 'd3-*', 'idb'], message: 'The engine does not know about views or browser storage.' },
          { group: ['**/app/**', '**/cli/**'], message: 'The engine must not import a higher layer.' },
        ],
      }],
    },
  },
  {
    files: ['src/app/**/*.{ts,tsx}'],
    plugins: { 'react-hooks': reactHooks },
    rules: { ...reactHooks.configs.recommended.rules },
  },
);
