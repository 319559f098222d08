// Lint rules for the TypeScript sources, tests, scripts and benchmarks: ESLint's recommended rules
// and typescript-eslint's (syntax only, fast); formatting is Prettier's (`pnpm format`).
import js from '@eslint/js';
import tseslint from 'typescript-eslint';

export default tseslint.config(
  { ignores: ['**/dist/**', 'node_modules/**', 'test-artifacts/**', 'review/**', '**/*.tmp.mjs'] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    languageOptions: {
      globals: {
        console: 'readonly',
        process: 'readonly',
        performance: 'readonly',
        URL: 'readonly',
        Buffer: 'readonly',
        setTimeout: 'readonly',
        clearTimeout: 'readonly',
        TextDecoder: 'readonly',
        TextEncoder: 'readonly',
        structuredClone: 'readonly',
      },
    },
    rules: {
      // unused names: `_`-prefixed arguments are deliberate
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_', caughtErrors: 'none' }],
    },
  },
  // scripts that drive Chromium pass functions to page.evaluate: they run in the page
  { files: ['bench/**', 'scripts/**'], languageOptions: { globals: { document: 'readonly' } } },
);
