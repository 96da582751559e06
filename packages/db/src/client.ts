// Opens a PostgreSQL pool and wraps it in Drizzle. The only module of this package with I/O,
// besides migrate.ts.
import { drizzle, type NodePgDatabase } from 'drizzle-orm/node-postgres';
import pg from 'pg';
import * as schema from './schema/index.ts';

export type Db = NodePgDatabase<typeof schema> & { $client: pg.Pool };

export interface DbHandle {
  db: Db;
  pool: pg.Pool;
  close: () => Promise<void>;
}

export function openDb(databaseUrl: string, options: { max?: number } = {}): DbHandle {
  const pool = new pg.Pool({ connectionString: databaseUrl, max: options.max ?? 10 });
  // A dropped idle connection must not crash the process; the pool replaces it.
  pool.on('error', () => undefined);
  const db = drizzle(pool, { schema }) as Db;
  return { db, pool, close: () => pool.end() };
}

export { schema };
