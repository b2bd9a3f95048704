// Lint config: typescript-eslint recommended rules on every TypeScript source, plus the project rules:
// the science core in layers/ must stay free of DOM, Node and UI imports (style.md habit 1), and every
// folder imports only in its allowed direction (eslint-import-boundaries.js, DEVELOPERS.md), and no
// function outside the tests is longer than 80 lines.
import js from '@eslint/js';
import tseslint from 'typescript-eslint';
import globals from 'globals';
import boundaries from './eslint-import-boundaries.js';

export default tseslint.config(
  { ignores: ['node_modules', 'dist', 'demo-data', 'tiles-out', 'web/public/tiles', '.cache', 'coverage'] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    files: ['**/*.{ts,tsx}'],
    languageOptions: { globals: { ...globals.browser, ...globals.node } },
    plugins: { boundaries },
    rules: {
      'boundaries/import-direction': 'error',
      '@typescript-eslint/no-explicit-any': 'error',
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_' }],
    },
  },
  {
    // Functions split by idea (issue 16): none over 80 lines outside the tests.
    files: ['**/*.{ts,tsx}'],
    ignores: ['tests/**'],
    rules: { 'max-lines-per-function': ['error', { max: 80, skipBlankLines: true, skipComments: true }] },
  },
  {
    files: ['layers/**/*.ts'],
    rules: {
      'no-restricted-imports': [
        'error',
        {
          patterns: [
            {
              group: ['node:*', 'fs', 'path', 'os', 'worker_threads', 'child_process'],
              message: 'layers/ is pure: no Node APIs',
            },
            {
              group: ['react', 'react-dom', 'maplibre-gl', '@deck.gl/*'],
              message: 'layers/ is pure: no UI imports',
            },
            {
              group: ['**/web/**', '**/data-pipeline/**'],
              message: 'layers/ must not import from the edges',
            },
          ],
        },
      ],
    },
  },
  {
    files: ['web/src/**/*.{ts,tsx}'],
    rules: {
      'no-restricted-imports': [
        'error',
        {
          patterns: [
            {
              group: ['node:*', 'fs', 'path', 'os', 'worker_threads', 'child_process'],
              message: 'web/src runs in the browser: no Node APIs',
            },
          ],
        },
      ],
    },
  },
  {
    files: ['bin/**/*.mjs', '*.js'],
    languageOptions: { globals: { ...globals.node } },
  },
);
