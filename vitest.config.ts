import { defineConfig } from 'vitest/config';

// Every test project of the workspace; `npm test` runs them all after the bootstrap.
export default defineConfig({
  test: {
    projects: ['packages/*/vitest.config.ts', 'apps/web/vitest.config.ts', 'apps/api/vitest.config.ts', 'tests/vitest.api.config.ts', 'tests/vitest.e2e.config.ts'],
  },
});
