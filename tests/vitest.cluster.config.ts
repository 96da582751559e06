import { defineConfig } from 'vitest/config';

// The cluster test (`npm run test:cluster`): nginx in front of two API processes and two workers,
// started by tests/support/cluster.ts. Not part of `npm test` (it installs and runs nginx).
export default defineConfig({
  test: {
    name: 'cluster',
    include: ['cluster/**/*.test.ts'],
    setupFiles: ['setup/fail-on-console-error.ts'],
    testTimeout: 60_000,
    hookTimeout: 180_000,
    pool: 'forks',
  },
});
