import { defineConfig } from 'vitest/config';

// Browser tests: the built web app served by the real API, driven by playwright-core in
// Debian's chromium. Screenshots go to test-output/screenshots.
export default defineConfig({
  test: {
    name: 'e2e',
    include: ['e2e/**/*.test.ts'],
    globalSetup: ['support/global-setup-e2e.ts'],
    setupFiles: ['setup/fail-on-console-error.ts', 'support/expect-visible.ts'],
    testTimeout: 60_000,
    hookTimeout: 90_000,
    pool: 'forks',
    fileParallelism: false,
    // No retries: a test that fails once is a finding (tests wait for states, never for time).
  },
});
