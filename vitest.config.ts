import { fileURLToPath } from 'node:url';
import { defineConfig } from 'vitest/config';

// Tests import the TypeScript sources directly; the CLI tests run the built launcher.
export default defineConfig({
  resolve: {
    alias: {
      '@hexsalvage/core': fileURLToPath(new URL('./packages/core/src/index.ts', import.meta.url)),
      '@hexsalvage/plot': fileURLToPath(new URL('./packages/plot/src/index.ts', import.meta.url)),
    },
  },
  test: {
    include: ['test/**/*.test.ts'],
    testTimeout: 60000,
  },
});
