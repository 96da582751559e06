// Progress of a campaign: schedule counts by status, work by engineer, rejected hits by reason.
import { eq, sql } from 'drizzle-orm';
import { hit, scheduleEntry, user } from '@resonote/db/schema';
import type { Db } from '@resonote/db/client';
import { nextEntry } from './schedule-status.ts';

export async function campaignProgress(db: Db, campaignId: string) {
  const byStatus = await db.select({ status: scheduleEntry.status, n: sql<number>`count(*)::int` }).from(scheduleEntry).where(eq(scheduleEntry.campaignId, campaignId)).groupBy(scheduleEntry.status);
  const byEngineer = await db
    .select({
      userId: hit.recordedBy,
      name: user.name,
      hits: sql<number>`count(*)::int`,
      accepted: sql<number>`count(*) FILTER (WHERE ${hit.verdict} = 'accept')::int`,
      rejected: sql<number>`count(*) FILTER (WHERE ${hit.verdict} = 'reject')::int`,
      lastHitAt: sql<string>`max(${hit.recordedAt})`,
    })
    .from(hit)
    .leftJoin(user, eq(user.id, hit.recordedBy))
    .where(eq(hit.campaignId, campaignId))
    .groupBy(hit.recordedBy, user.name);
  const reasons = await db.execute<{ code: string; n: number }>(
    sql`SELECT r->>'code' AS code, count(*)::int AS n FROM ${hit}, jsonb_array_elements(${hit.reasons}) r WHERE ${hit.campaignId} = ${campaignId} AND ${hit.verdict} = 'reject' GROUP BY 1 ORDER BY 2 DESC`,
  );
  const counts: Record<string, number> = { planned: 0, 'in-progress': 0, done: 0, flagged: 0, skipped: 0 };
  for (const r of byStatus) counts[r.status] = r.n;
  return {
    byStatus: counts,
    total: Object.values(counts).reduce((a, b) => a + b, 0),
    byEngineer,
    rejectedByReason: Object.fromEntries(reasons.rows.map((r) => [r.code, Number(r.n)])),
    next: await nextEntry(db, campaignId),
  };
}
