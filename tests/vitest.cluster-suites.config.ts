import { defineConfig } from 'vitest/config';

// `npm run test:cluster:suites`: the Tap, Review, Modes and Hand-over tests of the API and browser
// suites, each file against its own cluster — nginx in front of two API processes and two workers
// (RESONOTE_TEST_CLUSTER=1, tests/support/app.ts). One file at a time: a cluster is five processes.
export const CLUSTER_SUITES = [
  'api/hits.test.ts',
  'api/modes.test.ts',
  'api/handover.test.ts',
  'e2e/tap.test.ts',
  'e2e/review.test.ts',
  'e2e/modes.test.ts',
  'e2e/handover.test.ts',
];

export default defineConfig({
  test: {
    name: 'cluster-suites',
    include: CLUSTER_SUITES,
    globalSetup: ['support/global-setup-api.ts', 'support/global-setup-e2e.ts', 'setup/seeded-demo-templates.ts'],
    setupFiles: ['setup/fail-on-console-error.ts', 'support/expect-visible.ts', 'setup/same-fft-as-cluster.ts'],
    // RESONOTE_SEEDED_DEMO: the templates hold the demo already (setup/seeded-demo-templates.ts).
    env: { RESONOTE_TEST_CLUSTER: '1', RESONOTE_SEEDED_DEMO: '1' },
    testTimeout: 90_000,
    // A cluster start per file (the demo is seeded once, in the global set-up): generous on a shared machine.
    hookTimeout: 600_000,
    pool: 'forks',
    fileParallelism: false,
  },
});
