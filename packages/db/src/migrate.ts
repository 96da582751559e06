// Applies the SQL migrations that drizzle-kit generated into <repo>/drizzle. Never `push`.
import { fileURLToPath } from 'node:url';
import path from 'node:path';
import { migrate } from 'drizzle-orm/node-postgres/migrator';
import { openDb } from './client.ts';

export const migrationsFolder = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../../../drizzle');

export async function migrateDatabase(databaseUrl: string): Promise<void> {
  const handle = openDb(databaseUrl, { max: 1 });
  try {
    await migrate(handle.db, { migrationsFolder });
  } finally {
    await handle.close();
  }
}
