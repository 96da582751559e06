// Test databases: a migrated template per test project, and a fresh clone of it per test file.
import { randomBytes } from 'node:crypto';
import pg from 'pg';
import { migrateDatabase } from '@resonote/db/migrate';

/** Set by scripts/test.mjs; the default matches its test cluster so `pnpm vitest` works after a bootstrap. */
export const adminUrl = process.env.RESONOTE_TEST_DATABASE_URL ?? 'postgres://postgres@127.0.0.1:54339/postgres';

function urlFor(database: string): string {
  const url = new URL(adminUrl);
  url.pathname = `/${database}`;
  return url.toString();
}

async function withAdmin<T>(fn: (client: pg.Client) => Promise<T>): Promise<T> {
  const client = new pg.Client({ connectionString: adminUrl });
  await client.connect();
  try {
    return await fn(client);
  } finally {
    await client.end();
  }
}

export async function createTemplate(name: string): Promise<void> {
  await withAdmin(async (client) => {
    await client.query(`DROP DATABASE IF EXISTS "${name}" WITH (FORCE)`);
    await client.query(`CREATE DATABASE "${name}"`);
  });
  await migrateDatabase(urlFor(name));
}

export async function freshDatabase(template: string): Promise<{ url: string; drop: () => Promise<void> }> {
  const name = `t_${randomBytes(6).toString('hex')}`;
  await withAdmin((client) => client.query(`CREATE DATABASE "${name}" TEMPLATE "${template}"`));
  return {
    url: urlFor(name),
    drop: () => withAdmin((client) => client.query(`DROP DATABASE IF EXISTS "${name}" WITH (FORCE)`)).then(() => undefined),
  };
}
