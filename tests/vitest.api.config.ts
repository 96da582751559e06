import { defineConfig } from 'vitest/config';

// API tests: the real Express app against a real PostgreSQL database, one fresh database per
// test file (cloned from a migrated template made once in global-setup).
export default defineConfig({
  test: {
    name: 'api',
    include: ['api/**/*.test.ts'],
    globalSetup: ['support/global-setup-api.ts'],
    setupFiles: ['setup/fail-on-console-error.ts'],
    testTimeout: 60_000,
    hookTimeout: 60_000,
    pool: 'forks',
  },
});
