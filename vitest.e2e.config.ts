import { defineConfig } from 'vitest/config';

// Browser tests: Debian's Chromium driven by playwright-core against the real server, which
// serves the built app (dist/app/browser) and talks to the test database (DATABASE_URL).
export default defineConfig({
  test: {
    include: ['e2e/**/*.e2e.ts'],
    environment: 'node',
    globalSetup: ['e2e/global-setup.ts'],
    fileParallelism: false,
    testTimeout: 60_000,
    hookTimeout: 60_000,
    // expect.poll waits 1 s by default, a speed threshold in disguise: a busy machine drawing the
    // 3D view in software can take longer to show what the test waits for. A guard, not a goal.
    expect: { poll: { timeout: 20_000 } },
  },
});
