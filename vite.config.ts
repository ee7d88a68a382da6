/// <reference types="vitest/config" />
import { defineConfig } from 'vite';
import react from '@vitejs/plugin-react';

// The editor is served from index.html at the top level; vitest shares this config.
export default defineConfig({
  plugins: [react()],
  worker: { format: 'es' },
  // The engine-independent math of src/core (CommonJS packages): bundled up front, so neither the page nor the solver
  // worker finds a new dependency after start-up (which would make the dev server reload the page).
  optimizeDeps: {
    include: ['sin', 'cos', 'tan', 'asin', 'acos', 'atan', 'atan2', 'exp', 'ln', 'log10', 'pow', 'hypot'].map((f) => `@stdlib/math-base-special-${f}`),
  },
  server: { port: 5173, strictPort: false },
  test: {
    include: ['test/**/*.test.ts', 'test/**/*.test.tsx'],
    testTimeout: 60_000,
    hookTimeout: 120_000,
    pool: 'forks',
  },
});
