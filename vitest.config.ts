import { fileURLToPath } from 'node:url';
import { defineConfig } from 'vitest/config';

// Tests import the TypeScript sources directly; the CLI tests run the built launcher.
export default defineConfig({
  resolve: {
    // exact matches: '@hexsalvage/core/errors' must not be read as a path below the index
    alias: [
      { find: /^@hexsalvage\/core$/, replacement: fileURLToPath(new URL('./packages/core/src/index.ts', import.meta.url)) },
      { find: /^@hexsalvage\/core\/internal$/, replacement: fileURLToPath(new URL('./packages/core/src/internal.ts', import.meta.url)) },
      { find: /^@hexsalvage\/core\/node$/, replacement: fileURLToPath(new URL('./packages/core/src/node/index.ts', import.meta.url)) },
      { find: /^@hexsalvage\/core\/errors$/, replacement: fileURLToPath(new URL('./packages/core/src/shared/errors.ts', import.meta.url)) },
      { find: /^@hexsalvage\/plot$/, replacement: fileURLToPath(new URL('./packages/plot/src/index.ts', import.meta.url)) },
    ],
  },
  test: {
    include: ['test/**/*.test.ts'],
    globalSetup: ['test/support/tmpCleanup.ts'],
    testTimeout: 60000,
  },
});
