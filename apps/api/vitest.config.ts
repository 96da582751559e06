import { defineConfig } from 'vitest/config';

// Unit tests of the API's pure modules, beside the code (`src/**/*.test.ts`); no database.
// Tests through HTTP and PostgreSQL are in tests/api/.
export default defineConfig({
  test: {
    name: 'api-unit',
    include: ['src/**/*.test.ts'],
    setupFiles: ['../../tests/setup/fail-on-console-error.ts'],
  },
});
