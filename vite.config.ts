/// <reference types="vitest/config" />
import { defineConfig } from 'vite';
import react from '@vitejs/plugin-react';

// The editor is served from index.html at the top level; vitest shares this config.
export default defineConfig({
  plugins: [react()],
  worker: { format: 'es' },
  // Every dependency is found and bundled at start-up, the workers' too (the scan follows index.html only unless told),
  // so no page finds a new one after loading: the dev server would then reload the page under the user's (or a
  // test's) hands. The engine-independent math of src/core is CommonJS and is named as well.
  optimizeDeps: {
    entries: ['index.html', 'src/editor/worker/*Worker.ts'],
    include: ['sin', 'cos', 'tan', 'asin', 'acos', 'atan', 'atan2', 'exp', 'ln', 'log10', 'pow', 'hypot'].map((f) => `@stdlib/math-base-special-${f}`),
  },
  server: { port: 5173, strictPort: false },
  test: {
    include: ['test/**/*.test.ts', 'test/**/*.test.tsx'],
    testTimeout: 60_000,
    hookTimeout: 120_000,
    pool: 'forks',
    // Every test that runs bin/haloweave.js runs the current sources, never a prebuilt bundle (docs/startup.md).
    env: { HALOWEAVE_CLI: 'sources' },
  },
});
