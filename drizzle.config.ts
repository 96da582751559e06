import { defineConfig } from 'drizzle-kit';

// `pnpm db:generate` writes a new SQL migration into drizzle/ from packages/db/src/schema.
export default defineConfig({
  dialect: 'postgresql',
  schema: './packages/db/src/schema/index.ts',
  out: './drizzle',
});
