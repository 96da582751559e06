// Rate-limit counters in PostgreSQL (issue 18), so every API process behind the load balancer
// counts against the same limit. better-auth's `customStorage.consume` contract: check and
// increment in one step — here one INSERT … ON CONFLICT statement, atomic under concurrency.
// A fixed window per key: the first request opens it, it resets once `window` seconds passed.
import { sql } from 'drizzle-orm';
import type { Db } from '@resonote/db/client';

/** Rows whose window closed more than this long ago are deleted now and then. */
const SWEEP_AFTER_S = 24 * 60 * 60;

export function postgresRateLimitStore(db: Db) {
  let lastSweep = 0;
  return {
    async consume(key: string, rule: { window: number; max: number }): Promise<{ allowed: boolean; retryAfter: number | null }> {
      const result = await db.execute<{ count: number; retry_after: number }>(sql`
        INSERT INTO rate_limit_window AS w (key, window_start, count) VALUES (${key}, now(), 1)
        ON CONFLICT (key) DO UPDATE SET
          window_start = CASE WHEN w.window_start <= now() - make_interval(secs => ${rule.window}) THEN now() ELSE w.window_start END,
          count = CASE WHEN w.window_start <= now() - make_interval(secs => ${rule.window}) THEN 1 ELSE w.count + 1 END
        RETURNING count, ceil(extract(epoch from (window_start + make_interval(secs => ${rule.window}) - now())))::int AS retry_after`);
      const row = result.rows[0]!;
      if (Date.now() - lastSweep > 60_000) {
        lastSweep = Date.now();
        void db.execute(sql`DELETE FROM rate_limit_window WHERE window_start < now() - make_interval(secs => ${SWEEP_AFTER_S})`).catch(() => undefined);
      }
      if (row.count <= rule.max) return { allowed: true, retryAfter: null };
      return { allowed: false, retryAfter: Math.max(1, Number(row.retry_after)) };
    },
  };
}
