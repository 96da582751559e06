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

export interface OpenDbOptions {
  max?: number;
  /**
   * Called when a pooled connection breaks outside a query (PostgreSQL restarted or stopped:
   * 57P01, "Connection terminated unexpectedly"). The pool drops that connection and opens a new
   * one at the next checkout; the caller only notes the outage.
   */
  onConnectionError?: (err: Error) => void;
  /** Called when the pool opened a new connection (the database is reachable). */
  onConnect?: () => void;
}

export function openDb(databaseUrl: string, options: OpenDbOptions = {}): DbHandle {
  const pool = new pg.Pool({
    connectionString: databaseUrl,
    max: options.max ?? 10,
    // A request never waits forever for a connection: an unreachable server or a full pool
    // fails the checkout after 10 s (the API answers 503 then).
    connectionTimeoutMillis: 10_000,
  });
  const onError = options.onConnectionError ?? (() => undefined);
  // An idle pooled connection that breaks: the pool removes it and emits here.
  pool.on('error', (err) => onError(err));
  // A checked-out connection (inside a transaction, between two of its queries) has no listener of
  // the pool's, and an 'error' event without a listener ends the process. Every connection gets
  // its own listener for its whole life; the pool still discards it on release because it is no
  // longer queryable.
  pool.on('connect', (client) => {
    client.on('error', (err) => onError(err));
    options.onConnect?.();
  });
  const db = drizzle(pool, { schema }) as Db;
  return { db, pool, close: () => pool.end() };
}

export { schema };
