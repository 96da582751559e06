// The hand-over's hit statistics: totals, verdicts, reasons for rejection, who recorded them and
// when. Hits set aside by a redo (hits/exclusion.ts) stay stored but are not counted here, like
// every count and average of the product.
import { and, eq, sql } from 'drizzle-orm';
import { hit, user } from '@resonote/db/schema';
import type { Db } from '@resonote/db/client';
import { notExcluded } from '../hits/exclusion.ts';
import type { HandoverData } from './handover-data.ts';

export async function hitsOf(db: Db, campaignId: string): Promise<HandoverData['hits']> {
  const counted = and(eq(hit.campaignId, campaignId), notExcluded);
  const [span] = await db
    .select({
      total: sql<number>`count(*)::int`,
      accepted: sql<number>`count(*) FILTER (WHERE ${hit.verdict} = 'accept')::int`,
      rejected: sql<number>`count(*) FILTER (WHERE ${hit.verdict} = 'reject')::int`,
      overridden: sql<number>`count(*) FILTER (WHERE ${hit.verdict} <> ${hit.autoVerdict})::int`,
      firstAt: sql<string | null>`min(${hit.recordedAt})`,
      lastAt: sql<string | null>`max(${hit.recordedAt})`,
    })
    .from(hit)
    .where(counted);
  const byEngineer = (
    await db
      .select({
        name: user.name,
        hits: sql<number>`count(*)::int`,
        accepted: sql<number>`count(*) FILTER (WHERE ${hit.verdict} = 'accept')::int`,
        rejected: sql<number>`count(*) FILTER (WHERE ${hit.verdict} = 'reject')::int`,
      })
      .from(hit)
      .leftJoin(user, eq(user.id, hit.recordedBy))
      .where(counted)
      .groupBy(hit.recordedBy, user.name)
  ).map((r) => ({ ...r, name: r.name ?? '(account not on this instance)' }));
  const reasons = await db.execute<{ code: string; n: number }>(
    sql`SELECT r->>'code' AS code, count(*)::int AS n FROM ${hit}, jsonb_array_elements(${hit.reasons}) r WHERE ${hit.campaignId} = ${campaignId} AND ${hit.verdict} = 'reject' AND ${notExcluded} GROUP BY 1 ORDER BY 2 DESC, 1`,
  );
  const [aside] = await db
    .select({ n: sql<number>`count(*)::int` })
    .from(hit)
    .where(and(eq(hit.campaignId, campaignId), sql`NOT ${notExcluded}`));
  return {
    total: span?.total ?? 0,
    accepted: span?.accepted ?? 0,
    rejected: span?.rejected ?? 0,
    overridden: span?.overridden ?? 0,
    setAside: aside?.n ?? 0,
    byReason: reasons.rows.map((r) => ({ code: r.code, n: Number(r.n) })),
    byEngineer,
    firstAt: span?.firstAt ? new Date(span.firstAt) : null,
    lastAt: span?.lastAt ? new Date(span.lastAt) : null,
  };
}
