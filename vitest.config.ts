import { defineConfig } from 'vitest/config';

// Unit tests of the pure numerics (shared/) and the server's pure parts. The Angular app's specs
// run under `ng test`; the database and socket tests under vitest.integration.config.ts.
export default defineConfig({
  resolve: { alias: { odex: 'odex/src/odex.js' } },
  test: {
    include: ['shared/**/*.spec.ts', 'sim-server/**/*.spec.ts'],
    exclude: ['**/*.int.spec.ts', 'node_modules/**'],
    environment: 'node',
    pool: 'threads',
    // A guard, not a speed check: a clean-clone run with a busy loop beside a loaded machine
    // took a sliced twin run past vitest's 5 s default (issue 10 §4).
    testTimeout: 30_000,
  },
});
