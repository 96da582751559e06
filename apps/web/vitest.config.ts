import { defineConfig } from 'vitest/config';

// Unit tests of the web app's pure modules (no DOM): `lib/*.test.ts` beside the code.
export default defineConfig({
  test: {
    name: 'web',
    include: ['src/**/*.test.ts'],
    setupFiles: ['../../tests/setup/fail-on-console-error.ts'],
  },
});
