import { defineConfig } from 'vitest/config';

// Tests against the real local PostgreSQL (DATABASE_URL, a fresh database made by npm test) and
// real sockets on loopback. Files share the database, so they run one after another.
export default defineConfig({
  resolve: { alias: { odex: 'odex/src/odex.js' } },
  test: {
    include: ['sim-server/**/*.int.spec.ts'],
    environment: 'node',
    fileParallelism: false,
    // Guards, not speed checks: route fuzzing took over 20 s on a fully loaded machine.
    testTimeout: 60_000,
    hookTimeout: 30_000,
  },
});
