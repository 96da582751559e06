// Where the schedule stands: an entry's status from its hits (design.md, "Tap"), the entry to
// measure next, and the entries that have a result.
import { and, asc, eq, inArray, sql } from 'drizzle-orm';
import { hit, scheduleEntry } from '@resonote/db/schema';
import type { Db } from '@resonote/db/client';
import type { CurrentSettings } from './current-settings.ts';
import { entryResult, mainChannel, type EntryResult } from './entry-result.ts';
import type { ScheduleEntry } from './schedule-entry.ts';
import { notExcluded } from './exclusion.ts';

export type EntryStatus = (typeof scheduleEntry.$inferSelect)['status'];

/**
 * Schedule status from the hits (design.md, "Tap"): done when the required accepted hits are in
 * and the mean coherence over the band (on the channel that measures the entry's own response
 * DOF) reaches the campaign's threshold; flagged when the hits are in but the coherence is low;
 * in progress while hits are missing. An entry without any hit keeps its status.
 */
export function statusFrom(input: { hitCount: number; accepted: number; requiredHits: number; meanCoherence: number | null; threshold: number; current: EntryStatus }): EntryStatus {
  if (input.hitCount === 0) return input.current;
  if (input.accepted < input.requiredHits) return 'in-progress';
  return (input.meanCoherence ?? 0) >= input.threshold ? 'done' : 'flagged';
}

export interface EntryAfterHits {
  result: EntryResult | null;
  status: EntryStatus;
  /** Accepted hits of the entry (all, including any left out of the average). */
  accepted: number;
  total: number;
}

/** Recomputes the entry's result after its hits changed and stores the status that follows (a new row version when it changes). */
export async function refreshEntryStatus(db: Db, campaignId: string, entry: ScheduleEntry, settings: CurrentSettings): Promise<EntryAfterHits> {
  const result = await entryResult(db, campaignId, entry.id, settings);
  const [counts] = await db
    .select({ total: sql<number>`count(*)::int`, accepted: sql<number>`count(*) FILTER (WHERE ${hit.verdict} = 'accept')::int` })
    .from(hit)
    .where(and(eq(hit.scheduleEntryId, entry.id), notExcluded));
  const main = result ? result.channels[mainChannel(result.channels, entry.responseDof)] : undefined;
  const [fresh] = await db.select().from(scheduleEntry).where(eq(scheduleEntry.id, entry.id));
  const status = statusFrom({
    hitCount: counts?.total ?? 0,
    accepted: result?.averages ?? 0,
    requiredHits: fresh!.requiredHits,
    meanCoherence: main?.meanCoherence ?? null,
    threshold: settings.settings.coherenceThreshold,
    current: fresh!.status,
  });
  if (status !== fresh!.status) {
    await db.update(scheduleEntry).set({ status, version: fresh!.version + 1, updatedAt: new Date() }).where(eq(scheduleEntry.id, entry.id));
  }
  return { result, status, accepted: counts?.accepted ?? 0, total: counts?.total ?? 0 };
}

/** The entry to measure next: the first in progress, else the first planned, in schedule order; null when none is left. */
export async function nextEntry(db: Db, campaignId: string): Promise<string | null> {
  const [row] = await db
    .select({ id: scheduleEntry.id, status: scheduleEntry.status })
    .from(scheduleEntry)
    .where(and(eq(scheduleEntry.campaignId, campaignId), inArray(scheduleEntry.status, ['in-progress', 'planned'])))
    .orderBy(sql`CASE WHEN ${scheduleEntry.status} = 'in-progress' THEN 0 ELSE 1 END`, asc(scheduleEntry.position))
    .limit(1);
  return row?.id ?? null;
}

/** Schedule entries of a campaign that have at least one accepted hit, in schedule order. */
export async function entriesWithAcceptedHits(db: Db, campaignId: string): Promise<string[]> {
  const rows = await db
    .selectDistinct({ id: scheduleEntry.id, position: scheduleEntry.position })
    .from(scheduleEntry)
    .innerJoin(hit, and(eq(hit.scheduleEntryId, scheduleEntry.id), eq(hit.verdict, 'accept'), notExcluded))
    .where(eq(scheduleEntry.campaignId, campaignId))
    .orderBy(asc(scheduleEntry.position));
  return rows.map((r) => r.id);
}
