// Bundles the explorer page's script (the core, the plots, the report and the page code) into one
// file that `hexsalvage explore` inlines into a self-contained page: packages/cli/dist/bundle/.
// Vite (a dev dependency already, for the tests) does the bundling; it runs offline.
import { fileURLToPath } from 'node:url';
import { build } from 'vite';

const root = fileURLToPath(new URL('..', import.meta.url));
await build({
  configFile: false,
  logLevel: 'warn',
  root,
  build: {
    lib: {
      entry: `${root}packages/cli/explorer/src/main.ts`,
      formats: ['iife'],
      name: 'hexsalvageExplorer',
      fileName: () => 'explorer.js',
    },
    outDir: `${root}packages/cli/dist/bundle`,
    emptyOutDir: true,
    minify: true,
    sourcemap: false,
    target: 'es2022',
    reportCompressedSize: false,
  },
});
